import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { videoMode, type VideoMode } from "~/rules/video-modes";
import type { HarnessSummary, SyncMeasurement } from "./summary";

/** Judges the harness's raw sync measurements against the ruleset's video mode. */
export type Polarity = "negative" | "positive";

export interface VideoTiming {
  hsync: { periodClocks: number | null; pulseClocks: number | null; polarity: Polarity | null };
  vsync: { periodLines: number | null; pulseLines: number | null; polarity: Polarity | null };
  linesPerFrame: number | null;
  framesRendered: number;
  frameRateHz: number | null;
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

function syncFindings(kind: "hsync" | "vsync", sync: SyncMeasurement, mode: VideoMode, hPeriod: number): Finding[] {
  const std = kind === "hsync" ? mode.h : mode.v;
  const scale = kind === "hsync" ? 1 : hPeriod;
  const unit = kind === "hsync" ? "clocks" : "lines";
  const out: Finding[] = [];
  if (sync.periods > 0) {
    out.push(exact(`video.${kind}.period`, `${kind} period`, sync.periodMin / scale, sync.periodMax / scale, std.total, unit, {
      evidence: `${sync.periods} periods measured between leading edges`,
      advice: `one ${kind === "hsync" ? "line" : "frame"} must last exactly ${std.total} ${unit}`,
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
  const hPeriod = summary.hsync.periodMax || mode.h.total;
  findings.push(...syncFindings("hsync", summary.hsync, mode, hPeriod));

  if (!hasEdges(summary.vsync)) {
    findings.push({
      step: "simulation", rule: "video.vsync.missing", verdict: "fail", title: "vsync present",
      measured: `${summary.vsync.warmupEdges} edges`, limit: "a pulse every frame",
      evidence: `no vsync edge in the first ${summary.vsync.warmupClocks} clocks after reset; no frames could be captured`,
      advice: "drive the vsync pin with a pulse every frame",
    });
    return findings;
  }
  findings.push(...syncFindings("vsync", summary.vsync, mode, hPeriod));

  if (summary.linesPerFrame.frames > 0) {
    findings.push(exact("video.frame.lines", "lines per frame", summary.linesPerFrame.min, summary.linesPerFrame.max, mode.v.total, "lines", {
      evidence: `hsync pulses counted between vsync pulses over ${summary.linesPerFrame.frames} frames`,
    }));
  }
  if (summary.vsync.periods > 0) {
    const measured = ruleset.clock.frequencyHz / summary.vsync.periodMax;
    const standard = mode.pixelClockHz / (mode.h.total * mode.v.total);
    const offPct = (100 * Math.abs(measured - standard)) / standard;
    findings.push({
      step: "simulation", rule: "video.frame.rate", verdict: offPct <= ruleset.clock.tolerancePct ? "pass" : "fail",
      title: "frame rate at the ruleset clock",
      measured: `${measured.toFixed(3)} Hz`, limit: `${standard.toFixed(3)} Hz ± ${ruleset.clock.tolerancePct} %`,
      evidence: `${summary.vsync.periodMax} clocks per frame at ${(ruleset.clock.frequencyHz / 1e6).toFixed(3)} MHz`,
    });
  }
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
