import { placeByKeys, type RankedRow } from "./places";
import { MAX_POINTS, sortBallots, type RejectedBallot } from "./validate-ballot";

export interface PointsEntry {
  candidate: string;
  /** Total points over all counted ballots. */
  sum: number;
  /** Mean over the ballots that rated this entry (an unrated entry is not a 0); null if none did. */
  mean: number | null;
  /** Ballots that rated this entry. */
  ratings: number;
  /** histogram[k] = ballots that gave exactly k points. */
  histogram: number[];
}

export interface PointsTally {
  method: "points";
  ranking: RankedRow[];
  entries: PointsEntry[];
  counted: number;
  rejected: RejectedBallot[];
  rules: string[];
}

export const POINTS_TIE_BREAKS = ["sum", "mean"] as const;

/** Audience points, 0–5 per entry: ranked by the sum, ties broken by the mean over ballots that rated the entry. */
export function tallyPoints(ballots: readonly unknown[], candidates?: readonly string[]): PointsTally {
  const sorted = sortBallots("points", ballots, candidates);
  const entries: PointsEntry[] = sorted.candidates.map((candidate) => {
    const given = sorted.valid.map((b) => b.points[candidate]).filter((v): v is number => v !== undefined);
    const sum = given.reduce((a, b) => a + b, 0);
    const histogram = Array.from({ length: MAX_POINTS + 1 }, (_, k) => given.filter((v) => v === k).length);
    return { candidate, sum, mean: given.length > 0 ? sum / given.length : null, ratings: given.length, histogram };
  });
  const ranking = placeByKeys(entries.map((e) => ({ candidate: e.candidate, keys: [e.sum, e.mean] })), POINTS_TIE_BREAKS);
  return {
    method: "points",
    ranking,
    entries,
    counted: sorted.valid.length,
    rejected: sorted.rejected,
    rules: [
      `Each ballot gives 0–${MAX_POINTS} whole points per entry; an entry left off a ballot is unrated, not 0.`,
      "Score = sum of points. Ties: higher mean over the ballots that rated the entry; entries still equal share a place.",
      "Ballots that fail validation are set aside and listed with their reasons.",
    ],
  };
}
