import { toCsv } from "~/security/csv";
import { hashSchemeLabel, type HashScheme } from "./canonical";
import type { ResultsPayload, StandingRow } from "./shapes";

/** Figures as the results pages, the CSV and the text sheet print them. */
export function fmt(n: number | null, digits = 3): string {
  return n === null ? "—" : n.toFixed(digits);
}

export function placeLabel(r: Pick<StandingRow, "place" | "tied">): string {
  return r.tied ? `${r.place}=` : String(r.place);
}

export const METHOD_NAMES: Record<string, string> = {
  "jury-raw": "jury, mean of raw scores",
  "jury-z": "jury, z-scores per judge",
  points: "audience points (0–5 per entry)",
  borda: "audience ranking counted by Borda",
  schulze: "audience ranking counted by Schulze",
};

/** RFC 4180 CSV with formula escaping (app/security/csv.ts): entry titles and crew names are entrant-chosen. */
export function resultsCsv(p: ResultsPayload): string {
  const head = ["place", "tied", "entry_id", "title", "crew", "mixed", "jury_score", "jury_place", "audience_score", "audience_place"];
  return toCsv(head, p.standings.map((r) => [r.place, r.tied ? "yes" : "no", r.entryId, r.title, r.crew, r.mixed, r.jury.score, r.jury.place, r.audience.score, r.audience.place]));
}

/** A plain-text results sheet, monospaced columns, for notice boards and mailing lists. */
export function resultsText(p: ResultsPayload, hash: { sha256: string; scheme: HashScheme }, publishedAt: string): string {
  const rows = p.standings.map((r) => [placeLabel(r), r.title, r.crew, fmt(r.mixed), fmt(r.jury.score), fmt(r.audience.score)]);
  const head = ["Place", "Entry", "Crew", "Mixed", "Jury", "Audience"];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i >= 3 ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ").trimEnd();
  return [
    `${p.competition.eventTitle} — ${p.competition.title}`,
    `Results, version ${p.version}, published ${publishedAt}`,
    p.note ? `Note: ${p.note}` : null,
    `Jury ${p.method.juryWeightPct} % (${METHOD_NAMES[p.method.jury]}), audience ${p.method.audienceWeightPct} % (${METHOD_NAMES[p.method.audience]}).`,
    `${p.counts.entries} entries, ${p.counts.judges} judges, ${p.counts.ballots} audience ballots.`,
    "",
    line(head),
    line(widths.map((w) => "-".repeat(w))),
    ...rows.map(line),
    "",
    `${hashSchemeLabel(hash.scheme)}: ${hash.sha256}`,
    "Prizes and any money follow local law; Gatecrash gives no legal advice.",
    "",
  ]
    .filter((l): l is string => l !== null)
    .join("\n");
}
