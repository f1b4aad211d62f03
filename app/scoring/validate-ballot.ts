/** Audience ballot shapes and the checks a ballot must pass before it is stored or counted. */

export const MAX_POINTS = 5;

/** Points ballot: 0–5 whole points per entry; entries left out are not rated. */
export interface PointsBallot {
  points: Record<string, number>;
}

/** Ranked ballot: entries from most to least preferred; entries left out rank below all listed ones. */
export interface RankedBallot {
  ranking: string[];
}

export type BallotKind = "points" | "ranked";

export type BallotProblemCode =
  | "malformed"
  | "empty"
  | "unknown-candidate"
  | "duplicate-candidate"
  | "points-not-integer"
  | "points-out-of-range";

export interface BallotProblem {
  code: BallotProblemCode;
  message: string;
  candidate?: string;
}

export type BallotCheck<B> = { ok: true; ballot: B } | { ok: false; problems: BallotProblem[] };

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function checkPoints(ballot: unknown, known: ReadonlySet<string>): BallotCheck<PointsBallot> {
  if (!isRecord(ballot) || !isRecord(ballot.points))
    return { ok: false, problems: [{ code: "malformed", message: 'a points ballot is an object {"points": {entry: 0–5, …}}' }] };
  const problems: BallotProblem[] = [];
  const entries = Object.entries(ballot.points);
  if (entries.length === 0) problems.push({ code: "empty", message: "the ballot gives points to no entry" });
  for (const [candidate, value] of entries) {
    if (!known.has(candidate)) problems.push({ code: "unknown-candidate", candidate, message: `"${candidate}" is not an entry of this competition` });
    if (typeof value !== "number" || !Number.isInteger(value))
      problems.push({ code: "points-not-integer", candidate, message: `points for "${candidate}" must be a whole number, got ${JSON.stringify(value)}` });
    else if (value < 0 || value > MAX_POINTS)
      problems.push({ code: "points-out-of-range", candidate, message: `points for "${candidate}" must be 0–${MAX_POINTS}, got ${value}` });
  }
  return problems.length > 0 ? { ok: false, problems } : { ok: true, ballot: { points: { ...(ballot.points as Record<string, number>) } } };
}

function checkRanked(ballot: unknown, known: ReadonlySet<string>): BallotCheck<RankedBallot> {
  if (!isRecord(ballot) || !Array.isArray(ballot.ranking))
    return { ok: false, problems: [{ code: "malformed", message: 'a ranked ballot is an object {"ranking": [entry, …]}' }] };
  const problems: BallotProblem[] = [];
  if (ballot.ranking.length === 0) problems.push({ code: "empty", message: "the ranking lists no entry" });
  const seen = new Set<string>();
  ballot.ranking.forEach((candidate: unknown, i: number) => {
    if (typeof candidate !== "string") {
      problems.push({ code: "malformed", message: `place ${i + 1} of the ranking is not an entry id: ${JSON.stringify(candidate)}` });
      return;
    }
    if (!known.has(candidate)) problems.push({ code: "unknown-candidate", candidate, message: `"${candidate}" is not an entry of this competition` });
    if (seen.has(candidate)) problems.push({ code: "duplicate-candidate", candidate, message: `"${candidate}" is ranked more than once` });
    seen.add(candidate);
  });
  return problems.length > 0 ? { ok: false, problems } : { ok: true, ballot: { ranking: [...(ballot.ranking as string[])] } };
}

/**
 * Checks one ballot against the competition's entries. Accepts anything (a parsed request body) and
 * returns the cleaned ballot or every problem found, never throws.
 */
export function validateBallot(kind: "points", ballot: unknown, candidates: readonly string[]): BallotCheck<PointsBallot>;
export function validateBallot(kind: "ranked", ballot: unknown, candidates: readonly string[]): BallotCheck<RankedBallot>;
export function validateBallot(kind: BallotKind, ballot: unknown, candidates: readonly string[]): BallotCheck<PointsBallot | RankedBallot> {
  const known = new Set(candidates);
  return kind === "points" ? checkPoints(ballot, known) : checkRanked(ballot, known);
}

export interface RejectedBallot {
  /** 0-based position in the list given. */
  index: number;
  problems: BallotProblem[];
}

export interface SortedBallots<B> {
  candidates: string[];
  valid: B[];
  rejected: RejectedBallot[];
}

/** Ids a ballot mentions, for when no entry list is given. */
function mentioned(kind: BallotKind, ballot: unknown): string[] {
  if (!isRecord(ballot)) return [];
  if (kind === "points") return isRecord(ballot.points) ? Object.keys(ballot.points) : [];
  return Array.isArray(ballot.ranking) ? ballot.ranking.filter((c): c is string => typeof c === "string") : [];
}

/**
 * Splits ballots into those counted and those set aside with reasons. Without an entry list the
 * entries are the ids the ballots mention (in order of first mention), so "unknown entry" cannot occur.
 */
export function sortBallots(kind: "points", ballots: readonly unknown[], candidates?: readonly string[]): SortedBallots<PointsBallot>;
export function sortBallots(kind: "ranked", ballots: readonly unknown[], candidates?: readonly string[]): SortedBallots<RankedBallot>;
export function sortBallots(kind: BallotKind, ballots: readonly unknown[], candidates?: readonly string[]): SortedBallots<PointsBallot | RankedBallot> {
  const list = candidates ? [...new Set(candidates)] : [...new Set(ballots.flatMap((b) => mentioned(kind, b)))];
  const valid: (PointsBallot | RankedBallot)[] = [];
  const rejected: RejectedBallot[] = [];
  ballots.forEach((ballot, index) => {
    const check = kind === "points" ? validateBallot("points", ballot, list) : validateBallot("ranked", ballot, list);
    if (check.ok) valid.push(check.ballot);
    else rejected.push({ index, problems: check.problems });
  });
  return { candidates: list, valid, rejected };
}
