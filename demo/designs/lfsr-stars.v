// "Night Shift Orbit" by Tinfoil Orchard, Voltage Drop 2027 (invented demo data).
// Four layers of stars drift past a banded planet: a shift register, re-seeded every frame
// and stepped once per line, picks each line's stars; a sigma-delta triangle tune plays on
// pwm_out. Passes every rule.
module gc_entry (
  input            clk,
  input            rst_n,
  output reg [1:0] vga_r,
  output reg [1:0] vga_g,
  output reg [1:0] vga_b,
  output reg       vga_hs,
  output reg       vga_vs,
  output reg       pwm_out
);
  // VESA DMT 640x480 @ 60 Hz: 640+16+96+48 clocks per line, 480+10+2+33 lines per frame.
  localparam H_VISIBLE = 10'd640, H_SYNC_START = 10'd656, H_SYNC_END = 10'd752, H_LAST = 10'd799;
  localparam V_VISIBLE = 10'd480, V_SYNC_START = 10'd490, V_SYNC_END = 10'd492, V_LAST = 10'd524;
  localparam [15:0] STAR_SEED = 16'hACE1;

  reg [9:0] h, v;
  reg [9:0] frame;
  wire end_of_line  = (h == H_LAST);
  wire end_of_frame = end_of_line && (v == V_LAST);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      h <= 10'd0; v <= 10'd0; frame <= 10'd0;
    end else begin
      h <= end_of_line ? 10'd0 : h + 10'd1;
      if (end_of_line) v <= (v == V_LAST) ? 10'd0 : v + 10'd1;
      if (end_of_frame) frame <= frame + 10'd1;
    end

  // Galois LFSR, x^16 + x^14 + x^13 + x^11 + 1. The same seed each frame gives every line
  // the same stars every frame; only their positions move.
  reg [15:0] line_random;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) line_random <= STAR_SEED;
    else if (end_of_frame) line_random <= STAR_SEED;
    else if (end_of_line) line_random <= {1'b0, line_random[15:1]} ^ (line_random[0] ? 16'hB400 : 16'h0000);

  // Distance travelled by a star of a layer: (layer + 1) pixels per frame, leftwards.
  function [9:0] travelled;
    input [1:0] layer;
    input [9:0] frames;
    travelled = frames + (layer[0] ? frames : 10'd0) + (layer[1] ? {frames[8:0], 1'b0} : 10'd0);
  endfunction

  // Brightness of a star at offset `behind` from its head: faster layers are brighter and
  // leave a longer streak.
  function [1:0] star_light;
    input [9:0] home_x;
    input [1:0] layer;
    input [9:0] beam_x;
    input [9:0] frames;
    reg [9:0] behind;
    begin
      behind = beam_x - (home_x - travelled(layer, frames));
      star_light = (behind > {7'd0, layer, 1'b0}) ? 2'd0 : (behind == 10'd0) ? 2'd3 : {1'b0, layer[1]} + 2'd1;
    end
  endfunction

  wire [1:0] star_a = star_light(line_random[9:0], line_random[11:10], h, frame);
  wire [1:0] star_b = line_random[14] ? star_light(line_random[15:6] ^ {line_random[4:0], line_random[9:5]},
                                                   line_random[13:12], h, frame) : 2'd0;
  wire [1:0] star   = (star_a > star_b) ? star_a : star_b;

  // The planet: a disc of radius 100 centred at (470, 330), banded by latitude, its bands
  // drifting with time, with a dark limb on the side away from the sun (upper left).
  wire [9:0] from_x = (h >= 10'd470) ? h - 10'd470 : 10'd470 - h;
  wire [9:0] from_y = (v >= 10'd330) ? v - 10'd330 : 10'd330 - v;
  wire [15:0] dist2 = {8'd0, from_x[7:0]} * {8'd0, from_x[7:0]} + {8'd0, from_y[7:0]} * {8'd0, from_y[7:0]};
  wire on_planet = (from_x < 10'd128) && (from_y < 10'd128) && (dist2 < 16'd10000);
  // Lit where the disc overlaps a slightly larger one shifted towards the sun.
  wire [9:0] sun_x = (h >= 10'd440) ? h - 10'd440 : 10'd440 - h;
  wire [9:0] sun_y = (v >= 10'd300) ? v - 10'd300 : 10'd300 - v;
  wire [15:0] sun_dist2 = {8'd0, sun_x[7:0]} * {8'd0, sun_x[7:0]} + {8'd0, sun_y[7:0]} * {8'd0, sun_y[7:0]};
  wire sunny     = (sun_x < 10'd128) && (sun_y < 10'd128) && (sun_dist2 < 16'd12000);
  wire [9:0] latitude = v + {4'd0, dist2[15:10]} + {2'd0, frame[9:2]};
  wire [5:0] planet_colour = latitude[4] ? (sunny ? 6'b11_01_00 : 6'b01_00_00)
                                         : (sunny ? 6'b10_10_01 : 6'b01_01_00);

  reg [5:0] colour;
  always @(*)
    if (on_planet)            colour = planet_colour;
    else if (star != 2'd0)    colour = {star, star, (star == 2'd1) ? 2'd2 : star};
    else                      colour = 6'b00_00_00;

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: a triangle wave from a 24-bit phase accumulator, turned into one bit by a
  // first-order sigma-delta modulator, at half scale. Eight notes of a pentatonic tune,
  // one per 8 frames. Increment = f * 2^24 / 25.175 MHz.
  reg [9:0] increment;
  always @(*)
    case (frame[5:3])
      3'd0: increment = 10'd174; 3'd1: increment = 10'd220; 3'd2: increment = 10'd261; 3'd3: increment = 10'd349;
      3'd4: increment = 10'd293; 3'd5: increment = 10'd261; 3'd6: increment = 10'd196; default: increment = 10'd220;
    endcase

  reg [23:0] phase;
  reg [7:0]  error_sum;
  wire [7:0] triangle = phase[23] ? ~phase[22:15] : phase[22:15];
  wire [8:0] next_sum = {1'b0, error_sum} + {2'b00, triangle[7:1]} + 9'd64;

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      phase <= 24'd0; error_sum <= 8'd0; pwm_out <= 1'b0;
    end else begin
      phase     <= phase + {14'd0, increment};
      error_sum <= next_sum[7:0];
      pwm_out   <= next_sum[8];
    end
endmodule
