import { data } from "react-router";
import { publicParty } from "~/party/public.server";
import { partyCalendar } from "~/party/timetable";
import type { Route } from "./+types/party.calendar[.]ics";

/** The whole party's timetable as one iCalendar file (RFC 5545). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const p = await publicParty(params.eventSlug);
  if (!p) throw data({ message: "There is no such party." }, { status: 404 });
  return new Response(partyCalendar(p.event, p.compos, request.url, new Date()), {
    headers: { "Content-Type": "text/calendar; charset=utf-8", "Content-Disposition": `attachment; filename="${p.event.slug}.ics"`, "Cache-Control": "no-store" },
  });
}
