// kerf-case: RV32I main decoder (open RISC-V encodings) in the package/enum/struct style of
// kerf-case: real cores: a `unique case` on the opcode enum, nested funct3/funct7 cases, a
// kerf-case: packed control struct as output, illegal-instruction detection.
// kerf-with: include/rv32i_pkg.sv
module rv32i_decoder
  import rv32i_pkg::*;
(
  input  logic [31:0] instr,
  output ctrl_t       ctrl,
  output logic [4:0]  rd,
  output logic [4:0]  rs1,
  output logic [4:0]  rs2
);
  logic [6:0] opcode;
  logic [2:0] funct3;
  logic [6:0] funct7;

  assign opcode = instr[6:0];
  assign funct3 = instr[14:12];
  assign funct7 = instr[31:25];
  assign rd     = instr[11:7];
  assign rs1    = instr[19:15];
  assign rs2    = instr[24:20];

  always_comb begin
    ctrl = '0;
    ctrl.alu_op  = ALU_ADD;
    ctrl.imm_sel = IMM_NONE;
    unique case (opcode)
      OPC_LUI: begin
        ctrl.reg_write = 1'b1; ctrl.alu_src_imm = 1'b1; ctrl.alu_op = ALU_PASS_B; ctrl.imm_sel = IMM_U;
      end
      OPC_AUIPC: begin
        ctrl.reg_write = 1'b1; ctrl.alu_src_imm = 1'b1; ctrl.imm_sel = IMM_U;
      end
      OPC_JAL: begin
        ctrl.reg_write = 1'b1; ctrl.jump = 1'b1; ctrl.imm_sel = IMM_J;
      end
      OPC_JALR: begin
        ctrl.reg_write = 1'b1; ctrl.jump = 1'b1; ctrl.alu_src_imm = 1'b1; ctrl.imm_sel = IMM_I;
        ctrl.illegal = funct3 != 3'b000;
      end
      OPC_BRANCH: begin
        ctrl.branch = 1'b1; ctrl.imm_sel = IMM_B; ctrl.alu_op = ALU_SUB;
        ctrl.illegal = funct3 == 3'b010 || funct3 == 3'b011;
      end
      OPC_LOAD: begin
        ctrl.reg_write = 1'b1; ctrl.mem_read = 1'b1; ctrl.alu_src_imm = 1'b1; ctrl.imm_sel = IMM_I;
        ctrl.illegal = funct3 == 3'b011 || funct3 == 3'b110 || funct3 == 3'b111;
      end
      OPC_STORE: begin
        ctrl.mem_write = 1'b1; ctrl.alu_src_imm = 1'b1; ctrl.imm_sel = IMM_S;
        ctrl.illegal = funct3[2] || funct3 == 3'b011;
      end
      OPC_OP_IMM, OPC_OP: begin
        ctrl.reg_write   = 1'b1;
        ctrl.alu_src_imm = opcode == OPC_OP_IMM;
        ctrl.imm_sel     = opcode == OPC_OP_IMM ? IMM_I : IMM_NONE;
        case (funct3)
          3'b000: ctrl.alu_op = (opcode == OPC_OP && funct7[5]) ? ALU_SUB : ALU_ADD;
          3'b001: ctrl.alu_op = ALU_SLL;
          3'b010: ctrl.alu_op = ALU_SLT;
          3'b011: ctrl.alu_op = ALU_SLTU;
          3'b100: ctrl.alu_op = ALU_XOR;
          3'b101: ctrl.alu_op = funct7[5] ? ALU_SRA : ALU_SRL;
          3'b110: ctrl.alu_op = ALU_OR;
          3'b111: ctrl.alu_op = ALU_AND;
        endcase
        if (opcode == OPC_OP)
          ctrl.illegal = !(funct7 == 7'b0000000 || (funct7 == 7'b0100000 && (funct3 == 3'b000 || funct3 == 3'b101)));
        else if (funct3 == 3'b001)
          ctrl.illegal = funct7 != 7'b0000000;
        else if (funct3 == 3'b101)
          ctrl.illegal = funct7 != 7'b0000000 && funct7 != 7'b0100000;
      end
      OPC_MISC, OPC_SYSTEM: begin
        ctrl.illegal = 1'b0;
      end
      default: ctrl.illegal = 1'b1;
    endcase
  end
endmodule
