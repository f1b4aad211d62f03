import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { acceptanceWindow } from "~/rules/monitor";
import { lineInClocks, videoMode, type VideoMode } from "~/rules/video-modes";
import type { HarnessSummary, SyncMeasurement } from "./summary";

/** Judges the harness's raw sync measurements against the ruleset's video mode. */
export type Polarity = "negative" | "positive";

export interface VideoTiming {
  hsync: { periodClocks: number | null; pulseClocks: number | null; polarity: Polarity | null };
  vsync: { periodLines: number | null; pulseLines: number | null; polarity: Polarity | null };
  linesPerFrame: number | null;
  framesRendered: number;
  frameRateHz: number | null;
  lineRateHz?: number | null;
  clocksPerPixel?: number;
}

const STATUS_TEXT: Record<HarnessSummary["status"], string> = {
  ok: "the run completed",
  "no-hsync": "hsync never changed level",
  "no-vsync": "vsync never changed level",
  "hsync-lost": "hsync stopped toggling during the run",
  "vsync-lost": "vsync stopped toggling during the run",
  finished: "the design ended the simulation itself",
};

function polarityOf(sync: SyncMeasurement): Polarity {
  // active level 0 = idle high, pulse low
  return sync.activeLevel === 0 ? "negative" : "positive";
}

function hasEdges(sync: SyncMeasurement): boolean {
  return sync.warmupEdges >= 2;
}

function range(min: number, max: number, digits = 0): string {
  const f = (n: number) => (digits ? n.toFixed(digits).replace(/\.?0+$/, "") : String(n));
  return min === max ? f(min) : `${f(min)}–${f(max)}`;
}

export function measureVideo(summary: HarnessSummary, ruleset: Ruleset): VideoTiming {
  const hOk = hasEdges(summary.hsync) && summary.hsync.periods > 0;
  const vOk = hasEdges(summary.vsync) && summary.vsync.periods > 0 && hOk;
  const hPeriod = hOk ? summary.hsync.periodMax : null;
  return {
    hsync: {
      periodClocks: hPeriod,
      pulseClocks: hOk && summary.hsync.pulses > 0 ? summary.hsync.pulseMax : null,
      polarity: hasEdges(summary.hsync) ? polarityOf(summary.hsync) : null,
    },
    vsync: {
      periodLines: vOk && hPeriod ? summary.vsync.periodMax / hPeriod : null,
      pulseLines: vOk && hPeriod && summary.vsync.pulses > 0 ? summary.vsync.pulseMax / hPeriod : null,
      polarity: hasEdges(summary.vsync) ? polarityOf(summary.vsync) : null,
    },
    linesPerFrame: summary.linesPerFrame.frames > 0 ? summary.linesPerFrame.max : null,
    framesRendered: summary.framesCaptured,
    frameRateHz: vOk ? ruleset.clock.frequencyHz / summary.vsync.periodMax : null,
    lineRateHz: hPeriod ? ruleset.clock.frequencyHz / hPeriod : null,
    clocksPerPixel: ruleset.clock.clocksPerPixel,
  };
}

function exact(rule: string, title: string, min: number, max: number, standard: number, unit: string, extra: Partial<Finding> = {}): Finding {
  const pass = min === standard && max === standard;
  return {
    step: "simulation",
    rule,
    verdict: pass ? "pass" : "fail",
    title,
    measured: `${range(min, max, 2)} ${unit}`,
    limit: `${standard} ${unit}`,
    ...extra,
  };
}

function syncFindings(kind: "hsync" | "vsync", sync: SyncMeasurement, mode: VideoMode, clocksPerPixel: number, hPeriod: number): Finding[] {
  // a line is judged in board clocks (each pixel lasts clocksPerPixel of them), a frame in lines
  const std = kind === "hsync" ? lineInClocks(mode, clocksPerPixel) : mode.v;
  const scale = kind === "hsync" ? 1 : hPeriod;
  const unit = kind === "hsync" ? "clocks" : "lines";
  const perPixel = kind === "hsync" && clocksPerPixel > 1 ? ` (${mode.h.total} pixels × ${clocksPerPixel} clocks)` : "";
  const out: Finding[] = [];
  if (sync.periods > 0) {
    out.push(exact(`video.${kind}.period`, `${kind} period`, sync.periodMin / scale, sync.periodMax / scale, std.total, unit, {
      evidence: `${sync.periods} periods measured between leading edges`,
      advice: `one ${kind === "hsync" ? "line" : "frame"} must last exactly ${std.total} ${unit}${perPixel}`,
    }));
  }
  if (sync.pulses > 0) {
    out.push(exact(`video.${kind}.pulse`, `${kind} pulse width`, sync.pulseMin / scale, sync.pulseMax / scale, std.sync, unit, {
      evidence: `${sync.pulses} pulses measured`,
      advice: `the sync pulse must last ${std.sync} ${unit}`,
    }));
  }
  const polarity = polarityOf(sync);
  const highPct = (100 * sync.warmupHighClocks) / Math.max(1, sync.warmupClocks);
  out.push({
    step: "simulation",
    rule: `video.${kind}.polarity`,
    verdict: polarity === std.syncPolarity ? "pass" : "fail",
    title: `${kind} polarity`,
    measured: polarity,
    limit: std.syncPolarity,
    evidence: `high for ${highPct.toFixed(1)} % of the first ${sync.warmupClocks} clocks after reset`,
    advice: std.syncPolarity === "negative" ? `${kind} idles high and pulses low in this mode` : `${kind} idles low and pulses high in this mode`,
  });
  return out;
}

/**
 * Line rate and refresh against the monitor acceptance window, at both ends of the clock's tolerance. Not against
 * the DMT pixel clock: a 25 MHz board is 0.7 % off 25.175 MHz and every monitor locks to it (common practice).
 */
function rateFindings(summary: HarnessSummary, ruleset: Ruleset, mode: VideoMode): Finding[] {
  const window = acceptanceWindow(ruleset);
  const { frequencyHz, tolerancePct } = ruleset.clock;
  const windowSource = window.source === "ruleset"
    ? "the organizer's monitor window"
    : "the usual window of monitors for this mode (common practice, no published source)";
  const mhz = `${(frequencyHz / 1e6).toFixed(3)} MHz ± ${tolerancePct} %`;
  const judge = (rule: string, title: string, periodClocks: number, range: { min: number; max: number }, unit: string, perUnit: number, dmt: number, what: string): Finding => {
    const nominal = frequencyHz / periodClocks / perUnit;
    const low = nominal * (1 - tolerancePct / 100), high = nominal * (1 + tolerancePct / 100);
    const pass = low >= range.min && high <= range.max;
    return {
      step: "simulation", rule, verdict: pass ? "pass" : "fail", title,
      measured: `${nominal.toFixed(3)} ${unit} (${low.toFixed(3)}–${high.toFixed(3)} across the clock's tolerance)`,
      limit: `${range.min}–${range.max} ${unit}`,
      evidence: `${periodClocks} clocks per ${what} at ${mhz}; limit from ${windowSource}; the VESA DMT reference is ${dmt} ${unit} at ${(mode.pixelClockHz / 1e6).toFixed(3)} MHz`,
      advice: pass ? undefined : `at this clock a ${what} must last ${Math.ceil(frequencyHz * (1 + tolerancePct / 100) / range.max / perUnit)}–${Math.floor(frequencyHz * (1 - tolerancePct / 100) / range.min / perUnit)} clocks for the monitor to lock`,
    };
  };
  const out: Finding[] = [];
  if (summary.hsync.periods > 0) {
    out.push(judge("video.line.rate", "line rate at the ruleset clock", summary.hsync.periodMax, window.lineRateKHz, "kHz", 1000, mode.dmt.lineRateKHz, "line"));
  }
  if (summary.vsync.periods > 0) {
    out.push(judge("video.frame.rate", "frame rate at the ruleset clock", summary.vsync.periodMax, window.refreshHz, "Hz", 1, mode.dmt.refreshHz, "frame"));
  }
  return out;
}

export function timingFindings(summary: HarnessSummary, ruleset: Ruleset, framesRequested: number): Finding[] {
  const mode = videoMode(ruleset.videoMode);
  const findings: Finding[] = [];
  if (!hasEdges(summary.hsync)) {
    findings.push({
      step: "simulation", rule: "video.hsync.missing", verdict: "fail", title: "hsync present",
      measured: `${summary.hsync.warmupEdges} edges`, limit: "a pulse every line",
      evidence: `no hsync edge in the first ${summary.hsync.warmupClocks} clocks after reset`,
      advice: "drive the hsync pin with a pulse every line",
    });
    return findings;
  }
  const cpp = ruleset.clock.clocksPerPixel;
  const hPeriod = summary.hsync.periodMax || mode.h.total * cpp;
  findings.push(...syncFindings("hsync", summary.hsync, mode, cpp, hPeriod));

  if (!hasEdges(summary.vsync)) {
    findings.push({
      step: "simulation", rule: "video.vsync.missing", verdict: "fail", title: "vsync present",
      measured: `${summary.vsync.warmupEdges} edges`, limit: "a pulse every frame",
      evidence: `no vsync edge in the first ${summary.vsync.warmupClocks} clocks after reset; no frames could be captured`,
      advice: "drive the vsync pin with a pulse every frame",
    });
    return findings;
  }
  findings.push(...syncFindings("vsync", summary.vsync, mode, cpp, hPeriod));

  if (summary.linesPerFrame.frames > 0) {
    findings.push(exact("video.frame.lines", "lines per frame", summary.linesPerFrame.min, summary.linesPerFrame.max, mode.v.total, "lines", {
      evidence: `hsync pulses counted between vsync pulses over ${summary.linesPerFrame.frames} frames`,
    }));
  }
  findings.push(...rateFindings(summary, ruleset, mode));
  const b = summary.blanking;
  findings.push({
    step: "simulation", rule: "video.blanking.colour", verdict: b.colourClocks === 0 ? "pass" : "fail",
    title: "no colour during blanking",
    measured: `${b.colourClocks} clocks`, limit: "0 clocks",
    evidence: b.colourClocks === 0 ? undefined
      : `first in frame ${b.firstFrame + 1}, line ${b.firstLine} after vsync, ${b.firstHpos} clocks after hsync (colour #${b.firstColour.toString(16).padStart(6, "0")} in channel steps)`,
    advice: b.colourClocks === 0 ? undefined : `drive red, green and blue to 0 outside the ${mode.h.active}×${mode.v.active} active area`,
  });
  const complete = summary.status === "ok" && summary.framesCaptured >= framesRequested;
  findings.push({
    step: "simulation", rule: "video.frames.rendered", verdict: complete ? "pass" : "fail",
    title: "frames rendered",
    measured: summary.framesCaptured, limit: framesRequested,
    evidence: STATUS_TEXT[summary.status],
  });
  return findings;
}
