import { execFile } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PINS, DEMO_RULESET } from "../../app/rules/ruleset";
import { DEMO_DESIGNS, designPath, type DemoDesign } from "./index";

// yosys (Debian) and Icarus Verilog are the references here. These are our own trusted demo
// files, so the tools run directly, without the upload sandbox.
const run = promisify(execFile);
const TOP = DEMO_RULESET.topModule;

interface YosysPort { direction: string; bits: unknown[] }
interface Facts {
  ports: Record<string, { direction: string; width: number }>;
  cellsByType: Record<string, number>;
  cells: number;
}

const facts = new Map<string, Facts>();
let work = "";

function moduleOf<T>(modules: Record<string, T>, name: string): T {
  const found = modules[name] ?? modules[`\\${name}`];
  if (!found) throw new Error(`yosys output has no module ${name}: ${Object.keys(modules).join(", ")}`);
  return found;
}

/** One yosys run per design: ports after `proc`, then generic cells after `synth`. */
async function yosysFacts(design: DemoDesign): Promise<Facts> {
  const portsJson = join(work, `${design.slug}.ports.json`);
  const statJson = join(work, `${design.slug}.stat.json`);
  const script = [
    `read_verilog ${designPath(design.slug)}`,
    `hierarchy -check -top ${TOP}`,
    "proc",
    `write_json ${portsJson}`,
    `synth -top ${TOP}`,
    `tee -q -o ${statJson} stat -json`,
  ].join("; ");
  await run("yosys", ["-q", "-p", script], { maxBuffer: 16 * 1024 * 1024 });
  const netlist = JSON.parse(readFileSync(portsJson, "utf8")) as { modules: Record<string, { ports: Record<string, YosysPort> }> };
  const ports: Facts["ports"] = {};
  for (const [name, port] of Object.entries(moduleOf(netlist.modules, TOP).ports)) {
    ports[name] = { direction: port.direction, width: port.bits.length };
  }
  const statText = readFileSync(statJson, "utf8");
  const stat = JSON.parse(statText.slice(statText.indexOf("{"))) as {
    modules: Record<string, { num_cells: number; num_cells_by_type: Record<string, number> }>;
  };
  const top = moduleOf(stat.modules, TOP);
  return { ports, cellsByType: top.num_cells_by_type, cells: top.num_cells };
}

const FLIP_FLOP = /^\$_(DFF|DFFE|SDFF|SDFFE|SDFFCE|DFFSR|DFFSRE|ALDFF|ALDFFE)_/;
const RESETLESS_FLIP_FLOP = /^\$_DFFE?_[PN]{1,2}_$/; // $_DFF_P_, $_DFFE_PP_ …: no reset input
const LATCH = /^\$_DLATCH/;

function count(cells: Record<string, number>, pattern: RegExp): number {
  return Object.entries(cells).reduce((sum, [type, n]) => (pattern.test(type) ? sum + n : sum), 0);
}

/** Run `tasks` with at most `limit` at a time (the machine has two cores). */
async function pooled<T>(items: T[], limit: number, task: (item: T) => Promise<void>): Promise<void> {
  const queue = [...items];
  await Promise.all(Array.from({ length: limit }, async () => {
    for (let item = queue.shift(); item !== undefined; item = queue.shift()) await task(item);
  }));
}

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), "gc-demo-designs-"));
  await pooled(DEMO_DESIGNS, 2, async (d) => {
    facts.set(d.slug, await yosysFacts(d));
  });
}, 180_000);

afterAll(() => {
  if (work) rmSync(work, { recursive: true, force: true });
});

describe("demo design catalogue", () => {
  it("has eight entries with unique slugs, each a file on disk", () => {
    expect(DEMO_DESIGNS).toHaveLength(8);
    expect(new Set(DEMO_DESIGNS.map((d) => d.slug)).size).toBe(8);
    for (const d of DEMO_DESIGNS) expect(existsSync(designPath(d.slug)), d.slug).toBe(true);
    expect(() => designPath("no-such-entry")).toThrow(/unknown demo design/);
  });

  it("has four clean entries and one breaker of each kind", () => {
    expect(DEMO_DESIGNS.filter((d) => d.breaks === null)).toHaveLength(4);
    expect(DEMO_DESIGNS.map((d) => d.breaks).filter((b) => b !== null).sort()).toEqual(
      ["extra-port", "hsync-polarity", "latch", "system-task"],
    );
  });

  it("puts three entries in open and five in judging, with at most one breaker in judging", () => {
    const judging = DEMO_DESIGNS.filter((d) => d.competition === "judging");
    expect(DEMO_DESIGNS.filter((d) => d.competition === "open")).toHaveLength(3);
    expect(judging).toHaveLength(5);
    expect(judging.filter((d) => d.breaks !== null).length).toBeLessThanOrEqual(1);
  });
});

describe.each(DEMO_DESIGNS)("$slug ($title by $crew)", (design) => {
  const get = (): Facts => {
    const f = facts.get(design.slug);
    if (!f) throw new Error(`no yosys facts for ${design.slug}`);
    return f;
  };

  it("has the pin list's ports, with exactly one extra for the extra-port breaker", () => {
    const { ports } = get();
    for (const pin of DEMO_PINS) {
      expect(ports[pin.name], `${design.slug}: port ${pin.name}`).toEqual({ direction: pin.direction, width: pin.width });
    }
    const extra = Object.keys(ports).filter((name) => !DEMO_PINS.some((p) => p.name === name));
    expect(extra).toHaveLength(design.breaks === "extra-port" ? 1 : 0);
  });

  it("synthesises to a tile-sized design, with a latch only in the latch breaker", () => {
    const { cellsByType, cells } = get();
    const flipFlops = count(cellsByType, FLIP_FLOP);
    expect(cells).toBeGreaterThan(300);
    expect(cells).toBeLessThan(6000);
    expect(flipFlops).toBeGreaterThanOrEqual(40);
    expect(flipFlops).toBeLessThanOrEqual(200);
    // Silicon has no initial values: every flip-flop takes rst_n.
    expect(count(cellsByType, RESETLESS_FLIP_FLOP), JSON.stringify(cellsByType)).toBe(0);
    if (design.breaks === "latch") expect(count(cellsByType, LATCH)).toBeGreaterThan(0);
    else expect(count(cellsByType, LATCH), JSON.stringify(cellsByType)).toBe(0);
  });

  it("calls a system task only if it is the system-task breaker", () => {
    // yosys accepts $display (EDA.md), so the breaker must be caught by the pre-check, not the parse.
    const source = readFileSync(designPath(design.slug), "utf8").replace(/\/\/.*$/gm, "");
    const tasks = [...source.matchAll(/\$([a-z_][a-z0-9_]*)/g)].map((m) => m[1]).filter((n) => n !== "signed" && n !== "unsigned");
    expect(tasks).toEqual(design.breaks === "system-task" ? ["display"] : []);
  });

  it("drives 800-clock lines with a 96-clock hsync pulse of the right polarity (Icarus Verilog)", async () => {
    // VESA DMT 640x480 @ 60 Hz: 800 clocks per line, 96-clock sync pulse, negative polarity.
    const dir = mkdtempSync(join(work, `${design.slug}-iv-`));
    const bench = join(dir, "bench.v");
    writeFileSync(bench, `
module bench;
  reg clk = 1'b0, rst_n = 1'b0;
  wire [1:0] r, g, b;
  wire hs, vs, pwm;
  integer cycle, low, falls, first_fall, last_fall;
  reg last_hs;
  ${TOP} dut (.clk(clk), .rst_n(rst_n), .vga_r(r), .vga_g(g), .vga_b(b), .vga_hs(hs), .vga_vs(vs), .pwm_out(pwm));
  always #5 clk = ~clk;
  initial begin
    low = 0; falls = 0; first_fall = -1; last_fall = -1;
    repeat (4) @(posedge clk);
    rst_n = 1'b1;
    @(posedge clk); #1 last_hs = hs;
    for (cycle = 0; cycle < 4000; cycle = cycle + 1) begin
      @(posedge clk); #1;
      if (!hs) low = low + 1;
      if (last_hs && !hs) begin falls = falls + 1; if (first_fall < 0) first_fall = cycle; last_fall = cycle; end
      last_hs = hs;
    end
    $display("RESULT low=%0d falls=%0d span=%0d", low, falls, last_fall - first_fall);
    $finish;
  end
endmodule
`);
    const binary = join(dir, "bench.vvp");
    await run("iverilog", ["-g2005", "-o", binary, "-s", "bench", bench, designPath(design.slug)]);
    const { stdout } = await run("vvp", ["-n", binary]);
    const m = /RESULT low=(\d+) falls=(\d+) span=(\d+)/.exec(stdout);
    expect(m, stdout).not.toBeNull();
    const [low, falls, span] = [Number(m![1]), Number(m![2]), Number(m![3])];
    expect(falls).toBeGreaterThanOrEqual(4);
    expect(span).toBe((falls - 1) * 800); // every falling edge exactly one line apart
    const activeLow = low < 2000;
    expect(activeLow).toBe(design.breaks !== "hsync-polarity");
    expect(activeLow ? low : 4000 - low).toBe(5 * 96); // 4000 clocks = 5 lines, one pulse each
  });
});
