import { z } from "zod";
import { apiError, apiJson, parseJsonBody, requireApiUser, requireMethod } from "~/api/json.server";
import { competitionForJudge } from "~/judging/access.server";
import { apiCall } from "~/judging/http.server";
import { NOTE_MAX, saveNote } from "~/judging/scores.server";
import type { Route } from "./+types/api.judging.$competitionId.notes";

/** POST {entryId, note, version}: saves the judge's note on one entry; same refusals as scores. */
const bodySchema = z.object({
  entryId: z.string().min(1, "Which entry?"),
  note: z.string().max(NOTE_MAX, `A note is at most ${NOTE_MAX} characters.`),
  version: z.number().int().nonnegative(),
});

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireApiUser(request);
  requireMethod(request, ["POST"]);
  const c = await competitionForJudge(user.id, params.competitionId);
  if (!c) throw apiError(404, "not_found", "That competition was not found among the ones you judge.");
  const body = await parseJsonBody(request, bodySchema);
  const saved = await apiCall(() => saveNote({ judgeUserId: user.id, competitionId: c.id, ...body }));
  return apiJson({ saved });
}
