// kerf-case: minimal regression (F30 family), reduced by tests/randrtl/reduce.py from random module rm_31_2225
// kerf-case: (seed 31, --features all): the rewrite of the case block read w0's own bits before assigning
// kerf-case: them; the self-read was hidden by out0 (written as its word operation); exit 5. (q0 made an
// kerf-case: input: in the random module a register drives it.)
module min_block_self_read_case (
  input  logic [4:0] in0,
  input  logic [3:0] in1,
  input  logic in2,
  input  logic [3:0] in3,
  input  logic signed [4:0] in4,
  input  logic [3:0] q0,
  output logic [1:0] out0
);
  logic [7:0] w0;
  logic w1;
  always_comb begin
    case (q0)
      4'b0001: begin
        w0 = in1;
      end
      default: begin
        w0 = (~(in0 & q0[q0[1:0] +: 1]));
      end
    endcase
  end
  assign out0 = ((w0 && in1) + in1[0]);
endmodule
