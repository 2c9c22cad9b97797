// Invented scenario: the same bridge strobes in SystemVerilog, where a
// parameter reaches logic through every channel the language offers: a
// typedef, a localparam, a function, a width, an enum, and directly.
module lane_mask_sv #(parameter int LANES = 4) (
  input  logic [1:0]       size,
  input  logic [2:0]       offset,
  input  logic             wr, rd, err, hold,
  input  logic [3:0]       opcode,
  output logic [LANES-1:0] strobe,
  output logic             wide,
  output logic             odd_lanes,
  output logic             is_store,
  output logic             mode_hit,
  output logic             busy,
  output logic             grant
);
  typedef logic [LANES-1:0] mask_t;                      // a type from the parameter
  localparam int LAST = LANES - 1;                      // a localparam from the parameter
  typedef enum logic [1:0] {M_NARROW = 2'd0, M_WIDE = (LANES > 4) ? 2'd1 : 2'd2} mode_t;

  function automatic logic parity_of_lanes(input logic [2:0] off);
    return ^(off & LAST[2:0]);                           // a function that reads it
  endfunction

  always_comb begin
    strobe = mask_t'(0);                                 // through the typedef, a loop bound, a width
    for (int i = 0; i < LANES; i++) begin
      case (size)
        2'd0:    strobe[i] = (wr | rd) & (offset == 3'(i));
        2'd1:    strobe[i] = (wr | rd) & (offset[2:1] == 2'(i >> 1));
        2'd2:    strobe[i] = (wr | rd) & (offset[2] == 1'(i >> 2));
        default: strobe[i] = wr | rd;
      endcase
    end
  end
  assign wide      = LANES > 4 && size == 2'd3;          // directly
  assign odd_lanes = parity_of_lanes(offset) & wr;       // through the function
  assign mode_hit  = opcode[1:0] == M_WIDE;              // through the enum
  assign is_store  = opcode == 4'b0110 | opcode == 4'b0111;   // depends on nothing overridable
  assign busy      = (wr & ~err) | (rd & ~err) | (wr & rd & hold);
  assign grant     = (wr | rd) & ~hold & ~err | (wr & rd & ~err & ~hold);
endmodule
