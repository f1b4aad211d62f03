// Generated VGA entries of a few thousand gates for the simulation benchmark. Both obey the demo pin list.

/**
 * Shaped like a compo entry: beam counters, a 64-entry sine table (a case statement, as entrants write
 * ROMs), a plasma from three sine lookups and a product, a rotating checkerboard from four multipliers, a
 * bouncing 16×16 sprite from a bitmap table, ordered dithering down to 2 bits a channel, one LFSR for
 * sparkle, and a two-voice arpeggio from a note table mixed into the PWM pin. About 140 flip-flops.
 */
export function entryShapedDesign(): string {
  const sine = Array.from({ length: 64 }, (_, i) => Math.round(127.5 + 127.5 * Math.sin((2 * Math.PI * i) / 64)));
  const sineCase = sine.map((v, i) => `      6'd${i}: sin64 = 8'd${v};`).join("\n");
  const sprite = Array.from({ length: 16 }, (_, y) =>
    Array.from({ length: 16 }, (_, x) => { const d = Math.hypot(x - 7.5, y - 7.5); return d > 4 && d < 7.5 ? "1" : "0"; }).join(""));
  const spriteCase = sprite.map((row, i) => `      4'd${i}: sprite_row = 16'b${row};`).join("\n");
  const notes = [0, 4, 7, 12, 7, 4, 0, 5, 9, 12, 9, 5, 2, 7, 11, 14, 11, 7, 2, 0, 4, 7, 12, 16, 12, 7, 4, 5, 9, 12, 17, 12];
  // phase step per 256 clocks for a 16-bit accumulator, from 262 Hz up
  const noteCase = notes.map((n, i) => `      5'd${i}: step_of = 16'd${Math.round((262 * 2 ** (n / 12) * 65536) / (25_175_000 / 256))};`).join("\n");
  return `module gc_entry (
  input wire clk, input wire rst_n,
  output reg [1:0] vga_r, output reg [1:0] vga_g, output reg [1:0] vga_b,
  output reg vga_hs, output reg vga_vs, output reg pwm_out
);
  reg [9:0] x, y, t;
  function [7:0] sin64; input [5:0] a; case (a)
${sineCase}
      default: sin64 = 8'd0; endcase endfunction
  function [15:0] sprite_row; input [3:0] r; case (r)
${spriteCase}
      default: sprite_row = 16'd0; endcase endfunction
  function [15:0] step_of; input [4:0] n; case (n)
${noteCase}
      default: step_of = 16'd0; endcase endfunction
  wire [7:0] s1 = sin64(x[8:3] + t[5:0]);
  wire [7:0] s2 = sin64(y[8:3] - t[6:1]);
  wire [7:0] s3 = sin64(x[9:4] + y[9:4] + t[7:2]);
  wire [15:0] prod = s1 * s2;
  wire [9:0] plasma = s1 + s2 + s3 + prod[15:8];
  wire [7:0] c = sin64(t[7:2] + 6'd16), s = sin64(t[7:2]);
  wire signed [17:0] u = $signed({1'b0, x}) * $signed({1'b0, c}) - $signed({1'b0, y}) * $signed({1'b0, s});
  wire signed [17:0] w = $signed({1'b0, x}) * $signed({1'b0, s}) + $signed({1'b0, y}) * $signed({1'b0, c});
  wire tiles = u[14] ^ w[14];
  reg [9:0] sx, sy; reg dx, dy;
  wire [9:0] rx = x - sx, ry = y - sy;
  wire in_sprite = rx < 10'd64 && ry < 10'd64;
  wire [15:0] srow = sprite_row(ry[5:2]);
  wire sprite_px = in_sprite && srow[4'd15 - rx[5:2]];
  reg [15:0] lfsr;
  wire [3:0] bayer = {x[0] ^ y[0], y[0], x[1] ^ y[1], y[1]};
  wire visible = x < 640 && y < 480;
  wire [3:0] red4 = plasma[9:6] + (tiles ? 4'd3 : 4'd0);
  wire [3:0] green4 = s3[7:4] ^ {3'd0, lfsr[0] & (y[2:0] == 3'd0)};
  wire [3:0] blue4 = tiles ? prod[15:12] : s1[7:4];
  function [1:0] dith; input [3:0] v4; input [3:0] b; dith = (v4[3:2] == 2'b11) ? 2'b11 : v4[3:2] + (v4[1:0] > b[3:2]); endfunction
  reg [15:0] ph1, ph2; reg [4:0] note; reg [7:0] pwm_cnt; reg [7:0] div;
  wire [7:0] mix = (ph1[15] ? 8'd90 : 8'd0) + (ph2[15] ? 8'd60 : 8'd0) + {3'd0, lfsr[4:0] & {5{note[0]}}};
  always @(posedge clk) begin
    if (!rst_n) begin
      x <= 0; y <= 0; t <= 0; sx <= 100; sy <= 80; dx <= 0; dy <= 0; lfsr <= 16'hace1;
      ph1 <= 0; ph2 <= 0; note <= 0; pwm_cnt <= 0; div <= 0;
      vga_r <= 0; vga_g <= 0; vga_b <= 0; vga_hs <= 1; vga_vs <= 1; pwm_out <= 0;
    end else begin
      if (x == 799) begin
        x <= 0;
        if (y == 524) begin
          y <= 0; t <= t + 1;
          sx <= dx ? sx - 3 : sx + 3; sy <= dy ? sy - 2 : sy + 2;
          if (sx > 570) dx <= 1; if (sx < 6) dx <= 0;
          if (sy > 410) dy <= 1; if (sy < 4) dy <= 0;
          if (t[2:0] == 0) note <= note + 1;
        end else y <= y + 1;
      end else x <= x + 1;
      vga_hs <= !(x >= 656 && x < 752);
      vga_vs <= !(y >= 490 && y < 492);
      lfsr <= {lfsr[14:0], lfsr[15] ^ lfsr[13] ^ lfsr[12] ^ lfsr[10]};
      vga_r <= !visible ? 2'd0 : sprite_px ? 2'd3 : dith(red4, bayer);
      vga_g <= !visible ? 2'd0 : sprite_px ? 2'd3 : dith(green4, bayer);
      vga_b <= !visible ? 2'd0 : sprite_px ? 2'd1 : dith(blue4, bayer);
      div <= div + 1;
      if (div == 0) begin ph1 <= ph1 + step_of(note); ph2 <= ph2 + step_of(note + 5'd7); end
      pwm_cnt <= pwm_cnt + 1;
      pwm_out <= pwm_cnt < mix;
    end
  end
endmodule
`;
}

/**
 * The hard case: as many gates, but most of them in 48 sixteen-bit LFSRs (over 800 flip-flops, every one
 * changing every clock) XORed together, plus three multipliers. Flip-flops cost a simulator the most.
 */
export function flipFlopHeavyDesign(lfsrs = 48): string {
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

/**
 * The entry-shaped design made to loop: every state register goes back to its reset value at the end of frame
 * `frames`, at the same point of the picture where the reset left it, so the design's complete state repeats and
 * a whole-demo capture ends after exactly one loop. 3596 frames at 59.94 Hz are 60.0 s.
 */
export function loopingEntryDesign(frames = 3596): string {
  const src = entryShapedDesign();
  const at = "  always @(posedge clk) begin\n    if (!rst_n) begin";
  if (!src.includes(at)) throw new Error("the entry-shaped design changed: no reset block to loop from");
  return src.replace(
    at,
    `  reg [15:0] demo_frame;
  wire frame_end = x == 799 && y == 524;
  wire restart = frame_end && demo_frame == 16'd${frames - 1};
  always @(posedge clk)
    if (!rst_n) demo_frame <= 0;
    else if (frame_end) demo_frame <= restart ? 16'd0 : demo_frame + 16'd1;
  always @(posedge clk) begin
    if (!rst_n || restart) begin`,
  );
}
