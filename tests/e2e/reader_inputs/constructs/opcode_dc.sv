// Invented scenario: the operand select of a tiny accumulator machine. Opcodes
// 6 and 7 never occur, so the author marks their result as a don't-care.
module opcode_dc (
  input  logic [2:0] op,
  input  logic [3:0] a,
  input  logic [3:0] b,
  output logic [3:0] y,
  output logic       wr
);
  always_comb begin
    wr = 1'b1;
    case (op)
      3'd0: y = a & b;
      3'd1: y = a | b;
      3'd2: y = a ^ b;
      3'd3: y = ~a;
      3'd4: begin y = b; wr = 1'b0; end
      3'd5: y = a;
      default: begin y = 'x; wr = 1'bx; end
    endcase
  end
endmodule
