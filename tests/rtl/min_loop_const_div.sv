// kerf-case: minimal regression: division of a loop constant (`i / 2` in a constant-bound loop)
// kerf-case: is a constant after unrolling and must not be refused as an unsupported operator.
module min_loop_const_div (
  input  logic [1:0] pair,
  output logic [3:0] sel
);
  always_comb begin
    for (int i = 0; i < 4; i++) sel[i] = pair == 2'(i / 2);
  end
endmodule
