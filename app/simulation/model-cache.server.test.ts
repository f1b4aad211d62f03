import { createHash } from "node:crypto";
import { chmodSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { runSandboxed } from "~/sandbox/sandbox.server";
import { designPath } from "../../demo/designs/index";
import { MODEL_CXX_FLAGS, profilePays, simulateDesign, type SimulationRun } from "./build.server";
import { PCH_HEADER, PCH_MOUNT, verilatorPch } from "./runtime-cache.server";

/**
 * The build shortcuts must change no byte of what a check shows: a model from the cache draws the same frames
 * as a fresh build, the precompiled header makes the same object file and GCC really uses it, and the cache
 * never hands a model to a design that differs by one constant.
 */
const root = mkdtempSync(join(tmpdir(), "gc-model-cache-"));
chmodSync(root, 0o755); // the sandbox user must reach the build folders
afterAll(() => rmSync(root, { recursive: true, force: true }));

const sha = (run: SimulationRun & { framesSha256: string }) => run.framesSha256;
const fileSha = (path: string) => createHash("sha256").update(readFileSync(path)).digest("hex");
let n = 0;

// a cache of this file's own: the machine's cache outlives test runs and is shared with other test files
const modelCacheDir = join(root, "cache");

async function simulate(source: string, opts: { useModelCache?: boolean; profileGuided?: boolean | "auto"; forceBothEdges?: boolean } = {}): Promise<SimulationRun & { framesSha256: string }> {
  const dir = join(root, `run${n++}`);
  mkdirSync(join(dir, "src"), { recursive: true });
  writeFileSync(join(dir, "src", "entry.v"), source);
  // the frame stream as the harness sends it, hashed as it arrives
  const hash = createHash("sha256");
  const outcome = await simulateDesign({
    sourceDir: join(dir, "src"), verilogFiles: ["entry.v"], ruleset: DEMO_RULESET, workDir: join(dir, "work"), frames: 3, modelCacheDir, ...opts,
    onFrameStream: async (stream) => { for await (const chunk of stream) hash.update(chunk as Buffer); },
  });
  if (!outcome.ok) throw new Error(`build failed: ${outcome.log}`);
  return { ...outcome.run, framesSha256: hash.digest("hex") };
}

// verilator drops comments, so tests that want a design new to the cache change a constant of their own
const design = (colour: number) => readFileSync(designPath("munch-squares"), "utf8").replace("visible ? colour : 6'd0", `visible ? colour ^ 6'd${colour} : 6'd0`);

describe("the model cache", () => {
  it("gives the same design its compiled model again, and that model draws the same frames", async () => {
    const source = design(0);
    const fresh = await simulate(source);
    expect(fresh.modelCached).toBe(false);
    const frames = sha(fresh);
    const again = await simulate(source);
    expect(again.modelCached).toBe(true);
    expect(sha(again)).toBe(frames);
    expect(again.summary.cycles).toBe(fresh.summary.cycles);
    // without the cache the same bytes come out of a full build
    const uncached = await simulate(source, { useModelCache: false });
    expect(uncached.modelCached).toBe(false);
    expect(sha(uncached)).toBe(frames);
  }, 240_000);

  it("never hands a model to a design that differs, nor to the both-edges build of the same design", async () => {
    const source = design(2);
    await simulate(source);
    // the same design with one constant changed (one bit of every visible pixel's colour)
    const changed = design(1);
    expect(changed).not.toBe(source);
    expect((await simulate(changed)).modelCached).toBe(false);
    const bothEdges = await simulate(source, { forceBothEdges: true });
    expect(bothEdges.edgeMode).toBe("both-edges");
    expect(bothEdges.modelCached).toBe(false);
  }, 240_000);

  it("keeps the profile-guided build for runs long enough to pay for it", async () => {
    // 60 frames of 800 x 525 clocks (VESA DMT 640x480@60) = 25.2 M cycles, about a second: never worth two builds
    expect(profilePays(DEMO_RULESET, 60, 1500)).toBe(false);
    // 600 frames (ten seconds of picture) after a half-second build: worth it
    expect(profilePays(DEMO_RULESET, 600, 500)).toBe(true);
    const source = design(3);
    expect((await simulate(source)).profileGuided).toBe(false);
    const forced = await simulate(source, { profileGuided: true });
    expect(forced.profileGuided).toBe(true);
    expect((await simulate(source, { profileGuided: true })).modelCached).toBe(true);
  }, 240_000);

  it("finds the profile-guided model again after a run that built both models", async () => {
    // the first run of a design builds the plain model and then the profile-guided one; the second must find the
    // latter, although the first run's folder held the plain build's objects when it was stored
    const source = design(4);
    const first = await simulate(source, { profileGuided: true });
    expect(first.profileGuided).toBe(true);
    expect(first.modelCached).toBe(false);
    const again = await simulate(source, { profileGuided: true });
    expect(again.profileGuided).toBe(true);
    expect(again.modelCached).toBe(true);
  }, 240_000);
});

describe("the precompiled runtime header", () => {
  it("is used by GCC for a model file, and the object file comes out byte for byte the same", async () => {
    const pch = await verilatorPch(MODEL_CXX_FLAGS);
    expect(pch).not.toBeNull();
    const build = join(root, "pch");
    mkdirSync(build);
    writeFileSync(join(build, "entry.v"), readFileSync(designPath("munch-squares")));
    const make = (extra: string, out: string) =>
      `make -s -C obj -f Vtop.mk OPT_FAST="${MODEL_CXX_FLAGS} ${extra}" Vtop__ALL.o && mv obj/Vtop__ALL.o ${out}`;
    const script = [
      "verilator --cc -O3 --x-assign fast --x-initial fast --noassert -Wno-fatal --top-module gc_entry --prefix Vtop -Mdir obj entry.v",
      make("", "plain.o"),
      // GCC's -H lists every header it reads; a usable precompiled header is marked "!", an unusable one "x"
      make(`-include ${PCH_HEADER} -Winvalid-pch -H`, "pch.o"),
    ].join(" && ");
    const run = await runSandboxed({ command: "/bin/sh", args: ["-c", script], buildDir: build, readOnly: [{ host: pch!, inside: PCH_MOUNT }], limits: { wallSeconds: 120, cpuSeconds: 120 } });
    expect(run.exitCode, run.stderr).toBe(0);
    expect(run.stderr).toContain(`! ${PCH_MOUNT}/gc_pch.h.gch`);
    expect(run.stderr).not.toMatch(/invalid|x \/gc-pch/);
    expect(fileSha(join(build, "pch.o"))).toBe(fileSha(join(build, "plain.o")));
  }, 240_000);
});
