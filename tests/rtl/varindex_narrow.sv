// kerf-case: flag-register update of an invented interrupt controller with variable-index reads
// kerf-case: and writes: a 1-bit index into a 4-bit vector (only bits 0 and 1 reachable), a
// kerf-case: 3-bit index into 6 bits (6 and 7 out of range: a write does nothing, a read gives x).
module varindex_narrow (
  input  logic [3:0] flags_q,
  input  logic       clr_sel,     // 1-bit index
  input  logic [2:0] set_sel,     // 3-bit index into 6 bits
  input  logic [5:0] src,
  input  logic       set_en,
  output logic [3:0] flags_clr,
  output logic [5:0] flags_set,
  output logic       picked,
  output logic       picked_hi
);
  always_comb begin
    flags_clr = flags_q;
    flags_clr[clr_sel] = 1'b0;
  end

  always_comb begin
    flags_set = src;
    if (set_en) flags_set[set_sel] = 1'b1;
  end

  assign picked    = src[set_sel];
  assign picked_hi = flags_q[{clr_sel, 1'b1}];
endmodule
