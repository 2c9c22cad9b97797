// kerf-case: small ALU over an enum op from a package, flags struct, function call
// kerf-simulator: verilator
// kerf-with: include/alu_ops_pkg.sv
module alu_enum_ops import alu_ops_pkg::*; (
  input  op_e        op,
  input  logic [7:0] a,
  input  logic [7:0] b,
  output logic [7:0] y,
  output flags_t     f,
  output logic       shifting
);
  logic [8:0] sum;
  always_comb begin
    sum = '0;
    y   = '0;
    unique case (op)
      OP_ADD:  begin sum = {1'b0, a} + {1'b0, b}; y = sum[7:0]; end
      OP_SUB:  begin sum = {1'b0, a} - {1'b0, b}; y = sum[7:0]; end
      OP_AND:  y = a & b;
      OP_OR:   y = a | b;
      OP_XOR:  y = a ^ b;
      OP_SLL:  y = a << b[2:0];
      OP_SRL:  y = a >> b[2:0];
      OP_SLT:  y = {7'b0, $signed(a) < $signed(b)};
      default: y = a;
    endcase
  end
  assign f.zero  = ~|y;
  assign f.neg   = y[7];
  assign f.carry = (op == OP_ADD || op == OP_SUB) ? sum[8] : 1'b0;
  assign shifting = is_shift(op);
endmodule
