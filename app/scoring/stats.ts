/** The few descriptive statistics the standings need. Empty input gives null rather than NaN. */

export function mean(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  let total = 0;
  for (const v of values) total += v;
  return total / values.length;
}

/**
 * Population standard deviation (divide by n). A judge's scores in one competition are the whole
 * set being standardised, not a sample of some larger set, so n is the right divisor; it also
 * gives each judge's z-scores exactly mean 0 and SD 1, and is defined (0) for a single score.
 */
export function populationStandardDeviation(values: readonly number[]): number | null {
  const m = mean(values);
  if (m === null) return null;
  let squares = 0;
  for (const v of values) squares += (v - m) ** 2;
  return Math.sqrt(squares / values.length);
}

export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** Weighted mean; null when no weight is present. */
export function weightedMean(pairs: readonly { value: number; weight: number }[]): number | null {
  let total = 0;
  let weights = 0;
  for (const { value, weight } of pairs) {
    total += value * weight;
    weights += weight;
  }
  return weights > 0 ? total / weights : null;
}

/**
 * Equality for computed figures: the same standing reached by a different order of additions can
 * differ in the last bits, and that must still count as a tie.
 */
export function nearlyEqual(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}
