import { describe, expect, it } from "vitest";
import { placeByKeys } from "./places";

const names = ["score", "first tie-break", "second tie-break"];

describe("placeByKeys", () => {
  it("gives standard competition places 1, 2, 2, 4 to remaining ties", () => {
    const rows = placeByKeys(
      [
        { candidate: "d", keys: [1, 0, 0] },
        { candidate: "b", keys: [5, 1, 1] },
        { candidate: "a", keys: [9, 0, 0] },
        { candidate: "c", keys: [5, 1, 1] },
      ],
      names,
    );
    expect(rows.map((r) => [r.candidate, r.place, r.tied])).toEqual([
      ["a", 1, false],
      ["b", 2, true],
      ["c", 2, true],
      ["d", 4, false],
    ]);
  });

  it("names the key that broke a tie on the score", () => {
    const rows = placeByKeys(
      [
        { candidate: "x", keys: [5, 2, 0] },
        { candidate: "y", keys: [5, 2, 3] },
        { candidate: "z", keys: [5, 4, 0] },
      ],
      names,
    );
    expect(rows.map((r) => [r.candidate, r.place, r.decidedBy])).toEqual([
      ["z", 1, "first tie-break"],
      ["y", 2, "second tie-break"],
      ["x", 3, "second tie-break"],
    ]);
  });

  it("puts entries without a figure last, tied with each other", () => {
    const rows = placeByKeys(
      [
        { candidate: "n1", keys: [null] },
        { candidate: "neg", keys: [-2] },
        { candidate: "n2", keys: [null] },
      ],
      names,
    );
    expect(rows.map((r) => [r.candidate, r.place, r.score])).toEqual([
      ["neg", 1, -2],
      ["n1", 2, null],
      ["n2", 2, null],
    ]);
  });

  it("counts sums that differ only by rounding as a tie", () => {
    const rows = placeByKeys(
      [
        { candidate: "a", keys: [0.1 + 0.2] },
        { candidate: "b", keys: [0.3] },
      ],
      names,
    );
    expect(rows.map((r) => r.place)).toEqual([1, 1]);
  });
});
