import type { Ruleset } from "./ruleset";
import { ratesAtClock, videoMode, type AcceptanceWindow } from "./video-modes";

/** The window the ruleset's monitor locks to: the organizer's own, or the video mode's common-practice default. */
export function acceptanceWindow(ruleset: Ruleset): AcceptanceWindow & { source: "ruleset" | "mode" } {
  if (ruleset.monitor) return { ...ruleset.monitor, source: "ruleset" };
  return { ...videoMode(ruleset.videoMode).monitor, source: "mode" };
}

/** The line rate and refresh of a design following the mode exactly, at the clock's nominal value and both tolerance ends. */
export function expectedRates(ruleset: Ruleset): { nominal: Rates; slow: Rates; fast: Rates } {
  const mode = videoMode(ruleset.videoMode);
  const { frequencyHz, tolerancePct, clocksPerPixel } = ruleset.clock;
  const at = (hz: number): Rates => {
    const r = ratesAtClock(mode, hz, clocksPerPixel);
    return { lineRateKHz: r.lineRateHz / 1000, refreshHz: r.refreshHz };
  };
  return { nominal: at(frequencyHz), slow: at(frequencyHz * (1 - tolerancePct / 100)), fast: at(frequencyHz * (1 + tolerancePct / 100)) };
}
export interface Rates {
  lineRateKHz: number;
  refreshHz: number;
}

const within = (v: number, r: { min: number; max: number }) => v >= r.min && v <= r.max;

/**
 * Why no design could pass this ruleset's rates (the mode at this clock lands outside the monitor window somewhere
 * in the clock's tolerance), or null. Shown to the organizer when the ruleset is saved or imported.
 */
export function windowProblem(ruleset: Ruleset): string | null {
  const w = acceptanceWindow(ruleset);
  const { slow, fast, nominal } = expectedRates(ruleset);
  const mode = videoMode(ruleset.videoMode);
  const clock = `${(ruleset.clock.frequencyHz / 1e6).toFixed(3)} MHz ± ${ruleset.clock.tolerancePct} % with ${ruleset.clock.clocksPerPixel} clock${ruleset.clock.clocksPerPixel === 1 ? "" : "s"} per pixel`;
  if (!within(slow.lineRateKHz, w.lineRateKHz) || !within(fast.lineRateKHz, w.lineRateKHz)) {
    return `${mode.label} at ${clock} gives lines at ${nominal.lineRateKHz.toFixed(3)} kHz, outside the monitor's ${w.lineRateKHz.min}–${w.lineRateKHz.max} kHz`;
  }
  if (!within(slow.refreshHz, w.refreshHz) || !within(fast.refreshHz, w.refreshHz)) {
    return `${mode.label} at ${clock} gives ${nominal.refreshHz.toFixed(3)} frames a second, outside the monitor's ${w.refreshHz.min}–${w.refreshHz.max} Hz`;
  }
  return null;
}

/** One line for calendars and summaries: "board 25.000 MHz ± 0.5 %, 1 clock per pixel, 640×480 @ 60 Hz (VESA DMT); monitor 31–32 kHz, 59–61 Hz". */
export function signalSummary(ruleset: Ruleset): string {
  const mode = videoMode(ruleset.videoMode);
  const w = acceptanceWindow(ruleset);
  const cpp = ruleset.clock.clocksPerPixel;
  return `board clock ${(ruleset.clock.frequencyHz / 1e6).toFixed(3)} MHz ± ${ruleset.clock.tolerancePct} %, ${cpp} clock${cpp === 1 ? "" : "s"} per pixel, ${mode.label}; monitor window ${w.lineRateKHz.min}–${w.lineRateKHz.max} kHz, ${w.refreshHz.min}–${w.refreshHz.max} Hz`;
}
