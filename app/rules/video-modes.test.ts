import { describe, expect, it } from "vitest";
import { lineInClocks, ratesAtClock, VIDEO_MODES, videoMode } from "./video-modes";

/**
 * Check values from the VESA Display Monitor Timing standard (DMT), version 1.0, revision 13: for each mode the
 * pixel clock, the horizontal and vertical active/front porch/sync/back porch, the sync polarities and the line and
 * refresh rates the standard prints. Written out here from the standard's tables (from memory, cross-checked
 * against the modeline list "VESA and Industry Standards and Guide for Computer Display Monitor Timing" rev 0.8).
 */
const DMT: Record<string, { clockMHz: number; h: number[]; v: number[]; pol: string; lineKHz: number; refreshHz: number }> = {
  "vesa-dmt-640x480-60": { clockMHz: 25.175, h: [640, 16, 96, 48], v: [480, 10, 2, 33], pol: "negative", lineKHz: 31.469, refreshHz: 59.94 },
  "vesa-dmt-640x480-72": { clockMHz: 31.5, h: [640, 24, 40, 128], v: [480, 9, 3, 28], pol: "negative", lineKHz: 37.861, refreshHz: 72.809 },
  "vesa-dmt-640x480-75": { clockMHz: 31.5, h: [640, 16, 64, 120], v: [480, 1, 3, 16], pol: "negative", lineKHz: 37.5, refreshHz: 75.0 },
  "vesa-dmt-800x600-60": { clockMHz: 40.0, h: [800, 40, 128, 88], v: [600, 1, 4, 23], pol: "positive", lineKHz: 37.879, refreshHz: 60.317 },
};

describe("video modes against the VESA DMT tables", () => {
  it("offers exactly the modes the table lists", () => {
    expect(Object.keys(VIDEO_MODES).sort()).toEqual(Object.keys(DMT).sort());
  });
  for (const [id, ref] of Object.entries(DMT)) {
    it(`${id}: timing, polarity and the rates the standard prints`, () => {
      const m = videoMode(id);
      expect(m.pixelClockHz).toBe(Math.round(ref.clockMHz * 1e6));
      expect([m.h.active, m.h.frontPorch, m.h.sync, m.h.backPorch]).toEqual(ref.h);
      expect([m.v.active, m.v.frontPorch, m.v.sync, m.v.backPorch]).toEqual(ref.v);
      expect(m.h.total).toBe(ref.h.reduce((a, b) => a + b));
      expect(m.v.total).toBe(ref.v.reduce((a, b) => a + b));
      expect([m.h.syncPolarity, m.v.syncPolarity]).toEqual([ref.pol, ref.pol]);
      // the rates follow from the clock and totals; the standard prints them to 3 decimals
      const r = ratesAtClock(m, m.pixelClockHz, 1);
      expect(r.lineRateHz / 1000).toBeCloseTo(ref.lineKHz, 2);
      expect(r.refreshHz).toBeCloseTo(ref.refreshHz, 2);
      expect(m.dmt).toEqual({ lineRateKHz: ref.lineKHz, refreshHz: ref.refreshHz });
      // the default monitor window holds the mode at its own pixel clock
      expect(r.lineRateHz / 1000).toBeGreaterThanOrEqual(m.monitor.lineRateKHz.min);
      expect(r.lineRateHz / 1000).toBeLessThanOrEqual(m.monitor.lineRateKHz.max);
      expect(r.refreshHz).toBeGreaterThanOrEqual(m.monitor.refreshHz.min);
      expect(r.refreshHz).toBeLessThanOrEqual(m.monitor.refreshHz.max);
    });
  }
  it("states a line in board clocks for a design that holds each pixel two clocks", () => {
    const line = lineInClocks(videoMode("vesa-dmt-640x480-60"), 2);
    expect([line.active, line.frontPorch, line.sync, line.backPorch, line.total]).toEqual([1280, 32, 192, 96, 1600]);
    // 50 MHz ÷ 2 gives the same rates as a 25 MHz board
    expect(ratesAtClock(videoMode("vesa-dmt-640x480-60"), 50e6, 2)).toEqual(ratesAtClock(videoMode("vesa-dmt-640x480-60"), 25e6, 1));
  });
});
