import { z } from "zod";
import { apiJson, parseJsonBody } from "~/api/json.server";
import { gridFor } from "~/judging/grid.server";
import { apiCall } from "~/errors/http.server";
import { requireApiJudge } from "~/judging/http.server";
import { saveScore } from "~/judging/scores.server";
import type { Route } from "./+types/api.judging.$competitionId.scores";

/**
 * GET: the signed-in judge's grid (rows in their order, cells with versions).
 * POST {entryId, criterionId, value (number | null to clear), version}: saves one cell.
 * 400 field errors (value off the scale), 403 conflict of interest, 404 not theirs, 409 stale version
 * (body also has `current`), 423 judging closed.
 */
const bodySchema = z.object({
  entryId: z.string().min(1, "Which entry?"),
  criterionId: z.string().min(1, "Which criterion?"),
  value: z.number({ error: "A score must be a number or null." }).finite("A score must be a finite number.").nullable(),
  version: z.number({ error: "Send the version you saw." }).int().nonnegative(),
});

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { user, competition: c } = await requireApiJudge(request, context, params.competitionId);
  return apiJson({ grid: await gridFor(user.id, c), locked: c.judgingLocked });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition: c } = await requireApiJudge(request, context, params.competitionId, ["POST"]);
  const body = await parseJsonBody(request, bodySchema);
  const saved = await apiCall(() => saveScore({ judgeUserId: user.id, competitionId: c.id, ...body }));
  return apiJson({ saved });
}
