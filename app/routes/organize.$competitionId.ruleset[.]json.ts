import { requireCompetitionRole } from "~/competitions/access.server";
import { rulesetJson } from "~/competitions/ruleset-io";
import { storedRuleset } from "~/competitions/service.server";
import type { Route } from "./+types/organize.$competitionId.ruleset[.]json";

/** The stored ruleset as a JSON download (every default filled in), for organizers of the event. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition, event } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const { ruleset } = storedRuleset(competition);
  return new Response(rulesetJson(ruleset), {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${event.slug}-${competition.slug}-ruleset-v${competition.rulesetVersion}.json"`,
      "Cache-Control": "no-store",
    },
  });
}
