// kerf-case: a toy scrambler's 4-bit substitution with a bypass and the parity of its result
// kerf-case: (F182): the reduction `^sub` of a vector written in the same block stays a reduction.
module sbox_parity (
  input  logic [3:0] nib,
  input  logic       bypass,
  output logic [3:0] sub,
  output logic       odd
);
  // invented 4-bit substitution table of a toy scrambler
  localparam logic [63:0] TBL = 64'hB9A8D3F1E2705C46;   // entry k in bits [4k+3:4k]
  always_comb begin
    sub = bypass ? nib : TBL[{nib, 2'b00} +: 4];
    odd = ^sub;
  end
endmodule
