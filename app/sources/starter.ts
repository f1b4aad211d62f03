import type { Pin, Ruleset } from "~/rules/ruleset";
import { videoMode } from "~/rules/video-modes";

/**
 * The starter bundle of a compo, written from its ruleset: a minimal design that meets the ruleset (its top module,
 * its pin names and widths, its reset polarity, its video timing, every flip-flop reset), a self-checking testbench,
 * the ruleset itself and a README with the one-line local check. The testbench ends in `.tb`, so a bundle that
 * keeps it is still accepted: Gatecrash reads only .v/.sv/.vh files, and a testbench's $display would fail the
 * pre-check.
 */
export class StarterError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "StarterError";
  }
}

export interface StarterFile {
  path: string;
  body: string;
}

const bitsFor = (n: number) => Math.max(1, Math.ceil(Math.log2(n)));
const range = (w: number) => (w === 1 ? "" : `[${w - 1}:0] `);

export function starterFiles(ruleset: Ruleset, about: { compo: string; rulesetJson: string; rulesVersion: number }): StarterFile[] {
  const mode = videoMode(ruleset.videoMode);
  const top = ruleset.topModule;
  const role = (r: Pin["role"]) => ruleset.pins.find((p) => p.role === r);
  const clock = role("clock");
  if (!clock || clock.direction !== "input") throw new StarterError("this ruleset names no clock input, so no starter design can be written for it");
  const reset = role("reset");
  const xw = bitsFor(mode.h.total);
  const yw = bitsFor(mode.v.total);
  const hsStart = mode.h.active + mode.h.frontPorch;
  const vsStart = mode.v.active + mode.v.frontPorch;
  // about 440 Hz from the ruleset's clock: the top bit of a free-running counter (a fact of the trade: f / 2^n)
  const toneBits = Math.max(4, Math.round(Math.log2(ruleset.clock.frequencyHz / 440)));
  const low = ruleset.resetActive === "low";
  // a board clock faster than the pixel clock (50 MHz ÷ 2): x steps once every cpp clocks
  const cpp = ruleset.clock.clocksPerPixel;
  const pw = bitsFor(cpp);
  const lineClocks = mode.h.total * cpp;
  const resetEdge = reset ? ` or ${low ? "negedge" : "posedge"} ${reset.name}` : "";
  const inReset = reset ? (low ? `!${reset.name}` : reset.name) : "1'b0";

  const ports = ruleset.pins.map((p) => {
    const driven = p.direction === "output" && ["red", "green", "blue", "hsync", "vsync", "audio"].includes(p.role);
    return `  ${p.direction === "input" ? "input " : p.direction === "output" ? "output" : "inout "} ${driven ? "reg " : "wire"} ${range(p.width)}${p.name}`;
  });
  const colour = (p: Pin, source: string) => `      ${p.name} <= visible ? ${source} : ${p.width}'d0;`;
  const picks: Record<"red" | "green" | "blue", string> = { red: "x", green: "y", blue: "bar" };
  const driven: string[] = [];
  const resets: string[] = [];
  for (const p of ruleset.pins) {
    if (p.direction !== "output") continue;
    if (p.role === "red" || p.role === "green" || p.role === "blue") {
      const src = picks[p.role];
      const srcWidth = src === "bar" ? 3 : src === "x" ? xw : yw;
      // the upper bits under the top one: bands across the picture, fixed from frame to frame (nothing flashes)
      const hi = Math.min(srcWidth - 2, srcWidth - 1);
      const expr = p.width <= hi + 1 ? `${src}[${hi}${p.width === 1 ? "" : `:${hi - p.width + 1}`}]` : `{${p.width}{${src}[${hi}]}}`;
      driven.push(colour(p, expr));
      resets.push(`      ${p.name} <= ${p.width}'d0;`);
    } else if (p.role === "hsync") {
      driven.push(`      ${p.name} <= ${mode.h.syncPolarity === "negative" ? "~" : ""}in_hsync;`);
      resets.push(`      ${p.name} <= 1'b${mode.h.syncPolarity === "negative" ? 1 : 0};`);
    } else if (p.role === "vsync") {
      driven.push(`      ${p.name} <= ${mode.v.syncPolarity === "negative" ? "~" : ""}in_vsync;`);
      resets.push(`      ${p.name} <= 1'b${mode.v.syncPolarity === "negative" ? 1 : 0};`);
    } else if (p.role === "audio") {
      driven.push(`      ${p.name} <= tone[${toneBits - 1}] & tone[${toneBits - 2}] & tone[${toneBits - 3}]; // a soft 1/8-duty tone`);
      resets.push(`      ${p.name} <= 1'b0;`);
    }
  }
  const tiedOff = ruleset.pins
    .filter((p) => (p.direction === "output" && !["red", "green", "blue", "hsync", "vsync", "audio"].includes(p.role)) || p.direction === "inout")
    .map((p) => `  assign ${p.name} = ${p.direction === "inout" ? `{${p.width}{1'bz}}` : `${p.width}'d0`};`);

  const design = `// Starter design for ${about.compo}, written by Gatecrash from ruleset version ${about.rulesVersion}.
// ${mode.label}: ${mode.h.total} pixels a line${cpp > 1 ? ` of ${cpp} clocks each (${lineClocks} clocks)` : ""}, ${mode.v.total} lines a frame; sync pulses ${mode.h.sync} pixels / ${mode.v.sync} lines.
// Every flip-flop is reset (silicon has no initial values). Make it yours: the picture comes from x, y and bar.
module ${top} (
${ports.join(",\n")}
);
  localparam H_ACTIVE = ${mode.h.active}, H_SYNC_START = ${hsStart}, H_SYNC_END = ${hsStart + mode.h.sync}, H_LAST = ${mode.h.total - 1};
  localparam V_ACTIVE = ${mode.v.active}, V_SYNC_START = ${vsStart}, V_SYNC_END = ${vsStart + mode.v.sync}, V_LAST = ${mode.v.total - 1};

  reg [${xw - 1}:0] x;
  reg [${yw - 1}:0] y;
  reg [2:0] bar;
  reg [${toneBits - 1}:0] tone;
${cpp > 1 ? `  reg [${pw - 1}:0] pix; // clocks into the current pixel
` : ""}  wire visible = (x < H_ACTIVE) && (y < V_ACTIVE);
  wire in_hsync = (x >= H_SYNC_START) && (x < H_SYNC_END);
  wire in_vsync = (y >= V_SYNC_START) && (y < V_SYNC_END);
${tiedOff.join("\n")}

  always @(posedge ${clock.name}${resetEdge}) begin
    if (${inReset}) begin
      x <= ${xw}'d0;
      y <= ${yw}'d0;
      bar <= 3'd0;
      tone <= ${toneBits}'d0;
${cpp > 1 ? `      pix <= ${pw}'d0;
` : ""}${resets.join("\n")}
    end else begin
      tone <= tone + 1'b1;
${cpp > 1 ? `      pix <= (pix == ${pw}'d${cpp - 1}) ? ${pw}'d0 : pix + 1'b1;
      if (pix == ${pw}'d${cpp - 1}) begin
` : ""}      if (x == H_LAST) begin
        x <= ${xw}'d0;
        bar <= 3'd0;
        y <= (y == V_LAST) ? ${yw}'d0 : y + 1'b1;
      end else begin
        x <= x + 1'b1;
        if (x[6:0] == 7'd127) bar <= bar + 1'b1;
      end
${cpp > 1 ? "      end\n" : ""}${driven.join("\n")}
    end
  end
endmodule
`;

  const hs = role("hsync");
  const vs = role("vsync");
  const connections = ruleset.pins.map((p) => `.${p.name}(${p.name})`).join(", ");
  const declarations = ruleset.pins
    .map((p) => (p.direction === "input" ? `  reg ${range(p.width)}${p.name} = ${p.width}'d0;` : `  wire ${range(p.width)}${p.name};`))
    .join("\n");
  const hsActive = mode.h.syncPolarity === "negative" ? "0" : "1";
  const vsActive = mode.v.syncPolarity === "negative" ? "0" : "1";
  const testbench = `// Self-checking testbench for the starter design (Verilog-2005; runs in Icarus Verilog or any simulator).
// It holds the sync timing against ${mode.label}: ${lineClocks}-clock lines with ${mode.h.sync * cpp}-clock pulses,
// ${mode.v.total}-line frames with ${mode.v.sync}-line pulses, both of the ruleset's polarity.
\`timescale 1ns/1ps
module ${top}_check;
${declarations}
  ${top} dut (${connections});
  always #${(500e6 / ruleset.clock.frequencyHz).toFixed(3)} ${clock.name} = ~${clock.name};
  integer cycle, hs_edges, hs_first, hs_last, hs_width, vs_edges, vs_first, vs_last, failures;
  reg hs_was, vs_was;
  initial begin
    failures = 0; hs_edges = 0; vs_edges = 0; hs_width = 0; hs_first = -1; hs_last = -1; vs_first = -1; vs_last = -1;
${reset ? `    ${reset.name} = 1'b${low ? 0 : 1};\n    repeat (8) @(posedge ${clock.name});\n    ${reset.name} = 1'b${low ? 1 : 0};` : `    repeat (8) @(posedge ${clock.name});`}
    @(posedge ${clock.name}); #1 hs_was = ${hs?.name ?? "1'b0"}; vs_was = ${vs?.name ?? "1'b0"};
    for (cycle = 0; cycle < ${lineClocks * mode.v.total * 2 + lineClocks * 4}; cycle = cycle + 1) begin
      @(posedge ${clock.name}); #1;
${hs ? `      if (${hs.name} == 1'b${hsActive} && hs_was != 1'b${hsActive}) begin hs_edges = hs_edges + 1; if (hs_first < 0) hs_first = cycle; hs_last = cycle; end
      if (hs_edges == 1 && ${hs.name} == 1'b${hsActive}) hs_width = hs_width + 1;
      hs_was = ${hs.name};` : ""}
${vs ? `      if (${vs.name} == 1'b${vsActive} && vs_was != 1'b${vsActive}) begin vs_edges = vs_edges + 1; if (vs_first < 0) vs_first = cycle; vs_last = cycle; end
      vs_was = ${vs.name};` : ""}
    end
    if (hs_edges < 2 || (hs_last - hs_first) != (hs_edges - 1) * ${lineClocks}) begin failures = failures + 1; $display("FAIL hsync: %0d pulses, not one every ${lineClocks} clocks", hs_edges); end
    if (hs_width != ${mode.h.sync * cpp}) begin failures = failures + 1; $display("FAIL hsync pulse: %0d clocks, want ${mode.h.sync * cpp}", hs_width); end
    if (vs_edges < 2 || (vs_last - vs_first) != (vs_edges - 1) * ${lineClocks * mode.v.total}) begin failures = failures + 1; $display("FAIL vsync: %0d pulses, not one every ${mode.v.total} lines", vs_edges); end
    if (failures == 0) $display("starter check: PASS (${mode.label} timing)");
    else $display("starter check: FAIL (%0d problems)", failures);
    $finish;
  end
endmodule
`;

  const readme = `# Starter bundle: ${about.compo}

Gatecrash wrote this from the compo's ruleset (version ${about.rulesVersion}, in ruleset.json): a minimal design that
passes the compo's source checks and reference capture, a testbench, and this file.

- \`${top}.v\` — the design: the top module \`${top}\` with exactly the compo's pins, ${mode.label} timing, colour bands,
  a soft tone on the audio pin, every flip-flop reset (${reset ? `${reset.name}, active ${ruleset.resetActive}` : "the ruleset names no reset pin"}).
- \`check/${top}_check.tb\` — a self-checking testbench for the sync timing. Its ending is .tb, not .v, so you can
  leave it in your bundle: Gatecrash reads only .v, .sv and .vh files, and checks them for synthesizable code.
- \`ruleset.json\` — the compo's rules, every default filled in.

## Check it locally (one line, with Icarus Verilog)

    iverilog -g2005 -o check.vvp check/${top}_check.tb ${top}.v && vvp -n check.vvp

It prints \`starter check: PASS\` when the timing is right. Synthesis with yosys shows the cells and flip-flops:
\`yosys -p "read_verilog ${top}.v; synth -top ${top}; stat"\`.

## Before you upload

- Upload your sources (this folder as a .zip or .tar.gz, or a repository link and commit) and the layout (GDSII)
  your flow made **from these sources**: Gatecrash holds the layout's flip-flops, pin labels and top cell against the
  synthesized design.
- No \`include, $readmem*, $display or other system tasks in the design: the pre-check refuses them.

Cautions: a 1-bit PWM pin is a full-scale square wave with a DC offset — listen through a low-pass filter and a
coupling capacitor, and start at low volume. A passing check is not signoff: the shuttle's own design-rule and
layout-versus-schematic checks still apply.
`;
  return [
    { path: `${top}.v`, body: design },
    { path: `check/${top}_check.tb`, body: testbench },
    { path: "ruleset.json", body: about.rulesetJson },
    { path: "README.md", body: readme },
  ];
}
