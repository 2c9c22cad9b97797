// kerf-case: F63: a kept adder and an unrelated wiring loop with nothing to gain. The adder's
// kerf-case: statement is rewritten (its select logic shrinks); the loop stays byte for byte,
// kerf-case: and so does the reversal feeding the adder by name: a word operation joins only
// kerf-case: the statements that read its result.
// Invented: the sum and lane-enable stage of a small accumulator.
module min_word_op_apart (
  input  logic [7:0] a,
  input  logic [7:0] b,
  input  logic [1:0] mode,
  input  logic [3:0] lane_req,
  output logic [8:0] sum_q,
  output logic [3:0] lane_on
);
  logic [7:0] b_rev;
  always_comb begin
    for (int i = 0; i < 4; i++) lane_on[i] = lane_req[i];
  end
  always_comb begin
    for (int i = 0; i < 8; i++) b_rev[i] = b[7 - i];
  end
  assign sum_q = ((mode[0] & mode[1]) | (mode[0] & ~mode[1])) ? a + b_rev : 9'd0;
endmodule
