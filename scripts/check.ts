/**
 * `npm run check -- [--ruleset FILE] [--bundle FILE] [--layout FILE] [--video FILE] [--simulate [--frames N]] [--json]`
 * Runs Gatecrash's conformance checks locally with the same pipeline as the worker (default ruleset: the demo
 * compo's). `--simulate` captures the whole demo: until the design's state repeats at a frame start (it loops) or the
 * ruleset's simulation.maxRunSeconds; `--frames N` caps it at N frames. Exit 0 when nothing fails, 1 when a rule fails (or a step could not finish), 2 when the input cannot be read.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { parseArgs } from "node:util";
import { ZodError } from "zod";
import { runPipeline, type PipelineResult } from "~/conformance/pipeline.server";
import { DEMO_RULESET, parseRuleset, type Ruleset } from "~/rules/ruleset";

class InputError extends Error {}

function readRuleset(path: string | undefined): Ruleset {
  if (!path) return DEMO_RULESET;
  if (!existsSync(path)) throw new InputError(`ruleset file not found: ${path}`);
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, "utf8"));
  } catch {
    throw new InputError(`ruleset file is not valid JSON: ${path}`);
  }
  try {
    return parseRuleset(raw);
  } catch (e) {
    if (e instanceof ZodError) throw new InputError(`ruleset is not valid:\n${e.issues.map((i) => `  ${i.path.join(".") || "(top)"}: ${i.message}`).join("\n")}`);
    throw e;
  }
}

function existing(path: string | undefined, what: string): string | undefined {
  if (path === undefined) return undefined;
  if (!existsSync(path)) throw new InputError(`${what} not found: ${path}`);
  return resolve(path);
}

export function toJson(result: PipelineResult) {
  const f = result.figures as Record<string, Record<string, unknown> | null | undefined>;
  const layout = f.layout
    ? { topCell: f.layout.topCell, bboxUm: f.layout.bboxUm, instances: f.layout.instances, labels: f.layout.labels, figures: f.layout }
    : null;
  const video = f.video as Record<string, unknown> | null | undefined;
  return {
    verdict: result.verdict,
    findings: result.findings,
    skipped: result.skipped,
    intake: f.intake ?? null,
    source: f.source ?? null,
    layout,
    video: video ? { ...video, framesRendered: video.framesRendered } : null,
    audio: f.audio ?? null,
    speed: f.speed ?? null,
    flash: f.flash
      ? { verdict: f.flash.verdict, worstSecondFlashes: f.flash.worstSecondFlashes, worstSecondAt: f.flash.worstSecondAt, analysedSeconds: f.flash.analysedSeconds, wholeDemo: f.flash.wholeDemo, statement: f.flash.statement }
      : null,
    // capture.loop = {detected, periodFrames, periodSeconds, firstLoopFrame, …}
    loop: f.loop ?? null,
    capture: f.capture ?? null,
    captureFlash: f.captureFlash ?? null,
  };
}

const MARK = { pass: "PASS", warn: "WARN", fail: "FAIL" } as const;

function printReport(result: PipelineResult): void {
  for (const x of result.findings) {
    const measured = x.measured != null ? ` — measured ${x.measured}${x.limit != null ? `, limit ${x.limit}` : ""}` : "";
    console.log(`${MARK[x.verdict]}  ${x.rule}: ${x.title}${measured}`);
    if (x.evidence) console.log(`      ${x.evidence}`);
    if (x.verdict !== "pass" && x.advice) console.log(`      → ${x.advice}`);
  }
  for (const s of result.skipped) console.log(`SKIP  ${s.step}: ${s.reason}`);
  const f = result.figures as Record<string, { statement?: string } | null | undefined>;
  if (f.loop?.statement) console.log(`\nWhole demo: ${f.loop.statement}.`);
  if (f.flash?.statement) console.log(f.flash.statement);
  console.log(`\nVerdict: ${MARK[result.verdict]}. A passing check is not the foundry's or shuttle's own signoff (DRC/LVS).`);
}

export async function main(argv: string[]): Promise<number> {
  let args;
  try {
    args = parseArgs({
      args: argv,
      options: {
        ruleset: { type: "string" },
        bundle: { type: "string" },
        layout: { type: "string" },
        video: { type: "string" },
        simulate: { type: "boolean", default: false },
        frames: { type: "string" },
        json: { type: "boolean", default: false },
      },
      strict: true,
    }).values;
  } catch (e) {
    console.error((e as Error).message);
    return 2;
  }
  const workDir = mkdtempSync(join(tmpdir(), "gatecrash-check-"));
  chmodSync(workDir, 0o755); // the sandbox user must reach the build folders inside
  try {
    const ruleset = readRuleset(args.ruleset);
    const bundlePath = existing(args.bundle, "bundle");
    const layoutPath = existing(args.layout, "layout");
    const videoPath = existing(args.video, "video");
    if (!bundlePath && !layoutPath && !videoPath) throw new InputError("nothing to check: give --bundle, --layout and/or --video");
    const frames = args.frames === undefined ? undefined : Number(args.frames);
    if (frames !== undefined && (!Number.isInteger(frames) || frames < 1 || frames > 36_000)) throw new InputError("--frames must be a whole number from 1 to 36000");
    const result = await runPipeline({ ruleset, workDir, bundlePath, layoutPath, videoPath, simulate: args.simulate, frames, encode: false, pictures: false });
    const unreadable = result.findings.find((f) => f.rule === "layout.read" || f.rule === "intake.not-an-archive" || f.rule === "intake.corrupt" || f.rule === "capture.video.unreadable");
    if (args.json) console.log(JSON.stringify(toJson(result), null, 2));
    else printReport(result);
    if (unreadable) {
      console.error(`cannot read the input: ${unreadable.evidence ?? unreadable.title}`);
      return 2;
    }
    for (const e of result.internalErrors) console.error(`Gatecrash could not finish the ${e.step} step: ${e.message}`);
    return result.verdict === "fail" || result.internalErrors.length > 0 ? 1 : 0;
  } catch (e) {
    if (e instanceof InputError) {
      console.error(e.message);
      return 2;
    }
    throw e;
  } finally {
    rmSync(workDir, { recursive: true, force: true });
  }
}

/** The command line: run, then exit with main's code (the compiled CLI's launcher, scripts/cli.mjs, calls this). */
export async function cli(argv: string[]): Promise<never> {
  process.exit(await main(argv));
}

if (process.argv[1] && resolve(process.argv[1]) === resolve("scripts/check.ts")) {
  await cli(process.argv.slice(2));
}
