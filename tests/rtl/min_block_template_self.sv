// kerf-case: minimal regression (F30 family), reduced by tests/randrtl/reduce.py from random module rm_31_95
// kerf-case: (seed 31, --features all): the rewrite wrote out0[4:1] = out0[3:0] | ... as one vector
// kerf-case: assignment, reading bits the same statement assigns (the value before the block), and the
// kerf-case: self-read of out0 was hidden by out1 (written as its shift); exit 5. Now bit by bit, in order.
module min_block_template_self (
  input  logic clk,
  input  logic rst_n,
  input  logic [2:0] in0,
  input  logic [4:0] in1,
  output logic [4:0] out0,
  output logic [4:0] out1,
  output logic [1:0] qo0,
  output logic [1:0] qo1
);
  logic [7:0] w0;
  logic [1:0] w1b;
  logic [1:0] q0;
  logic [1:0] q1;
  function automatic logic [7:0] f_mix1(input logic [7:0] a0, input logic [7:0] a1);
    logic [7:0] r;
    r = a0 ^ a1;
    for (int k = 1; k < 8; k++) r[k] = r[k] | r[k - 1];
    return r;
  endfunction
  always_comb begin
    out0 = f_mix1(w0, in1);
    w1b = f_mix1(1'b1, in1[in1[1:0]]);
  end
  assign out1 = (((out0 < w0) ? q0 : in0[2:0]) << in0);
endmodule
