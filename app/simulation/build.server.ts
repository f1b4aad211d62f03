import { copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { dirname, isAbsolute, join, normalize } from "node:path";
import type { Ruleset } from "~/conformance/ruleset";
import { runSandboxed, type SandboxResult } from "~/sandbox/sandbox.server";
import { generateHarness } from "./harness";
import { RUNTIME_OBJECTS, verilatorRuntime } from "./runtime-cache.server";
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
}

export interface SimulationRun {
  summary: HarnessSummary;
  framesPath: string;
  pcmPath: string;
  compileMs: number;
  runMs: number;
}

export type SimulationFailureStage = "compile" | "run";
export type SimulationFailureReason = "failed" | "timeout" | "cpu-limit";

export type SimulationOutcome =
  | { ok: true; run: SimulationRun }
  | { ok: false; stage: SimulationFailureStage; reason: SimulationFailureReason; limitSeconds: number; log: string };

const FRAME_BYTES = 640 * 480 * 3;

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
    "--cc", "--exe", "-O3", "--x-assign", "fast", "--x-initial", "fast", "--noassert", "-Wno-fatal",
    "--top-module", ruleset.topModule, "--prefix", "Vtop", "-Mdir", "obj", ...sources, "harness.cpp",
  ];
}

// Arguments reach verilator through "$@", never through the shell's parser. The runtime objects are
// copied after verilator has written obj/Vtop.mk, which they must be newer than. OPT_FAST=-O2 builds the
// model for speed rather than size.
const COMPILE_SCRIPT =
  'verilator "$@" && { [ ! -d runtime ] || cp runtime/verilated.o runtime/verilated_threads.o obj/; } && make -s -C obj -f Vtop.mk -j 2 OPT_FAST=-O2';

export async function simulateDesign(req: SimulationRequest): Promise<SimulationOutcome> {
  const { ruleset } = req;
  const frames = req.frames ?? ruleset.simulation.frames;
  if (!Number.isInteger(frames) || frames < 1 || frames > 600) throw new SimulationInputError(`frames must be a whole number from 1 to 600, not ${frames}`);
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
  writeFileSync(join(buildDir, "harness.cpp"), generateHarness(ruleset));

  const runtime = await verilatorRuntime();
  if (runtime) {
    mkdirSync(join(buildDir, "runtime"));
    for (const name of RUNTIME_OBJECTS) copyFileSync(join(runtime, name), join(buildDir, "runtime", name));
  }
  const memoryBytes = ruleset.simulation.memoryMb * 1024 * 1024;
  const compile = await runSandboxed({
    command: "/bin/sh",
    args: ["-c", COMPILE_SCRIPT, "sh", ...verilatorArgs(ruleset, sources)],
    buildDir,
    limits: {
      wallSeconds: ruleset.simulation.compileSeconds,
      cpuSeconds: ruleset.simulation.compileSeconds,
      memoryBytes: Math.max(memoryBytes, 1024 * 1024 * 1024),
    },
  });
  const compileFailure = classify(compile);
  if (compileFailure) {
    return { ok: false, stage: "compile", reason: compileFailure, limitSeconds: ruleset.simulation.compileSeconds, log: tail(compile.stderr || compile.stdout) };
  }

  const run = await runSandboxed({
    command: "/build/obj/Vtop",
    args: [String(frames), "/build/out"],
    buildDir,
    limits: {
      wallSeconds: ruleset.simulation.runSeconds,
      cpuSeconds: ruleset.simulation.runSeconds,
      memoryBytes,
      fileSizeBytes: Math.max(500_000_000, (frames + 1) * FRAME_BYTES),
    },
    maxOutputBytes: 256 * 1024,
  });
  const runFailure = classify(run);
  const summaryPath = join(buildDir, "out", "summary.json");
  if (runFailure || !existsSync(summaryPath)) {
    return { ok: false, stage: "run", reason: runFailure ?? "failed", limitSeconds: ruleset.simulation.runSeconds, log: tail(run.stderr || run.stdout) };
  }
  return {
    ok: true,
    run: {
      summary: parseHarnessSummary(readFileSync(summaryPath, "utf8")),
      framesPath: join(buildDir, "out", "frames.rgb"),
      pcmPath: join(buildDir, "out", "audio.pcm"),
      compileMs: compile.durationMs,
      runMs: run.durationMs,
    },
  };
}
