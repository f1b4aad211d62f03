import { placeByKeys, type RankedRow } from "./places";
import { sortBallots, type RankedBallot, type RejectedBallot } from "./validate-ballot";

export interface BordaEntry {
  candidate: string;
  points: number;
  /** positions[i] = ballots that ranked this entry in place i + 1. */
  positions: number[];
  /** Ballots that left this entry off. */
  unranked: number;
}

export interface BordaTally {
  method: "borda";
  ranking: RankedRow[];
  entries: BordaEntry[];
  counted: number;
  rejected: RejectedBallot[];
  rules: string[];
}

/**
 * Points one ballot gives each entry, with n entries in the competition: place i (1-based) earns
 * n − i, so first gets n − 1 and last 0. Entries left off share the remaining places equally:
 * with k ranked, each unranked entry gets the mean of the points for places k+1..n, (n − 1 − k) / 2.
 * That keeps a truncated ballot neutral among the entries it leaves off and makes every entry's
 * count equal its pairwise wins plus half its pairwise ties.
 */
export function bordaPoints(ballot: RankedBallot, candidates: readonly string[]): Map<string, number> {
  const n = candidates.length;
  const k = ballot.ranking.length;
  const points = new Map<string, number>(candidates.map((c) => [c, (n - 1 - k) / 2]));
  ballot.ranking.forEach((candidate, i) => points.set(candidate, n - 1 - i));
  return points;
}

/** Ranked audience ballots counted by Borda (n − 1 … 0 points). Remaining ties share a place. */
export function tallyBorda(ballots: readonly unknown[], candidates?: readonly string[]): BordaTally {
  const sorted = sortBallots("ranked", ballots, candidates);
  const n = sorted.candidates.length;
  const byCandidate = new Map<string, BordaEntry>(
    sorted.candidates.map((c) => [c, { candidate: c, points: 0, positions: new Array<number>(n).fill(0), unranked: 0 }]),
  );
  for (const ballot of sorted.valid) {
    for (const [candidate, points] of bordaPoints(ballot, sorted.candidates)) byCandidate.get(candidate)!.points += points;
    ballot.ranking.forEach((candidate, i) => byCandidate.get(candidate)!.positions[i]++);
    for (const entry of byCandidate.values()) if (!ballot.ranking.includes(entry.candidate)) entry.unranked++;
  }
  const entries = [...byCandidate.values()];
  return {
    method: "borda",
    ranking: placeByKeys(entries.map((e) => ({ candidate: e.candidate, keys: [e.points] })), ["points"]),
    entries,
    counted: sorted.valid.length,
    rejected: sorted.rejected,
    rules: [
      `With ${n} entries, place i on a ballot earns ${n} − i points: first ${Math.max(n - 1, 0)}, last 0.`,
      "Entries left off a ballot share the remaining places equally (each gets the mean of those places' points).",
      "Score = total points. No tie-break: equal totals share a place.",
      "Ballots that fail validation are set aside and listed with their reasons.",
    ],
  };
}
