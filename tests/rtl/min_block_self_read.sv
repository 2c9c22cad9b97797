// kerf-case: minimal regression (F30), reduced by tests/randrtl/reduce.py from random module rm_31_784
// kerf-case: (seed 31, --features all): the rewrite of the block driving w0 reads w0[4] in the
// kerf-case: statement for w0[0], placed before the one assigning w0[7:2] (exit 5, nothing written).
module min_block_self_read (
  input  logic [11:0] in0,
  input  logic [3:0] in1,
  input  logic [7:0] in2,
  input  logic [1:0] in3,
  input  logic [1:0] in4,
  input  logic [7:0] in5,
  output logic [3:0] out0,
  output logic [1:0] out1,
  output logic [5:0] out2
);
  logic [7:0] w0;
  logic [7:0] w4;
  logic [4:0] w5;
  always_comb begin
    case (in3)
      2'b11: begin
      end
    endcase
    if ((in0[4:1] >= (in1[2:2] ? in1 : in2))) begin
      w0 = {in2, (in2[5:4] | in2)};
    end else begin
      w0 = ((in1 < in1) ~^ (in4 & in2));
    end
  end
  always_comb begin
    out0 = ((in0[5] / 3'd5) << in3);
  end
endmodule
