import { ScoringInputError } from "./errors";
import { JURY_TIE_BREAKS, type JuryStandings } from "./jury";
import { placeByKeys, type RankedRow } from "./places";

export interface AudienceScore {
  candidate: string;
  score: number | null;
}

export interface MixInput {
  jury: JuryStandings;
  /** Any audience ranking's rows (points, Borda or Schulze): higher score is better. */
  audience: readonly AudienceScore[];
  /** 0 = jury only, 100 = audience only. */
  audienceWeightPercent: number;
}

export interface SideFigures {
  score: number | null;
  /** (score − min) / (max − min) over the entries that have a score on this side; 0 when missing. */
  normalised: number;
}

export interface MixedEntry {
  candidate: string;
  jury: SideFigures;
  audience: SideFigures;
  /** (1 − w) · jury.normalised + w · audience.normalised, w = audienceWeightPercent / 100. */
  mixed: number;
  /** The jury's tie-breaks, carried over. */
  median: number | null;
  topThree: number;
}

export interface MixMissing {
  candidate: string;
  side: "jury" | "audience";
  treatment: string;
}

export interface MixedStandings {
  method: "mix";
  juryMethod: JuryStandings["method"];
  audienceWeightPercent: number;
  /** The range each side was scaled from. */
  scale: { jury: { min: number | null; max: number | null }; audience: { min: number | null; max: number | null } };
  entries: MixedEntry[];
  ranking: RankedRow[];
  missing: MixMissing[];
  rules: string[];
}

const TREAT_MISSING = "no score on this side: counted as 0, the lowest on the common scale";

function rangeOf(values: (number | null)[]): { min: number | null; max: number | null } {
  const present = values.filter((v): v is number => v !== null);
  return present.length === 0 ? { min: null, max: null } : { min: Math.min(...present), max: Math.max(...present) };
}

/** Min–max to 0..1; if every entry has the same score they all count as the best (1). */
function scale(score: number | null, range: { min: number | null; max: number | null }): number {
  if (score === null || range.min === null || range.max === null) return 0;
  return range.max === range.min ? 1 : (score - range.min) / (range.max - range.min);
}

/**
 * Final standings from jury and audience. Each side is first scaled to 0..1 by min–max over the
 * entries (best 1, worst 0), because jury figures (raw points, z-scores) and audience figures
 * (points, Borda counts, Schulze wins) live on unrelated scales. Ties follow the jury's rules.
 */
export function mixStandings(input: MixInput): MixedStandings {
  const w = input.audienceWeightPercent;
  if (!Number.isFinite(w) || w < 0 || w > 100) throw new ScoringInputError([`audience weight must be 0–100 %, got ${w}`]);
  const audienceBy = new Map<string, number | null>();
  for (const a of input.audience) {
    if (audienceBy.has(a.candidate)) throw new ScoringInputError([`entry "${a.candidate}" appears twice in the audience standings`]);
    audienceBy.set(a.candidate, a.score);
  }
  const juryBy = new Map(input.jury.entries.map((e) => [e.candidate, e]));
  const candidates = [...new Set([...juryBy.keys(), ...audienceBy.keys()])];

  const juryRange = rangeOf(input.jury.entries.map((e) => e.score));
  const audienceRange = rangeOf([...audienceBy.values()]);
  const missing: MixMissing[] = [];

  const entries: MixedEntry[] = candidates.map((candidate) => {
    const juryEntry = juryBy.get(candidate);
    const juryScore = juryEntry?.score ?? null;
    const audienceScore = audienceBy.get(candidate) ?? null;
    if (juryScore === null) missing.push({ candidate, side: "jury", treatment: TREAT_MISSING });
    if (audienceScore === null) missing.push({ candidate, side: "audience", treatment: TREAT_MISSING });
    const jury = { score: juryScore, normalised: scale(juryScore, juryRange) };
    const audience = { score: audienceScore, normalised: scale(audienceScore, audienceRange) };
    return {
      candidate,
      jury,
      audience,
      mixed: (1 - w / 100) * jury.normalised + (w / 100) * audience.normalised,
      median: juryEntry?.median ?? null,
      topThree: juryEntry?.topThree ?? 0,
    };
  });

  return {
    method: "mix",
    juryMethod: input.jury.method,
    audienceWeightPercent: w,
    scale: { jury: juryRange, audience: audienceRange },
    entries,
    ranking: placeByKeys(
      entries.map((e) => ({ candidate: e.candidate, keys: [e.mixed, e.median, e.topThree] })),
      ["mixed", JURY_TIE_BREAKS[1], JURY_TIE_BREAKS[2]],
    ),
    missing,
    rules: [
      "Each side is scaled to 0..1 by (score − lowest) / (highest − lowest) over the entries it scored; if all are equal they all get 1.",
      "An entry with no score on a side gets 0 there, and is listed as missing.",
      `Mixed = ${100 - w} % × jury + ${w} % × audience, both on the 0..1 scale.`,
      "Ties: higher mixed score, then the jury's median of per-judge figures, then top-three placements; entries still equal share a place.",
    ],
  };
}
