// "Copper Kelp" by Kelp Logic, Voltage Drop 2027 (invented demo data).
// Six shaded raster bars ride a sine curve built from a parabola (one sine unit, shared
// in horizontal blanking), over a backdrop of columns that sway line by line; a pulse-wave
// bass line plays on pwm_out. Passes every rule.
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
  reg [8:0] frame;
  wire end_of_line  = (h == H_LAST);
  wire end_of_frame = end_of_line && (v == V_LAST);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      h <= 10'd0; v <= 10'd0; frame <= 9'd0;
    end else begin
      h <= end_of_line ? 10'd0 : h + 10'd1;
      if (end_of_line) v <= (v == V_LAST) ? 10'd0 : v + 10'd1;
      if (end_of_frame) frame <= frame + 9'd1;
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

  // Bar i is centred at 232 + 1.5 * sine(2 * frame + 37 * i): a little wider than the screen's middle.
  function [9:0] bar_centre;
    input signed [8:0] s;
    reg signed [10:0] swing;
    begin
      swing = {{2{s[8]}}, s} + {{3{s[8]}}, s[8:1]};
      bar_centre = 10'd232 + swing[9:0];
    end
  endfunction

  // Shade inside a bar 32 lines tall: 3 at the middle, 1 at the rims, 0 outside.
  function [1:0] shade;
    input [9:0] line;
    input [9:0] centre;
    reg [9:0] distance;
    begin
      distance = (line >= centre) ? line - centre : centre - line;
      shade = (distance < 10'd5) ? 2'd3 : (distance < 10'd11) ? 2'd2 : (distance < 10'd16) ? 2'd1 : 2'd0;
    end
  endfunction

  // One sine unit serves the whole picture: in the first seven clocks of each horizontal
  // blanking it computes the six bar centres and the backdrop sway for the next line,
  // one per clock, into registers.
  wire [9:0] next_line  = (v == V_LAST) ? 10'd0 : v + 10'd1;
  wire [8:0] next_frame = (v == V_LAST) ? frame + 9'd1 : frame;
  wire [9:0] blank_step = h - H_VISIBLE;           // 0..6 selects what to compute
  reg  [7:0] step_phase;
  always @(*)
    case (blank_step[2:0])
      3'd0: step_phase = {next_frame[6:0], 1'b0};
      3'd1: step_phase = {next_frame[6:0], 1'b0} + 8'd37;
      3'd2: step_phase = {next_frame[6:0], 1'b0} + 8'd74;
      3'd3: step_phase = {next_frame[6:0], 1'b0} + 8'd111;
      3'd4: step_phase = {next_frame[6:0], 1'b0} + 8'd148;
      3'd5: step_phase = {next_frame[6:0], 1'b0} + 8'd185;
      default: step_phase = {next_line[6:0], 1'b0} + {next_frame[6:0], 1'b0} + next_frame[7:0];
    endcase
  wire signed [8:0] step_sine = sine(step_phase);
  wire [9:0] step_centre = bar_centre(step_sine);

  reg [9:0] centre0, centre1, centre2, centre3, centre4, centre5;
  reg signed [8:0] sway;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      centre0 <= 10'd0; centre1 <= 10'd0; centre2 <= 10'd0; centre3 <= 10'd0; centre4 <= 10'd0; centre5 <= 10'd0;
      sway <= 9'sd0;
    end else if (blank_step < 10'd7)
      case (blank_step[2:0])
        3'd0: centre0 <= step_centre;
        3'd1: centre1 <= step_centre;
        3'd2: centre2 <= step_centre;
        3'd3: centre3 <= step_centre;
        3'd4: centre4 <= step_centre;
        3'd5: centre5 <= step_centre;
        default: sway <= step_sine;
      endcase

  wire [1:0] s0 = shade(v, centre0);
  wire [1:0] s1 = shade(v, centre1);
  wire [1:0] s2 = shade(v, centre2);
  wire [1:0] s3 = shade(v, centre3);
  wire [1:0] s4 = shade(v, centre4);
  wire [1:0] s5 = shade(v, centre5);

  // The backdrop: dark columns, each line shifted by its own sine, so the columns sway.
  wire [9:0] swayed_x = h + {{4{sway[8]}}, sway[8:3]};
  wire [5:0] backdrop = swayed_x[5] ? 6'b00_00_01 : 6'b00_00_00;

  // Later bars are drawn in front: red, amber, yellow, green, cyan, violet.
  reg [5:0] colour;
  always @(*) begin
    colour = backdrop;
    if (s0 != 2'd0) colour = {s0, 2'b00, 2'b00};
    if (s1 != 2'd0) colour = {s1, s1[1], 1'b0, 2'b00};
    if (s2 != 2'd0) colour = {s2, s2, 2'b00};
    if (s3 != 2'd0) colour = {2'b00, s3, 2'b00};
    if (s4 != 2'd0) colour = {2'b00, s4, s4};
    if (s5 != 2'd0) colour = {s5[1], 1'b0, 2'b00, s5};
  end

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: an eight-note bass line (A2 A2 C3 D3 E3 E3 G3 E3), one note per 8 frames,
  // as a 25 % pulse wave: high for the first quarter of each period.
  reg [17:0] period;
  always @(*)
    case (frame[5:3])
      3'd0: period = 18'd228864; 3'd1: period = 18'd228864; 3'd2: period = 18'd192454; 3'd3: period = 18'd171456;
      3'd4: period = 18'd152752; 3'd5: period = 18'd152752; 3'd6: period = 18'd128444; default: period = 18'd152752;
    endcase

  reg [17:0] phase_count;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      phase_count <= 18'd0; pwm_out <= 1'b0;
    end else begin
      phase_count <= (phase_count >= period - 18'd1) ? 18'd0 : phase_count + 18'd1;
      pwm_out <= (phase_count < {2'b00, period[17:2]});
    end
endmodule
