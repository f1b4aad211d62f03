import { spawnSync } from "node:child_process";
import { chmodSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zipOf } from "../../tests/support/archives";
import { designPath } from "../../demo/designs/index";
import { runPipeline, type PipelineResult } from "./pipeline.server";
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
});
