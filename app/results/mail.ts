import { composeMail, type Mail } from "~/mail/templates";
import { fmt, METHOD_NAMES, placeLabel } from "./format";
import type { ResultsPayload, StandingRow } from "./shapes";

/** The mail every entrant gets when results are published (and again for a correction). */
export function resultsMail(a: { to: string; name: string; row: StandingRow; payload: ResultsPayload; url: string; dedupeKey: string }): Mail {
  const p = a.payload;
  const correction = p.version > 1;
  const subject = `${correction ? "Corrected results" : "Results"}: ${a.row.title} placed ${placeLabel(a.row)} in ${p.competition.title}`;
  return composeMail(
    a.to,
    subject,
    [
      `Hello ${a.name},`,
      `The results of ${p.competition.title} (${p.competition.eventTitle}) are out${correction ? ` — corrected, version ${p.version}` : ""}.`,
      ...(correction && p.note ? [`What changed: ${p.note}`] : []),
      `Your entry "${a.row.title}" placed ${placeLabel(a.row)} of ${p.standings.length}.`,
      `Jury (${METHOD_NAMES[p.method.jury]}): score ${fmt(a.row.jury.score)}, jury place ${a.row.jury.place ?? "—"}.\n` +
        `Audience (${METHOD_NAMES[p.method.audience]}): score ${fmt(a.row.audience.score)}, audience place ${a.row.audience.place ?? "—"}.\n` +
        `Mixed with ${p.method.juryWeightPct} % jury and ${p.method.audienceWeightPct} % audience: ${fmt(a.row.mixed)}.`,
      { text: "See the full results", href: a.url },
      "Prizes and any money follow local law; Gatecrash gives no legal advice.",
    ],
    a.dedupeKey,
  );
}
