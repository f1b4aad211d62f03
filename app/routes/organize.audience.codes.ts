import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { voteUrl } from "~/stage/stage.server";
import { unused } from "~/voting/code-book.server";
import { codeSheetHtml, htmlResponse } from "~/voting/code-sheet.server";
import { voteCodesOf } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience.codes";

/** A print view of this compo's own unused vote codes (party-wide codes are printed from the party's page). */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const lines = (await voteCodesOf(c.id)).filter((x) => !x.partyWide && unused(x));
  return htmlResponse(await codeSheetHtml({ heading: `${c.title} — ${c.eventTitle}`, url: voteUrl(c), lines }));
}
