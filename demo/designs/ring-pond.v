// "Oxbow Ripples" by Oxbow Static, Voltage Drop 2027 (invented demo data).
// Two stones drift across a pond; rings spread from each, measured by squared distance,
// and where they cross they make moire; a slow falling scale plays on pwm_out.
// Deliberate rule breaker for the demo scenario: hsync pulses high (positive polarity)
// where the video mode asks for a low pulse.
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

  function [6:0] fold;            // triangle wave: 0..127..0 over one 8-bit turn
    input [7:0] phase;
    fold = phase[7] ? ~phase[6:0] : phase[6:0];
  endfunction

  // Half the squared distance, in units of 4 px^2 (|dx|/2 squared plus |dy|/2 squared).
  function [17:0] half_dist2;
    input [9:0] x, y, cx, cy;
    reg [9:0] dx, dy;
    begin
      dx = (x >= cx) ? x - cx : cx - x;
      dy = (y >= cy) ? y - cy : cy - y;
      half_dist2 = {9'd0, dx[9:1]} * {9'd0, dx[9:1]} + {9'd0, dy[9:1]} * {9'd0, dy[9:1]};
    end
  endfunction

  // The stones wander on triangle-wave paths of different speeds.
  wire [9:0] stone1_x = 10'd120 + {1'b0, fold(frame[7:0]), 2'b00} - {3'd0, fold(frame[7:0])};
  wire [9:0] stone1_y = 10'd100 + {2'b00, fold({frame[6:0], 1'b0} + 8'd40), 1'b0};
  wire [9:0] stone2_x = 10'd520 - {2'b00, fold(frame[8:1] + 8'd90), 1'b0} - {3'd0, fold(frame[8:1] + 8'd90)};
  wire [9:0] stone2_y = 10'd380 - {2'b00, fold(frame[7:0] + 8'd17), 1'b0};

  wire [17:0] d1 = half_dist2(h, v, stone1_x, stone1_y);
  wire [17:0] d2 = half_dist2(h, v, stone2_x, stone2_y);

  // Ring number from each stone, running outwards as the frames go by.
  // A ring every 2048 units (8192 px^2), so rings crowd together further out, as on a zone plate.
  wire [5:0] ring1 = d1[10:5] - {frame[4:0], 1'b0};
  wire [5:0] ring2 = d2[10:5] - {frame[4:0], 1'b0};
  // Past 256 px from its stone a ripple has lost half its height.
  wire       far1  = (d1[17:14] != 4'd0);
  wire       far2  = (d2[17:14] != 4'd0);
  wire [1:0] crest1 = ring1[5] ? ~ring1[4:3] : ring1[4:3];
  wire [1:0] crest2 = ring2[5] ? ~ring2[4:3] : ring2[4:3];
  wire [1:0] wave1 = far1 ? {1'b0, crest1[1]} : crest1;
  wire [1:0] wave2 = far2 ? {1'b0, crest2[1]} : crest2;
  wire [2:0] height = {1'b0, wave1} + {1'b0, wave2};

  // Deep water is blue, crests go cyan, and where both sets of rings peak, foam.
  reg [5:0] colour;
  always @(*)
    case (height)
      3'd0:    colour = 6'b00_00_01;
      3'd1:    colour = 6'b00_00_10;
      3'd2:    colour = 6'b00_01_10;
      3'd3:    colour = 6'b00_10_11;
      3'd4:    colour = 6'b01_11_11;
      3'd5:    colour = 6'b10_11_11;
      default: colour = 6'b11_11_11;
    endcase

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b0; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      // Our bench monitor locks to either polarity, so we drive hsync high during the pulse.
      vga_hs <= (h >= H_SYNC_START) && (h < H_SYNC_END);
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: a C major scale falling from C5 to C4, one note per 12 frames, square wave.
  reg [3:0]  note_timer;
  reg [2:0]  note;
  reg [15:0] tone_count;
  reg [15:0] half_period;
  always @(*)
    case (note)
      3'd0: half_period = 16'd24056; 3'd1: half_period = 16'd25487; 3'd2: half_period = 16'd28608; 3'd3: half_period = 16'd32111;
      3'd4: half_period = 16'd36044; 3'd5: half_period = 16'd38187; 3'd6: half_period = 16'd42864; default: half_period = 16'd48112;
    endcase

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      note_timer <= 4'd0; note <= 3'd0; tone_count <= 16'd0; pwm_out <= 1'b0;
    end else begin
      if (end_of_frame) begin
        note_timer <= (note_timer == 4'd11) ? 4'd0 : note_timer + 4'd1;
        if (note_timer == 4'd11) note <= note + 3'd1;
      end
      if (tone_count >= half_period - 16'd1) begin
        tone_count <= 16'd0; pwm_out <= ~pwm_out;
      end else
        tone_count <= tone_count + 16'd1;
    end
endmodule
