import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { videoMode } from "~/rules/video-modes";
import { audioFigures, encodeWav, pcmFromBuffer, waveformSvg, type AudioFigures } from "./audio";
import { simulateDesign, type SimulationFailureReason, type SimulationFailureStage } from "./build.server";
import type { LumaSequence } from "./compare";
import type { EdgeMode } from "./edge-mode";
import { encodePreview } from "./encode.server";
import { flashFindings, type FlashReport } from "./flash";
import { COMPARE_GRID, FrameDigest } from "./frame-digest";
import { followFrames, RawFrameFile } from "./frame-file.server";
import { encodePng, thumbnailSheet } from "./frames";
import { AUDIO_SAMPLE_RATE } from "./harness";
import { measureVideo, timingFindings, type VideoTiming } from "./timing";

/**
 * The reference capture: simulate the design from reset, judge its video timing, and render what every
 * judge sees the same way (stills, contact sheet, WAV, waveform, optional preview videos), with flash
 * safety and simulation speed. Storing the files is the caller's job; they are left in workDir.
 */
export interface ReferenceCaptureRequest {
  sourceDir: string;
  verilogFiles: string[];
  ruleset: Ruleset;
  workDir: string;
  frames?: number;
  encode?: boolean;
  /** see SimulationRequest */
  forceBothEdges?: boolean;
  profileGuided?: boolean | "auto";
  /** The first frame as a PNG, as soon as it is drawn (the run goes on meanwhile), e.g. to show it early. */
  onFirstFrame?: (png: Buffer) => void;
}

export interface ReferenceCapture {
  findings: Finding[];
  video: VideoTiming | null;
  files: {
    firstFramePng: string | null;
    contactSheetPng: string | null;
    wav: string | null;
    waveformSvg: string | null;
    webm?: string;
    mp4?: string;
  };
  audio: AudioFigures | null;
  speed: {
    cycles: number;
    /** the model loop alone, measured inside the harness (wall and CPU) */
    seconds: number;
    cpuSeconds: number;
    cyclesPerSecond: number;
    /** cyclesPerSecond against the ruleset clock: 1 = as fast as the real chip */
    realTimeMultiple: number;
    /** wall time of the verilator build and of the sandboxed run, as seen from outside */
    buildMs: number;
    runMs: number;
    /** "rising-only" when the falling clock edge could be skipped (edge-mode.ts) */
    edgeMode: EdgeMode;
    profileGuided: boolean;
    /** the compiled model came from the model cache */
    modelCached: boolean;
  } | null;
  flash: FlashReport | null;
  /** 32×24 luma per frame, for comparing an uploaded capture (compare-video.server.ts) */
  referenceLuma: LumaSequence | null;
}

const FAILURE_TEXT: Record<SimulationFailureStage, Record<SimulationFailureReason, string>> = {
  compile: {
    failed: "verilator could not build the design",
    timeout: "the build did not finish within the compile limit and was stopped",
    "cpu-limit": "the build used up its CPU time and was stopped",
  },
  run: {
    failed: "the simulated design stopped with an error",
    timeout: "the simulation did not finish within the run limit and was stopped",
    "cpu-limit": "the simulation used up its CPU time and was stopped",
  },
};

function emptyCapture(findings: Finding[]): ReferenceCapture {
  return {
    findings,
    video: null,
    files: { firstFramePng: null, contactSheetPng: null, wav: null, waveformSvg: null },
    audio: null,
    speed: null,
    flash: null,
    referenceLuma: null,
  };
}

export async function runReferenceCapture(req: ReferenceCaptureRequest): Promise<ReferenceCapture> {
  const { ruleset } = req;
  const frames = req.frames ?? ruleset.simulation.frames;
  const mode = videoMode(ruleset.videoMode);
  // frames are digested while the simulation runs (second core); the nominal frame rate is replaced by the
  // measured one once the run is over
  const nominalFps = ruleset.clock.frequencyHz / (mode.h.total * ruleset.clock.clocksPerPixel * mode.v.total);
  let firstPng: Buffer | null = null;
  const digest = new FrameDigest(mode.h.active, mode.v.active, frames, ruleset.flashCheck.enabled ? nominalFps : null);
  const outcome = await simulateDesign({
    ...req,
    frames,
    watchFrames: (path, ended) => followFrames(path, mode.h.active, mode.v.active, ended, (img, i) => {
      digest.push(img, i);
      if (i === 0) {
        firstPng = encodePng(img); // while the run goes on; written out after it
        req.onFirstFrame?.(firstPng);
      }
    }),
  });
  if (!outcome.ok) {
    const timedOut = outcome.reason !== "failed";
    return emptyCapture([{
      step: "simulation",
      rule: outcome.stage === "compile" ? "simulation.compile" : "simulation.run",
      verdict: "fail",
      title: outcome.stage === "compile" ? "design builds with verilator" : "simulation runs",
      measured: FAILURE_TEXT[outcome.stage][outcome.reason],
      limit: timedOut ? `${outcome.limitSeconds} s` : null,
      evidence: outcome.log.slice(-1500),
      advice: timedOut ? "look for loops or constant functions that take very long to evaluate" : undefined,
    }]);
  }

  const { summary, framesPath, pcmPath } = outcome.run;
  const outDir = join(req.workDir, "build", "out");
  const findings = timingFindings(summary, ruleset, frames);
  const video = measureVideo(summary, ruleset);
  const cyclesPerSecond = summary.seconds > 0 ? summary.cycles / summary.seconds : 0;
  const capture: ReferenceCapture = {
    ...emptyCapture(findings),
    video,
    speed: {
      cycles: summary.cycles,
      seconds: summary.seconds,
      cpuSeconds: summary.cpuSeconds,
      cyclesPerSecond,
      realTimeMultiple: cyclesPerSecond / ruleset.clock.frequencyHz,
      buildMs: outcome.run.compileMs,
      runMs: outcome.run.runMs,
      edgeMode: outcome.run.edgeMode,
      profileGuided: outcome.run.profileGuided,
      modelCached: outcome.run.modelCached,
    },
  };

  const pcm = pcmFromBuffer(readFileSync(pcmPath));
  capture.audio = audioFigures(pcm, AUDIO_SAMPLE_RATE);
  capture.files.wav = join(outDir, "audio.wav");
  writeFileSync(capture.files.wav, encodeWav(pcm, AUDIO_SAMPLE_RATE));
  capture.files.waveformSvg = join(outDir, "waveform.svg");
  writeFileSync(capture.files.waveformSvg, waveformSvg(pcm, AUDIO_SAMPLE_RATE));

  const fps = summary.vsync.periodMax ? ruleset.clock.frequencyHz / summary.vsync.periodMax : nominalFps;
  if (firstPng) {
    capture.files.firstFramePng = join(outDir, "first-frame.png");
    writeFileSync(capture.files.firstFramePng, firstPng);
    const file = new RawFrameFile(framesPath, mode.h.active, mode.v.active);
    try {
      capture.files.contactSheetPng = join(outDir, "contact-sheet.png");
      writeFileSync(capture.files.contactSheetPng, encodePng(thumbnailSheet(digest.thumbnails((i) => file.read(i)))));
    } finally {
      file.close();
    }
    capture.referenceLuma = { ...COMPARE_GRID, fps, frames: digest.luma };
    capture.flash = digest.flashReport(fps);
    if (capture.flash) findings.push(...flashFindings(capture.flash, ruleset, "reference capture", mode.h.active, mode.v.active));
  }

  if (req.encode && digest.count > 0) {
    const preview = await encodePreview({
      framesPath, wavPath: capture.files.wav, width: mode.h.active, height: mode.v.active,
      frameRate: `${Math.round(ruleset.clock.frequencyHz)}/${summary.vsync.periodMax}`,
      frames: digest.count, durationSeconds: digest.count / fps,
    });
    capture.files.webm = preview.webm;
    capture.files.mp4 = preview.mp4;
  }
  return capture;
}
