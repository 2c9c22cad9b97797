// kerf-case: minimal regression (F30, the ordered form): min_block_self_read with the block's
// kerf-case: vector an output port. The rewrite of w0[0] and w0[1] reads w0[4] and w0[5], which
// kerf-case: the same always_comb block assigns: the writer orders the block's assignments so
// kerf-case: that every bit is assigned before a statement reads it (Icarus, Verilator).
module min_block_self_read_port (
  input  logic [11:0] in0,
  input  logic [3:0] in1,
  input  logic [7:0] in2,
  input  logic [1:0] in4,
  output logic [7:0] w0
);
  always_comb begin
    if ((in0[4:1] >= (in1[2:2] ? in1 : in2))) begin
      w0 = {in2, (in2[5:4] | in2)};
    end else begin
      w0 = ((in1 < in1) ~^ (in4 & in2));
    end
  end
endmodule
