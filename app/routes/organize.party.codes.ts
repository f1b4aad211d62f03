import { requireEventRole } from "~/competitions/access.server";
import { env } from "~/env.server";
import { partyCodes, unused } from "~/voting/code-book.server";
import { codeSheetCsv, codeSheetHtml, csvResponse, htmlResponse } from "~/voting/code-sheet.server";
import type { Route } from "./+types/organize.party.codes";

/** The party-wide vote codes: the print sheet of unused slips (…/party/codes) or every code as CSV (…/party/codes.csv). */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { event } = await requireEventRole(request, context, params.eventId, "organizer");
  const lines = await partyCodes(event.id);
  if (new URL(request.url).pathname.endsWith(".csv")) return csvResponse(codeSheetCsv(lines), `vote-codes-${event.slug}.csv`);
  const url = `${env().APP_URL.replace(/\/$/, "")}/e/${event.slug}`;
  return htmlResponse(await codeSheetHtml({ heading: `${event.title} — every compo`, url, lines: lines.filter(unused) }));
}
