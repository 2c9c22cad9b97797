// kerf-case: minimal regression (F30 family), reduced by tests/randrtl/reduce.py from random module rm_31_1805
// kerf-case: (seed 31, --features all): out0 written as its multiplication was taken to read itself, the
// kerf-case: planning rounds ran out and the last, unchecked plan (a loop kf_w1 -> w2 -> kf_w1) was written; exit 5.
module min_word_result_self (
  input  logic [7:0] in0,
  input  logic [3:0] in1,
  output logic [4:0] out0,
  output logic [1:0] out1
);
  logic [2:0] w2b;
  logic [7:0] w2;
  assign out0 = (in0[7] * (in1 | in1));
  always_comb begin
    w2 = (out0[4:4] == 1'b1);
    w2b = (out0 << out1);
  end
endmodule
