import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { videoMode } from "~/rules/video-modes";
import { audioFigures, audioFindings, encodeWav, pcmFromBuffer, waveformSvg, type AudioChecks, type AudioFigures } from "./audio";
import { captureFrameLimit, nominalFrameRate, simulateDesign, type SimulationFailureReason, type SimulationFailureStage } from "./build.server";
import type { LumaSequence } from "./compare";
import type { EdgeMode } from "./edge-mode";
import { startLiveEncode, type LiveEncoder } from "./encode.server";
import { captureSpan, flashFigures, flashFindings, type FlashFigures, type FlashReport } from "./flash";
import { COMPARE_GRID, FrameDigest } from "./frame-digest";
import { readFrameStream } from "./frame-stream";
import { encodePng, thumbnailSheet, type RgbImage } from "./frames";
import { AUDIO_SAMPLE_RATE } from "./harness";
import type { HarnessSummary } from "./summary";
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
  /** caps the capture at this many frames; without it the ruleset's frames, else the whole demo (loop or maxRunSeconds) */
  frames?: number | null;
  encode?: boolean;
  /** see SimulationRequest */
  forceBothEdges?: boolean;
  profileGuided?: boolean | "auto";
  /** The first frame as a PNG, as soon as it is drawn (the run goes on meanwhile), e.g. to show it early. */
  onFirstFrame?: (png: Buffer) => void;
  /** Every frame of the demo as it arrives (not the tail after the loop point); for tests and tools. */
  onFrame?: (img: RgbImage, index: number) => void;
}

/** Where the demo comes round again, as the report JSON carries it. */
export interface LoopReport {
  detected: boolean;
  /** frames from the loop's start to its repeat; null when no loop was found */
  periodFrames: number | null;
  periodSeconds: number | null;
  /** the frame (from 0, the first after reset) where the loop starts; frames before it are the intro */
  firstLoopFrame: number | null;
  /** frames and seconds of the demo that were captured and analysed */
  framesCaptured: number;
  capturedSeconds: number;
  /** why the capture ended: "loop", "frames" (the set cap), "max-run" (maxRunSeconds), "run-limit" (wall time), "sync" */
  stoppedBy: "loop" | "frames" | "max-run" | "run-limit" | "sync";
  /** bytes of the model's saved state compared at each frame start */
  stateBytes: number;
  /** the sentence for pages */
  statement: string;
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
  /** the flash verdict over the span analysed (flash.ts flashFigures) */
  flashFigures: FlashFigures | null;
  loop: LoopReport | null;
  audioChecks: AudioChecks | null;
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
    flashFigures: null,
    loop: null,
    audioChecks: null,
    referenceLuma: null,
  };
}

const seconds = (s: number) => `${s < 10 ? s.toFixed(1) : s.toFixed(s < 100 ? 1 : 0)} s`;

function loopReport(summary: HarnessSummary, fps: number, frameCap: number | null, maxRunSeconds: number): LoopReport {
  const found = summary.loop ?? { detected: false, firstLoopFrame: -1, periodFrames: 0, stateBytes: 0 };
  const captured = summary.framesCaptured;
  const capturedSeconds = captured / fps;
  const stoppedBy: LoopReport["stoppedBy"] = found.detected ? "loop" : summary.stoppedAtWallLimit ? "run-limit" : summary.status !== "ok" ? "sync" : frameCap !== null ? "frames" : "max-run";
  const periodSeconds = found.detected ? found.periodFrames / fps : null;
  const statement =
    stoppedBy === "loop"
      ? `loops every ${seconds(periodSeconds!)}${found.firstLoopFrame > 0 ? ` after a ${seconds(found.firstLoopFrame / fps)} intro` : ""}; the whole loop was analysed`
      : stoppedBy === "max-run"
        ? `did not loop within ${maxRunSeconds} s; the first ${seconds(capturedSeconds)} were analysed`
        : stoppedBy === "frames"
          ? `captured ${captured} frame${captured === 1 ? "" : "s"} as set (${seconds(capturedSeconds)}); no loop within them; the first ${seconds(capturedSeconds)} were analysed`
          : stoppedBy === "run-limit"
            ? `did not loop before the run time limit; the first ${seconds(capturedSeconds)} were analysed`
            : `the capture ended when the picture lost sync, after ${seconds(capturedSeconds)}`;
  return {
    detected: found.detected,
    periodFrames: found.detected ? found.periodFrames : null,
    periodSeconds,
    firstLoopFrame: found.detected ? found.firstLoopFrame : null,
    framesCaptured: captured,
    capturedSeconds,
    stoppedBy,
    stateBytes: found.stateBytes,
    statement,
  };
}

export async function runReferenceCapture(req: ReferenceCaptureRequest): Promise<ReferenceCapture> {
  const { ruleset } = req;
  const frameCap = req.frames ?? ruleset.simulation.frames;
  const maxFrames = captureFrameLimit(ruleset, req.frames);
  const mode = videoMode(ruleset.videoMode);
  const frameBytes = mode.h.active * mode.v.active * 3;
  // frames are digested while the simulation runs (second core); the nominal frame rate is replaced by the
  // measured one once the run is over
  const nominalFps = nominalFrameRate(ruleset);
  const flashOn = ruleset.flashCheck.enabled;
  let firstPng: Buffer | null = null;
  const digest = new FrameDigest(mode.h.active, mode.v.active, flashOn ? nominalFps : null, ruleset.flashCheck.viewing);
  const outDir = join(req.workDir, "build", "out");
  let encoder: LiveEncoder | null = null;
  const rate = `${Math.round(ruleset.clock.frequencyHz)}/${mode.h.total * ruleset.clock.clocksPerPixel * mode.v.total}`;
  // ffmpeg starts with the first frame, not before the build: it would hold its memory while the compiler runs
  const encodeStart = () => startLiveEncode({ dir: join(req.workDir, "encode"), width: mode.h.active, height: mode.v.active, frameRate: rate });
  const outcome = await simulateDesign({
    ...req,
    frames: maxFrames,
    // one second more after the loop point, so flash windows that wrap round it are counted
    tailFrames: flashOn ? Math.ceil(nominalFps) : 0,
    onFrameStream: (stream) => readFrameStream(stream, frameBytes, async (r) => {
      if (r.kind === "loop") return;
      const img = { width: mode.h.active, height: mode.v.active, data: r.data };
      if (r.kind === "tail") {
        digest.pushTail(img);
        return;
      }
      digest.push(img, r.index);
      req.onFrame?.(img, r.index);
      if (r.index === 0) {
        firstPng = encodePng(img); // while the run goes on; written out after it
        req.onFirstFrame?.(firstPng);
      }
      if (req.encode) {
        encoder ??= encodeStart();
        await encoder.write(r.data);
      }
    }),
  }).catch(async (e: unknown) => {
    await (encoder as LiveEncoder | null)?.abort();
    throw e;
  });
  if (!outcome.ok) {
    await (encoder as LiveEncoder | null)?.abort();
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

  const { summary, pcmPath } = outcome.run;
  // a demo that looped is complete at its loop point; otherwise every frame up to the limit was due
  const findings = timingFindings(summary, ruleset, summary.loop?.detected ? summary.framesCaptured : outcome.run.maxFrames);
  const video = measureVideo(summary, ruleset);
  const cyclesPerSecond = summary.seconds > 0 ? summary.cycles / summary.seconds : 0;
  const fps = summary.vsync.periodMax ? ruleset.clock.frequencyHz / summary.vsync.periodMax : nominalFps;
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
  const loop = loopReport(summary, fps, frameCap, ruleset.simulation.maxRunSeconds);
  capture.loop = loop;
  if (digest.count > 0) {
    findings.push({
      step: "simulation",
      rule: "simulation.loop",
      verdict: "pass",
      title: "The whole demo is captured up to its loop point",
      measured: loop.detected ? `${loop.periodFrames} frames (${loop.periodSeconds!.toFixed(2)} s)` : "no loop",
      limit: frameCap !== null ? `${frameCap} frames` : `${ruleset.simulation.maxRunSeconds} s`,
      evidence: `${loop.statement} (the design's complete state, ${loop.stateBytes} bytes, compared at every frame start)`,
    });
  }

  const pcm = pcmFromBuffer(readFileSync(pcmPath));
  capture.audio = audioFigures(pcm, AUDIO_SAMPLE_RATE);
  const hasAudioPin = ruleset.pins.some((p) => p.role === "audio");
  const audio = audioFindings(capture.audio, {
    risingEdges: summary.audio.risingEdges ?? 0,
    maxRisingEdgesPerFrame: summary.audio.maxRisingEdgesPerFrame ?? 0,
    lowPassHz: summary.audio.lowPassHz ?? ruleset.audio.lowPassHz,
  }, pcm, fps, hasAudioPin);
  capture.audioChecks = audio.checks;
  if (digest.count > 0) findings.push(...audio.findings);
  capture.files.wav = join(outDir, "audio.wav");
  writeFileSync(capture.files.wav, encodeWav(pcm, AUDIO_SAMPLE_RATE));
  capture.files.waveformSvg = join(outDir, "waveform.svg");
  writeFileSync(capture.files.waveformSvg, waveformSvg(pcm, AUDIO_SAMPLE_RATE));

  if (firstPng) {
    capture.files.firstFramePng = join(outDir, "first-frame.png");
    writeFileSync(capture.files.firstFramePng, firstPng);
    capture.files.contactSheetPng = join(outDir, "contact-sheet.png");
    writeFileSync(capture.files.contactSheetPng, encodePng(thumbnailSheet(digest.thumbnails())));
    capture.referenceLuma = { ...COMPARE_GRID, fps, frames: digest.luma };
    capture.flash = digest.flashReport(fps);
    if (capture.flash) {
      const stoppedBy = loop.stoppedBy === "max-run" ? `the demo did not loop within ${ruleset.simulation.maxRunSeconds} s` : loop.stoppedBy === "frames" ? "as many frames as set" : null;
      // with a loop, the analyser also saw the loop's start again (the tail): every window of the endless demo
      const span = captureSpan(loop.detected ? capture.flash.framesAnalysed / fps : loop.capturedSeconds, { detected: loop.detected, firstLoopFrame: loop.firstLoopFrame ?? 0, periodSeconds: loop.periodSeconds }, fps, stoppedBy);
      capture.flashFigures = flashFigures(capture.flash, ruleset, span);
      findings.push(...flashFindings(capture.flash, ruleset, "reference capture", mode.h.active, mode.v.active, span));
    }
  }

  const started = encoder as LiveEncoder | null;
  if (started) {
    if (digest.count > 0) {
      await started.finish();
      const preview = await started.mux(capture.files.wav, digest.count / fps);
      capture.files.webm = preview.webm;
      capture.files.mp4 = preview.mp4;
    } else {
      await started.abort();
    }
  }
  return capture;
}
