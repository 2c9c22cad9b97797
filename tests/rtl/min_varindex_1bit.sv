// kerf-case: minimal regression: a 1-bit index into a 4-bit vector reaches bits 0 and 1 only;
// kerf-case: truncating the bit position to the index's width also clears bits 2 and 3.
module min_varindex_1bit (
  input  logic [3:0] a,
  input  logic       s,
  output logic [3:0] y
);
  always_comb begin
    y = a;
    y[s] = 1'b0;
  end
endmodule
