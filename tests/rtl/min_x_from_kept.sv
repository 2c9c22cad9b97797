// kerf-case: minimal regression: an x produced by kept code (a variable part-select write over an
// kerf-case: 'x default) read by an `if` that kerf restructures: the original takes the else
// kerf-case: branch on x (IEEE 1800), the gate-level rewrite shows x.
module min_x_from_kept (
  input  logic [1:0] s,
  input  logic       en,
  input  logic       a,
  input  logic       b,
  output logic       y
);
  logic [3:0] m;
  always_comb begin
    m = 'x;
    m[s*2 +: 2] = {en, en};
  end
  always_comb begin
    if (m[3]) y = a;
    else      y = b;
  end
endmodule
