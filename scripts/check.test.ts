import { spawnSync } from "node:child_process";
import { chmodSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zipOf } from "../tests/support/archives";
import { DEMO_RULESET } from "~/rules/ruleset";
import { generateDemoLayout } from "../tests/support/demo-layout";

/**
 * The `npm run check` CLI end to end, as an entrant runs it: a real process, real yosys/verilator, files
 * written by the test with known answers.
 */
let dir: string;


// A design with the demo pin list whose only state is a counter of COUNTER_BITS flip-flops plus the VGA
// counters (10 + 10 bits): VESA DMT 640x480@60 timing — 800 clocks per line (640+16+96+48),
// 525 lines per frame (480+10+2+33), both syncs negative.
const COUNTER_BITS = 7;
const design = (extra = "", pwm = `n[${COUNTER_BITS - 1}]`) => `
module gc_entry(input clk, input rst_n, output [1:0] vga_r, output [1:0] vga_g, output [1:0] vga_b,
                output vga_hs, output vga_vs, output pwm_out);
  reg [9:0] x; reg [9:0] y; reg [${COUNTER_BITS - 1}:0] n;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin x <= 0; y <= 0; n <= 0; end
    else begin
      n <= n + 1'b1;
      if (x == 799) begin x <= 0; y <= (y == 524) ? 10'd0 : y + 1'b1; end else x <= x + 1'b1;
    end
  wire vis = (x < 640) && (y < 480);
  assign vga_r = vis ? x[6:5] : 2'b00;
  assign vga_g = vis ? y[6:5] : 2'b00;
  assign vga_b = vis ? n[1:0] : 2'b00;
  assign vga_hs = ~((x >= 656) && (x < 752));
  assign vga_vs = ~((y >= 490) && (y < 492));
  assign pwm_out = ${pwm};
  ${extra}
endmodule
`;

function check(args: string[]) {
  const res = spawnSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "scripts/check.ts", ...args], { encoding: "utf8", timeout: 240_000 });
  return { code: res.status, stdout: res.stdout, stderr: res.stderr };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "gc-cli-"));
  chmodSync(dir, 0o755);
  writeFileSync(join(dir, "good.zip"), await zipOf({ "top.v": design() }));
  writeFileSync(join(dir, "latch.zip"), await zipOf({ "top.v": design("reg l; always @* if (x[0]) l = y[0];", "l") }));
  // The layout of this design: its flip-flops, so the layout-against-source findings pass.
  const layout = generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 20 + COUNTER_BITS, logicCells: 120, seed: 7 });
  writeFileSync(join(dir, "good.gds"), layout.bytes);
  writeFileSync(join(dir, "truncated.gds"), layout.bytes.subarray(0, 101));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("npm run check", () => {
  it("reports a clean design and layout as JSON and exits 0", () => {
    const out = check(["--bundle", join(dir, "good.zip"), "--layout", join(dir, "good.gds"), "--json"]);
    expect(out.code, out.stderr).toBe(0);
    const report = JSON.parse(out.stdout);
    expect(report.verdict).not.toBe("fail");
    expect(Array.isArray(report.findings)).toBe(true);
    expect(report.findings.every((f: { rule: string; verdict: string }) => f.rule && ["pass", "warn", "fail"].includes(f.verdict))).toBe(true);
    expect(report.source.top).toBe("gc_entry");
    // 10 + 10 + COUNTER_BITS flip-flops by construction of the design above.
    expect(report.source.flipFlops).toBe(20 + COUNTER_BITS);
    expect(report.source.ports).toHaveLength(8);
    // The layout figures against what this test asked the generator for (its own record is not read back).
    expect(report.layout.topCell).toBe("gc_entry");
    expect(report.layout.bboxUm).toEqual([0, 0, 180, 120]); // DEMO_RULESET tile 180 × 120 µm
    expect(report.layout.instances.gc_dff + report.layout.instances.gc_dffr).toBe(20 + COUNTER_BITS);
    const labels = report.layout.labels.map((l: { text: string }) => l.text);
    expect(labels).toEqual(expect.arrayContaining(["clk", "rst_n", "vga_hs", "vga_vs", "pwm_out"]));
    expect(report.layout.labels[0]).toEqual(expect.objectContaining({ layer: DEMO_RULESET.pinLayer.layer, xUm: expect.any(Number), yUm: expect.any(Number) }));
  });

  it("exits 1 when a rule fails (a latch) and names it", () => {
    const out = check(["--bundle", join(dir, "latch.zip")]);
    expect(out.code).toBe(1);
    expect(out.stdout).toMatch(/FAIL\s+source\.latches/);
    expect(out.stdout).toMatch(/not the foundry's or shuttle's own signoff/);
  });

  it("exits 2 with a reason when the input cannot be read", () => {
    const truncated = check(["--layout", join(dir, "truncated.gds")]);
    expect(truncated.code).toBe(2);
    expect(truncated.stderr).toMatch(/cannot read the input/);
    const missing = check(["--bundle", join(dir, "nope.zip")]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/not found/);
    const badRuleset = join(dir, "bad-ruleset.json");
    writeFileSync(badRuleset, JSON.stringify({ pins: [] }));
    const invalid = check(["--ruleset", badRuleset, "--bundle", join(dir, "good.zip")]);
    expect(invalid.code).toBe(2);
    expect(invalid.stderr).toMatch(/topModule/);
  });

  it("simulates with --simulate and reports VESA timing", () => {
    const out = check(["--bundle", join(dir, "good.zip"), "--simulate", "--frames", "2", "--json"]);
    expect(out.code, out.stderr).toBe(0);
    const report = JSON.parse(out.stdout);
    // VESA DMT 640x480@60: 800 clocks per line, 96-clock hsync, 525 lines, 2-line vsync, both negative.
    expect(report.video.hsync).toEqual({ periodClocks: 800, pulseClocks: 96, polarity: "negative" });
    expect(report.video.vsync).toEqual({ periodLines: 525, pulseLines: 2, polarity: "negative" });
    expect(report.video.linesPerFrame).toBe(525);
    expect(report.video.framesRendered).toBe(2);
    // two frames are less than the one second WCAG 2.2 SC 2.3.1 counts flashes in: nothing is claimed
    expect(report.flash).toMatchObject({ verdict: "unmeasured", worstSecondFlashes: null, wholeDemo: false });
    expect(report.loop).toMatchObject({ detected: false, stoppedBy: "frames", framesCaptured: 2 });
  });

  it("captures the whole demo with --simulate alone, up to where it loops", () => {
    // at most 5 s of picture (the default 180 s would also make it worth a profile-guided build, slowing the test)
    const rulesetPath = join(dir, "short-ruleset.json");
    writeFileSync(rulesetPath, JSON.stringify({ ...DEMO_RULESET, simulation: { ...DEMO_RULESET.simulation, maxRunSeconds: 5 } }));
    const out = check(["--ruleset", rulesetPath, "--bundle", join(dir, "good.zip"), "--simulate", "--json"]);
    expect(out.code, out.stderr).toBe(0);
    const report = JSON.parse(out.stdout);
    // the design's state is the VGA counters and a 7-bit counter of clocks: 420 000 clocks a frame (VESA DMT 640x480@60)
    // leave it 420 000 mod 128 = 32 further on at each frame start, so it comes round every 128 / 32 = 4 frames
    expect(report.loop).toMatchObject({ detected: true, periodFrames: 4, firstLoopFrame: 0 });
    expect(report.loop.periodSeconds).toBeCloseTo((4 * 420_000) / 25_175_000, 6);
    expect(report.video.framesRendered).toBe(4);
    expect(report.flash).toMatchObject({ wholeDemo: true });
    expect(report.flash.statement).toMatch(/whole 0\.1 s loop/);
  });
});
