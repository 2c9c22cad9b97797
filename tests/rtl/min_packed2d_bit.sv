// kerf-case: minimal regression: bits of a 2-D packed array must be written m[i][j]; a flat
// kerf-case: offset m[5] is element 5 in SystemVerilog (out of range here).
module min_packed2d_bit (
  input  logic [1:0][3:0] m,
  output logic            y
);
  assign y = m[1][1] ^ m[0][2];
endmodule
