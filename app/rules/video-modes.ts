/**
 * Video modes a ruleset may name, in pixels and lines. Figures from the VESA Display Monitor Timing standard
 * (DMT, version 1.0, revision 13), which stays the reference table; the board may run its own clock (the ruleset's
 * `clock`), so timing is judged in clocks and the rates against a monitor acceptance window.
 */
export type SyncPolarity = "negative" | "positive";

interface Axis {
  active: number;
  frontPorch: number;
  sync: number;
  backPorch: number;
  total: number;
  syncPolarity: SyncPolarity;
}

/** What a monitor locks to, as ranges. */
export interface AcceptanceWindow {
  lineRateKHz: { min: number; max: number };
  refreshHz: { min: number; max: number };
}

export interface VideoMode {
  id: string;
  label: string;
  pixelClockHz: number;
  h: Axis;
  v: Axis;
  /** The DMT's own line and refresh rates for this mode, as the standard prints them (rounded to 3 decimals). */
  dmt: { lineRateKHz: number; refreshHz: number };
  /** Common practice, no published source: the window a typical monitor locks to around this mode. */
  monitor: AcceptanceWindow;
}

export const VIDEO_MODES: Record<string, VideoMode> = {
  "vesa-dmt-640x480-60": {
    id: "vesa-dmt-640x480-60",
    label: "640×480 @ 60 Hz (VESA DMT)",
    pixelClockHz: 25_175_000,
    h: { active: 640, frontPorch: 16, sync: 96, backPorch: 48, total: 800, syncPolarity: "negative" },
    v: { active: 480, frontPorch: 10, sync: 2, backPorch: 33, total: 525, syncPolarity: "negative" },
    dmt: { lineRateKHz: 31.469, refreshHz: 59.94 },
    monitor: { lineRateKHz: { min: 31.0, max: 32.0 }, refreshHz: { min: 59.0, max: 61.0 } },
  },
  "vesa-dmt-640x480-72": {
    id: "vesa-dmt-640x480-72",
    label: "640×480 @ 72 Hz (VESA DMT)",
    pixelClockHz: 31_500_000,
    h: { active: 640, frontPorch: 24, sync: 40, backPorch: 128, total: 832, syncPolarity: "negative" },
    v: { active: 480, frontPorch: 9, sync: 3, backPorch: 28, total: 520, syncPolarity: "negative" },
    dmt: { lineRateKHz: 37.861, refreshHz: 72.809 },
    monitor: { lineRateKHz: { min: 37.3, max: 38.4 }, refreshHz: { min: 71.5, max: 74.0 } },
  },
  "vesa-dmt-640x480-75": {
    id: "vesa-dmt-640x480-75",
    label: "640×480 @ 75 Hz (VESA DMT)",
    pixelClockHz: 31_500_000,
    h: { active: 640, frontPorch: 16, sync: 64, backPorch: 120, total: 840, syncPolarity: "negative" },
    v: { active: 480, frontPorch: 1, sync: 3, backPorch: 16, total: 500, syncPolarity: "negative" },
    dmt: { lineRateKHz: 37.5, refreshHz: 75.0 },
    monitor: { lineRateKHz: { min: 37.0, max: 38.0 }, refreshHz: { min: 74.0, max: 76.0 } },
  },
  "vesa-dmt-800x600-60": {
    id: "vesa-dmt-800x600-60",
    label: "800×600 @ 60 Hz (VESA DMT)",
    pixelClockHz: 40_000_000,
    h: { active: 800, frontPorch: 40, sync: 128, backPorch: 88, total: 1056, syncPolarity: "positive" },
    v: { active: 600, frontPorch: 1, sync: 4, backPorch: 23, total: 628, syncPolarity: "positive" },
    dmt: { lineRateKHz: 37.879, refreshHz: 60.317 },
    monitor: { lineRateKHz: { min: 37.3, max: 38.4 }, refreshHz: { min: 59.0, max: 61.0 } },
  },
};

export function videoMode(id: string): VideoMode {
  const mode = VIDEO_MODES[id];
  if (!mode) throw new Error(`unknown video mode "${id}"; known: ${Object.keys(VIDEO_MODES).join(", ")}`);
  return mode;
}

/** The mode's horizontal figures in board clocks, for a design that holds each pixel for `clocksPerPixel` clocks. */
export function lineInClocks(mode: VideoMode, clocksPerPixel: number): Axis {
  const h = mode.h;
  return {
    active: h.active * clocksPerPixel,
    frontPorch: h.frontPorch * clocksPerPixel,
    sync: h.sync * clocksPerPixel,
    backPorch: h.backPorch * clocksPerPixel,
    total: h.total * clocksPerPixel,
    syncPolarity: h.syncPolarity,
  };
}

/** Line rate (Hz) and refresh (Hz) of a design that follows the mode at the board's clock. */
export function ratesAtClock(mode: VideoMode, clockHz: number, clocksPerPixel: number): { lineRateHz: number; refreshHz: number } {
  const lineClocks = mode.h.total * clocksPerPixel;
  return { lineRateHz: clockHz / lineClocks, refreshHz: clockHz / (lineClocks * mode.v.total) };
}
