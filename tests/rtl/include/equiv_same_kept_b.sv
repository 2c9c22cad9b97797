// The other version of tests/rtl/equiv_same_kept.sv: same behaviour, different text.
module equiv_same_kept (
  input  logic [15:0] a,
  input  logic [7:0]  d,
  input  logic        hi,
  output logic [15:0] y
);
  always_comb begin
    y = a;
    if (hi) y[15:8] = d;
    else    y[7:0]  = d;
  end
endmodule
