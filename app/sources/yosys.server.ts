import { copyFile, mkdir, mkdtemp, readFile, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { runSandboxed, type SandboxLimits } from "~/sandbox/sandbox.server";
import { compileOrder, trimToolMessage } from "./precheck.server";
import {
  countCells,
  figureFindings,
  findModule,
  parseTransistors,
  portFindings,
  type SourceFigures,
  type SourcePort,
} from "./source-figures";
import { assertSandboxStarted, terminationSignal } from "./tool-run";
import { scanVerilog } from "./verilog-lexer";

export type { SourceFigures } from "./source-figures";

export interface SourceCheckOptions {
  limits?: Partial<SandboxLimits>;
  scratchDir?: string;
}

export const SOURCE_LIMITS: Partial<SandboxLimits> = {
  cpuSeconds: 60,
  wallSeconds: 90,
  memoryBytes: 4_000_000_000,
  fileSizeBytes: 200_000_000,
};

const MAX_JSON_BYTES = 64 * 1024 * 1024;

export interface SourceCheckResult {
  findings: Finding[];
  figures: SourceFigures;
}

/**
 * Parses and synthesizes the design with yosys in the sandbox and holds it against the ruleset.
 * Call only after a clean pre-check: yosys reads $readmemh files and follows `include on its own.
 */
export async function runSourceChecks(
  dir: string,
  verilogFiles: string[],
  ruleset: Ruleset,
  options: SourceCheckOptions = {},
): Promise<SourceCheckResult> {
  const top = ruleset.topModule;
  const { initialLines, sourceLines } = await readSourceFacts(dir, verilogFiles);
  const figures: SourceFigures = {
    top,
    ports: [],
    cells: 0,
    cellsByType: {},
    flipFlops: 0,
    resetlessFlipFlops: 0,
    latches: 0,
    initialBlocks: initialLines.length,
    transistors: null,
    transistorsRaw: null,
    sourceLines,
  };
  const order = compileOrder(verilogFiles);
  const build = await mkdtemp(join(options.scratchDir ?? tmpdir(), "gc-yosys-"));
  try {
    // yosys' script language splits on ";": staged under plain generated names, the upload's names never reach it.
    const staged = await stageUnderPlainNames(dir, order, build);
    const reads = staged.map((s) => `read_verilog${s.sv ? " -sv" : ""} ${s.name}`);
    const script = [
      ...reads,
      `hierarchy -check -top ${top}`,
      "proc",
      "write_json /build/ports.json",
      `synth -flatten -top ${top}`,
      "tee -q -o /build/stat.json stat -json",
      "tee -q -o /build/cmos.json stat -json -tech cmos",
    ].join("; ");
    const run = await runSandboxed({
      command: "yosys",
      args: ["-q", "-p", script],
      buildDir: build,
      limits: { ...SOURCE_LIMITS, ...options.limits },
    });
    assertSandboxStarted(run);
    const signal = terminationSignal(run);
    if (run.timedOut || signal) {
      const why = run.timedOut ? "it ran past its time limit" : `it was stopped by ${signal} at its CPU or memory limit`;
      return { figures, findings: [yosysFailure(`yosys could not finish: ${why}`, "Look for a generate loop or recursion that does not end, or a design far larger than a tile.")] };
    }
    if (run.exitCode !== 0) {
      // Longest name first, so src/f1.v never replaces part of src/f10.v.
      const named = [...staged]
        .sort((a, b) => b.name.length - a.name.length)
        .reduce((text, s) => text.replaceAll(s.name, s.original), `${run.stderr}\n${run.stdout}`);
      const message = trimToolMessage(named);
      if (new RegExp(`Module \`\\\\?${top}' not found`).test(message)) {
        return {
          figures,
          findings: [
            {
              step: "source",
              rule: "source.top",
              verdict: "fail",
              title: `The top module ${top} is not in the sources`,
              measured: null,
              limit: top,
              evidence: message,
              advice: `Name your top module "${top}", as the ruleset says.`,
            },
          ],
        };
      }
      return { figures, findings: [yosysFailure("yosys could not read or synthesize the design", "Fix the error yosys reports and upload again.", message)] };
    }
    figures.ports = await readPorts(join(build, "ports.json"), top);
    const statJson = await readJson(join(build, "stat.json"));
    figures.cellsByType = designCounts(statJson, top);
    Object.assign(figures, countCells(figures.cellsByType));
    figures.transistorsRaw = transistorString(await readJson(join(build, "cmos.json")), top);
    figures.transistors = parseTransistors(figures.transistorsRaw);
  } finally {
    await rm(build, { recursive: true, force: true });
  }
  const findings: Finding[] = [
    { step: "source", rule: "source.top", verdict: "pass", title: `Top module ${top} found`, measured: top, limit: top },
    ...portFindings(figures.ports, ruleset.pins),
    ...figureFindings(figures, ruleset, initialLines),
  ];
  return { findings, figures };
}

async function stageUnderPlainNames(dir: string, files: string[], build: string): Promise<{ name: string; original: string; sv: boolean }[]> {
  await mkdir(join(build, "src"));
  const staged = files.map((original, i) => {
    const ext = original.toLowerCase().endsWith(".sv") ? "sv" : original.toLowerCase().endsWith(".vh") ? "vh" : "v";
    return { name: `src/f${i}.${ext}`, original, sv: ext === "sv" };
  });
  for (const s of staged) await copyFile(join(dir, s.original), join(build, s.name));
  return staged;
}

async function readSourceFacts(dir: string, verilogFiles: string[]): Promise<{ initialLines: string[]; sourceLines: number }> {
  const initialLines: string[] = [];
  let sourceLines = 0;
  for (const file of verilogFiles) {
    const scan = scanVerilog(await readFile(join(dir, file), "latin1"));
    sourceLines += scan.codeLines.size;
    for (const t of scan.tokens) if (t.kind === "identifier" && t.text === "initial") initialLines.push(`${file}:${t.line}`);
  }
  return { initialLines, sourceLines };
}

function yosysFailure(title: string, advice: string, evidence?: string): Finding {
  return { step: "source", rule: "source.yosys", verdict: "fail", title, advice, ...(evidence ? { evidence } : {}) };
}

type Json = Record<string, unknown>;

async function readJson(path: string): Promise<Json> {
  // The files come from a tool that ran on untrusted input: bound them before parsing.
  const bytes = (await stat(path)).size;
  if (bytes > MAX_JSON_BYTES) throw new SourceCheckError(`yosys wrote ${bytes} bytes to ${path}; that is too large to read`);
  const parsed: unknown = JSON.parse(await readFile(path, "utf8"));
  if (typeof parsed !== "object" || parsed === null) throw new SourceCheckError(`${path} does not hold a JSON object`);
  return parsed as Json;
}

/** A yosys output that does not look the way yosys 0.23 writes it: a Gatecrash fault, not the entrant's. */
export class SourceCheckError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SourceCheckError";
  }
}

async function readPorts(path: string, top: string): Promise<SourcePort[]> {
  const json = await readJson(path);
  const module = findModule(json.modules as Record<string, Json> | undefined, top);
  if (!module) throw new SourceCheckError(`yosys' JSON has no module ${top}`);
  const ports = (module.ports ?? {}) as Record<string, { direction?: string; bits?: unknown[] }>;
  return Object.entries(ports).map(([name, port]) => {
    const direction = port.direction;
    if (direction !== "input" && direction !== "output" && direction !== "inout") {
      throw new SourceCheckError(`port ${name} has direction ${String(direction)} in yosys' JSON`);
    }
    return { name: name.replace(/^\\/, ""), direction, width: Array.isArray(port.bits) ? port.bits.length : 0 };
  });
}

function designCounts(json: Json, top: string): Record<string, number> {
  const design = json.design as Json | undefined;
  const module = findModule(json.modules as Record<string, Json> | undefined, top);
  const source = (design?.num_cells_by_type ?? module?.num_cells_by_type) as Record<string, number> | undefined;
  if (!source) throw new SourceCheckError("yosys' stat JSON has no num_cells_by_type");
  return { ...source };
}

function transistorString(json: Json, top: string): string | null {
  const design = json.design as Json | undefined;
  const module = findModule(json.modules as Record<string, Json> | undefined, top);
  const raw = design?.estimated_num_transistors ?? module?.estimated_num_transistors;
  return raw === undefined ? null : String(raw);
}
