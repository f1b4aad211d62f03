import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import { mean, median, nearlyEqual, populationStandardDeviation, weightedMean } from "./stats";

// Reference: the simple-statistics package from npm (7.12.1): mean, standardDeviation (population), median.
const samples: number[][] = [
  [10, 4, 7],
  [3, 4, 5],
  [2.5, 9, 9, 1, 7.25, 6],
  [42],
  [-3, 0, 0, 12, 5],
];

describe("descriptive statistics against simple-statistics", () => {
  it.each(samples.map((s) => [s]))("agree on %j", (values) => {
    expect(mean(values)).toBeCloseTo(ss.mean(values), 12);
    expect(populationStandardDeviation(values)).toBeCloseTo(ss.standardDeviation(values), 12);
    expect(median(values)).toBeCloseTo(ss.median(values), 12);
  });

  it("uses the population SD, not the sample SD", () => {
    const values = [2.5, 9, 9, 1, 7.25, 6];
    expect(populationStandardDeviation(values)).not.toBeCloseTo(ss.sampleStandardDeviation(values), 3);
  });

  it("gives null, not NaN, for no values", () => {
    expect(mean([])).toBeNull();
    expect(populationStandardDeviation([])).toBeNull();
    expect(median([])).toBeNull();
    expect(weightedMean([])).toBeNull();
  });

  it("weights by hand: (8·2 + 5·1) / 3 = 7", () => {
    expect(weightedMean([{ value: 8, weight: 2 }, { value: 5, weight: 1 }])).toBe(7);
  });

  it("treats last-bit differences as equal but real differences as different", () => {
    expect(nearlyEqual(0.1 + 0.2, 0.3)).toBe(true);
    expect(nearlyEqual(1, 1.000001)).toBe(false);
  });
});
