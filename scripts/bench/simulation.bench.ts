// The reference capture's speed: cycles per second against real time (25.175 MHz) and against Icarus
// Verilog (iverilog/vvp from Debian) on the same generated designs, measured in the same run.
// Run alone: npx tsx scripts/bench/simulation.bench.ts
import { execFileSync } from "node:child_process";
import { chmodSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { DEMO_RULESET } from "../../app/rules/ruleset";
import { RUNTIME_CXX_FLAGS } from "../../app/simulation/build.server";
import { runReferenceCapture, type ReferenceCapture } from "../../app/simulation/capture.server";
import { verilatorRuntime } from "../../app/simulation/runtime-cache.server";
import { entryShapedDesign, flipFlopHeavyDesign, loopingEntryDesign } from "./designs";

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

/**
 * Memory of this process and every process under it (harness, ffmpeg, the sandbox around them), in bytes: the sum of
 * RSS, which counts pages the processes share (libc, the sandbox's binaries) once per process, and of PSS
 * (/proc/PID/smaps_rollup), which splits each shared page among its sharers, so that it adds up to what the tree uses.
 */
const gone = (e: unknown) => (e as NodeJS.ErrnoException).code === "ENOENT" || (e as NodeJS.ErrnoException).code === "ESRCH";

/** Proportional set size of one process in bytes; null when it has ended. */
function processPss(pid: number): number | null {
  try {
    const kb = /^Pss:\s+(\d+) kB/m.exec(readFileSync(`/proc/${pid}/smaps_rollup`, "utf8"));
    return kb ? Number(kb[1]) * 1024 : null;
  } catch (e) {
    if (!gone(e)) throw e;
    return null;
  }
}

function treeMemory(): { rss: number; pss: number } {
  const children = new Map<number, number[]>();
  const rss = new Map<number, number>();
  for (const name of readdirSync("/proc")) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = readFileSync(`/proc/${name}/stat`, "utf8");
      // pid (comm) state ppid … ; comm may hold spaces, so read after the last ")"
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      const ppid = Number(fields[1]);
      const pages = Number(fields[21]);
      rss.set(Number(name), pages * 4096);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(name)]);
    } catch (e) {
      // the process ended while we looked
      if (!gone(e)) throw e;
    }
  }
  const total = { rss: 0, pss: 0 };
  // PSS is read for the tree's processes only: smaps_rollup walks a process's page tables
  const walk = (pid: number) => {
    const own = rss.get(pid);
    if (own !== undefined) {
      total.rss += own;
      total.pss += processPss(pid) ?? own;
    }
    for (const c of children.get(pid) ?? []) walk(c);
  };
  walk(process.pid);
  return total;
}

/** Runs `fn` while sampling the process tree's memory every 50 ms; returns its result and the peaks (RSS sum, PSS sum). */
async function withPeakMemory<T>(fn: () => Promise<T>): Promise<{ value: T; peakBytes: number; peakPssBytes: number }> {
  let peak = treeMemory();
  const sample = () => { const now = treeMemory(); peak = { rss: Math.max(peak.rss, now.rss), pss: Math.max(peak.pss, now.pss) }; };
  const timer = setInterval(sample, 50);
  try {
    const value = await fn();
    sample();
    return { value, peakBytes: peak.rss, peakPssBytes: peak.pss };
  } finally {
    clearInterval(timer);
  }
}

const WHOLE_REPEATS = Number(process.env.BENCH_WHOLE_REPEATS ?? 3);
const LOOP_FRAMES = Number(process.env.BENCH_LOOP_FRAMES ?? 3596); // 60.0 s at 59.94 Hz

/**
 * Issue 13's goal: a whole 60 s looping demo of the entry-shaped design captured, analysed (flash, thumbnails,
 * audio) and encoded to WebM and MP4 in at most its own running time, build excluded; beside it the plain one-second
 * capture of before, measured the same way in the same run. Best of WHOLE_REPEATS (default 3; the issue asks five:
 * BENCH_WHOLE_REPEATS=5), peak memory of the whole process tree.
 */
async function benchWholeDemo(): Promise<void> {
  const root = mkdtempSync(join(tmpdir(), "gc-bench-whole-"));
  chmodSync(root, 0o755);
  try {
    mkdirSync(join(root, "src"));
    writeFileSync(join(root, "src", "entry.v"), loopingEntryDesign(LOOP_FRAMES));
    const base = process.memoryUsage().rss;
    const capture = async (name: string, frames: number | null) => {
      const t0 = Date.now();
      const { value, peakBytes, peakPssBytes } = await withPeakMemory(() => runReferenceCapture({
        sourceDir: join(root, "src"), verilogFiles: ["entry.v"], ruleset: DEMO_RULESET, frames, workDir: join(root, name), encode: true,
      }));
      const wall = Date.now() - t0;
      if (!value.speed) throw new Error(`bench design failed: ${JSON.stringify(value.findings[0])}`);
      rmSync(join(root, name), { recursive: true, force: true });
      return { capture: value, afterBuildMs: wall - value.speed.buildMs, buildMs: value.speed.buildMs, peakBytes, peakPssBytes };
    };
    console.log(`\nwhole-demo capture: the entry-shaped design looping every ${LOOP_FRAMES} frames; WebM + MP4 encoded; best of ${WHOLE_REPEATS}`);
    // a first run builds the model (and its profile) into the model cache; the timed runs reuse it, the build is reported apart
    const first = await capture("warm", null);
    console.log(`  build (reported apart): ${first.buildMs} ms${first.capture.speed!.profileGuided ? ", profile-guided" : ""}; ${first.capture.loop!.statement}`);
    let best: Awaited<ReturnType<typeof capture>> | null = null;
    // the warm run's peak holds the compiler; the timed runs take the model from the cache, as a repeat upload does
    let wholePeak = 0, wholePss = 0;
    for (let i = 0; i < WHOLE_REPEATS; i++) {
      const run = await capture(`whole${i}`, null);
      wholePeak = Math.max(wholePeak, run.peakBytes);
      wholePss = Math.max(wholePss, run.peakPssBytes);
      if (!best || run.afterBuildMs < best.afterBuildMs) best = run;
    }
    let plain: Awaited<ReturnType<typeof capture>> | null = null;
    let plainPeak = 0, plainPss = 0;
    for (let i = 0; i < WHOLE_REPEATS; i++) {
      const run = await capture(`second${i}`, FRAMES);
      plainPeak = Math.max(plainPeak, run.peakBytes);
      plainPss = Math.max(plainPss, run.peakPssBytes);
      if (!plain || run.afterBuildMs < plain.afterBuildMs) plain = run;
    }
    const peak = Math.max(wholePeak, plainPeak);
    const peakPss = Math.max(wholePss, plainPss);
    const demoSeconds = best!.capture.loop!.periodSeconds ?? best!.capture.loop!.capturedSeconds;
    const ratio = best!.afterBuildMs / 1000 / demoSeconds;
    const plainSeconds = FRAMES / (REAL_TIME_HZ / (800 * 525));
    const plainRatio = plain!.afterBuildMs / 1000 / plainSeconds;
    // a timed run that built its model again holds the compiler's memory in its peak
    console.log(`  whole demo (${demoSeconds.toFixed(1)} s loop + 1 s wrap-around for the flash check): ${(best!.afterBuildMs / 1000).toFixed(1)} s wall; model ${best!.capture.speed!.modelCached ? "from the cache" : `built again (${best!.buildMs} ms)`}`);
    console.log(`  ratio against the demo's duration: ${ratio.toFixed(2)}x   (goal <= 1.0x: ${ratio <= 1 ? "met" : "not met"})`);
    // the model loop runs on one core whatever else overlaps it: the whole capture cannot take less wall time
    const sim = best!.capture.speed!;
    console.log(`  of that, the model loop inside the harness: ${sim.seconds.toFixed(1)} s wall, ${sim.cpuSeconds.toFixed(1)} s CPU = ${(sim.seconds / demoSeconds).toFixed(2)}x the demo's duration (${(sim.cyclesPerSecond / REAL_TIME_HZ).toFixed(2)}x real time), the floor for one core`);
    console.log(`  plain 1 s capture (${FRAMES} frames, encoded): ${(plain!.afterBuildMs / 1000).toFixed(2)} s wall = ${plainRatio.toFixed(2)}x its duration; whole demo / 1 s capture: ${(best!.afterBuildMs / plain!.afterBuildMs).toFixed(1)}x the wall time for ${(demoSeconds / plainSeconds).toFixed(0)}x the picture`);
    const mb = (n: number) => `${(n / 1e6).toFixed(0)} MB`;
    // PSS is the figure the goal is judged by: the RSS sum counts the pages the processes share once per process
    console.log(`  peak memory (this process and its children, sampled every 50 ms): ${mb(peakPss)} PSS, ${mb(peak)} summed RSS (goal < 300 MB for 180 s: ${peakPss < 300e6 ? "met" : "not met"})`);
    // the Node process's own growth over the runs: memory the captures left behind in it
    console.log(`  this Node process: ${mb(base)} RSS before the first capture, ${mb(process.memoryUsage().rss)} after the last`);
    // frames stream through: a capture 60 times longer should need no more memory than the 1 s one
    console.log(`  peak by length (PSS): whole ${demoSeconds.toFixed(0)} s demo ${mb(wholePss)}, 1 s capture ${mb(plainPss)} (${mb(wholePss - plainPss)} more for ${(demoSeconds / plainSeconds).toFixed(0)}x the picture)`);
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
  await benchWholeDemo();
}

if (import.meta.url === `file://${process.argv[1]}`) {
  (process.env.BENCH_WHOLE_ONLY ? benchWholeDemo() : benchSimulation()).catch((e: unknown) => {
    console.error(e);
    process.exit(1);
  });
}
