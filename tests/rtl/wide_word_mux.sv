// kerf-case: Wide datapath select of an invented trace unit: 100-bit vectors and a 100-bit named
// kerf-case: constant (beyond 64 bits everywhere: constants, comparison, shift by 65, rotation by
// kerf-case: concatenation), a 68-bit and-or select with replicated masks, and an 8-bit variable
// kerf-case: part-select that can run past the top (x by the language's rules: kept as written).
module wide_word_mux (
  input  logic [99:0] w,
  input  logic [6:0]  idx,
  input  logic [1:0]  s,
  output logic [99:0] y,
  output logic        hit,
  output logic [7:0]  nib,
  output logic [67:0] z
);
  localparam logic [99:0] MAGIC = 100'hA_5A5A_5A5A_5A5A_0000_FFFF_1234;
  assign hit = (w == MAGIC) || (w[99:64] == 36'h8_0000_0001);
  assign y   = s[0] ? (w ^ MAGIC) : (s[1] ? {w[49:0], w[99:50]} : w >> 65);
  assign nib = w[idx +: 8];
  assign z   = {w[3:0], 64'hDEAD_BEEF_0123_4567} & {68{s[1]}} | {4'b0, w[63:0]} & ~{68{s[1]}};
endmodule
