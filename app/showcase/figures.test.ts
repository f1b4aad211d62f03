import { describe, expect, it } from "vitest";
import { captureFlashSummary, flashSummary, isFlashFlagged, loopSummary, publicStats } from "./figures";

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

  it("uses the span-naming sentence of a whole-demo capture, and claims nothing when under a second was analysed", () => {
    const whole = flashSummary({ flash: { verdict: "pass", worstSecondFlashes: 1, statement: "Flash check: no flashes over the WCAG 2.3.1 thresholds in the whole 34.1 s loop (at most 1 a second)." } });
    expect(whole).toMatchObject({ verdict: "pass", statement: expect.stringContaining("whole 34.1 s loop") });
    const short = flashSummary({ flash: { verdict: "unmeasured", worstSecondFlashes: null, statement: "Flash check: not measured — only 0.07 s was analysed." } });
    expect(short.verdict).toBeNull();
    expect(isFlashFlagged(short)).toBe(true);
    // an older figure without its span: the sentence does not claim the whole demo
    expect(flashSummary({ flash: { verdict: "pass", worstSecondFlashes: 2 } }).statement).toMatch(/in the part analysed/);
  });

  it("keeps the crew video's own verdict apart from the reference capture's", () => {
    const figures = { flash: { verdict: "pass", worstSecondFlashes: 1 }, captureFlash: { verdict: "warn", worstSecondFlashes: 6, statement: "Flash check: FLAGGED — 6 flashes in one second, in the whole 20 s video." } };
    expect(flashSummary(figures).verdict).toBe("pass");
    expect(captureFlashSummary(figures)).toMatchObject({ verdict: "warn", statement: expect.stringContaining("whole 20 s video") });
    expect(captureFlashSummary({ flash: { verdict: "pass" } }).verdict).toBeNull();
  });

  it("reads the loop point for the player's mark", () => {
    const loop = loopSummary({ loop: { detected: true, periodFrames: 120, periodSeconds: 2.002, firstLoopFrame: 60, framesCaptured: 180, capturedSeconds: 3.003, statement: "loops every 2.0 s" } });
    expect(loop).toMatchObject({ detected: true, periodSeconds: 2.002, statement: "loops every 2.0 s" });
    expect(loop!.loopStartSeconds).toBeCloseTo(1.001, 3);
    expect(loopSummary({})).toBeNull();
  });

  it("reads stats defensively", () => {
    expect(publicStats({ source: { cells: "many" }, layout: { widthUm: 180 } })).toEqual({ flipFlops: null, cells: null, sourceLines: null, tileShape: null, tileSizeUm: null, utilization: null });
    expect(publicStats({ layout: { flipFlops: 138, widthUm: 360, heightUm: 120, matchedShape: "wide", utilization: 0.5 } })).toMatchObject({ flipFlops: 138, tileShape: "wide", tileSizeUm: { width: 360, height: 120 } });
  });
});
