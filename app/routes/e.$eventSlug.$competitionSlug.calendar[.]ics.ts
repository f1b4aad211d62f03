import { data } from "react-router";
import { competitionCalendar, publicCompetition } from "~/competitions/public.server";
import type { Route } from "./+types/e.$eventSlug.$competitionSlug.calendar[.]ics";

/** The compo's deadline and voting window as an iCalendar file (RFC 5545). Public past draft. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const found = await publicCompetition(context, params.eventSlug, params.competitionSlug);
  if (!found) throw data({ message: "No such compo." }, { status: 404 });
  const pageUrl = new URL(`/e/${found.event.slug}/${found.competition.slug}`, request.url).toString();
  const body = competitionCalendar(found.competition, found.event, pageUrl, new Date());
  return new Response(body, {
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Content-Disposition": `attachment; filename="${found.event.slug}-${found.competition.slug}.ics"`,
      "Cache-Control": "no-store",
    },
  });
}
