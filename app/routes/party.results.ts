import { data } from "react-router";
import { publicParty } from "~/party/public.server";
import { partyResultsCsv, partyResultsText } from "~/results/party-format";
import { partyResults } from "~/results/party.server";
import type { Route } from "./+types/party.results";

/** The party-wide results sheet: /e/:eventSlug/results.txt (plain text) or results.csv. Public once a compo's results are out. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const party = await publicParty(params.eventSlug);
  const results = party ? await partyResults(party.event.id) : null;
  if (!party || !results || results.compos.length === 0) throw data({ message: "No results of this party are out yet." }, { status: 404 });
  if (new URL(request.url).pathname.endsWith(".csv"))
    return new Response(partyResultsCsv(results), { headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="results-${party.event.slug}.csv"` } });
  return new Response(partyResultsText(results), { headers: { "Content-Type": "text/plain; charset=utf-8" } });
}
