import { toCsv } from "~/security/csv";
import { fmt, placeLabel } from "./format";
import type { PartyResults } from "./party.server";

/** The party results as CSV: one line per entry and compo, then one per award (place empty, award named). */
export function partyResultsCsv(p: PartyResults): string {
  const rows = p.compos.flatMap((c) =>
    c.standings.map((r) => [c.slug, c.title, c.version, r.place, r.tied, r.title, r.crew, r.mixed, r.jury.score, r.audience.score, ""]),
  );
  const awards = p.awards.map((a) => [a.winner!.competitionSlug, a.winner!.competitionTitle, null, null, null, a.winner!.title, a.winner!.crew, null, null, null, a.title]);
  return toCsv(["compo_slug", "compo", "results_version", "place", "tied", "entry", "crew", "points", "jury_score", "audience_score", "award"], [...rows, ...awards]);
}

function table(head: string[], rows: string[][], rightFrom: number): string[] {
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i >= rightFrom ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ").trimEnd();
  return [line(head), line(widths.map((w) => "-".repeat(w))), ...rows.map(line)];
}

/** A plain-text sheet of the whole party for the notice board: every compo's places, points and crews, then the awards. */
export function partyResultsText(p: PartyResults): string {
  const out: string[] = [`${p.event.title} — results of the party`, ""];
  for (const c of p.compos) {
    out.push(`${c.title} (results version ${c.version}, published ${c.publishedAt})`, ...table(["Place", "Entry", "Crew", "Points"], c.standings.map((r) => [placeLabel(r), r.title, r.crew, fmt(r.mixed)]), 3), `SHA-256 of the canonical results JSON: ${c.sha256}`, "");
  }
  for (const c of p.pending) out.push(`${c.title}: results not out yet.`, "");
  if (p.awards.length) {
    out.push("Awards", ...table(["Award", "Entry", "Crew", "Compo"], p.awards.map((a) => [a.title, a.winner!.title, a.winner!.crew, a.winner!.competitionTitle]), 99), "");
  }
  out.push("Points are each compo's mixed score (jury and audience, scaled 0–1). Prizes and any money follow local law; Gatecrash gives no legal advice.", "");
  return out.join("\n");
}
