import { copyFile, mkdir, mkdtemp, readFile, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { worstVerdict, type Finding } from "~/rules/findings";
import { runSandboxed, type SandboxLimits } from "~/sandbox/sandbox.server";
import { dedupeFindings, definedMacros, mapPreprocessed, scanText } from "./precheck-rules";
import { scanVerilatorXml } from "./precheck-xml";
import { assertSandboxStarted, terminationSignal } from "./tool-run";

/**
 * The pre-check runs before any other tool reads an upload: verilator and yosys both execute or
 * follow things a design names ($system, $readmemh paths, `include), so those are refused first
 * on the raw text, then on the preprocessed text, then on verilator's elaborated tree.
 */
export interface PrecheckOptions {
  limits?: Partial<SandboxLimits>;
  /** Where fresh build folders are made; the system temp folder by default. */
  scratchDir?: string;
}

/** Process count stays at the sandbox default: RLIMIT_NPROC counts every process of the sandbox user, machine-wide. */
export const PRECHECK_LIMITS: Partial<SandboxLimits> = {
  cpuSeconds: 30,
  wallSeconds: 60,
  memoryBytes: 2_000_000_000,
  fileSizeBytes: 200_000_000,
};

const MAX_FINDINGS = 50;
const MAX_TOOL_OUTPUT = 16 * 1024 * 1024;
const SRC = "src";

export function precheckPassed(findings: Finding[]): boolean {
  return worstVerdict(findings.filter((f) => f.step === "precheck")) !== "fail";
}

/** Headers first (they stand in for `include), then the rest, each group in name order. */
export function compileOrder(verilogFiles: string[]): string[] {
  const sorted = [...verilogFiles].sort();
  return [...sorted.filter((f) => f.toLowerCase().endsWith(".vh")), ...sorted.filter((f) => !f.toLowerCase().endsWith(".vh"))];
}

export async function precheckSources(dir: string, verilogFiles: string[], options: PrecheckOptions = {}): Promise<Finding[]> {
  if (verilogFiles.length === 0) {
    return [fail("precheck.no-sources", "The bundle holds no Verilog (.v, .sv or .vh) files", "Add your design's source files to the bundle.")];
  }
  const raw = await scanRawSources(dir, verilogFiles);
  if (raw.length > 0) return raw;
  const expanded = await scanPreprocessedSources(dir, verilogFiles, options);
  if (expanded.length > 0) return expanded;
  const elaborated = await scanElaboratedSources(dir, verilogFiles, options);
  if (elaborated.length > 0) return elaborated;
  return [
    {
      step: "precheck",
      rule: "precheck.clean",
      verdict: "pass",
      title: "No system tasks, foreign imports or outside files",
      measured: `${verilogFiles.length} file(s)`,
    },
  ];
}

/** Stage (a): the upload's own text. No tool has read it yet. */
export async function scanRawSources(dir: string, verilogFiles: string[]): Promise<Finding[]> {
  const texts = await Promise.all(verilogFiles.map((f) => readFile(join(dir, f), "latin1")));
  const macros = definedMacros(texts);
  const raw = verilogFiles.flatMap((file, i) => scanText(texts[i], (line) => ({ file, line }), { macros, stage: "source" }));
  return capped(dedupeFindings(raw));
}

/** Stage (b): `verilator -E` in the sandbox, so names built by macro pasting show. Only after a clean stage (a). */
export async function scanPreprocessedSources(dir: string, verilogFiles: string[], options: PrecheckOptions = {}): Promise<Finding[]> {
  return withBuild(dir, verilogFiles, options, async (build, args, limits) => {
    const pre = await runSandboxed({ command: "verilator", args: ["-E", ...args], buildDir: build, limits, maxOutputBytes: MAX_TOOL_OUTPUT });
    const problem = toolProblem("precheck.preprocess", "verilator could not preprocess the sources", pre);
    if (problem) return [problem];
    const { text, where } = mapPreprocessed(pre.stdout, fromBuild);
    return capped(dedupeFindings(scanText(text, where, { macros: new Set(), stage: "preprocessed" })));
  });
}

/** Stage (c): `verilator --xml-only` in the sandbox; every module is elaborated, used or not. Only after clean (a) and (b). */
export async function scanElaboratedSources(dir: string, verilogFiles: string[], options: PrecheckOptions = {}): Promise<Finding[]> {
  return withBuild(dir, verilogFiles, options, async (build, args, limits) => {
    const tree = await runSandboxed({
      command: "verilator",
      args: ["--xml-only", "--xml-output", "/build/tree.xml", "-Mdir", "/build/obj", "-Wno-fatal", "-Wno-MULTITOP", ...args],
      buildDir: build,
      limits,
      maxOutputBytes: MAX_TOOL_OUTPUT,
    });
    const problem = toolProblem("precheck.elaborate", "verilator could not elaborate the design", tree);
    if (problem) return [problem];
    const xmlPath = join(build, "tree.xml");
    const xmlBytes = (await stat(xmlPath)).size;
    if (xmlBytes > MAX_TOOL_OUTPUT * 4) {
      return [fail("precheck.elaborate", "The elaborated design is far too large for an entry", "Shrink the design.", `${xmlBytes} bytes of netlist`)];
    }
    return capped(dedupeFindings(scanVerilatorXml(await readFile(xmlPath, "utf8"), fromBuild)));
  });
}

/** verilator names files as staged (src/…, maybe /build/src/…); one such prefix per mention is ours. */
function withUploadNames(text: string): string {
  return text.replace(/(^|[\s'"`(])(?:\/build\/)?src\//gm, "$1");
}

const fromBuild = (reported: string) => (reported.startsWith(`${SRC}/`) ? reported.slice(SRC.length + 1) : reported);

async function withBuild(
  dir: string,
  verilogFiles: string[],
  options: PrecheckOptions,
  run: (build: string, args: string[], limits: Partial<SandboxLimits>) => Promise<Finding[]>,
): Promise<Finding[]> {
  const order = compileOrder(verilogFiles);
  const build = await stageSources(dir, order, options.scratchDir);
  try {
    return await run(build, order.map((f) => `${SRC}/${f}`), { ...PRECHECK_LIMITS, ...options.limits });
  } finally {
    await rm(build, { recursive: true, force: true });
  }
}

/** A fresh build folder holding copies of the sources under src/. */
export async function stageSources(dir: string, files: string[], scratchDir?: string): Promise<string> {
  const build = await mkdtemp(join(scratchDir ?? tmpdir(), "gc-build-"));
  for (const file of files) {
    const target = join(build, SRC, file);
    await mkdir(dirname(target), { recursive: true });
    await copyFile(join(dir, file), target);
  }
  return build;
}

interface ToolRun {
  exitCode: number | null;
  signal: NodeJS.Signals | null;
  timedOut: boolean;
  stderr: string;
  truncated: boolean;
}

function toolProblem(rule: string, title: string, run: ToolRun): Finding | null {
  assertSandboxStarted(run);
  const signal = terminationSignal(run);
  if (run.timedOut || signal) {
    const why = run.timedOut ? "it ran past its time limit" : `it was stopped by ${signal} (CPU or memory limit)`;
    return fail(rule, `${title}: ${why}`, "Look for a generate loop, recursion or macro that never ends.");
  }
  if (run.truncated) return fail(rule, `${title}: its output is too large`, "Shrink the design or its macros.");
  if (run.exitCode !== 0) return fail(rule, title, "Fix the error verilator reports and upload again.", trimToolMessage(withUploadNames(run.stderr)));
  return null;
}

export function trimToolMessage(text: string, maxChars = 600): string {
  const lines = text
    .split("\n")
    .map((l) => l.trimEnd())
    .filter((l) => /^%(Error|Warning)|ERROR|error/i.test(l))
    .slice(0, 6);
  const message = lines.length > 0 ? lines.join("\n") : text.trim();
  return message.length > maxChars ? `${message.slice(0, maxChars)}…` : message;
}

function fail(rule: string, title: string, advice: string, evidence?: string): Finding {
  return { step: "precheck", rule, verdict: "fail", title, advice, ...(evidence ? { evidence } : {}) };
}

function capped(findings: Finding[]): Finding[] {
  if (findings.length <= MAX_FINDINGS) return findings;
  const rest = findings.length - MAX_FINDINGS;
  return [...findings.slice(0, MAX_FINDINGS), fail("precheck.more", `… and ${rest} more pre-check problems`, "Fix the ones above first.")];
}
