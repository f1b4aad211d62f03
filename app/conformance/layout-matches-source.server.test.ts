import { chmodSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zipOf } from "../../tests/support/archives";
import { designPath } from "../../demo/designs/index";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { DEMO_PINS, DEMO_RULESET } from "~/rules/ruleset";
import { runPipeline } from "./pipeline.server";

/**
 * Is the uploaded layout the uploaded design? The demo entry "xor-tide" synthesizes to 58 flip-flops (yosys 0.23,
 * `synth -flatten`, counted in app/sources), so a layout that places 140 flip-flop cells is some other design.
 */
let dir: string;
const sourceFlipFlops = 58;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "gc-consistency-"));
  chmodSync(dir, 0o755);
  writeFileSync(join(dir, "tide.zip"), await zipOf({ "tide.v": readFileSync(designPath("xor-tide")) }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function check(layout: Uint8Array, name: string) {
  writeFileSync(join(dir, `${name}.gds`), layout);
  return runPipeline({ ruleset: DEMO_RULESET, workDir: join(dir, name), bundlePath: join(dir, "tide.zip"), layoutPath: join(dir, `${name}.gds`), simulate: false });
}

describe("the layout must be the design", () => {
  it("fails a layout with 140 flip-flops for a source with 58, and names both numbers", async () => {
    const result = await check(generateDemoLayout({ flipFlops: 140 }).bytes, "other");
    expect(result.figures.source).toMatchObject({ flipFlops: sourceFlipFlops });
    const f = result.findings.find((x) => x.rule === "layout.matches.flipflops");
    expect(f?.verdict).toBe("fail");
    expect(f?.measured).toBe(140);
    expect(String(f?.limit)).toContain("58");
    expect(f?.evidence).toMatch(/58.*140|140.*58/);
    expect(result.verdict).toBe("fail");
  }, 120_000);

  it("passes the same source with a layout of its own 58 flip-flops and its ports", async () => {
    const result = await check(generateDemoLayout({ flipFlops: sourceFlipFlops }).bytes, "same");
    for (const rule of ["layout.matches.flipflops", "layout.matches.ports", "layout.top.name"]) {
      expect(result.findings.find((x) => x.rule === rule)?.verdict, rule).toBe("pass");
    }
  }, 120_000);

  it("allows the ruleset's tolerance for flip-flops duplicated for fan-out, and no more", async () => {
    // 5 % of 58 is 2.9: 60 flip-flops are within, 61 are not.
    const within = await check(generateDemoLayout({ flipFlops: 60 }).bytes, "within");
    expect(within.findings.find((x) => x.rule === "layout.matches.flipflops")?.verdict).toBe("pass");
    const beyond = await check(generateDemoLayout({ flipFlops: 61 }).bytes, "beyond");
    expect(beyond.findings.find((x) => x.rule === "layout.matches.flipflops")?.verdict).toBe("fail");
  }, 240_000);

  it("fails a layout whose labels do not name the source's ports, both ways", async () => {
    const pins = [...DEMO_PINS.filter((p) => p.name !== "pwm_out"), { name: "beat_led", direction: "output" as const, width: 1, role: "unused" as const }];
    const result = await check(generateDemoLayout({ flipFlops: sourceFlipFlops, ports: pins }).bytes, "ports");
    const f = result.findings.find((x) => x.rule === "layout.matches.ports");
    expect(f?.verdict).toBe("fail");
    expect(f?.evidence).toContain("pwm_out");
    expect(f?.evidence).toContain("beat_led");
  }, 120_000);

  it("fails a layout whose top cell is not the ruleset's top module", async () => {
    const result = await check(generateDemoLayout({ flipFlops: sourceFlipFlops, topCell: "my_chip" }).bytes, "top");
    const f = result.findings.find((x) => x.rule === "layout.top.name");
    expect(f).toMatchObject({ verdict: "fail", measured: "my_chip", limit: "gc_entry" });
  }, 120_000);
});
