import { describe, expect, it } from "vitest";
import { CompareError, compareCaptures, type LumaSequence } from "./compare";

function seq(frames: number, at: (f: number, i: number) => number, fps = 60): LumaSequence {
  return { width: 8, height: 6, fps, frames: Array.from({ length: frames }, (_, f) => Uint8Array.from({ length: 48 }, (_, i) => at(f, i))) };
}
const pattern = (f: number, i: number) => ((f * 5 + i * 37) % 97) * 2;

describe("capture comparison", () => {
  it("finds the time offset of a delayed copy and calls it the same picture", () => {
    const ref = seq(100, pattern);
    const up = seq(60, (f, i) => pattern(f + 15, i));
    const r = compareCaptures(ref, up);
    expect(r.offsetFrames).toBe(15);
    expect(r.similarity).toBeCloseTo(1, 6);
    expect(r.offsetSeconds).toBeCloseTo(0.25, 6);
  });
  it("is unmoved by a change of brightness and contrast (correlation is invariant to gain and offset)", () => {
    const r = compareCaptures(seq(50, pattern), seq(50, (f, i) => 16 + Math.round(pattern(f, i) * 0.8)));
    expect(r.offsetFrames).toBe(0);
    expect(r.similarity!).toBeGreaterThan(0.99);
  });
  it("scores unrelated pictures low and says so", () => {
    const r = compareCaptures(seq(50, pattern), seq(50, (f, i) => ((f * 13 + i * 11) % 89) * 2), 0.2);
    expect(r.similarity!).toBeLessThan(0.6);
    expect(r.statement).toMatch(/does not resemble/);
  });
  it("cannot compare pictures that never change", () => {
    expect(compareCaptures(seq(10, () => 40), seq(10, () => 40)).similarity).toBeNull();
  });
  it("refuses mismatched grids and frame rates", () => {
    expect(() => compareCaptures(seq(10, pattern), seq(10, pattern, 30))).toThrow(CompareError);
    expect(() => compareCaptures(seq(10, pattern), { ...seq(10, pattern), width: 4 })).toThrow(CompareError);
  });
});
