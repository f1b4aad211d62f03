import { data } from "react-router";
import { rulesetJson } from "~/competitions/ruleset-io";
import { publicCompetition } from "~/competitions/public.server";
import type { Route } from "./+types/e.$eventSlug.$competitionSlug.ruleset[.]json";

/** The compo's ruleset as JSON, every default filled in: public once the compo is past draft. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const found = await publicCompetition(context, params.eventSlug, params.competitionSlug);
  if (!found) throw data({ message: "No such compo." }, { status: 404 });
  return new Response(rulesetJson(found.ruleset), {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${found.event.slug}-${found.competition.slug}-ruleset-v${found.competition.rulesetVersion}.json"`,
      "Cache-Control": "no-store",
    },
  });
}
