import { randomBytes } from "node:crypto";
import { existsSync } from "node:fs";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { hostileDesigns, writeDesign, type HostileTargets } from "../../tests/fixtures/hostile/designs";
import { mapPreprocessed, scanText } from "./precheck-rules";
import { precheckPassed, precheckSources, scanElaboratedSources, scanPreprocessedSources } from "./precheck.server";

let work: string;
let targets: HostileTargets;
let secretText: string;
let n = 0;

beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), "gc-precheck-"));
  // Host-only paths the hostile designs aim at. The sandbox's /tmp is its own tmpfs.
  targets = { marker: join(work, "host-marker"), secret: join(work, "host-secret.hex") };
  secretText = randomBytes(8).toString("hex");
  await writeFile(targets.secret, `${secretText.slice(0, 8)}\n${secretText.slice(8)}\n`);
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

async function designDir(files: Record<string, string>): Promise<{ dir: string; verilogFiles: string[] }> {
  const dir = join(work, `d${n++}`);
  return { dir, verilogFiles: await writeDesign(dir, files) };
}

const clean = {
  "defs.vh": "`define WIDTH 4\n",
  "rtl/top.v": `// $display in a comment is fine, and "$system" in a string is too
module gc_entry(input clk, input rst_n, output reg [\`WIDTH-1:0] q);
  localparam integer N = $clog2(16) + $bits(q);
  wire signed [3:0] s = $signed(q);
  always @(posedge clk or negedge rst_n)
    if (!rst_n) q <= 0; else q <= q + $unsigned(s[0]);
endmodule
`,
};

describe("precheckSources", () => {
  it("passes a clean design that uses only the allowed functions and its own header", async () => {
    const { dir, verilogFiles } = await designDir(clean);
    const findings = await precheckSources(dir, verilogFiles);
    expect(findings.map((f) => f.rule)).toEqual(["precheck.clean"]);
    expect(precheckPassed(findings)).toBe(true);
  });

  it("refuses each hostile design with file and line, and none of them runs", async () => {
    const expected: Record<string, { rule: string; evidence: string; measured: string }> = {
      "system-plain": { rule: "precheck.system-call", evidence: "top.v:3", measured: "$system" },
      "system-pasted": { rule: "precheck.system-call", evidence: "top.v:1", measured: "$sys" },
      fopen: { rule: "precheck.system-call", evidence: "top.v:4", measured: "$fopen" },
      "readmemh-outside": { rule: "precheck.system-call", evidence: "top.v:3", measured: "$readmemh" },
      "include-absolute": { rule: "precheck.directive", evidence: "rtl/top.v:1", measured: "`include" },
      "dpi-import": { rule: "precheck.dpi", evidence: "top.v:1", measured: 'import "DPI-C"' },
    };
    for (const [name, files] of Object.entries(hostileDesigns(targets))) {
      const { dir, verilogFiles } = await designDir(files);
      const findings = await precheckSources(dir, verilogFiles);
      expect(precheckPassed(findings), name).toBe(false);
      const first = findings[0];
      expect({ name, rule: first.rule, evidence: first.evidence, measured: first.measured }).toEqual({ name, ...expected[name] });
      expect(first.advice, name).toBeTruthy();
      expect(JSON.stringify(findings)).not.toContain(secretText.slice(0, 8));
    }
    expect(existsSync(targets.marker)).toBe(false);
  });

  it("catches a system call that only appears after macro expansion (stage b) and maps it to its line", async () => {
    const { dir, verilogFiles } = await designDir(hostileDesigns(targets)["system-pasted"]);
    const findings = await scanPreprocessedSources(dir, verilogFiles);
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ rule: "precheck.system-call", measured: "$system", evidence: "top.v:3" });
    expect(findings[0].title).toMatch(/after macro expansion/);
    expect(existsSync(targets.marker)).toBe(false);
  });

  it("finds system calls and foreign functions in verilator's elaborated tree (stage c)", async () => {
    const designs = hostileDesigns(targets);
    const system = await designDir(designs["system-plain"]);
    const fromSystem = await scanElaboratedSources(system.dir, system.verilogFiles);
    expect(fromSystem.map((f) => [f.rule, f.evidence])).toEqual([
      ["precheck.elaborated-system-call", "top.v:3"],
      ["precheck.elaborated-system-call", "top.v:4"],
    ]);
    const dpi = await designDir(designs["dpi-import"]);
    const fromDpi = await scanElaboratedSources(dpi.dir, dpi.verilogFiles);
    expect(fromDpi).toEqual([expect.objectContaining({ rule: "precheck.foreign-function", measured: "system", evidence: "top.v:1" })]);
    expect(existsSync(targets.marker)).toBe(false);
  });

  it("reports a macro that expands without end as a preprocessing failure, within short limits", async () => {
    const { dir, verilogFiles } = await designDir({ "top.v": "`define LOOP `LOOP `LOOP\nmodule gc_entry; wire a = `LOOP; endmodule\n" });
    const findings = await precheckSources(dir, verilogFiles, { limits: { cpuSeconds: 2, wallSeconds: 4 } });
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ rule: "precheck.preprocess", verdict: "fail" });
    expect(findings[0].evidence).toMatch(/Recursive `define/);
  });

  it("reports a syntax error as a finding with verilator's message", async () => {
    const { dir, verilogFiles } = await designDir({ "top.v": "module gc_entry(input clk;\nendmodule\n" });
    const findings = await precheckSources(dir, verilogFiles);
    expect(findings[0]).toMatchObject({ rule: "precheck.elaborate", verdict: "fail" });
    expect(findings[0].evidence).toMatch(/top\.v:1/);
  });
});

describe("scanText", () => {
  const at = (line: number) => ({ file: "t.v", line });
  const scan = (text: string, macros: string[] = []) => scanText(text, at, { macros: new Set(macros), stage: "source" });

  it("ignores comments, strings and escaped identifiers", () => {
    expect(scan('// $system\n/* `include "x" \n $fopen */ wire \\$system ; initial x = "$finish";')).toEqual([]);
  });

  it("refuses tool-specific directives, stray backticks and a lone $", () => {
    const rules = scan("`systemc_imp_header\n`line 5 \"x\" 0\n` define\nwire a = $ ;").map((f) => [f.measured, f.evidence]);
    expect(rules).toEqual([
      ["`systemc_imp_header", "t.v:1"],
      ["`line", "t.v:2"],
      ["`", "t.v:3"],
      ["a lone $", "t.v:4"],
    ]);
  });

  it("accepts uses of macros the bundle defines", () => {
    expect(scan("`define X 1\nwire a = `X;", ["X"])).toEqual([]);
  });

  it("maps lines of preprocessed output back through `line directives (IEEE 1800-2017 22.12)", () => {
    const { where } = mapPreprocessed('`line 1 "src/a.v" 1\nx\ny\n`line 1 "src/b.v" 1\nz\n', (f) => f.replace(/^src\//, ""));
    expect([where(2), where(3), where(5)]).toEqual([
      { file: "a.v", line: 1 },
      { file: "a.v", line: 2 },
      { file: "b.v", line: 1 },
    ]);
  });
});

// Kept for a reader who wonders whether the secret file really is readable on the host.
it("the secret file exists on the host, so a leak would be visible", async () => {
  expect(await readFile(targets.secret, "utf8")).toContain(secretText.slice(0, 8));
});
