import { ScoringInputError } from "./errors";
import { placeByKeys, type RankedRow } from "./places";
import { mean, median, nearlyEqual, populationStandardDeviation, weightedMean } from "./stats";

export type JuryMethod = "jury-raw" | "jury-z";

export interface Criterion {
  id: string;
  /** Relative weight, > 0. Weights need not sum to anything in particular. */
  weight: number;
  min?: number;
  max?: number;
}

export interface JudgeScore {
  judge: string;
  candidate: string;
  criterion: string;
  value: number;
}

export interface JuryInput {
  criteria: readonly Criterion[];
  scores: readonly JudgeScore[];
  /** Every entry of the competition, so entries nobody scored still appear. */
  candidates?: readonly string[];
}

/** How a judge's scores were standardised. */
export type JudgeSpread = "ok" | "single-score" | "no-spread";

export interface JudgeSummary {
  judge: string;
  /** Mean of all this judge's scores (every entry, every criterion). */
  mean: number;
  /** Population SD of the same scores. */
  sd: number;
  count: number;
  spread: JudgeSpread;
}

export interface CriterionFigure {
  criterion: string;
  weight: number;
  raw: number;
  z: number;
}

export interface JudgeFigures {
  judge: string;
  /** Weighted mean of this judge's raw scores for the entry (over the criteria they scored). */
  raw: number;
  /** The same over the judge's z-scores. */
  normalised: number;
  /** The entry's place among the entries this judge scored, by the method's figure (1, 2, 2, 4). */
  placeForJudge: number;
  criteria: CriterionFigure[];
}

export interface EntryFigures {
  candidate: string;
  perJudge: JudgeFigures[];
  /** Mean over judges of `raw`; null when no judge scored the entry. */
  raw: number | null;
  /** Mean over judges of `normalised`. */
  normalised: number | null;
  /** The method's figure: `raw` for jury-raw, `normalised` for jury-z. */
  score: number | null;
  /** First tie-break: median of the per-judge figures the method uses. */
  median: number | null;
  /** Second tie-break: how many judges placed the entry 1st, 2nd or 3rd among those they scored. */
  topThree: number;
}

export type MissingScore =
  | { kind: "criterion"; judge: string; candidate: string; criterion: string; treatment: string }
  | { kind: "entry"; judge: string; candidate: string; treatment: string }
  | { kind: "unscored"; candidate: string; treatment: string };

export interface JuryStandings {
  method: JuryMethod;
  ranking: RankedRow[];
  judges: JudgeSummary[];
  entries: EntryFigures[];
  missing: MissingScore[];
  /** The rules applied, in words, for the page to print beside the table. */
  rules: string[];
}

export const JURY_TIE_BREAKS = ["score", "median of per-judge figures", "top-three placements"] as const;

const TREAT_CRITERION =
  "left out of this judge's figure for the entry; the weights of the criteria the judge did score were rescaled to sum to 1";
const TREAT_ENTRY = "this judge is left out of the entry's mean, which is taken over the judges who scored it";
const TREAT_UNSCORED = "no figure; placed after every scored entry, tied with any other unscored entry";

const RULES: Record<JuryMethod, string> = {
  "jury-raw":
    "Score = mean over judges of each judge's weighted mean of raw scores over the criteria.",
  "jury-z":
    "Each score is replaced by its z-score within its judge: (value − judge's mean) / judge's SD, over all that judge's scores. " +
    "Score = mean over judges of each judge's weighted mean of z-scores over the criteria.",
};

const COMMON_RULES = [
  "SD is the population SD (divide by n): a judge's scores are the whole set being standardised, not a sample, " +
    "so every judge ends up with z-scores of mean 0 and SD 1.",
  "A judge with a single score or with every score equal has no spread to divide by: all their z-scores count as 0 " +
    "(every entry at that judge's own average), and they stay in the means.",
  "Missing scores are listed; a missing criterion rescales the judge's weights over the criteria scored, " +
    "a missing entry leaves the judge out of that entry's mean.",
  "Ties: higher score, then higher median of the per-judge figures, then more top-three placements across judges; " +
    "entries still equal share a place (1, 2, 2, 4).",
];

function checkInput(input: JuryInput): void {
  const issues: string[] = [];
  const criteria = new Map<string, Criterion>();
  if (input.criteria.length === 0) issues.push("at least one criterion is needed");
  for (const c of input.criteria) {
    if (!c.id) issues.push("a criterion has an empty id");
    if (criteria.has(c.id)) issues.push(`criterion "${c.id}" is listed twice`);
    criteria.set(c.id, c);
    if (!Number.isFinite(c.weight) || c.weight <= 0) issues.push(`criterion "${c.id}": weight must be a positive number, got ${c.weight}`);
    if (c.min !== undefined && c.max !== undefined && c.min > c.max) issues.push(`criterion "${c.id}": min ${c.min} is above max ${c.max}`);
  }
  const known = input.candidates ? new Set(input.candidates) : null;
  if (input.candidates && known && known.size !== input.candidates.length) issues.push("an entry is listed twice in candidates");
  const seen = new Set<string>();
  input.scores.forEach((s, i) => {
    const where = `score ${i + 1} (judge "${s.judge}", entry "${s.candidate}", criterion "${s.criterion}")`;
    if (!s.judge) issues.push(`${where}: judge is empty`);
    if (!s.candidate) issues.push(`${where}: entry is empty`);
    const c = criteria.get(s.criterion);
    if (!c) issues.push(`${where}: unknown criterion`);
    if (known && !known.has(s.candidate)) issues.push(`${where}: unknown entry`);
    if (!Number.isFinite(s.value)) issues.push(`${where}: value must be a finite number`);
    else if (c && ((c.min !== undefined && s.value < c.min) || (c.max !== undefined && s.value > c.max)))
      issues.push(`${where}: value ${s.value} is outside ${c.min ?? "−∞"}..${c.max ?? "∞"}`);
    const key = JSON.stringify([s.judge, s.candidate, s.criterion]);
    if (seen.has(key)) issues.push(`${where}: this judge scored this criterion of this entry twice`);
    seen.add(key);
  });
  if (issues.length > 0) throw new ScoringInputError(issues);
}

function unique(values: Iterable<string>): string[] {
  return [...new Set(values)];
}

function summariseJudge(judge: string, values: number[]): JudgeSummary {
  const m = mean(values) ?? 0;
  const sd = populationStandardDeviation(values) ?? 0;
  const spread: JudgeSpread = values.length === 1 ? "single-score" : nearlyEqual(sd, 0) ? "no-spread" : "ok";
  return { judge, mean: m, sd, count: values.length, spread };
}

function zScore(value: number, judge: JudgeSummary): number {
  return judge.spread === "ok" ? (value - judge.mean) / judge.sd : 0;
}

/** Standard competition places among one judge's figures (1, 2, 2, 4). */
function placesWithin(figures: Map<string, number>): Map<string, number> {
  const places = new Map<string, number>();
  const values = [...figures.values()];
  for (const [candidate, v] of figures) {
    places.set(candidate, 1 + values.filter((other) => other > v && !nearlyEqual(other, v)).length);
  }
  return places;
}

/**
 * Jury standings with every intermediate figure. Throws ScoringInputError on input that cannot be
 * counted (unknown criterion or entry, value out of range, duplicate score, bad weight).
 */
export function juryStandings(input: JuryInput, method: JuryMethod): JuryStandings {
  checkInput(input);
  const criteria = new Map(input.criteria.map((c) => [c.id, c]));
  const candidates = unique([...(input.candidates ?? []), ...input.scores.map((s) => s.candidate)]);
  const judgeIds = unique(input.scores.map((s) => s.judge));

  const judges = judgeIds.map((j) => summariseJudge(j, input.scores.filter((s) => s.judge === j).map((s) => s.value)));
  const judgeById = new Map(judges.map((j) => [j.judge, j]));

  const sheet = new Map<string, JudgeScore[]>(); // judge+entry → scores
  const sheetKey = (judge: string, candidate: string) => JSON.stringify([judge, candidate]);
  for (const s of input.scores) {
    const key = sheetKey(s.judge, s.candidate);
    sheet.set(key, [...(sheet.get(key) ?? []), s]);
  }

  const missing: MissingScore[] = [];
  const partial = new Map<string, Omit<JudgeFigures, "placeForJudge">[]>();
  for (const candidate of candidates) {
    const rows: Omit<JudgeFigures, "placeForJudge">[] = [];
    const scoredBy = judgeIds.filter((j) => sheet.has(sheetKey(j, candidate)));
    if (scoredBy.length === 0) missing.push({ kind: "unscored", candidate, treatment: TREAT_UNSCORED });
    for (const judge of judgeIds) {
      const scores = sheet.get(sheetKey(judge, candidate));
      if (!scores) {
        if (scoredBy.length > 0) missing.push({ kind: "entry", judge, candidate, treatment: TREAT_ENTRY });
        continue;
      }
      const summary = judgeById.get(judge)!;
      const figures = input.criteria.flatMap((c): CriterionFigure[] => {
        const s = scores.find((x) => x.criterion === c.id);
        if (!s) {
          missing.push({ kind: "criterion", judge, candidate, criterion: c.id, treatment: TREAT_CRITERION });
          return [];
        }
        return [{ criterion: c.id, weight: criteria.get(c.id)!.weight, raw: s.value, z: zScore(s.value, summary) }];
      });
      rows.push({
        judge,
        raw: weightedMean(figures.map((f) => ({ value: f.raw, weight: f.weight })))!,
        normalised: weightedMean(figures.map((f) => ({ value: f.z, weight: f.weight })))!,
        criteria: figures,
      });
    }
    partial.set(candidate, rows);
  }

  const figureOf = (f: { raw: number; normalised: number }) => (method === "jury-raw" ? f.raw : f.normalised);
  const judgePlaces = new Map<string, Map<string, number>>();
  for (const judge of judgeIds) {
    const figures = new Map<string, number>();
    for (const [candidate, rows] of partial) {
      const row = rows.find((r) => r.judge === judge);
      if (row) figures.set(candidate, figureOf(row));
    }
    judgePlaces.set(judge, placesWithin(figures));
  }

  const entries: EntryFigures[] = candidates.map((candidate) => {
    const perJudge = partial.get(candidate)!.map((r) => ({ ...r, placeForJudge: judgePlaces.get(r.judge)!.get(candidate)! }));
    const raw = mean(perJudge.map((r) => r.raw));
    const normalised = mean(perJudge.map((r) => r.normalised));
    return {
      candidate,
      perJudge,
      raw,
      normalised,
      score: method === "jury-raw" ? raw : normalised,
      median: median(perJudge.map(figureOf)),
      topThree: perJudge.filter((r) => r.placeForJudge <= 3).length,
    };
  });

  const ranking = placeByKeys(
    entries.map((e) => ({ candidate: e.candidate, keys: [e.score, e.median, e.topThree] })),
    JURY_TIE_BREAKS,
  );
  return { method, ranking, judges, entries, missing, rules: [RULES[method], ...COMMON_RULES] };
}
