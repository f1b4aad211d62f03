// "Ferret Mail" by Lumen Ferrets, Voltage Drop 2027 (invented demo data).
// A bouncing scroller of our own square-cornered block letters, every letter pixel a
// bevelled tile, mirrored in rippling water; a sixteen-note tune plays on pwm_out.
// No font memory: the message and the letters are case tables, i.e. plain logic.
// Deliberate rule breaker for the demo scenario: a $display call (simulation-only
// system task) is left in the frame logic, which the pre-check must refuse.
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
  localparam [6:0] MESSAGE_LAST = 7'd92;
  localparam [9:0] TEXT_TOP = 10'd120, WATER_LINE = 10'd300;

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

  // Letter codes: 0=' ', 1='A', 2='B', 3='C', 4='D', 5='E', 6='F', 7='G', 8='H', 9='I', 10='L', 11='M', 12='N', 13='O', 14='P', 15='R', 16='S', 17='T', 18='U', 19='V', 20='W', 21='Y', 22='0', 23='2', 24='7', 25='*'
  function [4:0] letter_at;   // the message, one letter code per position
    input [6:0] position;
    case (position)
      7'd0: letter_at = 5'd19; 7'd1: letter_at = 5'd13; 7'd2: letter_at = 5'd10; 7'd3: letter_at = 5'd17; 7'd4: letter_at = 5'd1; 7'd5: letter_at = 5'd7;
      7'd6: letter_at = 5'd5; 7'd7: letter_at = 5'd0; 7'd8: letter_at = 5'd4; 7'd9: letter_at = 5'd15; 7'd10: letter_at = 5'd13; 7'd11: letter_at = 5'd14;
      7'd12: letter_at = 5'd0; 7'd13: letter_at = 5'd23; 7'd14: letter_at = 5'd22; 7'd15: letter_at = 5'd23; 7'd16: letter_at = 5'd24; 7'd17: letter_at = 5'd0;
      7'd18: letter_at = 5'd25; 7'd19: letter_at = 5'd0; 7'd20: letter_at = 5'd6; 7'd21: letter_at = 5'd5; 7'd22: letter_at = 5'd15; 7'd23: letter_at = 5'd15;
      7'd24: letter_at = 5'd5; 7'd25: letter_at = 5'd17; 7'd26: letter_at = 5'd0; 7'd27: letter_at = 5'd11; 7'd28: letter_at = 5'd1; 7'd29: letter_at = 5'd9;
      7'd30: letter_at = 5'd10; 7'd31: letter_at = 5'd0; 7'd32: letter_at = 5'd2; 7'd33: letter_at = 5'd21; 7'd34: letter_at = 5'd0; 7'd35: letter_at = 5'd10;
      7'd36: letter_at = 5'd18; 7'd37: letter_at = 5'd11; 7'd38: letter_at = 5'd5; 7'd39: letter_at = 5'd12; 7'd40: letter_at = 5'd0; 7'd41: letter_at = 5'd6;
      7'd42: letter_at = 5'd5; 7'd43: letter_at = 5'd15; 7'd44: letter_at = 5'd15; 7'd45: letter_at = 5'd5; 7'd46: letter_at = 5'd17; 7'd47: letter_at = 5'd16;
      7'd48: letter_at = 5'd0; 7'd49: letter_at = 5'd25; 7'd50: letter_at = 5'd0; 7'd51: letter_at = 5'd8; 7'd52: letter_at = 5'd5; 7'd53: letter_at = 5'd10;
      7'd54: letter_at = 5'd10; 7'd55: letter_at = 5'd13; 7'd56: letter_at = 5'd0; 7'd57: letter_at = 5'd17; 7'd58: letter_at = 5'd13; 7'd59: letter_at = 5'd0;
      7'd60: letter_at = 5'd5; 7'd61: letter_at = 5'd19; 7'd62: letter_at = 5'd5; 7'd63: letter_at = 5'd15; 7'd64: letter_at = 5'd21; 7'd65: letter_at = 5'd0;
      7'd66: letter_at = 5'd3; 7'd67: letter_at = 5'd15; 7'd68: letter_at = 5'd5; 7'd69: letter_at = 5'd20; 7'd70: letter_at = 5'd0; 7'd71: letter_at = 5'd13;
      7'd72: letter_at = 5'd12; 7'd73: letter_at = 5'd0; 7'd74: letter_at = 5'd17; 7'd75: letter_at = 5'd8; 7'd76: letter_at = 5'd5; 7'd77: letter_at = 5'd0;
      7'd78: letter_at = 5'd16; 7'd79: letter_at = 5'd8; 7'd80: letter_at = 5'd1; 7'd81: letter_at = 5'd15; 7'd82: letter_at = 5'd5; 7'd83: letter_at = 5'd4;
      7'd84: letter_at = 5'd0; 7'd85: letter_at = 5'd3; 7'd86: letter_at = 5'd8; 7'd87: letter_at = 5'd9; 7'd88: letter_at = 5'd14; 7'd89: letter_at = 5'd0;
      7'd90: letter_at = 5'd25; 7'd91: letter_at = 5'd0; 7'd92: letter_at = 5'd0;
      default: letter_at = 5'd0;
    endcase
  endfunction

  function [4:0] glyph_row;   // five lit/dark bits of one row of a letter, left first
    input [4:0] letter;
    input [2:0] row;
    case ({letter, row})
      // 'A'
      {5'd1, 3'd0}: glyph_row = 5'b11111; {5'd1, 3'd1}: glyph_row = 5'b10001; {5'd1, 3'd2}: glyph_row = 5'b10001; {5'd1, 3'd3}: glyph_row = 5'b11111;
      {5'd1, 3'd4}: glyph_row = 5'b10001; {5'd1, 3'd5}: glyph_row = 5'b10001; {5'd1, 3'd6}: glyph_row = 5'b10001;
      // 'B'
      {5'd2, 3'd0}: glyph_row = 5'b11110; {5'd2, 3'd1}: glyph_row = 5'b10001; {5'd2, 3'd2}: glyph_row = 5'b10001; {5'd2, 3'd3}: glyph_row = 5'b11110;
      {5'd2, 3'd4}: glyph_row = 5'b10001; {5'd2, 3'd5}: glyph_row = 5'b10001; {5'd2, 3'd6}: glyph_row = 5'b11110;
      // 'C'
      {5'd3, 3'd0}: glyph_row = 5'b11111; {5'd3, 3'd1}: glyph_row = 5'b10000; {5'd3, 3'd2}: glyph_row = 5'b10000; {5'd3, 3'd3}: glyph_row = 5'b10000;
      {5'd3, 3'd4}: glyph_row = 5'b10000; {5'd3, 3'd5}: glyph_row = 5'b10000; {5'd3, 3'd6}: glyph_row = 5'b11111;
      // 'D'
      {5'd4, 3'd0}: glyph_row = 5'b11110; {5'd4, 3'd1}: glyph_row = 5'b10001; {5'd4, 3'd2}: glyph_row = 5'b10001; {5'd4, 3'd3}: glyph_row = 5'b10001;
      {5'd4, 3'd4}: glyph_row = 5'b10001; {5'd4, 3'd5}: glyph_row = 5'b10001; {5'd4, 3'd6}: glyph_row = 5'b11110;
      // 'E'
      {5'd5, 3'd0}: glyph_row = 5'b11111; {5'd5, 3'd1}: glyph_row = 5'b10000; {5'd5, 3'd2}: glyph_row = 5'b10000; {5'd5, 3'd3}: glyph_row = 5'b11110;
      {5'd5, 3'd4}: glyph_row = 5'b10000; {5'd5, 3'd5}: glyph_row = 5'b10000; {5'd5, 3'd6}: glyph_row = 5'b11111;
      // 'F'
      {5'd6, 3'd0}: glyph_row = 5'b11111; {5'd6, 3'd1}: glyph_row = 5'b10000; {5'd6, 3'd2}: glyph_row = 5'b10000; {5'd6, 3'd3}: glyph_row = 5'b11110;
      {5'd6, 3'd4}: glyph_row = 5'b10000; {5'd6, 3'd5}: glyph_row = 5'b10000; {5'd6, 3'd6}: glyph_row = 5'b10000;
      // 'G'
      {5'd7, 3'd0}: glyph_row = 5'b11111; {5'd7, 3'd1}: glyph_row = 5'b10000; {5'd7, 3'd2}: glyph_row = 5'b10000; {5'd7, 3'd3}: glyph_row = 5'b10111;
      {5'd7, 3'd4}: glyph_row = 5'b10001; {5'd7, 3'd5}: glyph_row = 5'b10001; {5'd7, 3'd6}: glyph_row = 5'b11111;
      // 'H'
      {5'd8, 3'd0}: glyph_row = 5'b10001; {5'd8, 3'd1}: glyph_row = 5'b10001; {5'd8, 3'd2}: glyph_row = 5'b10001; {5'd8, 3'd3}: glyph_row = 5'b11111;
      {5'd8, 3'd4}: glyph_row = 5'b10001; {5'd8, 3'd5}: glyph_row = 5'b10001; {5'd8, 3'd6}: glyph_row = 5'b10001;
      // 'I'
      {5'd9, 3'd0}: glyph_row = 5'b11111; {5'd9, 3'd1}: glyph_row = 5'b00100; {5'd9, 3'd2}: glyph_row = 5'b00100; {5'd9, 3'd3}: glyph_row = 5'b00100;
      {5'd9, 3'd4}: glyph_row = 5'b00100; {5'd9, 3'd5}: glyph_row = 5'b00100; {5'd9, 3'd6}: glyph_row = 5'b11111;
      // 'L'
      {5'd10, 3'd0}: glyph_row = 5'b10000; {5'd10, 3'd1}: glyph_row = 5'b10000; {5'd10, 3'd2}: glyph_row = 5'b10000; {5'd10, 3'd3}: glyph_row = 5'b10000;
      {5'd10, 3'd4}: glyph_row = 5'b10000; {5'd10, 3'd5}: glyph_row = 5'b10000; {5'd10, 3'd6}: glyph_row = 5'b11111;
      // 'M'
      {5'd11, 3'd0}: glyph_row = 5'b11111; {5'd11, 3'd1}: glyph_row = 5'b10101; {5'd11, 3'd2}: glyph_row = 5'b10101; {5'd11, 3'd3}: glyph_row = 5'b10101;
      {5'd11, 3'd4}: glyph_row = 5'b10001; {5'd11, 3'd5}: glyph_row = 5'b10001; {5'd11, 3'd6}: glyph_row = 5'b10001;
      // 'N'
      {5'd12, 3'd0}: glyph_row = 5'b11110; {5'd12, 3'd1}: glyph_row = 5'b10001; {5'd12, 3'd2}: glyph_row = 5'b10001; {5'd12, 3'd3}: glyph_row = 5'b10001;
      {5'd12, 3'd4}: glyph_row = 5'b10001; {5'd12, 3'd5}: glyph_row = 5'b10001; {5'd12, 3'd6}: glyph_row = 5'b10001;
      // 'O'
      {5'd13, 3'd0}: glyph_row = 5'b11111; {5'd13, 3'd1}: glyph_row = 5'b10001; {5'd13, 3'd2}: glyph_row = 5'b10001; {5'd13, 3'd3}: glyph_row = 5'b10001;
      {5'd13, 3'd4}: glyph_row = 5'b10001; {5'd13, 3'd5}: glyph_row = 5'b10001; {5'd13, 3'd6}: glyph_row = 5'b11111;
      // 'P'
      {5'd14, 3'd0}: glyph_row = 5'b11111; {5'd14, 3'd1}: glyph_row = 5'b10001; {5'd14, 3'd2}: glyph_row = 5'b10001; {5'd14, 3'd3}: glyph_row = 5'b11111;
      {5'd14, 3'd4}: glyph_row = 5'b10000; {5'd14, 3'd5}: glyph_row = 5'b10000; {5'd14, 3'd6}: glyph_row = 5'b10000;
      // 'R'
      {5'd15, 3'd0}: glyph_row = 5'b11111; {5'd15, 3'd1}: glyph_row = 5'b10001; {5'd15, 3'd2}: glyph_row = 5'b10001; {5'd15, 3'd3}: glyph_row = 5'b11110;
      {5'd15, 3'd4}: glyph_row = 5'b10010; {5'd15, 3'd5}: glyph_row = 5'b10001; {5'd15, 3'd6}: glyph_row = 5'b10001;
      // 'S'
      {5'd16, 3'd0}: glyph_row = 5'b11111; {5'd16, 3'd1}: glyph_row = 5'b10000; {5'd16, 3'd2}: glyph_row = 5'b10000; {5'd16, 3'd3}: glyph_row = 5'b11111;
      {5'd16, 3'd4}: glyph_row = 5'b00001; {5'd16, 3'd5}: glyph_row = 5'b00001; {5'd16, 3'd6}: glyph_row = 5'b11111;
      // 'T'
      {5'd17, 3'd0}: glyph_row = 5'b11111; {5'd17, 3'd1}: glyph_row = 5'b00100; {5'd17, 3'd2}: glyph_row = 5'b00100; {5'd17, 3'd3}: glyph_row = 5'b00100;
      {5'd17, 3'd4}: glyph_row = 5'b00100; {5'd17, 3'd5}: glyph_row = 5'b00100; {5'd17, 3'd6}: glyph_row = 5'b00100;
      // 'U'
      {5'd18, 3'd0}: glyph_row = 5'b10001; {5'd18, 3'd1}: glyph_row = 5'b10001; {5'd18, 3'd2}: glyph_row = 5'b10001; {5'd18, 3'd3}: glyph_row = 5'b10001;
      {5'd18, 3'd4}: glyph_row = 5'b10001; {5'd18, 3'd5}: glyph_row = 5'b10001; {5'd18, 3'd6}: glyph_row = 5'b11111;
      // 'V'
      {5'd19, 3'd0}: glyph_row = 5'b10001; {5'd19, 3'd1}: glyph_row = 5'b10001; {5'd19, 3'd2}: glyph_row = 5'b10001; {5'd19, 3'd3}: glyph_row = 5'b10001;
      {5'd19, 3'd4}: glyph_row = 5'b10001; {5'd19, 3'd5}: glyph_row = 5'b01010; {5'd19, 3'd6}: glyph_row = 5'b00100;
      // 'W'
      {5'd20, 3'd0}: glyph_row = 5'b10001; {5'd20, 3'd1}: glyph_row = 5'b10001; {5'd20, 3'd2}: glyph_row = 5'b10001; {5'd20, 3'd3}: glyph_row = 5'b10101;
      {5'd20, 3'd4}: glyph_row = 5'b10101; {5'd20, 3'd5}: glyph_row = 5'b10101; {5'd20, 3'd6}: glyph_row = 5'b11111;
      // 'Y'
      {5'd21, 3'd0}: glyph_row = 5'b10001; {5'd21, 3'd1}: glyph_row = 5'b10001; {5'd21, 3'd2}: glyph_row = 5'b10001; {5'd21, 3'd3}: glyph_row = 5'b11111;
      {5'd21, 3'd4}: glyph_row = 5'b00100; {5'd21, 3'd5}: glyph_row = 5'b00100; {5'd21, 3'd6}: glyph_row = 5'b00100;
      // '0'
      {5'd22, 3'd0}: glyph_row = 5'b11111; {5'd22, 3'd1}: glyph_row = 5'b10011; {5'd22, 3'd2}: glyph_row = 5'b10101; {5'd22, 3'd3}: glyph_row = 5'b10101;
      {5'd22, 3'd4}: glyph_row = 5'b10101; {5'd22, 3'd5}: glyph_row = 5'b11001; {5'd22, 3'd6}: glyph_row = 5'b11111;
      // '2'
      {5'd23, 3'd0}: glyph_row = 5'b11111; {5'd23, 3'd1}: glyph_row = 5'b00001; {5'd23, 3'd2}: glyph_row = 5'b00001; {5'd23, 3'd3}: glyph_row = 5'b11111;
      {5'd23, 3'd4}: glyph_row = 5'b10000; {5'd23, 3'd5}: glyph_row = 5'b10000; {5'd23, 3'd6}: glyph_row = 5'b11111;
      // '7'
      {5'd24, 3'd0}: glyph_row = 5'b11111; {5'd24, 3'd1}: glyph_row = 5'b00001; {5'd24, 3'd2}: glyph_row = 5'b00001; {5'd24, 3'd3}: glyph_row = 5'b00010;
      {5'd24, 3'd4}: glyph_row = 5'b00100; {5'd24, 3'd5}: glyph_row = 5'b00100; {5'd24, 3'd6}: glyph_row = 5'b00100;
      // '*'
      {5'd25, 3'd0}: glyph_row = 5'b00000; {5'd25, 3'd1}: glyph_row = 5'b01010; {5'd25, 3'd2}: glyph_row = 5'b00100; {5'd25, 3'd3}: glyph_row = 5'b11111;
      {5'd25, 3'd4}: glyph_row = 5'b00100; {5'd25, 3'd5}: glyph_row = 5'b01010; {5'd25, 3'd6}: glyph_row = 5'b00000;
      default: glyph_row = 5'b00000;
    endcase
  endfunction

  // Where the beam is in the message: {position, column 0..5, sub-pixel 0..7}. A letter
  // is 5 columns plus a gap, each column 8 px wide, so no division is needed anywhere.
  function [12:0] next_pixel;
    input [12:0] at;
    reg [6:0] position;
    reg [2:0] column, sub;
    begin
      {position, column, sub} = at;
      if (sub != 3'd7) sub = sub + 3'd1;
      else begin
        sub = 3'd0;
        if (column != 3'd5) column = column + 3'd1;
        else begin
          column = 3'd0;
          position = (position == MESSAGE_LAST) ? 7'd0 : position + 7'd1;
        end
      end
      next_pixel = {position, column, sub};
    end
  endfunction

  reg [12:0] scroll;   // message point at the left edge of the screen this frame
  reg [12:0] beam;     // message point under the beam
  wire [12:0] next_scroll = next_pixel(next_pixel(scroll));   // 2 px per frame

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      scroll <= 13'd0; beam <= 13'd0;
    end else if (end_of_frame) begin
      scroll <= next_scroll; beam <= next_scroll;
      if (next_scroll[12:6] == 7'd0 && scroll[12:6] == MESSAGE_LAST)
        $display("Ferret Mail: message restarts at frame %0d", frame);
    end else if (end_of_line)
      beam <= scroll;
    else if (h < H_VISIBLE)
      beam <= next_pixel(beam);

  wire [6:0] position = beam[12:6];
  wire [2:0] column   = beam[5:3];
  wire [2:0] sub_x    = beam[2:0];
  wire [4:0] letter   = letter_at(position);

  // Each letter bobs on a triangle wave that travels along the message.
  wire [7:0] bob_phase = {position[4:0], 3'b000} + {frame[5:0], 2'b00};
  wire [6:0] bob       = bob_phase[7] ? ~bob_phase[6:0] : bob_phase[6:0];
  wire [9:0] letter_top = TEXT_TOP + {4'd0, bob[6:1]};

  // The letter itself.
  wire [9:0] down   = v - letter_top;
  wire [4:0] bits   = glyph_row(letter, down[5:3]);
  wire       lit    = (v >= letter_top) && (down < 10'd56) && (column < 3'd5) && bits[3'd4 - column];

  // Its reflection: the row mirrored about the water line, wobbled a little per line.
  wire [7:0] wobble_phase = {v[4:0], 3'b000} + {frame[4:0], 3'b000};
  wire [1:0] wobble       = wobble_phase[7] ? ~wobble_phase[6:5] : wobble_phase[6:5];
  wire [9:0] mirrored_v   = {WATER_LINE[8:0], 1'b0} - v + {8'd0, wobble};
  wire [9:0] mirror_down  = mirrored_v - letter_top;
  wire [4:0] mirror_bits  = glyph_row(letter, mirror_down[5:3]);
  wire       mirror_lit   = (v >= WATER_LINE) && (mirrored_v >= letter_top) && (mirror_down < 10'd56)
                            && (column < 3'd5) && mirror_bits[3'd4 - column];

  // Bevel: the top edge of each 8x8 tile catches the light, the bottom and right are in shade.
  wire [2:0] sub_y = down[2:0];
  wire       edge_light = (sub_y == 3'd0);
  wire       edge_shade = (sub_x == 3'd7) || (sub_y == 3'd7);
  reg [5:0] letter_colour;
  always @(*)
    case (down[5:3])                    // warm gradient from the top row down
      3'd0: letter_colour = 6'b11_11_01;
      3'd1: letter_colour = 6'b11_11_00;
      3'd2: letter_colour = 6'b11_10_00;
      3'd3: letter_colour = 6'b11_01_00;
      3'd4: letter_colour = 6'b11_00_01;
      3'd5: letter_colour = 6'b10_00_10;
      default: letter_colour = 6'b01_00_10;
    endcase

  // Sky bands above the water, a deep blue pond below, and two rainbow rails.
  wire [5:0] rail_hue = h[9:4] + frame[5:0];
  wire       on_rail  = (v[9:3] == 7'd5) || (v[9:3] == 7'd55);
  wire [5:0] rail_colour = {rail_hue[5:4], rail_hue[3:2] ^ rail_hue[5:4], ~rail_hue[5:4]};
  reg [5:0] sky;                       // dusk: darkest at the top, violet towards the water
  always @(*)
    case (v[8:6])
      3'd0:    sky = 6'b00_00_00;
      3'd1:    sky = 6'b00_00_01;
      3'd2:    sky = 6'b01_00_01;
      3'd3:    sky = 6'b01_00_10;
      default: sky = 6'b10_01_10;
    endcase

  reg [5:0] colour;
  always @(*)
    if (on_rail)                       colour = rail_colour;
    else if (lit && v < WATER_LINE)    colour = edge_light ? 6'b11_11_11 : edge_shade ? (letter_colour & 6'b10_10_10) : letter_colour;
    else if (v < WATER_LINE)           colour = sky;
    else if (mirror_lit)               colour = 6'b01_01_11;
    else                               colour = (v[2:0] == wobble_phase[7:5]) ? 6'b00_01_10 : 6'b00_00_10;

  wire visible = (h < H_VISIBLE) && (v < V_VISIBLE);

  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      vga_hs <= 1'b1; vga_vs <= 1'b1; {vga_r, vga_g, vga_b} <= 6'd0;
    end else begin
      vga_hs <= ~((h >= H_SYNC_START) && (h < H_SYNC_END));
      vga_vs <= ~((v >= V_SYNC_START) && (v < V_SYNC_END));
      {vga_r, vga_g, vga_b} <= visible ? colour : 6'd0;
    end

  // Audio: sixteen notes, 8 frames each, the last 2 frames of each note silent (staccato).
  // Half periods at 25.175 MHz: E4 G4 A4 G4 E4 D4 C4 D4 E4 G4 A4 C5 A4 G4 E4, then a rest.
  reg [15:0] half_period;
  always @(*)
    case (frame[6:3])
      4'd0:  half_period = 16'd38187; 4'd1:  half_period = 16'd32111; 4'd2:  half_period = 16'd28608; 4'd3:  half_period = 16'd32111;
      4'd4:  half_period = 16'd38187; 4'd5:  half_period = 16'd42864; 4'd6:  half_period = 16'd48112; 4'd7:  half_period = 16'd42864;
      4'd8:  half_period = 16'd38187; 4'd9:  half_period = 16'd32111; 4'd10: half_period = 16'd28608; 4'd11: half_period = 16'd24056;
      4'd12: half_period = 16'd28608; 4'd13: half_period = 16'd32111; 4'd14: half_period = 16'd38187; default: half_period = 16'd0;
    endcase
  wire sounding = (half_period != 16'd0) && (frame[2:1] != 2'b11);

  reg [15:0] tone_count;
  reg        square_wave;
  always @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      tone_count <= 16'd0; square_wave <= 1'b0; pwm_out <= 1'b0;
    end else begin
      if (tone_count >= half_period - 16'd1) begin
        tone_count <= 16'd0; square_wave <= ~square_wave;
      end else
        tone_count <= tone_count + 16'd1;
      pwm_out <= square_wave && sounding;
    end
endmodule
