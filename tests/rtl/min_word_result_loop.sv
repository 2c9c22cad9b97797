// kerf-case: minimal regression (F26, from random module rm_31_87): a block reads the result of
// kerf-case: a kept word operation (`ok >= ok`) whose operand is an output that the writer would
// kerf-case: compute from the block's own signal (w[2:1] is the function ok needs); every bit is
// kerf-case: acyclic, but the statements would form a loop through the operation.
module min_word_result_loop (
  input  logic       a,
  input  logic [2:0] b,
  input  logic [2:0] c,
  output logic       ok,
  output logic [2:0] w
);
  assign ok = a | ((b[2:1] & c[2:1]) != 2'b00);
  always_comb begin
    w = (b & c) | {2'b00, ok >= ok};
  end
endmodule
