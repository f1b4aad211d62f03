import { describe, expect, it } from "vitest";
import { isFullyScored, parseTypedScore, scaleError, weightedTotal } from "./sheet";
import { moveCell } from "./grid-keys";
import { retryDelayMs } from "./retry";

const crit = [
  { id: "v", name: "Visuals", weight: 2, scaleMin: 0, scaleMax: 10 },
  { id: "s", name: "Sound", weight: 1, scaleMin: 0, scaleMax: 10 },
];

describe("scoresheet arithmetic", () => {
  it("checks the scale and half points", () => {
    expect(scaleError(crit[0], 10)).toBeNull();
    expect(scaleError(crit[0], 7.5)).toBeNull();
    expect(scaleError(crit[0], 11)).toMatch(/between 0 and 10/);
    expect(scaleError(crit[0], -1)).toMatch(/between 0 and 10/);
    expect(scaleError(crit[0], 7.25)).toMatch(/half point/);
    expect(scaleError(crit[0], Number.NaN)).toMatch(/number/);
  });

  it("weights the total and rescales over the criteria scored", () => {
    // (8·2 + 5·1) / 3 = 7 (worked by hand)
    expect(weightedTotal(crit, { v: 8, s: 5 })).toBe(7);
    expect(weightedTotal(crit, { v: 8 })).toBe(8);
    expect(weightedTotal(crit, {})).toBeNull();
    expect(isFullyScored(crit, { v: 8, s: 5 })).toBe(true);
    expect(isFullyScored(crit, { v: 8, s: null })).toBe(false);
  });

  it("parses typed scores", () => {
    expect(parseTypedScore(" 7 ")).toEqual({ value: 7 });
    expect(parseTypedScore("7,5")).toEqual({ value: 7.5 });
    expect(parseTypedScore("")).toEqual({ value: null });
    expect(parseTypedScore("7a")).toEqual({ error: "Type a number." });
  });
});

describe("grid keyboard movement", () => {
  // 3 rows; columns: 0 #, 1 entry, 2..3 scores, 4 total, 5 note
  const m = (row: number, col: number, move: Parameters<typeof moveCell>[1]) => moveCell({ row, col }, move, 3, 6, 2, 3);
  it("moves with arrows and stops at the edges", () => {
    expect(m(0, 2, "down")).toEqual({ row: 1, col: 2 });
    expect(m(0, 2, "up")).toEqual({ row: 0, col: 2 });
    expect(m(1, 5, "right")).toEqual({ row: 1, col: 5 });
    expect(m(1, 0, "left")).toEqual({ row: 1, col: 0 });
    expect(m(1, 3, "home")).toEqual({ row: 1, col: 0 });
    expect(m(1, 3, "end")).toEqual({ row: 1, col: 5 });
  });
  it("runs Tab through the scores, wrapping rows, and lets focus leave at the end", () => {
    expect(m(0, 2, "next")).toEqual({ row: 0, col: 3 });
    expect(m(0, 3, "next")).toEqual({ row: 1, col: 2 });
    expect(m(2, 3, "next")).toBeNull();
    expect(m(1, 2, "prev")).toEqual({ row: 0, col: 3 });
    expect(m(0, 2, "prev")).toBeNull();
    expect(m(0, 1, "next")).toEqual({ row: 0, col: 2 });
    expect(m(0, 5, "prev")).toEqual({ row: 0, col: 3 });
  });
  it("backs off retries 1 s, 2 s, 4 s … up to 30 s", () => {
    expect([0, 1, 2, 3, 4, 5, 6].map((a) => retryDelayMs(a))).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000]);
  });
});
