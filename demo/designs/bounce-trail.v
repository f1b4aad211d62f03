// "Salt Bounce" by Brine Circuit, Voltage Drop 2027 (invented demo data).
// A box bounces around the screen dragging four fading ghosts of where it has been;
// each wall it hits changes its colour and rings a short blip on pwm_out.
// Deliberate rule breaker for the demo scenario: the ghost colour below is chosen in a
// combinational block with no final else, so synthesis infers a level-sensitive latch.
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
  localparam BOX = 10'd56;

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

  // The box moves 7 px across and 4 px down per frame and reflects off the edges.
  reg [9:0] box_x, box_y;
  reg       going_left, going_up;
  reg [2:0] hue;                  // advances at every bounce
  reg [9:0] g1x, g1y, g2x, g2y, g3x, g3y, g4x, g4y;   // ghosts, newest first
  wire hit_x = going_left ? (box_x < 10'd7) : (box_x + BOX + 10'd7 > H_VISIBLE);
  wire hit_y = going_up   ? (box_y < 10'd4) : (box_y + BOX + 10'd4 > V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      box_x <= 10'd360; box_y <= 10'd260; going_left <= 1'b0; going_up <= 1'b0; hue <= 3'd1;
      g1x <= 10'd360; g1y <= 10'd260; g2x <= 10'd360; g2y <= 10'd260;
      g3x <= 10'd360; g3y <= 10'd260; g4x <= 10'd360; g4y <= 10'd260;
    end else if (end_of_frame) begin
      if (hit_x) going_left <= ~going_left;
      else box_x <= going_left ? box_x - 10'd7 : box_x + 10'd7;
      if (hit_y) going_up <= ~going_up;
      else box_y <= going_up ? box_y - 10'd4 : box_y + 10'd4;
      if (hit_x || hit_y) hue <= (hue == 3'd6) ? 3'd1 : hue + 3'd1;
      if (frame[1:0] == 2'd0) begin      // a new ghost every 4 frames
        g4x <= g3x; g4y <= g3y; g3x <= g2x; g3y <= g2y;
        g2x <= g1x; g2y <= g1y; g1x <= box_x; g1y <= box_y;
      end
    end

  function covers;
    input [9:0] x, y, left, top;
    covers = (x >= left) && (x < left + BOX) && (y >= top) && (y < top + BOX);
  endfunction

  wire in_box = covers(h, v, box_x, box_y);
  wire in_g1  = covers(h, v, g1x, g1y);
  wire in_g2  = covers(h, v, g2x, g2y);
  wire in_g3  = covers(h, v, g3x, g3y);
  wire in_g4  = covers(h, v, g4x, g4y);
  wire any_box = in_box | in_g1 | in_g2 | in_g3 | in_g4;

  // The box in full colour; each ghost takes the next hue round the wheel, the older
  // two at half strength, so the trail reads as a fading rainbow.
  function [5:0] paint;
    input [2:0] base;
    input [2:0] step;
    input       faded;
    reg   [2:0] turned;
    begin
      turned = (base + step > 3'd6) ? base + step - 3'd6 : base + step;  // stay in 1..6
      paint = faded ? {1'b0, turned[2], 1'b0, turned[1], 1'b0, turned[0]}
                    : {turned[2], turned[2], turned[1], turned[1], turned[0], turned[0]};
    end
  endfunction

  // THE BREAK: no final else, so trail_colour keeps its value when no box covers the beam.
  reg [5:0] trail_colour;
  always @(*)
    if (in_box)     trail_colour = paint(hue, 3'd0, 1'b0);
    else if (in_g1) trail_colour = paint(hue, 3'd1, 1'b0);
    else if (in_g2) trail_colour = paint(hue, 3'd2, 1'b0);
    else if (in_g3) trail_colour = paint(hue, 3'd3, 1'b1);
    else if (in_g4) trail_colour = paint(hue, 3'd4, 1'b1);

  // Backdrop: a faint grid that scrolls down a pixel per frame.
  wire [9:0] grid_y = v - frame;
  wire grid = (h[4:0] == 5'd0) || (grid_y[4:0] == 5'd0);
  wire [5:0] colour = any_box ? trail_colour : (grid ? 6'b00_01_01 : 6'b00_00_00);
  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: a 10-frame blip at each bounce, higher (A5) off the side walls than off the
  // floor and ceiling (E5), silent in between.
  reg [3:0]  blip_frames;
  reg        blip_high;
  reg [15:0] tone_count;
  reg        square_wave;
  wire [15:0] half_period = blip_high ? 16'd14304 : 16'd19093;

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      blip_frames <= 4'd0; blip_high <= 1'b0; tone_count <= 16'd0; square_wave <= 1'b0; pwm_out <= 1'b0;
    end else begin
      if (end_of_frame) begin
        if (hit_x || hit_y) begin blip_frames <= 4'd10; blip_high <= hit_x; end
        else if (blip_frames != 4'd0) blip_frames <= blip_frames - 4'd1;
      end
      if (tone_count >= half_period - 16'd1) begin
        tone_count <= 16'd0; square_wave <= ~square_wave;
      end else
        tone_count <= tone_count + 16'd1;
      pwm_out <= square_wave && (blip_frames != 4'd0);
    end
endmodule
