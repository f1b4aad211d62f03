import { describe, expect, it } from "vitest";
import { ScoringInputError } from "./errors";
import { juryStandings } from "./jury";
import { mixStandings } from "./mix";

// Jury: the lenient/harsh example of jury.test.ts, counted raw: A 6.5, C 6, B 4.
const jury = juryStandings(
  {
    criteria: [{ id: "overall", weight: 1 }],
    scores: [
      { judge: "lenient", candidate: "A", criterion: "overall", value: 10 },
      { judge: "lenient", candidate: "B", criterion: "overall", value: 4 },
      { judge: "lenient", candidate: "C", criterion: "overall", value: 7 },
      { judge: "harsh", candidate: "A", criterion: "overall", value: 3 },
      { judge: "harsh", candidate: "B", criterion: "overall", value: 4 },
      { judge: "harsh", candidate: "C", criterion: "overall", value: 5 },
    ],
  },
  "jury-raw",
);
// Audience points (invented): A 10, B 20, C 15.
const audience = [
  { candidate: "A", score: 10 },
  { candidate: "B", score: 20 },
  { candidate: "C", score: 15 },
];

describe("mixStandings (hand-worked)", () => {
  it("scales both sides to 0..1 and mixes 60 % jury, 40 % audience", () => {
    // jury 4..6.5:    A (6.5−4)/2.5 = 1,  B 0,  C (6−4)/2.5 = 0.8
    // audience 10..20: A 0,  B 1,  C 0.5
    // mixed: A 0.6·1 + 0.4·0 = 0.6;  B 0.6·0 + 0.4·1 = 0.4;  C 0.6·0.8 + 0.4·0.5 = 0.68
    const m = mixStandings({ jury, audience, audienceWeightPercent: 40 });
    expect(m.scale).toEqual({ jury: { min: 4, max: 6.5 }, audience: { min: 10, max: 20 } });
    const rows = m.ranking.map((r) => [r.candidate, Number(r.score!.toFixed(10)), r.place]);
    expect(rows).toEqual([
      ["C", 0.68, 1],
      ["A", 0.6, 2],
      ["B", 0.4, 3],
    ]);
    const c = m.entries.find((e) => e.candidate === "C")!;
    expect(c.jury).toEqual({ score: 6, normalised: 0.8 });
    expect(c.audience).toEqual({ score: 15, normalised: 0.5 });
  });

  it("follows the jury alone at 0 % and the audience alone at 100 %", () => {
    expect(mixStandings({ jury, audience, audienceWeightPercent: 0 }).ranking.map((r) => r.candidate)).toEqual(["A", "C", "B"]);
    expect(mixStandings({ jury, audience, audienceWeightPercent: 100 }).ranking.map((r) => r.candidate)).toEqual(["B", "C", "A"]);
  });

  it("breaks an equal mix by the jury's median", () => {
    // 50 %: A 0.5·1 + 0.5·0 = 0.5, B 0.5·0 + 0.5·1 = 0.5, C 0.5·0.8 + 0.5·0.5 = 0.65.
    // A and B tie at 0.5; jury medians A (10, 3) → 6.5, B (4, 4) → 4, so A goes ahead.
    const m = mixStandings({ jury, audience, audienceWeightPercent: 50 });
    expect(m.ranking.map((r) => [r.candidate, r.place, r.decidedBy])).toEqual([
      ["C", 1, null],
      ["A", 2, "median of per-judge figures"],
      ["B", 3, "median of per-judge figures"],
    ]);
  });

  it("counts a missing side as 0 and reports it", () => {
    const m = mixStandings({ jury, audience: audience.filter((a) => a.candidate !== "A"), audienceWeightPercent: 40 });
    expect(m.missing).toEqual([{ candidate: "A", side: "audience", treatment: expect.stringContaining("0") }]);
    // audience now 15..20: B 1, C 0; A 0. A 0.6·1 = 0.6, B 0.4, C 0.6·0.8 = 0.48.
    expect(m.ranking.map((r) => r.candidate)).toEqual(["A", "C", "B"]);
  });

  it("rejects a weight outside 0–100 and a duplicated audience row", () => {
    expect(() => mixStandings({ jury, audience, audienceWeightPercent: 120 })).toThrow(ScoringInputError);
    expect(() => mixStandings({ jury, audience: [...audience, audience[0]], audienceWeightPercent: 10 })).toThrow(/twice/);
  });
});
