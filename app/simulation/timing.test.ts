import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { videoMode } from "~/rules/video-modes";
import type { HarnessSummary } from "./summary";
import { measureVideo, timingFindings } from "./timing";

// Check values: VESA Display Monitor Timing standard (DMT), 640×480 @ 60 Hz.
describe("VESA DMT 640×480 @ 60 Hz", () => {
  const mode = videoMode("vesa-dmt-640x480-60");
  it("has a 25.175 MHz pixel clock, 800 clocks a line, 525 lines a frame, negative syncs", () => {
    expect(mode.pixelClockHz).toBe(25_175_000);
    expect(mode.h.active + mode.h.frontPorch + mode.h.sync + mode.h.backPorch).toBe(800);
    expect([mode.h.active, mode.h.frontPorch, mode.h.sync, mode.h.backPorch]).toEqual([640, 16, 96, 48]);
    expect(mode.h.total).toBe(800);
    expect(mode.v.active + mode.v.frontPorch + mode.v.sync + mode.v.backPorch).toBe(525);
    expect([mode.v.active, mode.v.frontPorch, mode.v.sync, mode.v.backPorch]).toEqual([480, 10, 2, 33]);
    expect(mode.h.syncPolarity).toBe("negative");
    expect(mode.v.syncPolarity).toBe("negative");
  });
  it("lasts about 39.7 ns a pixel (common practice, no source) and about 59.94 frames a second", () => {
    expect(1e9 / mode.pixelClockHz).toBeCloseTo(39.72, 2);
    expect(mode.pixelClockHz / (mode.h.total * mode.v.total)).toBeCloseTo(59.94, 2);
  });
});

function summary(over: Partial<{ hPeriod: number; hPulse: number; hActive: 0 | 1; vLines: number; vPulse: number; blank: number }> = {}): HarnessSummary {
  const hPeriod = over.hPeriod ?? 800, vLines = over.vLines ?? 525;
  const sync = (period: number, pulse: number, active: 0 | 1, warm: number) => ({
    warmupHighClocks: active === 0 ? Math.round(warm * (1 - pulse / period)) : Math.round((warm * pulse) / period),
    warmupEdges: 2 * Math.floor(warm / period), warmupClocks: warm, activeLevel: active,
    periodMin: period, periodMax: period, periods: 4, pulseMin: pulse, pulseMax: pulse, pulses: 4,
  });
  const warm = hPeriod * vLines * 2;
  return {
    status: "ok", cycles: 3_000_000, seconds: 0.1, cpuSeconds: 0.1, framesCaptured: 4,
    hsync: sync(hPeriod, over.hPulse ?? 96, over.hActive ?? 0, warm),
    vsync: sync(hPeriod * vLines, (over.vPulse ?? 2) * hPeriod, 0, warm),
    linesPerFrame: { min: vLines, max: vLines, frames: 4 },
    blanking: { colourClocks: over.blank ?? 0, firstFrame: 0, firstLine: 3, firstHpos: 790, firstColour: 0x030000 },
    audio: { sampleRate: 48_000, samples: 3200 },
  };
}

const failing = (s: HarnessSummary, ruleset = DEMO_RULESET) => timingFindings(s, ruleset, 4).filter((f) => f.verdict !== "pass").map((f) => f.rule);

describe("timing findings", () => {
  it("passes standard timing on every rule, each with measured and standard value", () => {
    const findings = timingFindings(summary(), DEMO_RULESET, 4);
    expect(findings.map((f) => f.rule).sort()).toEqual([
      "video.blanking.colour", "video.frame.lines", "video.frame.rate", "video.frames.rendered",
      "video.hsync.period", "video.hsync.polarity", "video.hsync.pulse",
      "video.line.rate", "video.vsync.period", "video.vsync.polarity", "video.vsync.pulse",
    ]);
    expect(findings.every((f) => f.verdict === "pass" && f.step === "simulation" && f.limit != null)).toBe(true);
    expect(measureVideo(summary(), DEMO_RULESET)).toMatchObject({
      hsync: { periodClocks: 800, pulseClocks: 96, polarity: "negative" },
      vsync: { periodLines: 525, pulseLines: 2, polarity: "negative" },
      linesPerFrame: 525,
    });
  });
  it("names each fault by its own rule", () => {
    expect(failing(summary({ hPulse: 100 }))).toEqual(["video.hsync.pulse"]);
    expect(failing(summary({ hActive: 1 }))).toEqual(["video.hsync.polarity"]);
    expect(failing(summary({ vPulse: 3 }))).toEqual(["video.vsync.pulse"]);
    expect(failing(summary({ blank: 12 }))).toEqual(["video.blanking.colour"]);
    // a line of 810 clocks: the frame is 525 lines still, but lines come at 31.08 kHz and frames at 59.20 Hz, and
    // at the slow end of the clock's 0.5 % both leave the 31–32 kHz / 59–61 Hz window
    expect(failing(summary({ hPeriod: 810 }))).toEqual(["video.hsync.period", "video.line.rate", "video.frame.rate"]);
  });
  it("reports one fewer line as a wrong vsync period and line count, but a frame rate within 0.5 %", () => {
    expect(failing(summary({ vLines: 524 }))).toEqual(["video.vsync.period", "video.frame.lines"]);
  });
});

describe("the compo's own clock", () => {
  // Common practice, no source: boards in this trade clock 640×480 designs at 25 MHz, 0.7 % off the DMT pixel clock,
  // and monitors lock to it (31.25 kHz lines, 59.52 Hz frames).
  const at25 = { ...DEMO_RULESET, clock: { ...DEMO_RULESET.clock, frequencyHz: 25_000_000 } };
  it("passes a correct 800×525 design clocked at 25 MHz", () => {
    const findings = timingFindings(summary(), at25, 4);
    expect(findings.filter((f) => f.verdict !== "pass").map((f) => f.rule)).toEqual([]);
    const rate = findings.find((f) => f.rule === "video.frame.rate")!;
    expect(rate.measured).toMatch(/^59\.524 Hz/); // 25e6 / (800 × 525)
    expect(rate.limit).toBe("59–61 Hz");
    expect(rate.evidence).toContain("common practice, no published source");
    expect(findings.find((f) => f.rule === "video.line.rate")!.measured).toMatch(/^31\.250 kHz/); // 25e6 / 800
  });
  it("judges a 50 MHz board that holds each pixel two clocks in clocks: 1600 a line, 192 of hsync", () => {
    const at50 = { ...DEMO_RULESET, clock: { ...DEMO_RULESET.clock, frequencyHz: 50_000_000, clocksPerPixel: 2 } };
    expect(failing(summary({ hPeriod: 1600, hPulse: 192 }), at50)).toEqual([]);
    // the same design without the divider: every line half as long, twice the rates
    expect(failing(summary(), at50)).toEqual(["video.hsync.period", "video.hsync.pulse", "video.line.rate", "video.frame.rate"]);
    const period = timingFindings(summary({ hPeriod: 1600, hPulse: 192 }), at50, 4).find((f) => f.rule === "video.hsync.period")!;
    expect(period.limit).toBe("1600 clocks");
  });
  it("uses the organizer's own monitor window when the ruleset names one", () => {
    const narrow = { ...at25, monitor: { lineRateKHz: { min: 31.3, max: 31.6 }, refreshHz: { min: 59.0, max: 61.0 } } };
    expect(failing(summary(), narrow)).toEqual(["video.line.rate"]);
    expect(timingFindings(summary(), narrow, 4).find((f) => f.rule === "video.line.rate")!.evidence).toContain("the organizer's monitor window");
  });
});
