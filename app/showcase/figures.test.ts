import { describe, expect, it } from "vitest";
import { flashSummary, isFlashFlagged, publicStats } from "./figures";

describe("public figures of a check run", () => {
  it("states the flash result, or that it is not measured yet", () => {
    expect(flashSummary({}).statement).toBe("Flash check: not measured yet.");
    expect(isFlashFlagged(flashSummary({}))).toBe(true);
    const pass = flashSummary({ flash: { verdict: "pass", worstSecondFlashes: 2 } });
    expect(pass).toMatchObject({ verdict: "pass", worstSecondFlashes: 2 });
    expect(isFlashFlagged(pass)).toBe(false);
    // The flash step's own report shape (passes + per-kind worst counts) reads the same way.
    const report = flashSummary({ flash: { passes: false, general: { worstFlashes: 7 }, red: { worstFlashes: 4 } } });
    expect(report).toMatchObject({ verdict: "warn", worstSecondFlashes: 7 });
    expect(report.statement).toMatch(/FLAGGED/);
  });

  it("reads stats defensively", () => {
    expect(publicStats({ source: { cells: "many" }, layout: { widthUm: 180 } })).toEqual({ flipFlops: null, cells: null, sourceLines: null, tileShape: null, tileSizeUm: null, utilization: null });
    expect(publicStats({ layout: { flipFlops: 138, widthUm: 360, heightUm: 120, matchedShape: "wide", utilization: 0.5 } })).toMatchObject({ flipFlops: 138, tileShape: "wide", tileSizeUm: { width: 360, height: 120 } });
  });
});
