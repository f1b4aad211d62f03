import { z } from "zod";
import { apiJson, parseJsonBody } from "~/api/json.server";
import { apiCall } from "~/errors/http.server";
import { requireApiJudge } from "~/judging/http.server";
import { NOTE_MAX, saveNote } from "~/judging/scores.server";
import type { Route } from "./+types/api.judging.$competitionId.notes";

/** POST {entryId, note, version}: saves the judge's note on one entry; same refusals as scores. */
const bodySchema = z.object({
  entryId: z.string().min(1, "Which entry?"),
  note: z.string().max(NOTE_MAX, `A note is at most ${NOTE_MAX} characters.`),
  version: z.number().int().nonnegative(),
});

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition: c } = await requireApiJudge(request, context, params.competitionId, ["POST"]);
  const body = await parseJsonBody(request, bodySchema);
  const saved = await apiCall(() => saveNote({ judgeUserId: user.id, competitionId: c.id, ...body }));
  return apiJson({ saved });
}
