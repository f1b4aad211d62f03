/**
 * Scoresheet arithmetic shared by the grid (in the browser) and the services: scale checks, a judge's
 * weighted total, and the "fully scored" test behind the progress line. Pure.
 */
export interface ScaleCriterion {
  id: string;
  name: string;
  weight: number;
  scaleMin: number;
  scaleMax: number;
}

/** A score must be a finite number on the criterion's scale, in whole or half points. */
export function scaleError(c: Pick<ScaleCriterion, "scaleMin" | "scaleMax">, value: number): string | null {
  if (!Number.isFinite(value)) return "A score must be a number.";
  if (value < c.scaleMin || value > c.scaleMax) return `A score must be between ${c.scaleMin} and ${c.scaleMax}.`;
  if (Math.round(value * 2) !== value * 2) return "A score is a whole or half point (like 7 or 7.5).";
  return null;
}

/**
 * The judge's weighted total for one entry: the weighted mean of the scores given, with the weights of the
 * criteria scored rescaled to sum to 1 (the same treatment of a missing criterion as the standings).
 */
export function weightedTotal(criteria: readonly ScaleCriterion[], values: Record<string, number | null | undefined>): number | null {
  let sum = 0;
  let weights = 0;
  for (const c of criteria) {
    const v = values[c.id];
    if (v === null || v === undefined) continue;
    sum += v * c.weight;
    weights += c.weight;
  }
  return weights > 0 ? sum / weights : null;
}

export function isFullyScored(criteria: readonly ScaleCriterion[], values: Record<string, number | null | undefined>): boolean {
  return criteria.length > 0 && criteria.every((c) => values[c.id] !== null && values[c.id] !== undefined);
}

/** Parses what a judge typed into a score cell: "" clears, "7", "7.5" and "7,5" are numbers. */
export function parseTypedScore(text: string): { value: number | null } | { error: string } {
  const t = text.trim().replace(",", ".");
  if (t === "") return { value: null };
  if (!/^\d+(\.\d+)?$/.test(t)) return { error: "Type a number." };
  return { value: Number(t) };
}
