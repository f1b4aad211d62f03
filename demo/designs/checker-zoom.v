// "Mole Floor Spin" by Quartz Mole Society, Voltage Drop 2027 (invented demo data).
// A checkerboard that turns and breathes: two accumulators walk texture space along the
// beam (a rotozoomer with no multiply per pixel); a two-tone chime rings on pwm_out. Passes every rule.
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
  wire end_of_video = end_of_line && (v == V_VISIBLE - 10'd1);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      h <= 10'd0; v <= 10'd0; frame <= 10'd0;
    end else begin
      h <= end_of_line ? 10'd0 : h + 10'd1;
      if (end_of_line) v <= (v == V_LAST) ? 10'd0 : v + 10'd1;
      if (end_of_frame) frame <= frame + 10'd1;
    end

  // Sine from a parabola: each half wave is q*(128-q)/32, which peaks at 128.
  function signed [8:0] sine;
    input [7:0] phase;
    reg [13:0] product;
    begin
      product = {7'd0, phase[6:0]} * (14'd128 - {7'd0, phase[6:0]});
      sine = phase[7] ? -$signed({1'b0, product[12:5]}) : $signed({1'b0, product[12:5]});
    end
  endfunction

  // Per frame: angle and zoom. The zoom swings between 0.5 and 1.5 (as 64..192 over 128).
  wire [7:0] angle = frame[8:1];
  wire [7:0] zoom  = 8'd64 + {frame[7] ? ~frame[6:0] : frame[6:0], 1'b0} - {7'd0, frame[7]};
  // One sine unit and one multiplier, used twice at the start of vertical blanking:
  // first for the cosine (on the last clock of the last visible line), then the sine.
  wire               take_cos = end_of_video;
  wire               take_sin = (v == V_VISIBLE) && (h == 10'd0);
  wire signed [8:0]  wave     = sine(take_sin ? angle : angle + 8'd64);
  wire signed [17:0] zoomed   = wave * $signed({1'b0, zoom});

  // Texture steps per screen pixel, 8 fraction bits (256 = one texel per pixel at zoom 1).
  reg signed [11:0] step_c, step_s;
  // Texture coordinates at the start of this line and at the beam.
  reg signed [21:0] line_u, line_w, u, w;

  // Where the top-left pixel lands so that the screen centre (320, 240) spins in place;
  // the pan makes the floor drift diagonally as well.
  wire signed [21:0] c22 = {{10{step_c[11]}}, step_c};
  wire signed [21:0] s22 = {{10{step_s[11]}}, step_s};
  wire signed [21:0] pan = {3'd0, frame, 9'd0};
  wire signed [21:0] origin_u = pan - ((c22 <<< 8) + (c22 <<< 6)) + ((s22 <<< 8) - (s22 <<< 4));
  wire signed [21:0] origin_w = pan - ((s22 <<< 8) + (s22 <<< 6)) - ((c22 <<< 8) - (c22 <<< 4));

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      step_c <= 12'sd256; step_s <= 12'sd0;
      line_u <= 22'sd0; line_w <= 22'sd0; u <= 22'sd0; w <= 22'sd0;
    end else begin
      if (take_cos) step_c <= zoomed[17:6];   // new angle and zoom during vertical blanking
      if (take_sin) step_s <= zoomed[17:6];
      if (end_of_frame) begin
        line_u <= origin_u; line_w <= origin_w; u <= origin_u; w <= origin_w;
      end else if (end_of_line) begin   // one line down: u -= sin, w += cos
        line_u <= line_u - s22; line_w <= line_w + c22;
        u <= line_u - s22;      w <= line_w + c22;
      end else if (h < H_VISIBLE) begin // one pixel right: u += cos, w += sin
        u <= u + c22; w <= w + s22;
      end
    end

  // Checkers of 32 texels; every fourth square in each direction is a darker plate,
  // and a thin groove runs along the square edges.
  wire square = u[13] ^ w[13];
  wire plate  = u[15] ^ w[15];
  wire groove = (u[12:9] == 4'd0) || (w[12:9] == 4'd0);
  reg [5:0] colour;
  always @(*)
    case ({groove, plate, square})
      3'b000:  colour = 6'b11_10_00;
      3'b001:  colour = 6'b01_00_10;
      3'b010:  colour = 6'b10_01_00;
      3'b011:  colour = 6'b00_01_11;
      default: colour = 6'b00_00_01;
    endcase

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: E5 then C5, each struck every 32 frames and fading out. The fade is a
  // 6-bit pulse-width gate on the square wave: loud at the strike, silent at the end.
  wire [15:0] half_period = frame[5] ? 16'd24056 : 16'd19093;
  wire [5:0]  loudness    = ~{frame[4:0], 1'b0};
  reg  [15:0] tone_count;
  reg         square_wave;
  reg  [5:0]  gate_count;

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      tone_count <= 16'd0; square_wave <= 1'b0; gate_count <= 6'd0; pwm_out <= 1'b0;
    end else begin
      gate_count <= gate_count + 6'd1;
      if (tone_count >= half_period - 16'd1) begin
        tone_count <= 16'd0; square_wave <= ~square_wave;
      end else
        tone_count <= tone_count + 16'd1;
      pwm_out <= square_wave && (gate_count < loudness);
    end
endmodule
