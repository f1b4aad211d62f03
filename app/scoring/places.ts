import { nearlyEqual } from "./stats";

/** One row to be placed: the first key is the score, later keys are tie-breaks (higher is better). */
export interface RankInput {
  candidate: string;
  keys: readonly (number | null)[];
}

/** A placed row as every standings table shows it. */
export interface RankedRow {
  candidate: string;
  /** The figure the method ranks by; null when the entry has none (it is placed last). */
  score: number | null;
  /** Standard competition places: 1, 2, 2, 4. */
  place: number;
  /** True when another row shares this place. */
  tied: boolean;
  /** Name of the tie-break key that separated this row from a neighbour with an equal score; null if the score alone decided. */
  decidedBy: string | null;
}

/** Higher first; null (no figure) after every number; nearly equal numbers compare equal. */
function compareDescending(a: number | null, b: number | null): number {
  if (a === null || b === null) return a === b ? 0 : a === null ? 1 : -1;
  if (nearlyEqual(a, b)) return 0;
  return b - a;
}

function firstDifference(a: readonly (number | null)[], b: readonly (number | null)[]): number {
  const n = Math.max(a.length, b.length);
  for (let i = 0; i < n; i++) {
    if (compareDescending(a[i] ?? null, b[i] ?? null) !== 0) return i;
  }
  return -1;
}

/**
 * Sorts rows by their keys (score first, then each tie-break in turn) and gives standard
 * competition places. Rows equal on every key share a place. Candidate id orders rows within a
 * shared place only so the output is stable; it never changes a place.
 */
export function placeByKeys(rows: readonly RankInput[], keyNames: readonly string[]): RankedRow[] {
  const sorted = [...rows].sort((a, b) => {
    const at = firstDifference(a.keys, b.keys);
    if (at >= 0) return compareDescending(a.keys[at] ?? null, b.keys[at] ?? null);
    return a.candidate < b.candidate ? -1 : a.candidate > b.candidate ? 1 : 0;
  });

  const places: number[] = [];
  sorted.forEach((row, i) => {
    places.push(i > 0 && firstDifference(sorted[i - 1].keys, row.keys) < 0 ? places[i - 1] : i + 1);
  });

  return sorted.map((row, i) => {
    const tied = places[i - 1] === places[i] || places[i + 1] === places[i];
    // The deepest key needed against either neighbour is the one that settled this row's place.
    let deciding = 0;
    if (!tied) {
      for (const neighbour of [sorted[i - 1], sorted[i + 1]]) {
        if (neighbour) deciding = Math.max(deciding, firstDifference(neighbour.keys, row.keys));
      }
    }
    const decidedBy = deciding > 0 ? (keyNames[deciding] ?? `key ${deciding}`) : null;
    return { candidate: row.candidate, score: row.keys[0] ?? null, place: places[i], tied, decidedBy };
  });
}
