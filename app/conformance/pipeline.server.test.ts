import { spawnSync } from "node:child_process";
import { chmodSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zipOf } from "../../tests/support/archives";
import { designPath } from "../../demo/designs/index";
import { runPipeline, type PipelineResult, type StepReport } from "./pipeline.server";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { DEMO_RULESET } from "~/rules/ruleset";

/**
 * The pipeline with an uploaded capture video: the entrant's own recording of the reference (re-encoded by
 * ffmpeg, an independent tool) must agree with the reference; ffmpeg's synthetic test pattern must not.
 */
let dir: string;
let first: PipelineResult;


function ffmpeg(args: string[]): void {
  const res = spawnSync("ffmpeg", ["-hide_banner", "-loglevel", "error", "-y", ...args], { encoding: "utf8" });
  if (res.status !== 0) throw new Error(res.stderr);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "gc-pipeline-"));
  chmodSync(dir, 0o755);
  writeFileSync(join(dir, "b.zip"), await zipOf({ "stars.v": readFileSync(designPath("lfsr-stars")) }));
  first = await runPipeline({ ruleset: DEMO_RULESET, workDir: join(dir, "w1"), bundlePath: join(dir, "b.zip"), simulate: true, frames: 12, encode: true });
}, 300_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("the pipeline with an uploaded capture video", () => {
  it("finds a re-encoded recording of the reference in agreement with it", async () => {
    const mp4 = first.artifacts.find((a) => a.kind === "mp4");
    expect(mp4).toBeDefined();
    // A "capture" as a camera-less recorder would make it: scaled down and re-encoded.
    ffmpeg(["-i", mp4!.path, "-vf", "scale=320:240", "-c:v", "libx264", "-preset", "ultrafast", "-an", join(dir, "capture.mp4")]);
    const result = await runPipeline({ ruleset: DEMO_RULESET, workDir: join(dir, "w2"), bundlePath: join(dir, "b.zip"), videoPath: join(dir, "capture.mp4"), simulate: true, frames: 12, encode: false });
    const agreement = result.findings.find((f) => f.rule === "capture.agreement");
    expect(agreement?.verdict).toBe("pass");
    expect(Number(agreement?.measured)).toBeGreaterThan(0.8);
    expect(result.findings.some((f) => f.step === "capture" && f.rule.startsWith("capture.flash"))).toBe(true);
  }, 300_000);

  it("warns when the capture shows something else", async () => {
    // ffmpeg's moving test pattern: a video that cannot come from this design.
    ffmpeg(["-f", "lavfi", "-i", "testsrc2=size=320x240:rate=60:duration=0.4", "-c:v", "libx264", "-preset", "ultrafast", join(dir, "other.mp4")]);
    const result = await runPipeline({ ruleset: DEMO_RULESET, workDir: join(dir, "w3"), bundlePath: join(dir, "b.zip"), videoPath: join(dir, "other.mp4"), simulate: true, frames: 12, encode: false });
    const agreement = result.findings.find((f) => f.rule === "capture.agreement");
    expect(agreement?.verdict).toBe("warn");
    expect(agreement?.evidence).toBeTruthy();
  }, 300_000);

  it("skips source checks and simulation when the pre-check refuses the source, and says why", async () => {
    writeFileSync(join(dir, "bad.zip"), await zipOf({ "scroller.v": readFileSync(designPath("block-scroller")) }));
    const result = await runPipeline({ ruleset: DEMO_RULESET, workDir: join(dir, "w4"), bundlePath: join(dir, "bad.zip"), simulate: true, frames: 2 });
    expect(result.verdict).toBe("fail");
    expect(result.findings.find((f) => f.rule === "precheck.system-call")?.measured).toBe("$display");
    expect(result.findings.some((f) => f.step === "source" || f.step === "simulation")).toBe(false);
    expect(result.skipped.map((s) => s.step)).toEqual(expect.arrayContaining(["source", "simulation"]));
  }, 120_000);

  it("reports the cheap steps before the reference capture, and the first still before the capture ends", async () => {
    writeFileSync(join(dir, "l.gds"), generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 40, logicCells: 300, seed: 1 }).bytes);
    // the order things happened in, as one log (no clock): reports as they arrive, and the moment simulation starts
    const seen: { report: StepReport }[] = [];
    let reportsBeforeSimulation = -1;
    const result = await runPipeline({
      ruleset: DEMO_RULESET, workDir: join(dir, "w5"), bundlePath: join(dir, "b.zip"), layoutPath: join(dir, "l.gds"), simulate: true, frames: 12, encode: true,
      onStep: (step) => {
        if (step === "simulation") reportsBeforeSimulation = seen.length;
      },
      onReport: (report) => {
        seen.push({ report });
      },
    });
    expect(reportsBeforeSimulation).toBeGreaterThan(0);
    const before = seen.slice(0, reportsBeforeSimulation).flatMap((s) => s.report.findings.map((f) => f.rule));
    for (const rule of ["intake.bundle", "precheck.clean", "source.top", "layout.die.size"]) expect(before).toContain(rule);
    const simulation = seen.filter((s) => s.report.step === "simulation");
    // two reports of the step: the first still alone, then everything else (the still is not sent twice)
    expect(simulation).toHaveLength(2);
    expect(simulation[0].report.artifacts.map((a) => a.kind)).toEqual(["first-frame"]);
    expect(simulation[0].report.findings).toEqual([]);
    expect(simulation[1].report.artifacts.map((a) => a.kind)).not.toContain("first-frame");
    expect(simulation[1].report.artifacts.map((a) => a.kind)).toContain("webm");
    // PNG signature (ISO/IEC 15948): the early still is a complete PNG file
    expect(readFileSync(simulation[0].report.artifacts[0].path).subarray(0, 8).toString("hex")).toBe("89504e470d0a1a0a");
    expect(result.findings.map((f) => f.rule)).toEqual(seen.flatMap((s) => s.report.findings.map((f) => f.rule)));
    expect(result.internalErrors).toEqual([]);
  }, 300_000);

  it("turns Gatecrash's own failure in one step into that step's finding and keeps the others", async () => {
    // A ruleset naming a video mode Gatecrash does not know: a fault on our side, not in the upload.
    const broken = { ...DEMO_RULESET, videoMode: "not-a-mode" };
    const result = await runPipeline({ ruleset: broken, workDir: join(dir, "w6"), bundlePath: join(dir, "b.zip"), simulate: true, frames: 2, encode: false });
    expect(result.internalErrors.map((e) => e.step)).toEqual(["simulation"]);
    const internal = result.findings.find((f) => f.rule === "simulation.internal");
    expect(internal?.verdict).toBe("warn");
    expect(internal?.evidence).toContain("not-a-mode");
    expect(result.findings.find((f) => f.rule === "source.top")?.verdict).toBe("pass");
  }, 120_000);
});
