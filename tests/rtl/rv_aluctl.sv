// kerf-case: ALU control of an invented RV32I core (opcode, funct3 and funct7 encodings of the
// kerf-case: RISC-V base ISA, an open standard), in the style of hand-written cores: named opcode
// kerf-case: localparams, an x default for the ALU code, a `unique case` inside an if, an output
// kerf-case: (is_sub) read back by a later statement of the same block, and a legality term.
// kerf-case: Icarus compares every output bit where the original is not x.
module rv_aluctl (
  input  logic [6:0] opcode,
  input  logic [2:0] funct3,
  input  logic [6:0] funct7,
  output logic [3:0] alu_op,
  output logic       is_sub,
  output logic       illegal
);
  localparam logic [6:0] OP_REG = 7'b0110011, OP_IMM = 7'b0010011;
  always_comb begin
    alu_op  = 4'bxxxx;
    is_sub  = 1'b0;
    illegal = 1'b0;
    if (opcode == OP_REG || opcode == OP_IMM) begin
      unique case (funct3)
        3'b000: begin
          is_sub = (opcode == OP_REG) && funct7[5];
          alu_op = is_sub ? 4'd1 : 4'd0;
        end
        3'b001: alu_op = 4'd2;
        3'b010: alu_op = 4'd3;
        3'b011: alu_op = 4'd4;
        3'b100: alu_op = 4'd5;
        3'b101: alu_op = funct7[5] ? 4'd7 : 4'd6;
        3'b110: alu_op = 4'd8;
        3'b111: alu_op = 4'd9;
      endcase
      if (opcode == OP_REG && funct7 != 7'b0000000 && !(funct7 == 7'b0100000 && (funct3 == 3'b000 || funct3 == 3'b101)))
        illegal = 1'b1;
    end else begin
      illegal = 1'b1;
    end
  end
endmodule
