import { describe, expect, it } from "vitest";
import { tallyPoints } from "./points";

describe("tallyPoints (hand-counted)", () => {
  // Invented demo ballots:
  //   1: A 5, B 3, C 0     2: A 2, B 4     3: A 4, B 4, C 5     4: B 0, C 5 (A unrated)
  // sums: A 5+2+4 = 11, B 3+4+4+0 = 11, C 0+5+5 = 10
  // means over ballots that rated: A 11/3 ≈ 3.667, B 11/4 = 2.75, C 10/3 ≈ 3.333
  // A and B tie on the sum; A's higher mean puts it first.
  const ballots = [
    { points: { A: 5, B: 3, C: 0 } },
    { points: { A: 2, B: 4 } },
    { points: { A: 4, B: 4, C: 5 } },
    { points: { B: 0, C: 5 } },
  ];
  const tally = tallyPoints(ballots, ["A", "B", "C"]);

  it("sums points and breaks the A/B tie by the mean", () => {
    expect(tally.ranking.map((r) => [r.candidate, r.score, r.place, r.decidedBy])).toEqual([
      ["A", 11, 1, "mean"],
      ["B", 11, 2, "mean"],
      ["C", 10, 3, null],
    ]);
  });

  it("shows the mean, the number of ratings and the histogram", () => {
    const by = Object.fromEntries(tally.entries.map((e) => [e.candidate, e]));
    expect(by.A.mean).toBeCloseTo(11 / 3, 12);
    expect(by.B.mean).toBe(2.75);
    expect([by.A.ratings, by.B.ratings, by.C.ratings]).toEqual([3, 4, 3]);
    expect(by.B.histogram).toEqual([1, 0, 0, 1, 2, 0]);
    expect(by.C.histogram).toEqual([1, 0, 0, 0, 0, 2]);
    expect(tally.counted).toBe(4);
  });

  it("leaves a tie on sum and mean as a shared place, and an unrated entry last with no mean", () => {
    const t = tallyPoints([{ points: { A: 5, B: 5 } }, { points: { A: 3, B: 3 } }], ["A", "B", "C"]);
    expect(t.ranking.map((r) => [r.candidate, r.score, r.place, r.tied])).toEqual([
      ["A", 8, 1, true],
      ["B", 8, 1, true],
      ["C", 0, 3, false],
    ]);
    expect(t.entries[2].mean).toBeNull();
  });

  it("sets an invalid ballot aside and counts the rest", () => {
    const t = tallyPoints([{ points: { A: 9 } }, { points: { A: 2 } }], ["A"]);
    expect(t.counted).toBe(1);
    expect(t.rejected).toEqual([{ index: 0, problems: [expect.objectContaining({ code: "points-out-of-range" })] }]);
    expect(t.ranking[0].score).toBe(2);
  });
});
