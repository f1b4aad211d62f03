import { copyFileSync, existsSync, lstatSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { dirname, isAbsolute, join, normalize } from "node:path";
import type { Readable } from "node:stream";
import { pinsByRole, type Ruleset } from "~/rules/ruleset";
import { videoMode } from "~/rules/video-modes";
import { runSandboxed, type SandboxResult } from "~/sandbox/sandbox.server";
import { edgeModeHeader, edgeModeOf, type EdgeMode } from "./edge-mode";
import { generateHarness } from "./harness";
import { cachedModel, modelKey, placeModel, storeModel } from "./model-cache.server";
import { PCH_HEADER, PCH_MOUNT, RUNTIME_OBJECTS, verilatorPch, verilatorRuntime } from "./runtime-cache.server";
import { parseHarnessSummary, type HarnessSummary } from "./summary";

/**
 * Compiles a design with verilator and runs the generated harness, both inside the sandbox with the
 * ruleset's limits. A design that fails to build, or is killed at a limit, is an outcome (it becomes a
 * finding), not an exception; exceptions are for bad calls and a broken environment.
 */
export class SimulationInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SimulationInputError";
  }
}

export interface SimulationRequest {
  sourceDir: string;
  /** Paths relative to sourceDir, in the order verilator should read them. */
  verilogFiles: string[];
  ruleset: Ruleset;
  /** Empty or missing folder owned by this run. */
  workDir: string;
  frames?: number;
  /** Evaluate the falling clock edge even when the model shows it changes nothing (to check that shortcut). */
  forceBothEdges?: boolean;
  /** true always makes the profile-guided build, false never; "auto" (the default) when the run is long enough to pay for it */
  profileGuided?: boolean | "auto";
  /** false compiles even when the model cache has this model, and stores nothing (for measuring builds) */
  useModelCache?: boolean;
  /** the model cache's folder (default: MODEL_CACHE_DIR, shared by every build on this machine) */
  modelCacheDir?: string;
  /**
   * Frames after the loop point the harness still sends (marked as tail), so a flash window that wraps around the
   * loop point is seen; default 0.
   */
  tailFrames?: number;
  /**
   * Called when the run starts with the harness's frame stream (frame-stream.ts), which it must read to the end;
   * the harness waits while it is not read. Without it the frames are read and dropped.
   */
  onFrameStream?: (stream: Readable) => Promise<unknown>;
}

export interface SimulationRun {
  summary: HarnessSummary;
  pcmPath: string;
  /** the most frames the run was allowed (the set frames, or the whole-demo limit) */
  maxFrames: number;
  compileMs: number;
  runMs: number;
  /** whether the falling clock edge was evaluated too (edge-mode.ts) */
  edgeMode: EdgeMode;
  /** whether the model was compiled with a profile of its own first frames */
  profileGuided: boolean;
  /** whether the compiled model came from the model cache (model-cache.server.ts) instead of a C++ build */
  modelCached: boolean;
}

export type SimulationFailureStage = "compile" | "run";
export type SimulationFailureReason = "failed" | "timeout" | "cpu-limit";

export type SimulationOutcome =
  | { ok: true; run: SimulationRun }
  | { ok: false; stage: SimulationFailureStage; reason: SimulationFailureReason; limitSeconds: number; log: string };

/** Bytes of one captured RGB frame in the ruleset's video mode. */
function frameBytes(ruleset: Ruleset): number {
  const mode = videoMode(ruleset.videoMode);
  return mode.h.active * mode.v.active * 3;
}

function safeRelative(path: string): string {
  const n = normalize(path);
  if (isAbsolute(n) || n.startsWith("..") || n.includes("\0")) {
    throw new SimulationInputError(`source path "${path}" must stay inside the source folder`);
  }
  return n;
}

function classify(result: SandboxResult): SimulationFailureReason | null {
  if (result.timedOut) return "timeout";
  if (result.signal === "SIGXCPU" || result.signal === "SIGKILL") return "cpu-limit";
  if (result.exitCode !== 0) return "failed";
  return null;
}

function tail(text: string, max = 4000): string {
  return text.length > max ? `…${text.slice(-max)}` : text;
}

export function verilatorArgs(ruleset: Ruleset, sources: string[]): string[] {
  // Flags from EDA.md, without --build: make runs separately so prebuilt runtime objects can be dropped in.
  return [
    // --savable: the harness saves the model's complete state at each frame start to find where the demo loops
    "--cc", "--exe", "--savable", "-O3", "--x-assign", "fast", "--x-initial", "fast", "--noassert", "-Wno-fatal",
    "--top-module", ruleset.topModule, "--prefix", "Vtop", "-Mdir", "obj", ...sources, "harness.cpp",
  ];
}

// Arguments reach verilator through "$@", never through the shell's parser.
const VERILATE_SCRIPT = 'verilator "$@"';

/**
 * C++ flags for the model and the harness. -O3 and the build machine's own instruction set (the binary
 * never leaves it); SLP vectorisation is off because it merges the model's one-byte copies of the clock
 * and reset into one wider load right after the harness stored the clock byte, and that load cannot be
 * forwarded from the store: a stall on every evaluation, measured at a fifth of the cycle on small designs
 * (npm run bench -- simulation).
 */
export const MODEL_CXX_FLAGS = "-O3 -march=native -fno-tree-slp-vectorize";
/** For verilator's runtime library (verilated.o), which verilator builds with -Os by default. */
export const RUNTIME_CXX_FLAGS = "-O2 -march=native";

// The runtime objects are copied after verilator has written obj/Vtop.mk, which they must be newer than.
const COPY_RUNTIME = `{ [ ! -d runtime ] || cp ${RUNTIME_OBJECTS.map((n) => `runtime/${n}`).join(" ")} obj/; }`;
const make = (fast: string, extra = "") =>
  `make -s -C obj -f Vtop.mk -j 2 OPT_FAST="${MODEL_CXX_FLAGS} ${fast}" OPT_GLOBAL="${RUNTIME_CXX_FLAGS}" ${extra}`.trim();
const CLEAN_OBJECTS = "rm -f obj/*.o obj/*.a obj/Vtop";

/**
 * Profile-guided build, measured at about a third faster on designs with case tables (their nested
 * branches are laid out for the paths the picture takes): an instrumented build runs PROFILE_FRAMES frames,
 * then everything is compiled again with the profile. A profiling run that fails only costs the profile.
 * It costs two more compiles without the precompiled header and a profiling run — measured at about five plain
 * builds' time on the demo designs — and saves a quarter to a half of the run, so it is made only when the run is
 * estimated at PROFILE_PAYS_AFTER_BUILDS plain builds or more. Demo-length captures (a second of picture) never are.
 */
const PROFILE_FRAMES = 2;
const PROFILE_PAYS_AFTER_BUILDS = 12;
/** Before a model has run, its speed is taken as EDA.md's measurement on a small design here (29–42 M cycles/s). */
const ASSUMED_CYCLES_PER_SECOND = 30e6;
const PROFILE_BUILD = `${CLEAN_OBJECTS} && ${COPY_RUNTIME} && ${make("-fprofile-generate", "LDFLAGS=-fprofile-generate")}`;
const FINAL_BUILD = `${CLEAN_OBJECTS} && ${COPY_RUNTIME} && ${make("-fprofile-use -fprofile-correction -Wno-missing-profile")}`;
const plainBuild = (pch: boolean) => `${COPY_RUNTIME} && ${make(pch ? `-include ${PCH_HEADER}` : "")}`;

/** The fast-path model source verilator wrote (never the __Slow files), for edgeModeOf. */
function modelSource(objDir: string): string {
  return readdirSync(objDir)
    .filter((name) => /^Vtop___024root__DepSet_\w+__0\.cpp$/.test(name))
    .map((name) => {
      const path = join(objDir, name);
      // written by a sandboxed process: only plain, reasonably sized files are read
      const st = lstatSync(path);
      return st.isFile() && st.size < 64 * 1024 * 1024 ? readFileSync(path, "utf8") : "";
    })
    .join("\n");
}

/** Builds the runtime objects and the precompiled header now, so the first check run does not wait for them. */
export async function warmBuildTools(): Promise<void> {
  await Promise.all([verilatorRuntime(RUNTIME_CXX_FLAGS), verilatorPch(MODEL_CXX_FLAGS)]);
}

/** Frames a second at the ruleset's clock and video mode (before any measurement). */
export function nominalFrameRate(ruleset: Ruleset): number {
  const mode = videoMode(ruleset.videoMode);
  return ruleset.clock.frequencyHz / (mode.h.total * ruleset.clock.clocksPerPixel * mode.v.total);
}

/** The most frames a capture runs: the frames asked for, else the ruleset's, else maxRunSeconds of picture. */
export function captureFrameLimit(ruleset: Ruleset, frames?: number | null): number {
  return frames ?? ruleset.simulation.frames ?? Math.ceil(ruleset.simulation.maxRunSeconds * nominalFrameRate(ruleset));
}

/** Seconds of wall time the sandboxed run may take: the ruleset's limit, and at least enough for the frame limit. */
export function runWallSeconds(ruleset: Ruleset, maxFrames: number): number {
  // small designs simulate faster than real time (EDA.md: 1.2–1.7× at 25.175 MHz); four times the picture's length leaves
  // room for a slow design, a board clock twice as fast, and the encoder holding the harness back
  return Math.max(ruleset.simulation.runSeconds, Math.ceil((4 * maxFrames) / nominalFrameRate(ruleset)) + 30);
}

/** Whether a profile-guided build pays for a run of `frames` frames, given what a plain build of it costs. */
export function profilePays(ruleset: Ruleset, frames: number, plainBuildMs: number): boolean {
  const mode = videoMode(ruleset.videoMode);
  const runSeconds = (frames * mode.h.total * ruleset.clock.clocksPerPixel * mode.v.total) / ASSUMED_CYCLES_PER_SECOND;
  return runSeconds * 1000 >= PROFILE_PAYS_AFTER_BUILDS * plainBuildMs;
}

export async function simulateDesign(req: SimulationRequest): Promise<SimulationOutcome> {
  const { ruleset } = req;
  const frames = captureFrameLimit(ruleset, req.frames);
  if (!Number.isInteger(frames) || frames < 1 || frames > 36_000) throw new SimulationInputError(`frames must be a whole number from 1 to 36000, not ${frames}`);
  if (req.verilogFiles.length === 0) throw new SimulationInputError("no Verilog files to simulate");
  const buildDir = join(req.workDir, "build");
  rmSync(buildDir, { recursive: true, force: true });
  mkdirSync(join(buildDir, "src"), { recursive: true });
  mkdirSync(join(buildDir, "out"));

  const sources = req.verilogFiles.map((file) => {
    const rel = safeRelative(file);
    const from = join(req.sourceDir, rel);
    if (!existsSync(from)) throw new SimulationInputError(`source file "${file}" does not exist`);
    const to = join(buildDir, "src", rel);
    mkdirSync(dirname(to), { recursive: true });
    copyFileSync(from, to);
    return `src/${rel}`;
  });
  const harness = generateHarness(ruleset);
  writeFileSync(join(buildDir, "harness.cpp"), harness);

  const [runtime, pch] = await Promise.all([verilatorRuntime(RUNTIME_CXX_FLAGS), verilatorPch(MODEL_CXX_FLAGS)]);
  if (runtime) {
    mkdirSync(join(buildDir, "runtime"));
    for (const name of RUNTIME_OBJECTS) copyFileSync(join(runtime, name), join(buildDir, "runtime", name));
  }
  const memoryBytes = ruleset.simulation.memoryMb * 1024 * 1024;
  const compileLimits = (seconds: number) => ({ wallSeconds: seconds, cpuSeconds: seconds, memoryBytes: Math.max(memoryBytes, 1024 * 1024 * 1024) });
  const verilate = await runSandboxed({
    command: "/bin/sh",
    args: ["-c", VERILATE_SCRIPT, "sh", ...verilatorArgs(ruleset, sources)],
    buildDir,
    limits: compileLimits(ruleset.simulation.compileSeconds),
  });
  let compile = verilate;
  let edgeMode: EdgeMode = "both-edges";
  let profileGuided = false;
  let modelCached = false;
  if (!classify(verilate)) {
    const objDir = join(buildDir, "obj");
    if (!req.forceBothEdges) edgeMode = edgeModeOf(modelSource(objDir), pinsByRole(ruleset, "clock")[0].name, pinsByRole(ruleset, "reset")[0]?.name ?? null);
    const edgeHeader = edgeModeHeader(edgeMode);
    writeFileSync(join(buildDir, "gc_edge.h"), edgeHeader);
    const started = Date.now() - verilate.durationMs;
    const left = () => Math.max(1, ruleset.simulation.compileSeconds - Math.ceil((Date.now() - started) / 1000));
    const step = (script: string, readOnly?: { host: string; inside: string }[]) =>
      runSandboxed({ command: "/bin/sh", args: ["-c", script], buildDir, limits: compileLimits(left()), readOnly });
    const useCache = req.useModelCache !== false;
    // taken now, before anything of this build has run
    const inputs = [{ name: "harness.cpp", bytes: harness }, { name: "gc_edge.h", bytes: edgeHeader }, { name: "runtime", bytes: runtime ? "prebuilt" : "built here" }];
    const keyOf = (flavour: string) => modelKey(objDir, inputs, `${flavour} ${MODEL_CXX_FLAGS} ${RUNTIME_CXX_FLAGS}`);
    const binary = join(objDir, "Vtop");

    // both keys before anything is built: the key hashes objDir, which a plain build fills with its objects
    const plainKey = keyOf("plain");
    const profiledKey = keyOf("profile-guided");
    let plain = useCache ? cachedModel(plainKey, req.modelCacheDir) : null;
    if (plain) {
      placeModel(plain, binary);
      modelCached = true;
    } else {
      const makeStarted = Date.now();
      compile = await step(plainBuild(pch !== null), pch ? [{ host: pch, inside: PCH_MOUNT }] : undefined);
      if (!classify(compile)) {
        plain = { binary, buildMs: Date.now() - makeStarted };
        if (useCache) storeModel(plainKey, binary, plain.buildMs, req.modelCacheDir);
      }
    }
    const wantProfile = req.profileGuided === true || ((req.profileGuided ?? "auto") === "auto" && plain !== null && profilePays(ruleset, frames, plain.buildMs));
    if (plain && wantProfile) {
      const cached = useCache ? cachedModel(profiledKey, req.modelCacheDir) : null;
      if (cached) {
        placeModel(cached, binary);
        profileGuided = true;
        modelCached = true;
      } else {
        modelCached = false;
        const makeStarted = Date.now();
        compile = await step(PROFILE_BUILD);
        if (!classify(compile)) {
          mkdirSync(join(buildDir, "profile"));
          const seconds = Math.min(20, left());
          const profiled = await runSandboxed({
            command: "/build/obj/Vtop", args: [String(PROFILE_FRAMES), "/build/profile"], buildDir,
            limits: { wallSeconds: seconds, cpuSeconds: seconds, memoryBytes, fileSizeBytes: (PROFILE_FRAMES + 1) * (frameBytes(ruleset) + 16) + 64 * 1024 * 1024 },
            maxOutputBytes: 64 * 1024,
          });
          profileGuided = !classify(profiled);
          compile = await step(FINAL_BUILD);
          if (!classify(compile) && profileGuided && useCache) storeModel(profiledKey, binary, Date.now() - makeStarted, req.modelCacheDir);
        }
      }
    }
    compile = { ...compile, durationMs: Date.now() - started };
  }
  const compileFailure = classify(compile);
  if (compileFailure) {
    return { ok: false, stage: "compile", reason: compileFailure, limitSeconds: ruleset.simulation.compileSeconds, log: tail(compile.stderr || compile.stdout) };
  }

  const wallSeconds = runWallSeconds(ruleset, frames);
  let frameStream: Readable | null = null;
  const running = runSandboxed({
    command: "/build/obj/Vtop",
    // the harness ends by itself a little before the sandbox would kill it, keeping what it has
    args: [String(frames), "/build/out", String(req.tailFrames ?? 0), "3", String(Math.max(1, wallSeconds - 10))],
    buildDir,
    limits: {
      wallSeconds,
      cpuSeconds: wallSeconds,
      memoryBytes,
      // frames are not written to disk; this bounds the saved states and the audio
      fileSizeBytes: 1_000_000_000,
    },
    maxOutputBytes: 256 * 1024,
    pipes: { fd3: true },
    onStreams: (io) => { frameStream = io.fd3; },
  });
  const stream = frameStream as Readable | null;
  if (!stream) throw new Error("the sandbox gave no frame stream");
  // the reader consumes frames as they are written; the run is awaited even when the reader fails
  const reading = req.onFrameStream ? req.onFrameStream(stream) : (async () => { for await (const _ of stream) void _; })();
  const [ran, watched] = await Promise.allSettled([running, reading.finally(() => stream.destroy())]);
  if (ran.status === "rejected") throw ran.reason;
  if (watched.status === "rejected") throw watched.reason;
  const run = ran.value;
  const runFailure = classify(run);
  const summaryPath = join(buildDir, "out", "summary.json");
  if (runFailure || !existsSync(summaryPath)) {
    return { ok: false, stage: "run", reason: runFailure ?? "failed", limitSeconds: wallSeconds, log: tail(run.stderr || run.stdout) };
  }
  return {
    ok: true,
    run: {
      summary: parseHarnessSummary(readFileSync(summaryPath, "utf8")),
      maxFrames: frames,
      pcmPath: join(buildDir, "out", "audio.pcm"),
      compileMs: compile.durationMs,
      edgeMode,
      profileGuided,
      modelCached,
      runMs: run.durationMs,
    },
  };
}
