// "Tidal XOR" by Parity Goats, Voltage Drop 2027 (invented demo data).
// An XOR lattice bent by a travelling swell, coloured by a three-wave plasma;
// a four-chord arpeggio plays on pwm_out. Passes every rule of the demo compo.
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

  // A triangle wave is our sine: fold the top bit back over the rest.
  function [6:0] fold;
    input [7:0] phase;
    fold = phase[7] ? ~phase[6:0] : phase[6:0];
  endfunction

  // One palette channel: a 2-bit triangle over a 6-bit hue.
  function [1:0] ramp;
    input [5:0] hue;
    ramp = hue[5] ? ~hue[4:3] : hue[4:3];
  endfunction

  wire [7:0] t = frame[7:0];
  wire [6:0] swell   = fold(v[8:1] + t);
  wire [6:0] ripple  = fold(h[9:2] + {t[6:0], 1'b0});
  wire [9:0] x_bent  = h + {4'd0, swell[6:1]};
  wire [9:0] y_bent  = v + {5'd0, ripple[6:2]} + {1'b0, t, 1'b0};
  wire [9:0] lattice = x_bent ^ y_bent;

  wire [8:0] plasma = {2'b00, fold(h[8:1] + t)} + {2'b00, fold(v[8:1] - {t[6:0], 1'b0})}
                    + {2'b00, fold(x_bent[9:2] + y_bent[9:2] + t)};
  wire [5:0] hue    = {lattice[8:6], 3'b000} + plasma[8:3];
  // Dark grooves where the low lattice bits agree keep the XOR structure readable.
  wire       groove = (lattice[5:4] == 2'b00);

  wire [5:0] colour = groove ? {1'b0, hue[5], 1'b0, hue[4], 2'b01}
                             : {ramp(hue), ramp(hue + 6'd21), ramp(hue + 6'd42)};
  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  // Registered outputs keep syncs and colour aligned and free of glitches.
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: an arpeggio, one note every 6 frames, four chords of 64 frames (Am, F, C, G).
  reg [2:0]  note_timer;
  reg [1:0]  arp_step;
  reg [15:0] tone_count;
  reg [15:0] half_period;

  wire [3:0] arp = {frame[7:6], arp_step};   // chord changes every 64 frames
  always @(*)
    case (arp)
      4'h0: half_period = 16'd57216; 4'h1: half_period = 16'd48112; 4'h2: half_period = 16'd38187; 4'h3: half_period = 16'd28608;
      4'h4: half_period = 16'd36044; 4'h5: half_period = 16'd28608; 4'h6: half_period = 16'd24056; 4'h7: half_period = 16'd18022;
      4'h8: half_period = 16'd48112; 4'h9: half_period = 16'd38187; 4'hA: half_period = 16'd32111; 4'hB: half_period = 16'd24056;
      4'hC: half_period = 16'd64222; 4'hD: half_period = 16'd50974; 4'hE: half_period = 16'd42864; default: half_period = 16'd32111;
    endcase

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      note_timer <= 3'd0; arp_step <= 2'd0; tone_count <= 16'd0; pwm_out <= 1'b0;
    end else begin
      if (end_of_frame) begin
        note_timer <= (note_timer == 3'd5) ? 3'd0 : note_timer + 3'd1;
        if (note_timer == 3'd5) begin
          arp_step <= arp_step + 2'd1;
        end
      end
      if (tone_count >= half_period - 16'd1) begin
        tone_count <= 16'd0; pwm_out <= ~pwm_out;
      end else
        tone_count <= tone_count + 16'd1;
    end
endmodule
