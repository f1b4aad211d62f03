// The reference capture's speed: cycles per second against real time (25.175 MHz) and against Icarus
// Verilog (iverilog/vvp from Debian) on the same generated designs, measured in the same run.
// Run alone: npx tsx scripts/bench/simulation.bench.ts
import { execFileSync } from "node:child_process";
import { chmodSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { DEMO_RULESET } from "../../app/rules/ruleset";
import { RUNTIME_CXX_FLAGS } from "../../app/simulation/build.server";
import { runReferenceCapture, type ReferenceCapture } from "../../app/simulation/capture.server";
import { verilatorRuntime } from "../../app/simulation/runtime-cache.server";
import { entryShapedDesign, flipFlopHeavyDesign } from "./designs";

const REAL_TIME_HZ = 25_175_000;
// one second of picture: the window the flash rule counts in, and the demo rulesets' capture length
const FRAMES = 60;
// best of five: this machine is shared, and a slower run measures the neighbours, not Gatecrash
const REPEATS = 5;
const ICARUS_CYCLES = 100_000;

const testbench = (cycles: number) => `\`timescale 1ns/1ps
module bench;
  reg clk = 0, rst_n = 0;
  wire [1:0] r, g, b; wire hs, vs, pwm;
  reg [31:0] acc = 0;
  integer i;
  gc_entry dut(.clk(clk), .rst_n(rst_n), .vga_r(r), .vga_g(g), .vga_b(b), .vga_hs(hs), .vga_vs(vs), .pwm_out(pwm));
  initial begin
    for (i = 0; i < 20; i = i + 1) begin #1 clk = 1; #1 clk = 0; end
    rst_n = 1;
    for (i = 0; i < ${cycles}; i = i + 1) begin
      #1 clk = 1; #1 clk = 0;
      acc = acc + {r, g, b, hs, vs, pwm}; // read every output every clock, as the harness does
    end
    $display("acc %0d", acc);
    $finish;
  end
endmodule
`;

function seconds(fn: () => void): number {
  const t = process.hrtime.bigint();
  fn();
  return Number(process.hrtime.bigint() - t) / 1e9;
}

/** Generic cells and flip-flops after a yosys synthesis to simple gates. */
function gateCount(root: string, file: string): { cells: number; flipFlops: number } {
  const json = join(root, "stat.json");
  writeFileSync(join(root, "stat.ys"), `read_verilog ${file}\nsynth -top gc_entry\nabc -g AND,NAND,OR,NOR,XOR,XNOR,ANDNOT,ORNOT,MUX\ntee -q -o ${json} stat -json\n`);
  execFileSync("yosys", ["-q", "-s", join(root, "stat.ys")]);
  const mod = JSON.parse(readFileSync(json, "utf8")).modules["\\gc_entry"];
  const flipFlops = Object.entries(mod.num_cells_by_type as Record<string, number>)
    .filter(([type]) => /DFF/i.test(type))
    .reduce((n, [, count]) => n + count, 0);
  return { cells: mod.num_cells, flipFlops };
}

const mhz = (n: number) => `${(n / 1e6).toFixed(2)} M cycles/s`;
const rt = (n: number) => `${(n / REAL_TIME_HZ).toFixed(2)}x real time`;

async function timedCapture(root: string, name: string, encode: boolean, plainBuild = false): Promise<{ capture: ReferenceCapture; afterBuildMs: number }> {
  const t0 = Date.now();
  const capture = await runReferenceCapture({
    sourceDir: join(root, "src"), verilogFiles: ["entry.v"], ruleset: DEMO_RULESET, frames: FRAMES, workDir: join(root, name), encode,
    // the shortcuts measured here include the profile-guided build, which checks make only for long captures
    ...(plainBuild ? { profileGuided: false, forceBothEdges: true } : { profileGuided: true }),
  });
  const wall = Date.now() - t0;
  if (!capture.speed) throw new Error(`bench design failed: ${JSON.stringify(capture.findings[0])}`);
  rmSync(join(root, name), { recursive: true, force: true });
  return { capture, afterBuildMs: wall - capture.speed.buildMs };
}

async function benchDesign(label: string, source: string): Promise<{ label: string; endToEnd: number }> {
  const root = mkdtempSync(join(tmpdir(), "gc-bench-sim-"));
  chmodSync(root, 0o755);
  try {
    mkdirSync(join(root, "src"));
    writeFileSync(join(root, "src", "entry.v"), source);
    const { cells, flipFlops } = gateCount(root, join(root, "src", "entry.v"));
    console.log(`\n${label}: ${cells} generic cells, ${flipFlops} flip-flops after yosys synth; ${FRAMES} frames, best of ${REPEATS}`);

    let best: { capture: ReferenceCapture; afterBuildMs: number } | null = null;
    let bestLoop = 0;
    for (let i = 0; i < REPEATS; i++) {
      const run = await timedCapture(root, `plain${i}`, false);
      if (!best || run.afterBuildMs < best.afterBuildMs) best = run;
      bestLoop = Math.max(bestLoop, run.capture.speed!.cyclesPerSecond);
    }
    const encoded = await timedCapture(root, "encoded", true);
    // the reference in the same run, measured the same way: builds without a profile, evaluating both clock edges
    let plainLoop = 0;
    for (let i = 0; i < REPEATS; i++) plainLoop = Math.max(plainLoop, (await timedCapture(root, `plain-build${i}`, false, true)).capture.speed!.cyclesPerSecond);
    const speed = best!.capture.speed!;
    const endToEnd = speed.cycles / (best!.afterBuildMs / 1000);
    const withEncode = encoded.capture.speed!.cycles / (encoded.afterBuildMs / 1000);

    mkdirSync(join(root, "icarus"));
    writeFileSync(join(root, "icarus", "bench.v"), testbench(ICARUS_CYCLES));
    const vvp = join(root, "icarus", "bench.vvp");
    execFileSync("iverilog", ["-o", vvp, join(root, "icarus", "bench.v"), join(root, "src", "entry.v")]);
    const icarusS = seconds(() => execFileSync("vvp", ["-n", vvp], { stdio: "ignore" }));
    const icarusRate = (ICARUS_CYCLES + 20) / icarusS;

    console.log(`  model loop (inside the harness):  ${mhz(bestLoop)} = ${rt(bestLoop)} (${speed.edgeMode} evaluation, ${speed.profileGuided ? "profile-guided" : "no profile"}, ${speed.cycles} cycles)`);
    console.log(`  same loop, plain build:          ${mhz(plainLoop)} (both edges, no profile, best of ${REPEATS}): the shortcuts give ${(bestLoop / plainLoop).toFixed(2)}x`);
    console.log(`  whole capture, no encode:         ${mhz(endToEnd)} = ${rt(endToEnd)} (${best!.afterBuildMs} ms after a ${speed.buildMs} ms build: run, frames, stills, audio, flash)`);
    console.log(`  whole capture + WebM and MP4:     ${mhz(withEncode)} = ${rt(withEncode)} (${encoded.afterBuildMs} ms)`);
    console.log(`  icarus (vvp, compile excluded):   ${mhz(icarusRate)} (${ICARUS_CYCLES} cycles in ${icarusS.toFixed(2)} s)`);
    console.log(`  ratios: whole capture / real time ${(endToEnd / REAL_TIME_HZ).toFixed(2)} (goal >= 1); model loop / icarus ${(bestLoop / icarusRate).toFixed(0)}x, whole capture / icarus ${(endToEnd / icarusRate).toFixed(0)}x (goal >= 100x)`);
    return { label, endToEnd };
  } finally {
    rmSync(root, { recursive: true, force: true });
  }
}

export async function benchSimulation(): Promise<void> {
  // verilator's runtime library is built once per machine and reused; keep that out of the timings
  await verilatorRuntime(RUNTIME_CXX_FLAGS);
  const results = [
    await benchDesign("entry-shaped design (tables, multipliers, sprite, dither, two voices)", entryShapedDesign()),
    await benchDesign("flip-flop-heavy design (48 LFSRs XORed, three multipliers)", flipFlopHeavyDesign()),
  ];
  console.log("\nreal-time goal (whole capture without encoding >= 1x):");
  for (const r of results) console.log(`  ${r.endToEnd >= REAL_TIME_HZ ? "met    " : "not met"} ${(r.endToEnd / REAL_TIME_HZ).toFixed(2)}x  ${r.label}`);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  benchSimulation().catch((e: unknown) => {
    console.error(e);
    process.exit(1);
  });
}
