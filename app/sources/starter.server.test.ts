import { execFileSync } from "node:child_process";
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runPipeline } from "~/conformance/pipeline.server";
import { rulesetJson } from "~/competitions/ruleset-io";
import { DEMO_PINS, DEMO_RULESET, rulesetSchema, type Ruleset } from "~/rules/ruleset";
import { starterFiles } from "./starter";
import { starterZip } from "./starter-zip.server";

/**
 * The starter bundle must pass the very ruleset it was written from: through Gatecrash's whole pipeline (intake,
 * pre-check, yosys, the verilator reference capture with VGA timing and flash check), and by its own testbench
 * in Icarus Verilog, an independent simulator. Two rulesets: the demo compo's and one with other names, widths
 * and an active-high reset.
 */
const dir = mkdtempSync(join(tmpdir(), "gc-starter-"));
chmodSync(dir, 0o755);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// Other names, 3-bit colour, a 2-bit spare output and an active-high reset.
const RENAMED: Record<string, string> = { clk: "clock_in", rst_n: "reset", vga_r: "red", vga_g: "green", vga_b: "blue", vga_hs: "hsync", vga_vs: "vsync", pwm_out: "sound" };
const OTHER = rulesetSchema.parse({
  topModule: "beam_chaser",
  resetActive: "high",
  colourBitsPerChannel: 3,
  pins: [
    ...DEMO_PINS.map((p) => ({ ...p, name: RENAMED[p.name], width: p.width === 2 ? 3 : p.width })),
    { name: "spare", direction: "output", width: 2, role: "unused" },
  ],
});

// A 50 MHz board whose design holds each pixel two clocks (common practice, no source: halving a 50 MHz oscillator).
const HALVED = rulesetSchema.parse({ ...DEMO_RULESET, clock: { frequencyHz: 50_000_000, clocksPerPixel: 2 } });
// A 25 MHz board (common practice, no source): 0.7 % off the DMT pixel clock, inside the monitor window.
const AT_25 = rulesetSchema.parse({ ...DEMO_RULESET, topModule: "board_25", clock: { frequencyHz: 25_000_000 } });

describe.each([
  ["the demo compo's ruleset", DEMO_RULESET],
  ["a ruleset with other names and an active-high reset", OTHER],
  ["a 50 MHz board at two clocks a pixel", HALVED],
  ["a 25 MHz board", AT_25],
] as [string, Ruleset][])("the starter bundle for %s", (_name, ruleset) => {
  const files = starterFiles(ruleset, { compo: "Test Compo (Test Party)", rulesetJson: rulesetJson(ruleset), rulesVersion: 1 });
  const folder = join(dir, `${ruleset.topModule}-${ruleset.clock.clocksPerPixel}`);
  for (const f of files) {
    mkdirSync(dirname(join(folder, f.path)), { recursive: true });
    writeFileSync(join(folder, f.path), f.body);
  }

  // one second of picture (60 frames), not the whole demo of up to 180 s, to keep the suite's time
  it("passes Gatecrash's pipeline with that ruleset: no warning, no failure", async () => {
    const zipPath = join(dir, `${ruleset.topModule}-${ruleset.clock.clocksPerPixel}.zip`);
    writeFileSync(zipPath, await starterZip("starter", files));
    const result = await runPipeline({ ruleset, workDir: join(dir, `${ruleset.topModule}-${ruleset.clock.clocksPerPixel}-run`), bundlePath: zipPath, simulate: true, encode: false, frames: 60 });
    const notPass = result.findings.filter((f) => f.verdict !== "pass").map((f) => `${f.rule}: ${f.measured} ${f.evidence ?? ""}`);
    expect(notPass).toEqual([]);
    expect(result.findings.some((f) => f.rule.startsWith("video.") || f.rule.startsWith("simulation."))).toBe(true);
    // the testbench (.tb) stays in the bundle and is not read as design source
    expect((result.figures.intake as { verilogFiles: number }).verilogFiles).toBe(1);
  }, 300_000);

  it("passes its own testbench in Icarus Verilog with the one-line check from its README", () => {
    const readme = files.find((f) => f.path === "README.md")!.body;
    const line = /^ {4}(iverilog .+)$/m.exec(readme)![1];
    const out = execFileSync("sh", ["-c", line], { cwd: folder, encoding: "utf8", timeout: 120_000 });
    expect(out).toMatch(/starter check: PASS/);
  }, 120_000);
});
