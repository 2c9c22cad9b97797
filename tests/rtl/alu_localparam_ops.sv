// kerf-case: invented 8-bit ALU in the localparam style: case over op codes of word operations
module alu_localparam_ops (input logic [3:0] op, input logic [7:0] a, input logic [7:0] b, output logic [7:0] y);
  localparam logic [3:0] OP_ADD = 4'h0, OP_SUB = 4'h1, OP_AND = 4'h2, OP_OR = 4'h3, OP_XOR = 4'h4,
                         OP_SLL = 4'h5, OP_SRL = 4'h6, OP_SLT = 4'h7;
  always_comb begin
    y = '0;
    case (op)
      OP_ADD:  y = a + b;
      OP_SUB:  y = a - b;
      OP_AND:  y = a & b;
      OP_OR:   y = a | b;
      OP_XOR:  y = a ^ b;
      OP_SLL:  y = a << b[2:0];
      OP_SRL:  y = a >> b[2:0];
      OP_SLT:  y = {7'b0, $signed(a) < $signed(b)};
      default: y = a;
    endcase
  end
endmodule
