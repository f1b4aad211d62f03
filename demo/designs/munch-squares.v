// "Munch Ado" by Sleepy Carry Flag, Voltage Drop 2027 (invented demo data).
// Munching squares: a cell lights once x XOR y drops below a threshold that climbs
// each frame and then falls back, eating the screen in nested squares and giving it back;
// the tune on pwm_out climbs and falls with it.
// Deliberate rule breaker for the demo scenario: an extra output, beat_led, that is not
// in the compo's pin list.
module gc_entry (
  input            clk,
  input            rst_n,
  output reg [1:0] vga_r,
  output reg [1:0] vga_g,
  output reg [1:0] vga_b,
  output reg       vga_hs,
  output reg       vga_vs,
  output reg       pwm_out,
  output           beat_led      // not in the pin list: lights on every 16th frame for our stage lamp
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

  // Cells of 2x2 px; the 256-cell pattern repeats after 512 px across.
  wire [7:0] cell_x = h[8:1];
  wire [7:0] cell_y = v[8:1];
  wire [7:0] munch  = cell_x ^ cell_y;
  // The threshold climbs 2 per frame for 128 frames, then falls back.
  wire [7:0] threshold = frame[7] ? ~{frame[6:0], 1'b0} : {frame[6:0], 1'b0};
  wire       eaten     = munch < threshold;
  // Eaten cells cycle colour by how long ago they were eaten; the rest show a faint lattice.
  wire [7:0] age  = threshold - munch;
  wire [5:0] hue  = age[7:2] + frame[7:2];
  wire [5:0] eaten_colour = {hue[5:4], hue[4:3], ~hue[5:4]} | {1'b0, age[1], 4'b0000};
  wire [5:0] colour = eaten ? eaten_colour : (munch[3:0] == 4'd0 ? 6'b01_00_01 : 6'b00_00_00);

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  assign beat_led = (frame[3:0] == 4'd0);

  // Audio: a G major pentatonic run, one note per 16 frames, that climbs while the
  // threshold climbs and falls while it falls. Square wave.
  wire [2:0] rung = frame[7] ? ~frame[6:4] : frame[6:4];
  reg [15:0] half_period;
  always @(*)
    case (rung)
      3'd0: half_period = 16'd64222; 3'd1: half_period = 16'd57216; 3'd2: half_period = 16'd50974; 3'd3: half_period = 16'd42864;
      3'd4: half_period = 16'd38187; 3'd5: half_period = 16'd32111; 3'd6: half_period = 16'd28608; default: half_period = 16'd25487;
    endcase

  reg [15:0] tone_count;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      tone_count <= 16'd0; pwm_out <= 1'b0;
    end else if (tone_count >= half_period - 16'd1) begin
      tone_count <= 16'd0; pwm_out <= ~pwm_out;
    end else
      tone_count <= tone_count + 16'd1;
endmodule
