import { describe, expect, it } from "vitest";
import { parseRecountInput, recount } from "./recount";

function parsed(value: unknown) {
  const p = parseRecountInput(value);
  if (!p.ok) throw new Error(p.message);
  return p.input;
}

describe("parseRecountInput", () => {
  it("names the unknown method", () => {
    const p = parseRecountInput({ method: "lottery", ballots: [] });
    expect(p.ok).toBe(false);
    if (!p.ok) expect(p.message).toMatch(/method must be one of/);
  });

  it("points at the broken field", () => {
    const p = parseRecountInput({ method: "jury-raw", criteria: [{ id: "c", weight: -1 }], scores: [] });
    expect(p.ok).toBe(false);
    if (!p.ok) expect(p.message).toMatch(/criteria\[0\]\.weight/);
  });

  it("rejects a ballot of the wrong shape for the method", () => {
    const p = parseRecountInput({ method: "borda", ballots: [{ points: { a: 1 } }] });
    expect(p.ok).toBe(false);
  });
});

describe("recount", () => {
  it("recounts jury-z with missing-score warnings", () => {
    const out = recount(
      parsed({
        method: "jury-z",
        criteria: [{ id: "c", weight: 1 }],
        candidates: ["A", "B", "C"],
        scores: [
          { judge: "j", candidate: "A", criterion: "c", value: 2 },
          { judge: "j", candidate: "B", criterion: "c", value: 4 },
        ],
      }),
    );
    // j: mean 3, SD 1 → A −1, B +1; C unscored.
    expect(out.ranking).toEqual([
      { candidate: "B", score: 1, place: 1, tied: false },
      { candidate: "A", score: -1, place: 2, tied: false },
      { candidate: "C", score: null, place: 3, tied: false },
    ]);
    expect(out.warnings).toEqual([expect.stringMatching(/entry "C" has no scores/)]);
  });

  it("recounts points, borda and schulze with the same ranking rows", () => {
    const points = recount(parsed({ method: "points", ballots: [{ points: { x: 3, y: 4 } }, { points: { x: 7 } }] }));
    expect(points.ranking.map((r) => [r.candidate, r.score])).toEqual([
      ["y", 4],
      ["x", 3],
    ]);
    expect(points.warnings[0]).toMatch(/ballot 2 set aside: points for "x" must be 0–5, got 7/);

    const ranked = [{ ranking: ["x", "y", "z"] }, { ranking: ["y", "x", "z"] }, { ranking: ["x", "z", "y"] }];
    // Borda 2-1-0: x 2+1+2 = 5, y 1+2+0 = 3, z 0+0+1 = 1.
    expect(recount(parsed({ method: "borda", ballots: ranked })).ranking.map((r) => [r.candidate, r.score])).toEqual([
      ["x", 5],
      ["y", 3],
      ["z", 1],
    ]);
    // x beats y 2–1 and z 3–0; y beats z 2–1.
    expect(recount(parsed({ method: "schulze", ballots: ranked })).ranking.map((r) => [r.candidate, r.place])).toEqual([
      ["x", 1],
      ["y", 2],
      ["z", 3],
    ]);
  });
});
