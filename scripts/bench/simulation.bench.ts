// The reference capture's speed: cycles per second against real time (25.175 MHz) and against
// Icarus Verilog (iverilog/vvp from Debian) on the same generated design, measured in the same run.
// Run alone: npx tsx scripts/bench/simulation.bench.ts
import { execFileSync } from "node:child_process";
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { DEMO_RULESET } from "../../app/conformance/ruleset";
import { runReferenceCapture } from "../../app/simulation/capture.server";

const REAL_TIME_HZ = 25_175_000;
const FRAMES = 30;
const ICARUS_CYCLES = 200_000;

/** A VGA entry of a few thousand gates: timing counters, LFSR noise, a multiplier plasma, a PWM tone. */
export function benchDesign(lfsrs = 48): string {
  const lfsrRegs = Array.from({ length: lfsrs }, (_, i) => `  reg [15:0] n${i};`).join("\n");
  const lfsrReset = Array.from({ length: lfsrs }, (_, i) => `n${i} <= 16'h${((0xace1 + i * 0x1111) & 0xffff || 1).toString(16)};`).join(" ");
  const lfsrStep = Array.from({ length: lfsrs }, (_, i) => `n${i} <= {n${i}[14:0], n${i}[15] ^ n${i}[13] ^ n${i}[12] ^ n${i}[10] ^ x[${i % 10}]};`).join("\n      ");
  const noise = Array.from({ length: lfsrs }, (_, i) => `n${i}[7:0]`).join(" ^ ");
  return `module gc_entry (
  input wire clk, input wire rst_n,
  output reg [1:0] vga_r, output reg [1:0] vga_g, output reg [1:0] vga_b,
  output reg vga_hs, output reg vga_vs, output reg pwm_out
);
  reg [9:0] x, y;
  reg [7:0] t;
  reg [11:0] phase;
  reg [7:0] level;
${lfsrRegs}
  wire [7:0] nz = ${noise};
  wire [15:0] p1 = (x[7:0] + t) * (y[7:0] - t);
  wire [15:0] p2 = (x[8:1] ^ y[8:1]) * (t + nz[3:0]);
  wire [15:0] p3 = (p1[15:8] ^ nz) * (p2[12:5] + y[7:0]);
  wire [7:0] plasma = p1[15:8] + p2[14:7] + p3[15:8] + (nz & 8'h0f);
  wire visible = x < 640 && y < 480;
  always @(posedge clk) begin
    if (!rst_n) begin
      x <= 0; y <= 0; t <= 0; phase <= 0; level <= 0; pwm_out <= 0;
      vga_r <= 0; vga_g <= 0; vga_b <= 0; vga_hs <= 1; vga_vs <= 1;
      ${lfsrReset}
    end else begin
      if (x == 799) begin x <= 0; if (y == 524) begin y <= 0; t <= t + 1; end else y <= y + 1; end
      else x <= x + 1;
      vga_hs <= !(x >= 656 && x < 752);
      vga_vs <= !(y >= 490 && y < 492);
      vga_r <= visible ? plasma[7:6] : 0;
      vga_g <= visible ? plasma[5:4] ^ nz[1:0] : 0;
      vga_b <= visible ? p1[9:8] : 0;
      ${lfsrStep}
      phase <= phase + 12'd7;
      level <= level + 1;
      pwm_out <= level < phase[11:4];
    end
  end
endmodule
`;
}

const TESTBENCH = `\`timescale 1ns/1ps
module bench;
  reg clk = 0, rst_n = 0;
  wire [1:0] r, g, b; wire hs, vs, pwm;
  reg [31:0] acc = 0;
  integer i;
  gc_entry dut(.clk(clk), .rst_n(rst_n), .vga_r(r), .vga_g(g), .vga_b(b), .vga_hs(hs), .vga_vs(vs), .pwm_out(pwm));
  initial begin
    for (i = 0; i < 20; i = i + 1) begin #1 clk = 1; #1 clk = 0; end
    rst_n = 1;
    for (i = 0; i < ${ICARUS_CYCLES}; i = i + 1) begin
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

export async function benchSimulation(): Promise<void> {
  const root = mkdtempSync(join(tmpdir(), "gc-bench-sim-"));
  chmodSync(root, 0o755);
  try {
    const src = join(root, "src");
    mkdirSync(src);
    writeFileSync(join(src, "entry.v"), benchDesign());
    writeFileSync(join(root, "stat.ys"), `read_verilog ${join(src, "entry.v")}\nsynth -top gc_entry\nabc -g AND,NAND,OR,NOR,XOR,XNOR,ANDNOT,ORNOT,MUX\ntee -o ${join(root, "stat.json")} stat -json\n`);
    execFileSync("yosys", ["-q", "-s", join(root, "stat.ys")]);
    const stat = JSON.parse(execFileSync("cat", [join(root, "stat.json")]).toString());
    console.log(`design: ${stat.modules["\\gc_entry"]?.num_cells ?? stat.design?.num_cells} generic cells after yosys synth`);

    const request = { sourceDir: src, verilogFiles: ["entry.v"], ruleset: DEMO_RULESET, frames: FRAMES };
    let t0 = Date.now();
    const plain = await runReferenceCapture({ ...request, workDir: join(root, "plain"), encode: false });
    const plainMs = Date.now() - t0;
    t0 = Date.now();
    const encoded = await runReferenceCapture({ ...request, workDir: join(root, "encoded"), encode: true });
    const encodedMs = Date.now() - t0;
    if (!plain.speed || !encoded.speed) throw new Error(`bench design failed: ${JSON.stringify(plain.findings[0] ?? encoded.findings[0])}`);

    mkdirSync(join(root, "icarus"));
    writeFileSync(join(root, "icarus", "bench.v"), TESTBENCH);
    const vvpFile = join(root, "icarus", "bench.vvp");
    execFileSync("iverilog", ["-o", vvpFile, join(root, "icarus", "bench.v"), join(src, "entry.v")]);
    const icarusS = seconds(() => execFileSync("vvp", ["-n", vvpFile], { stdio: "ignore" }));
    const icarusRate = (ICARUS_CYCLES + 20) / icarusS;

    const c = plain.speed.cycles;
    const simRate = plain.speed.cyclesPerSecond; // the model loop alone, measured inside the harness
    // whole capture after the build: run + frames + audio + flash (+ encode); the build is reported apart
    const captureRate = c / ((plainMs - plain.speed.buildMs) / 1000);
    const encodedRate = encoded.speed.cycles / ((encodedMs - encoded.speed.buildMs) / 1000);
    const fmt = (n: number) => `${(n / 1e6).toFixed(2)} M cycles/s`;
    console.log(`verilator model loop:     ${fmt(simRate)} = ${(simRate / REAL_TIME_HZ).toFixed(2)}x real time (${c} cycles, ${FRAMES} frames, ${plain.speed.seconds.toFixed(3)} s wall, ${plain.speed.cpuSeconds.toFixed(3)} s CPU)`);
    console.log(`whole capture, no encode: ${fmt(captureRate)} = ${(captureRate / REAL_TIME_HZ).toFixed(2)}x real time (${plainMs - plain.speed.buildMs} ms; verilator build ${plain.speed.buildMs} ms apart)`);
    console.log(`whole capture + encode:   ${fmt(encodedRate)} = ${(encodedRate / REAL_TIME_HZ).toFixed(2)}x real time (${encodedMs - encoded.speed.buildMs} ms incl. WebM + MP4; build ${encoded.speed.buildMs} ms apart)`);
    console.log(`icarus (vvp):             ${fmt(icarusRate)} (${ICARUS_CYCLES} cycles in ${icarusS.toFixed(2)} s, compile excluded)`);
    console.log(`ratio verilator loop / icarus: ${(simRate / icarusRate).toFixed(0)}x (goal >= 100x); loop / real time: ${(simRate / REAL_TIME_HZ).toFixed(2)} (goal >= 1)`);
  } finally {
    rmSync(root, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  benchSimulation().catch((e: unknown) => {
    console.error(e);
    process.exit(1);
  });
}
