import { describe, expect, it } from "vitest";
import { tallySchulze } from "./schulze";

function repeat(count: number, order: string) {
  return Array.from({ length: count }, () => ({ ranking: order.split("") }));
}

describe("Schulze: the 45-voter, five-candidate example", () => {
  // The worked example of the Wikipedia article "Schulze method" (section "Example"), which is also
  // Example 1 of Markus Schulze's own list of examples for his method. d, p and the order below were
  // checked against the article's mirror at liquisearch.com/schulze_method/example and against
  // pinocchiopedia.com/wiki/User:MarkusSchulze/Schulze_method_examples.
  const ballots = [
    ...repeat(5, "ACBED"),
    ...repeat(5, "ADECB"),
    ...repeat(8, "BEDAC"),
    ...repeat(3, "CABED"),
    ...repeat(7, "CAEBD"),
    ...repeat(2, "CBADE"),
    ...repeat(7, "DCEBA"),
    ...repeat(8, "EBADC"),
  ];
  const tally = tallySchulze(ballots, ["A", "B", "C", "D", "E"]);

  it("has the published pairwise matrix d", () => {
    expect(tally.d).toEqual([
      [null, 20, 26, 30, 22],
      [25, null, 16, 33, 18],
      [19, 29, null, 17, 24],
      [15, 12, 28, null, 14],
      [23, 27, 21, 31, null],
    ]);
  });

  it("has the published strongest-path matrix p", () => {
    expect(tally.p).toEqual([
      [null, 28, 28, 30, 24],
      [25, null, 28, 33, 24],
      [25, 29, null, 29, 24],
      [25, 28, 28, null, 24],
      [25, 28, 28, 31, null],
    ]);
  });

  it("ranks E > A > C > B > D, as published", () => {
    expect(tally.ranking.map((r) => [r.candidate, r.place, r.score])).toEqual([
      ["E", 1, 4],
      ["A", 2, 3],
      ["C", 3, 2],
      ["B", 4, 1],
      ["D", 5, 0],
    ]);
    expect(tally.counted).toBe(45);
  });
});

describe("Schulze: ties and partial ballots", () => {
  it("gives a shared place where the relation is not strict", () => {
    const tally = tallySchulze([{ ranking: ["A", "B", "C"] }, { ranking: ["B", "A", "C"] }]);
    expect(tally.ranking.map((r) => [r.candidate, r.place, r.tied])).toEqual([
      ["A", 1, true],
      ["B", 1, true],
      ["C", 3, false],
    ]);
  });

  it("ranks listed entries above unlisted ones and unlisted ones level with each other (hand-worked)", () => {
    // Ballot "A" alone: A over B, A over C; B and C level. d[A,B] = d[A,C] = 1, all else 0.
    const tally = tallySchulze([{ ranking: ["A"] }], ["A", "B", "C"]);
    expect(tally.d).toEqual([
      [null, 1, 1],
      [0, null, 0],
      [0, 0, null],
    ]);
    expect(tally.ranking.map((r) => [r.candidate, r.place])).toEqual([
      ["A", 1],
      ["B", 2],
      ["C", 2],
    ]);
  });

  it("sets invalid ballots aside", () => {
    const tally = tallySchulze([{ ranking: ["A", "A"] }, { ranking: ["B"] }], ["A", "B"]);
    expect(tally.counted).toBe(1);
    expect(tally.rejected[0].problems[0].code).toBe("duplicate-candidate");
    expect(tally.ranking[0].candidate).toBe("B");
  });
});
