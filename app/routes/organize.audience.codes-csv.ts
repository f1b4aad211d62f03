import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { codeSheetCsv, csvResponse } from "~/voting/code-sheet.server";
import { voteCodesOf } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience.codes-csv";

/** Every code that votes in this compo, its own and the party-wide ones, as CSV. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  return csvResponse(codeSheetCsv(await voteCodesOf(c.id)), `vote-codes-${c.slug}.csv`);
}
