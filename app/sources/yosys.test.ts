import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET, rulesetSchema, type Ruleset } from "~/rules/ruleset";
import { writeDesign } from "../../tests/fixtures/hostile/designs";
import { runSourceChecks } from "./yosys.server";

let work: string;
let n = 0;
beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), "gc-yosys-test-"));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

async function check(files: Record<string, string>, ruleset: Ruleset = DEMO_RULESET, limits?: Parameters<typeof runSourceChecks>[3]) {
  const dir = join(work, `d${n++}`);
  return runSourceChecks(dir, await writeDesign(dir, files), ruleset, limits);
}

const counterRuleset = (width: number) =>
  rulesetSchema.parse({
    topModule: "counter",
    pins: [
      { name: "clk", direction: "input", width: 1, role: "clock" },
      { name: "rst_n", direction: "input", width: 1, role: "reset" },
      { name: "q", direction: "output", width, role: "unused" },
    ],
  });

const counter = (width: number) => `module counter(input clk, input rst_n, output reg [${width - 1}:0] q);
  always @(posedge clk or negedge rst_n)
    if (!rst_n) q <= 0;
    else q <= q + 1'b1;
endmodule
`;

/** The demo pin list, driven by an N-bit counter; `body` may override the port list. */
const demoEntry = (ports: string, body = "") => `module gc_entry(${ports});
  reg [9:0] t;
  always @(posedge clk or negedge rst_n) if (!rst_n) t <= 0; else t <= t + 1;
  assign vga_r = t[1:0]; assign vga_g = t[3:2]; assign vga_b = t[5:4];
  assign vga_hs = t[6]; assign vga_vs = t[7]; assign pwm_out = t[8] ^ t[9];
${body}
endmodule
`;
const demoPorts =
  "input clk, input rst_n, output [1:0] vga_r, output [1:0] vga_g, output [1:0] vga_b, output vga_hs, output vga_vs, output pwm_out";

describe("runSourceChecks", () => {
  it("counts N flip-flops for an N-bit counter with reset (N = 1, 7, 16)", async () => {
    for (const width of [1, 7, 16]) {
      const { findings, figures } = await check({ "counter.v": counter(width) }, counterRuleset(width));
      // An N-bit binary counter holds N bits of state: one flip-flop per bit (common practice, no source).
      expect({ width, ff: figures.flipFlops, resetless: figures.resetlessFlipFlops, latches: figures.latches }).toEqual({
        width,
        ff: width,
        resetless: 0,
        latches: 0,
      });
      expect(figures.cellsByType["$_DFF_PN0_"]).toBe(width);
      expect(figures.cells).toBeGreaterThanOrEqual(width);
      expect(figures.transistors).toBeGreaterThan(0);
      expect(findings.filter((f) => f.verdict !== "pass")).toEqual([]);
      expect(figures.ports).toEqual([
        { name: "clk", direction: "input", width: 1 },
        { name: "rst_n", direction: "input", width: 1 },
        { name: "q", direction: "output", width },
      ]);
    }
  });

  it("passes the demo pin list and holds the flip-flop count against a budget", async () => {
    const ok = await check({ "top.v": demoEntry(demoPorts) });
    expect(ok.findings.filter((f) => f.verdict === "fail")).toEqual([]);
    expect(ok.figures.flipFlops).toBe(10);
    expect(ok.findings.find((f) => f.rule === "source.ports")?.verdict).toBe("pass");
    const tight = await check({ "top.v": demoEntry(demoPorts) }, { ...DEMO_RULESET, flipFlopBudget: 8 });
    expect(tight.findings.find((f) => f.rule === "source.flip-flops")).toMatchObject({ verdict: "fail", measured: 10, limit: 8 });
  });

  it("fails a level-sensitive latch", async () => {
    const latched = await check({
      "top.v": `module gc_entry(input clk, input rst_n, output reg [1:0] vga_r, output [1:0] vga_g, output [1:0] vga_b,
  output vga_hs, output vga_vs, output pwm_out);
  reg [2:0] t;
  always @(posedge clk or negedge rst_n) if (!rst_n) t <= 0; else t <= t + 1;
  // Level-sensitive: vga_r holds its value while t[2] is low, so yosys must infer two latches.
  always @* if (t[2]) vga_r = t[1:0];
  assign vga_g = 0; assign vga_b = 0; assign vga_hs = 0; assign vga_vs = 0; assign pwm_out = 0;
endmodule
`,
    });
    expect(latched.figures.latches).toBe(2);
    expect(latched.findings.find((f) => f.rule === "source.latches")).toMatchObject({ verdict: "fail", measured: 2 });
  });

  it("warns on flip-flops without reset and on initial blocks", async () => {
    const { findings, figures } = await check({
      "top.v": `module gc_entry(input clk, input rst_n, output [1:0] vga_r, output [1:0] vga_g, output [1:0] vga_b,
  output vga_hs, output vga_vs, output pwm_out);
  reg [2:0] free;
  reg [1:0] gated;
  initial free = 0;
  always @(posedge clk) free <= free + 1;
  always @(posedge clk) if (rst_n) gated <= gated + 1;
  assign vga_r = free[1:0]; assign vga_g = gated; assign vga_b = 0;
  assign vga_hs = free[2]; assign vga_vs = 0; assign pwm_out = 0;
endmodule
`,
    });
    expect(figures.flipFlops).toBe(5);
    expect(figures.resetlessFlipFlops).toBe(5);
    expect(findings.find((f) => f.rule === "source.flip-flops.reset")).toMatchObject({ verdict: "warn", measured: 5 });
    expect(findings.find((f) => f.rule === "source.initial")).toMatchObject({ verdict: "warn", measured: 1, evidence: "top.v:5" });
  });

  it("finds each port mismatch as its own finding naming the pin", async () => {
    const ports = "input clk, output rst_n, output [2:0] vga_r, output [1:0] vga_g, output [1:0] vga_b, output vga_hs, output pwm_out, output debug";
    const { findings } = await check({
      "top.v": `module gc_entry(${ports});
  assign rst_n = clk; assign vga_r = 0; assign vga_g = 0; assign vga_b = 0; assign vga_hs = 0; assign pwm_out = 0; assign debug = 0;
endmodule
`,
    });
    const problems = findings.filter((f) => f.rule.startsWith("source.ports")).map((f) => [f.rule, f.verdict, f.title]);
    expect(problems).toEqual([
      ["source.ports.direction", "fail", "Pin rst_n is an output; the pin list says input"],
      ["source.ports.width", "fail", "Pin vga_r is 3 bit(s) wide; the pin list says 2"],
      ["source.ports.missing", "fail", "Pin vga_vs is missing from the top module"],
      ["source.ports.extra", "fail", "Port debug is not on the pin list"],
    ]);
  });

  it("fails a missing top module and turns a yosys error into a finding", async () => {
    const missing = await check({ "other.v": "module not_the_top(input clk); endmodule\n" });
    expect(missing.findings).toEqual([expect.objectContaining({ rule: "source.top", verdict: "fail" })]);
    const broken = await check({ "rtl/bad name;x.v": "module gc_entry(input clk);\n  wire a = ;\nendmodule\n" });
    expect(broken.findings).toHaveLength(1);
    expect(broken.findings[0]).toMatchObject({ rule: "source.yosys", verdict: "fail" });
    // The message names the upload's own file, not the staged copy.
    expect(broken.findings[0].evidence).toMatch(/rtl\/bad name;x\.v:2/);
  });

  it("kills an endless generate loop at its limit with a clear finding", async () => {
    const { findings } = await check(
      {
        "top.v": `module gc_entry(input clk, output [7:0] q);
  genvar i;
  generate for (i = 0; i < 2000000000; i = i + 1) begin : g
    wire [7:0] w = i;
  end endgenerate
  assign q = 0;
endmodule
`,
      },
      DEMO_RULESET,
      { limits: { cpuSeconds: 2, wallSeconds: 6, memoryBytes: 1_000_000_000 } },
    );
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ rule: "source.yosys", verdict: "fail" });
    expect(findings[0].title).toMatch(/could not finish/);
  });
});
