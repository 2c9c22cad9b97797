// Invented scenario: status flags of a receive FIFO computed by small helper
// functions (automatic, with a constant-bound loop; a static one; one calling another).
module flag_funcs (
  input  logic [7:0] mask,
  input  logic [7:0] data,
  input  logic [2:0] level,
  output logic [3:0] ones,
  output logic       odd,
  output logic [1:0] band,
  output logic       busy
);
  function automatic logic [3:0] popcount8(input logic [7:0] v);
    logic [3:0] c;
    c = 4'd0;
    for (int i = 0; i < 8; i++) c = c + 4'(v[i]);
    return c;
  endfunction
  function logic parity(input [7:0] v);
    parity = ^v;
  endfunction
  function automatic logic [1:0] level_band(input logic [2:0] l);
    case (l)
      3'd0, 3'd1: return 2'd0;
      3'd2, 3'd3: return 2'd1;
      3'd7:       return 2'd3;
      default:    return 2'd2;
    endcase
  endfunction
  function automatic logic any_high(input logic [7:0] v, input logic [2:0] l);
    return popcount8(v) > {1'b0, l};
  endfunction
  assign ones = popcount8(mask & data);
  assign odd  = parity(data);
  assign band = level_band(level);
  always_comb begin
    busy = 1'b0;
    if (any_high(mask, level)) busy = 1'b1;
  end
endmodule
