import { execFileSync } from "node:child_process";
import { chmodSync, copyFileSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET, rulesetSchema, type Ruleset } from "~/rules/ruleset";
import { pcmFromBuffer } from "./audio";
import { runReferenceCapture, type ReferenceCapture } from "./capture.server";

/**
 * Whole-demo captures with real verilator and ffmpeg builds of tests/fixtures/designs/gc_loop.v, whose loop length
 * is set by a define, so the expected loop is known: frames and seconds follow from VESA DMT 640×480 @ 60 Hz
 * (800 × 525 = 420 000 clocks a frame at 25.175 MHz, 59.94 Hz). The runs are kept to a few seconds of picture.
 */
const FIXTURE = resolve(__dirname, "../../tests/fixtures/designs/gc_loop.v");
const FRAME_CLOCKS = 800 * 525; // VESA DMT 640×480 @ 60 Hz
const FPS = 25_175_000 / FRAME_CLOCKS;
const root = mkdtempSync(join(tmpdir(), "gc-whole-"));
chmodSync(root, 0o755); // the sandbox user must reach the build folders
afterAll(() => rmSync(root, { recursive: true, force: true }));

function withSimulation(sim: Partial<Ruleset["simulation"]>, more: Partial<Ruleset> = {}): Ruleset {
  return rulesetSchema.parse({ ...DEMO_RULESET, ...more, simulation: { ...DEMO_RULESET.simulation, ...sim } });
}

async function capture(name: string, defines: string, ruleset: Ruleset, opts: { frames?: number; encode?: boolean } = {}): Promise<ReferenceCapture> {
  const src = join(root, name, "src");
  mkdirSync(src, { recursive: true });
  writeFileSync(join(src, "defines.v"), `${defines}\n`);
  copyFileSync(FIXTURE, join(src, "design.v"));
  return runReferenceCapture({ sourceDir: src, verilogFiles: ["defines.v", "design.v"], ruleset, workDir: join(root, name, "work"), frames: opts.frames, encode: opts.encode ?? false });
}

const probeSeconds = (file: string) => Number(JSON.parse(execFileSync("ffprobe", ["-v", "error", "-show_entries", "format=duration", "-of", "json", file]).toString()).format.duration);

const runs = new Map<string, ReferenceCapture>();
beforeAll(async () => {
  const whole = withSimulation({ frames: null, maxRunSeconds: 1 });
  const jobs: [string, () => Promise<ReferenceCapture>][] = [
    ["loop4", () => capture("loop4", "`define LOOP_FRAMES 4", whole, { encode: true })],
    ["never", () => capture("never", "`define NEVER_LOOP", whole)],
    // flashing starts at frame 130 (2.17 s) of a 200-frame loop: whole-demo mode must find it
    ["late", () => capture("late", "`define LOOP_FRAMES 200\n`define FLASH_AFTER 130", withSimulation({ frames: null, maxRunSeconds: 10 }))],
    ["lateCapped", () => capture("lateCapped", "`define LOOP_FRAMES 200\n`define FLASH_AFTER 130", whole, { frames: 60 })],
    // the RC low-pass well below the tone: 500 Hz against 1198.8 Hz
    ["rc", () => capture("rc", "`define LOOP_FRAMES 60", withSimulation({ frames: null, maxRunSeconds: 2 }, { audio: { lowPassHz: 500 } }))],
  ];
  // two at a time: the machine has two cores
  for (let i = 0; i < jobs.length; i += 2) await Promise.all(jobs.slice(i, i + 2).map(async ([n, job]) => runs.set(n, await job())));
}, 300_000);

describe("a demo that loops", () => {
  it("stops where the design's complete state repeats, and reports the loop", () => {
    const c = runs.get("loop4")!;
    expect(c.loop).toMatchObject({ detected: true, periodFrames: 4, firstLoopFrame: 0, framesCaptured: 4, stoppedBy: "loop" });
    expect(c.loop!.periodSeconds!).toBeCloseTo(4 / FPS, 6);
    expect(c.loop!.stateBytes).toBeGreaterThan(0);
    expect(c.findings.find((f) => f.rule === "simulation.loop")).toMatchObject({ verdict: "pass", measured: "4 frames (0.07 s)" });
    expect(c.loop!.statement).toBe("loops every 0.1 s; the whole loop was analysed");
  });

  it("judges flashes over the whole loop, wrapping round the loop point, though the loop is shorter than a second", () => {
    const c = runs.get("loop4")!;
    // the loop plus one second of its repeat: every one-second window of the endless demo (WCAG 2.2 SC 2.3.1)
    expect(c.flash!.framesAnalysed).toBe(4 + Math.ceil(FPS));
    expect(c.flashFigures).toMatchObject({ verdict: "pass", wholeDemo: true, span: "the whole 0.1 s loop", worstSecondFlashes: 0 });
    expect(c.flashFigures!.statement).toContain("in the whole 0.1 s loop");
  });

  it("makes the WAV and the preview videos exactly one loop long", () => {
    const c = runs.get("loop4")!;
    const samples = pcmFromBuffer(execFileSync("ffmpeg", ["-v", "error", "-i", c.files.wav!, "-f", "s16le", "-"]));
    // 48 000 samples a second over 4 frames of 420 000 clocks at 25.175 MHz
    expect(Math.abs(samples.length - (48_000 * 4) / FPS)).toBeLessThanOrEqual(2);
    for (const file of [c.files.webm!, c.files.mp4!]) {
      expect(probeSeconds(file)).toBeGreaterThan(0.05);
      expect(probeSeconds(file)).toBeLessThan(0.12);
    }
  });
});

describe("a demo that never loops", () => {
  it("runs until maxRunSeconds and says the first seconds were analysed, not the whole demo", () => {
    const c = runs.get("never")!;
    expect(c.loop).toMatchObject({ detected: false, periodFrames: null, stoppedBy: "max-run", framesCaptured: Math.ceil(FPS) });
    expect(c.loop!.statement).toBe("did not loop within 1 s; the first 1.0 s were analysed");
    expect(c.flashFigures).toMatchObject({ wholeDemo: false, verdict: "pass" });
    expect(c.flashFigures!.span).toBe("the first 1.0 s (the demo did not loop within 1 s)");
  });
});

describe("a demo that starts flashing after two seconds", () => {
  it("is flagged by the whole-demo capture, at the second it starts", () => {
    const c = runs.get("late")!;
    expect(c.loop).toMatchObject({ detected: true, periodFrames: 200 });
    // black and white every frame: 30 flashes a second, from frame 130 on (WCAG 2.2 SC 2.3.1 allows three)
    expect(c.flashFigures).toMatchObject({ verdict: "warn", wholeDemo: true, worstSecondFlashes: 30 });
    expect(c.flashFigures!.worstSecondAt!).toBeCloseTo(130 / FPS, 1);
    expect(c.findings.find((f) => f.rule === "flash.general")!.verdict).toBe("warn");
  });
  it("passes a capture capped at its first second, and the statement says it covers only that second", () => {
    const c = runs.get("lateCapped")!;
    expect(c.loop).toMatchObject({ detected: false, stoppedBy: "frames", framesCaptured: 60 });
    expect(c.flashFigures).toMatchObject({ verdict: "pass", wholeDemo: false });
    expect(c.flashFigures!.statement).toContain("in the first 1.0 s");
    expect(c.flashFigures!.statement).not.toContain("whole");
  });
});

describe("audio through the RC low-pass", () => {
  it("gives a 50 % square wave the fundamental and ripple the first-order RC formulas predict", () => {
    const c = runs.get("rc")!;
    const samples = pcmFromBuffer(execFileSync("ffmpeg", ["-v", "error", "-i", c.files.wav!, "-f", "s16le", "-"]));
    const fs = 48_000, f = 25_175_000 / 21_000, fc = 500;
    // skip the first 20 ms (the capacitor charging from 0: τ = 1/(2π·500) = 0.32 ms); use whole periods after it
    const from = Math.round(0.02 * fs);
    const periods = Math.floor(((samples.length - from) / fs) * f) - 1;
    const n = Math.floor((periods / f) * fs);
    const x = Array.from(samples.subarray(from, from + n), (s) => s / 32768);
    const mean = x.reduce((a, b) => a + b, 0) / n;
    let re = 0, im = 0;
    for (let i = 0; i < n; i++) { re += (x[i] - mean) * Math.cos((2 * Math.PI * f * i) / fs); im -= (x[i] - mean) * Math.sin((2 * Math.PI * f * i) / fs); }
    const fundamental = (2 / n) * Math.hypot(re, im);
    // Fourier series of a square wave: the fundamental of a ±1 square is 4/π (any signals-and-systems text; from memory).
    // A first-order RC low-pass passes it with |H| = 1/√(1 + (f/fc)²); averaging over a sample period (the WAV's
    // samples are means over 1/48 000 s) multiplies by sin(πf/fs)/(πf/fs).
    const sinc = Math.sin((Math.PI * f) / fs) / ((Math.PI * f) / fs);
    const expected = (4 / Math.PI) / Math.sqrt(1 + (f / fc) ** 2) * sinc;
    expect(Math.abs(fundamental - expected) / expected).toBeLessThan(0.02);
    // Time domain: a 50 % square wave of period T through an RC of time constant τ settles to a ripple of
    // tanh(T/(4τ)) of the step (the exponential charge and discharge of each half period; from memory), ×2 here.
    const tau = 1 / (2 * Math.PI * fc);
    const rippleExpected = 2 * Math.tanh(1 / f / (4 * tau));
    const ripple = Math.max(...x) - Math.min(...x);
    expect(Math.abs(ripple - rippleExpected) / rippleExpected).toBeLessThan(0.03);
    // a box-car average of the raw pin (the old WAV) would keep nearly the full ±1 swing
    expect(ripple).toBeLessThan(1.3);
    expect(c.findings.find((f) => f.rule === "audio.silence")!.verdict).toBe("pass");
    expect(c.findings.find((f) => f.rule === "audio.carrier")).toMatchObject({ verdict: "pass" });
  });
});
