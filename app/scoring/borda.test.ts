import { describe, expect, it } from "vitest";
import { bordaPoints, tallyBorda } from "./borda";
import { pairwisePreferences } from "./schulze";

function repeat(count: number, ranking: string[]) {
  return Array.from({ length: count }, () => ({ ranking }));
}

describe("Borda: electing Tennessee's capital", () => {
  // Worked example from the Wikipedia article "Borda count", section "An example" (read through its
  // mirror at liquisearch.com/borda_count/an_example): 100 voters, n − i points per place.
  // Published totals: Memphis 126, Nashville 194, Chattanooga 173, Knoxville 107; winner Nashville.
  // Published position shares for Chattanooga: 15 % first, 43 % second, 42 % third, 0 % fourth.
  const ballots = [
    ...repeat(42, ["Memphis", "Nashville", "Chattanooga", "Knoxville"]),
    ...repeat(26, ["Nashville", "Chattanooga", "Knoxville", "Memphis"]),
    ...repeat(15, ["Chattanooga", "Knoxville", "Nashville", "Memphis"]),
    ...repeat(17, ["Knoxville", "Chattanooga", "Nashville", "Memphis"]),
  ];
  const tally = tallyBorda(ballots);

  it("gives the published totals and winner", () => {
    expect(tally.ranking.map((r) => [r.candidate, r.score, r.place])).toEqual([
      ["Nashville", 194, 1],
      ["Chattanooga", 173, 2],
      ["Memphis", 126, 3],
      ["Knoxville", 107, 4],
    ]);
  });

  it("shows the published position counts", () => {
    const chattanooga = tally.entries.find((e) => e.candidate === "Chattanooga")!;
    expect(chattanooga.positions).toEqual([15, 43, 42, 0]);
    expect(chattanooga.unranked).toBe(0);
  });
});

describe("Borda: partial rankings", () => {
  it("shares the places below a truncated ranking equally (hand-worked)", () => {
    // 4 entries, ballot ranks only A: A gets 3; the 3 others share places 2–4 worth 2, 1, 0 → 1 each.
    const points = bordaPoints({ ranking: ["A"] }, ["A", "B", "C", "D"]);
    expect(Object.fromEntries(points)).toEqual({ A: 3, B: 1, C: 1, D: 1 });
    // 4 entries, A then B: 3, 2; C and D share 1 and 0 → 0.5 each. Every ballot is still worth 6 in all.
    expect(Object.fromEntries(bordaPoints({ ranking: ["A", "B"] }, ["A", "B", "C", "D"]))).toEqual({ A: 3, B: 2, C: 0.5, D: 0.5 });
  });

  it("equals pairwise wins plus half ties, so it agrees with the Schulze pairwise matrix", () => {
    const candidates = ["A", "B", "C", "D"];
    const ballots = [{ ranking: ["B"] }, { ranking: ["C", "A"] }, { ranking: ["D", "C", "B", "A"] }, { ranking: ["A", "D"] }];
    const tally = tallyBorda(ballots, candidates);
    const d = pairwisePreferences(ballots, candidates);
    candidates.forEach((x, i) => {
      let expected = 0;
      candidates.forEach((_, j) => {
        if (i !== j) expected += d[i][j] + (ballots.length - d[i][j] - d[j][i]) / 2;
      });
      expect(tally.entries.find((e) => e.candidate === x)!.points).toBe(expected);
    });
  });

  it("shows remaining ties as shared places and sets invalid ballots aside", () => {
    const tally = tallyBorda([{ ranking: ["A", "B"] }, { ranking: ["B", "A"] }, { ranking: ["A", "Z"] }], ["A", "B", "C"]);
    expect(tally.ranking.map((r) => [r.candidate, r.score, r.place])).toEqual([
      ["A", 3, 1],
      ["B", 3, 1],
      ["C", 0, 3],
    ]);
    expect(tally.rejected.map((r) => r.index)).toEqual([2]);
  });
});
