import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { edgeModeHeader, edgeModeOf } from "./edge-mode";

// The model text comes from the real verilator (Debian's, as the product uses it) on designs written here;
// these are our own trusted designs, so verilator runs directly rather than in the sandbox.
const root = mkdtempSync(join(tmpdir(), "gc-edge-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function modelOf(name: string, body: string): string {
  const dir = join(root, name);
  execFileSync("mkdir", ["-p", dir]);
  writeFileSync(join(dir, "d.v"), `module gc_entry(input clk, input rst_n, output reg [1:0] q);\n${body}\nendmodule\n`);
  execFileSync("verilator", ["--cc", "-O3", "-Wno-fatal", "-Wno-lint", "-Wno-style", "--top-module", "gc_entry", "--prefix", "Vtop", "-Mdir", join(dir, "obj"), join(dir, "d.v")], { stdio: "pipe" });
  return readdirSync(join(dir, "obj"))
    .filter((n) => /^Vtop___024root__DepSet_\w+__0\.cpp$/.test(n))
    .map((n) => readFileSync(join(dir, "obj", n), "utf8"))
    .join("\n");
}

describe("which clock edges the harness must evaluate", () => {
  it("rising edge only for a design clocked on the rising edge, with a synchronous or an asynchronous reset", () => {
    expect(edgeModeOf(modelOf("sync", "always @(posedge clk) if (!rst_n) q <= 0; else q <= q + 1;"), "clk", "rst_n")).toBe("rising-only");
    expect(edgeModeOf(modelOf("async", "always @(posedge clk or negedge rst_n) if (!rst_n) q <= 0; else q <= q + 1;"), "clk", "rst_n")).toBe("rising-only");
  });

  it("both edges when anything reacts to the clock falling or to a clock made from it", () => {
    expect(edgeModeOf(modelOf("falling", "always @(negedge clk) q <= q + 1;"), "clk", "rst_n")).toBe("both-edges");
    expect(edgeModeOf(modelOf("mixed", "reg a; always @(negedge clk) a <= !a; always @(posedge clk) q <= {q[0], a};"), "clk", "rst_n")).toBe("both-edges");
    expect(edgeModeOf(modelOf("gated", "reg en; wire g = clk & en; always @(posedge clk) en <= !en; always @(posedge g) q <= q + 1;"), "clk", "rst_n")).toBe("both-edges");
    expect(edgeModeOf(modelOf("divided", "reg half; always @(posedge clk) half <= !half; always @(posedge half) q <= q + 1;"), "clk", "rst_n")).toBe("both-edges");
  });

  it("both edges when the reset pin is not the reset the ruleset names, or the text is not understood", () => {
    const asyncModel = modelOf("async2", "always @(posedge clk or negedge rst_n) if (!rst_n) q <= 0; else q <= q + 1;");
    expect(edgeModeOf(asyncModel, "clk", null)).toBe("both-edges");
    expect(edgeModeOf("", "clk", "rst_n")).toBe("both-edges");
    expect(edgeModeOf(asyncModel.replace(/__Vtrigrprev__TOP__clk\)\)\)/, "__Vtrigrprev__TOP__clk)) | 1)"), "clk", "rst_n")).toBe("both-edges");
    // a design without any clocked logic gives no rising-edge trigger to lean on
    expect(edgeModeOf(modelOf("comb", "always @* q = {clk, rst_n};"), "clk", "rst_n")).toBe("both-edges");
  });

  it("tells the harness through one define", () => {
    expect(edgeModeHeader("rising-only")).toContain("#define GC_RISING_ONLY 1");
    expect(edgeModeHeader("both-edges")).toContain("#define GC_RISING_ONLY 0");
  });
});
