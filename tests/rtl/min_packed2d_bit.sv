// kerf-case: minimal regression: bits of a 2-D packed array must be written m[i][j]; a flat
// kerf-case: offset m[5] is element 5 in SystemVerilog (out of range here). z and full have
// kerf-case: something to gain, so the writer names bits (z) and a whole element (full) itself.
module min_packed2d_bit (
  input  logic [1:0][3:0] m,
  output logic            y,
  output logic            z,
  output logic            full
);
  assign y = m[1][1] ^ m[0][2];
  assign z = (m[1][1] & m[0][2]) | (m[1][1] & m[0][3]);
  assign full = (m[1][3] & m[1][2] & m[1][1] & m[1][0]) | (m[1][3] & m[1][2] & m[1][1] & m[1][0] & m[0][0]);
endmodule
