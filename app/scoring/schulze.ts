import type { RankedRow } from "./places";
import { sortBallots, type RankedBallot, type RejectedBallot } from "./validate-ballot";

/** Square matrix indexed like `candidates`; the diagonal is null. */
export type CandidateMatrix = (number | null)[][];

export interface SchulzeTally {
  method: "schulze";
  candidates: string[];
  /** d[i][j] = ballots that prefer candidates[i] to candidates[j]. */
  d: CandidateMatrix;
  /** p[i][j] = strength of the strongest path from candidates[i] to candidates[j] (winning votes). */
  p: CandidateMatrix;
  /** beats[i] = candidates that candidates[i] is better than: p[i][j] > p[j][i]. */
  beats: string[][];
  ranking: RankedRow[];
  counted: number;
  rejected: RejectedBallot[];
  rules: string[];
}

/** Pairwise preferences: a listed entry is preferred to every entry below it and to every unlisted one. */
export function pairwisePreferences(ballots: readonly RankedBallot[], candidates: readonly string[]): number[][] {
  const n = candidates.length;
  const index = new Map(candidates.map((c, i) => [c, i]));
  const d = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (const ballot of ballots) {
    const rank = new Array<number>(n).fill(Infinity); // unlisted entries tie below all listed ones
    ballot.ranking.forEach((c, place) => (rank[index.get(c)!] = place));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (rank[i] < rank[j]) d[i][j]++;
  }
  return d;
}

/** Widest paths over the winning links (a link i→j exists when d[i][j] > d[j][i], with strength d[i][j]). */
export function strongestPaths(d: readonly (readonly number[])[]): number[][] {
  const n = d.length;
  const p = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i !== j && d[i][j] > d[j][i] ? d[i][j] : 0)));
  for (let via = 0; via < n; via++) {
    for (let from = 0; from < n; from++) {
      if (from === via) continue;
      for (let to = 0; to < n; to++) {
        if (to === from || to === via) continue;
        p[from][to] = Math.max(p[from][to], Math.min(p[from][via], p[via][to]));
      }
    }
  }
  return p;
}

function withNullDiagonal(m: number[][]): CandidateMatrix {
  return m.map((row, i) => row.map((v, j) => (i === j ? null : v)));
}

/**
 * Ranked audience ballots counted by the Schulze method. Places come from the Schulze relation
 * (X better than Y when p[X][Y] > p[Y][X]): repeatedly, every remaining entry that no remaining
 * entry is better than takes the next place together. The relation is transitive, so some entry
 * is always unbeaten. Score shown = number of entries this one is better than.
 */
export function tallySchulze(ballots: readonly unknown[], candidates?: readonly string[]): SchulzeTally {
  const sorted = sortBallots("ranked", ballots, candidates);
  const list = sorted.candidates;
  const n = list.length;
  const d = pairwisePreferences(sorted.valid, list);
  const p = strongestPaths(d);
  const better = (i: number, j: number) => i !== j && p[i][j] > p[j][i];

  const ranking: RankedRow[] = [];
  let remaining = list.map((_, i) => i);
  while (remaining.length > 0) {
    const unbeaten = remaining.filter((i) => !remaining.some((j) => better(j, i)));
    const place = ranking.length + 1;
    for (const i of unbeaten) {
      ranking.push({
        candidate: list[i],
        score: list.filter((_, j) => better(i, j)).length,
        place,
        tied: unbeaten.length > 1,
        decidedBy: null,
      });
    }
    remaining = remaining.filter((i) => !unbeaten.includes(i));
  }

  return {
    method: "schulze",
    candidates: list,
    d: withNullDiagonal(d),
    p: withNullDiagonal(p),
    beats: list.map((_, i) => list.filter((_, j) => better(i, j))),
    ranking,
    counted: sorted.valid.length,
    rejected: sorted.rejected,
    rules: [
      "d[X,Y] = ballots ranking X above Y; an entry left off a ballot ranks below every listed one, tied with the other unlisted ones.",
      "A path's strength is its weakest link; links are pairwise wins measured by winning votes (d[X,Y] where d[X,Y] > d[Y,X]).",
      `X is better than Y when p[X,Y] > p[Y,X]. Entries no remaining entry is better than share the next place (${n} entries).`,
      "Score shown = how many entries this entry is better than.",
      "Ballots that fail validation are set aside and listed with their reasons.",
    ],
  };
}
