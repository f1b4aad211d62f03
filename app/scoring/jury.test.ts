import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import { ScoringInputError } from "./errors";
import { juryStandings, type JudgeScore } from "./jury";

const one = [{ id: "overall", weight: 1 }];

/** Scores on the single criterion "overall": {judge: {entry: value}}. */
function sheet(byJudge: Record<string, Record<string, number>>, criterion = "overall"): JudgeScore[] {
  return Object.entries(byJudge).flatMap(([judge, entries]) =>
    Object.entries(entries).map(([candidate, value]) => ({ judge, candidate, criterion, value })),
  );
}

const order = (r: { ranking: { candidate: string }[] }) => r.ranking.map((x) => x.candidate);

describe("a lenient and a harsh judge (hand-worked)", () => {
  // lenient: A 10, B 4, C 7 → mean 7, deviations 3, −3, 0, population variance 18/3 = 6, SD √6 ≈ 2.449490
  //          z: A = 3/√6 = √1.5 ≈ 1.224745, B ≈ −1.224745, C = 0
  // harsh:   A 3, B 4, C 5  → mean 4, deviations −1, 0, 1, variance 2/3, SD √(2/3) ≈ 0.816497
  //          z: A = −1/√(2/3) ≈ −1.224745, B = 0, C ≈ 1.224745
  // raw means: A (10+3)/2 = 6.5, C (7+5)/2 = 6, B (4+4)/2 = 4     → A, C, B (the lenient judge's wide spread decides)
  // z means:   C (0+1.224745)/2 ≈ 0.612372, A (1.224745−1.224745)/2 = 0, B (−1.224745+0)/2 ≈ −0.612372 → C, A, B
  const input = { criteria: one, scores: sheet({ lenient: { A: 10, B: 4, C: 7 }, harsh: { A: 3, B: 4, C: 5 } }) };

  it("ranks by raw means A, C, B", () => {
    const r = juryStandings(input, "jury-raw");
    expect(order(r)).toEqual(["A", "C", "B"]);
    expect(r.ranking.map((x) => x.score)).toEqual([6.5, 6, 4]);
  });

  it("ranks by z-scores C, A, B", () => {
    const r = juryStandings(input, "jury-z");
    expect(order(r)).toEqual(["C", "A", "B"]);
    const [c, a, b] = r.ranking.map((x) => x.score!);
    expect(c).toBeCloseTo(0.612372, 6);
    expect(a).toBeCloseTo(0, 12);
    expect(b).toBeCloseTo(-0.612372, 6);
  });

  it("shows each judge's mean, SD and count", () => {
    const r = juryStandings(input, "jury-z");
    expect(r.judges.map((j) => [j.judge, j.mean, j.count, j.spread])).toEqual([
      ["lenient", 7, 3, "ok"],
      ["harsh", 4, 3, "ok"],
    ]);
    expect(r.judges[0].sd).toBeCloseTo(2.449490, 6);
    expect(r.judges[1].sd).toBeCloseTo(0.816497, 6);
    const entryA = r.entries.find((e) => e.candidate === "A")!;
    expect(entryA.perJudge.map((j) => [j.judge, j.raw, Number(j.normalised.toFixed(6)), j.placeForJudge])).toEqual([
      ["lenient", 10, 1.224745, 1],
      ["harsh", 3, -1.224745, 3],
    ]);
    expect(entryA.raw).toBe(6.5);
  });
});

describe("z-scores against simple-statistics", () => {
  // Invented demo data: three judges, four entries, two weighted criteria.
  const criteria = [
    { id: "visuals", weight: 3 },
    { id: "sound", weight: 1 },
  ];
  const values: Record<string, Record<string, [number, number]>> = {
    vex: { e1: [8, 6], e2: [9, 9], e3: [5, 7], e4: [7, 4] },
    quill: { e1: [3, 2], e2: [6, 5], e3: [4, 4], e4: [2, 6] },
    moth: { e1: [10, 10], e2: [7, 9], e3: [9, 3], e4: [8, 8] },
  };
  const scores: JudgeScore[] = Object.entries(values).flatMap(([judge, entries]) =>
    Object.entries(entries).flatMap(([candidate, [v, s]]) => [
      { judge, candidate, criterion: "visuals", value: v },
      { judge, candidate, criterion: "sound", value: s },
    ]),
  );
  const result = juryStandings({ criteria, scores }, "jury-z");

  it("matches ss.mean and ss.standardDeviation (population) per judge", () => {
    for (const j of result.judges) {
      const own = scores.filter((s) => s.judge === j.judge).map((s) => s.value);
      expect(j.count).toBe(own.length);
      expect(j.mean).toBeCloseTo(ss.mean(own), 12);
      expect(j.sd).toBeCloseTo(ss.standardDeviation(own), 12);
    }
  });

  it("matches ss.zScore for every score, and weights them 3:1 per entry", () => {
    for (const e of result.entries) {
      for (const pj of e.perJudge) {
        const judge = result.judges.find((j) => j.judge === pj.judge)!;
        for (const c of pj.criteria) expect(c.z).toBeCloseTo(ss.zScore(c.raw, judge.mean, judge.sd), 12);
        const [vis, snd] = values[pj.judge][e.candidate].map((v) => ss.zScore(v, judge.mean, judge.sd));
        expect(pj.normalised).toBeCloseTo((3 * vis + snd) / 4, 12);
      }
      expect(e.normalised).toBeCloseTo(ss.mean(e.perJudge.map((p) => p.normalised)), 12);
    }
  });
});

describe("weighted raw totals (hand-worked)", () => {
  it("takes each judge's weighted mean over criteria, then the mean over judges", () => {
    // j1: (2·8 + 1·5) / 3 = 7; j2: (2·6 + 1·9) / 3 = 7 → 7.  Other entry: j1 (2·4 + 1·10)/3 = 6, j2 (2·5 + 1·2)/3 = 4 → 5.
    const r = juryStandings(
      {
        criteria: [
          { id: "design", weight: 2 },
          { id: "sound", weight: 1 },
        ],
        scores: [
          ...sheet({ j1: { X: 8, Y: 4 }, j2: { X: 6, Y: 5 } }, "design"),
          ...sheet({ j1: { X: 5, Y: 10 }, j2: { X: 9, Y: 2 } }, "sound"),
        ],
      },
      "jury-raw",
    );
    expect(r.ranking.map((x) => [x.candidate, x.score, x.place])).toEqual([
      ["X", 7, 1],
      ["Y", 5, 2],
    ]);
  });
});

describe("missing scores", () => {
  const criteria = [
    { id: "design", weight: 1 },
    { id: "sound", weight: 1 },
  ];
  const scores: JudgeScore[] = [
    { judge: "j1", candidate: "A", criterion: "design", value: 8 }, // j1 gave A no sound score
    { judge: "j1", candidate: "B", criterion: "design", value: 6 },
    { judge: "j1", candidate: "B", criterion: "sound", value: 4 },
    { judge: "j1", candidate: "C", criterion: "design", value: 5 },
    { judge: "j1", candidate: "C", criterion: "sound", value: 5 },
    { judge: "j2", candidate: "A", criterion: "design", value: 6 }, // j2 did not score B at all
    { judge: "j2", candidate: "A", criterion: "sound", value: 8 },
    { judge: "j2", candidate: "C", criterion: "design", value: 7 },
    { judge: "j2", candidate: "C", criterion: "sound", value: 3 },
  ];
  const r = juryStandings({ criteria, scores, candidates: ["A", "B", "C", "D"] }, "jury-raw");

  it("reports which judge, entry and criterion is missing and how it was treated", () => {
    expect(r.missing.map(({ treatment, ...rest }) => rest)).toEqual([
      { kind: "criterion", judge: "j1", candidate: "A", criterion: "sound" },
      { kind: "entry", judge: "j2", candidate: "B" },
      { kind: "unscored", candidate: "D" },
    ]);
    for (const m of r.missing) expect(m.treatment.length).toBeGreaterThan(10);
  });

  it("rescales weights over scored criteria and averages over judges who scored", () => {
    // A: j1 = 8 (design only), j2 = (6+8)/2 = 7 → 7.5.  B: j1 (6+4)/2 = 5 only.  C: j1 5, j2 5 → 5.  D: none.
    // B and C tie at 5 and on the median (5); top-three: j1 places A 1, B 2, C 2; j2 places A 1, C 2 → C 2, B 1.
    expect(r.ranking.map((x) => [x.candidate, x.score, x.place, x.decidedBy])).toEqual([
      ["A", 7.5, 1, null],
      ["C", 5, 2, "top-three placements"],
      ["B", 5, 3, "top-three placements"],
      ["D", null, 4, null],
    ]);
    expect(r.entries.find((e) => e.candidate === "C")!.topThree).toBe(2);
    expect(r.entries.find((e) => e.candidate === "B")!.topThree).toBe(1);
  });
});

describe("judges without spread", () => {
  it("counts every z-score of a single-score or all-equal judge as 0 and says so", () => {
    const r = juryStandings(
      { criteria: one, scores: sheet({ solo: { A: 9 }, flat: { A: 5, B: 5 }, wide: { A: 2, B: 8 } }) },
      "jury-z",
    );
    expect(r.judges.map((j) => [j.judge, j.spread])).toEqual([
      ["solo", "single-score"],
      ["flat", "no-spread"],
      ["wide", "ok"],
    ]);
    const a = r.entries.find((e) => e.candidate === "A")!;
    expect(a.perJudge.map((p) => p.normalised)).toEqual([0, 0, -1]); // wide: mean 5, SD 3 → (2−5)/3 = −1
    expect(a.normalised).toBeCloseTo(-1 / 3, 12);
    expect(r.entries.find((e) => e.candidate === "B")!.normalised).toBeCloseTo(0.5, 12); // (0 + 1) / 2
    expect(r.ranking.every((x) => Number.isFinite(x.score))).toBe(true);
  });
});

describe("ties", () => {
  it("leaves entries equal on score, median and top-three sharing a place: 1, 2, 2, 4", () => {
    const input = { criteria: one, scores: sheet({ j1: { A: 9, B: 7, C: 5, D: 1 }, j2: { A: 9, B: 5, C: 7, D: 1 } }) };
    for (const method of ["jury-raw", "jury-z"] as const) {
      const r = juryStandings(input, method);
      expect(r.ranking.map((x) => [x.candidate, x.place, x.tied])).toEqual([
        ["A", 1, false],
        ["B", 2, true],
        ["C", 2, true],
        ["D", 4, false],
      ]);
    }
  });

  it("breaks an equal mean by the median of per-judge totals", () => {
    // X: 9, 5, 4 → mean 6, median 5.  Y: 6, 6, 6 → mean 6, median 6.  Y ahead.
    const r = juryStandings(
      { criteria: one, scores: sheet({ j1: { X: 9, Y: 6, Z: 1 }, j2: { X: 5, Y: 6, Z: 1 }, j3: { X: 4, Y: 6, Z: 1 } }) },
      "jury-raw",
    );
    expect(r.ranking.map((x) => [x.candidate, x.place, x.decidedBy])).toEqual([
      ["Y", 1, "median of per-judge figures"],
      ["X", 2, "median of per-judge figures"],
      ["Z", 3, null],
    ]);
    expect(r.entries.find((e) => e.candidate === "X")!.median).toBe(5);
  });

  it("breaks an equal mean and median by top-three placements", () => {
    // j1: X 10 (1st), P 9, Q 8, R 7, Y 2 (5th).  j2: P 14, Q 13, R 12, Y 10 (4th), X 2 (5th).
    // X and Y: mean 6, median 6; X has one top-three placement, Y none.
    const r = juryStandings(
      {
        criteria: one,
        scores: sheet({ j1: { X: 10, P: 9, Q: 8, R: 7, Y: 2 }, j2: { P: 14, Q: 13, R: 12, Y: 10, X: 2 } }),
      },
      "jury-raw",
    );
    expect(r.ranking.map((x) => [x.candidate, x.score, x.place])).toEqual([
      ["P", 11.5, 1],
      ["Q", 10.5, 2],
      ["R", 9.5, 3],
      ["X", 6, 4],
      ["Y", 6, 5],
    ]);
    expect(r.ranking[3].decidedBy).toBe("top-three placements");
  });
});

describe("bad input", () => {
  const bad = (input: Parameters<typeof juryStandings>[0]) => {
    try {
      juryStandings(input, "jury-raw");
    } catch (error) {
      expect(error).toBeInstanceOf(ScoringInputError);
      return (error as ScoringInputError).issues.join("\n");
    }
    throw new Error("expected a ScoringInputError");
  };

  it("names an unknown criterion and an unknown entry", () => {
    const message = bad({
      criteria: one,
      candidates: ["A"],
      scores: [{ judge: "j", candidate: "Q", criterion: "colour", value: 3 }],
    });
    expect(message).toMatch(/unknown criterion/);
    expect(message).toMatch(/unknown entry/);
  });

  it("rejects values out of range, duplicates, bad weights and NaN", () => {
    const message = bad({
      criteria: [
        { id: "c", weight: 1, min: 0, max: 10 },
        { id: "w", weight: 0 },
      ],
      scores: [
        { judge: "j", candidate: "A", criterion: "c", value: 11 },
        { judge: "j", candidate: "A", criterion: "c", value: 4 },
        { judge: "j", candidate: "B", criterion: "c", value: Number.NaN },
      ],
    });
    expect(message).toMatch(/value 11 is outside 0\.\.10/);
    expect(message).toMatch(/scored this criterion of this entry twice/);
    expect(message).toMatch(/weight must be a positive number/);
    expect(message).toMatch(/finite number/);
  });

  it("needs at least one criterion", () => {
    expect(bad({ criteria: [], scores: [] })).toMatch(/at least one criterion/);
  });
});
