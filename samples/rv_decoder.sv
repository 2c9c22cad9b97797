// Instruction decoder of an invented two-stage RV32I micro-controller core
// ("Sparrow"). Opcode and funct3 encodings follow the RISC-V unprivileged
// specification (RV32I base); the control-signal set is our own.
module rv_decoder (
    /* verilator lint_off UNUSEDSIGNAL */
    input  logic [31:0] instr,       // only opcode, funct3 and bit 30 are decoded here
    /* verilator lint_on UNUSEDSIGNAL */
    output logic        reg_write,
    output logic        mem_read,
    output logic        mem_write,
    output logic        branch,
    output logic        jump,
    output logic [1:0]  alu_src,     // 0 rs2, 1 immediate, 2 pc
    output logic [3:0]  alu_op,
    output logic [2:0]  imm_sel,     // I S B U J
    output logic        illegal
);
  logic [6:0] opcode;
  logic [2:0] funct3;
  logic       f7_alt;

  assign opcode = instr[6:0];
  assign funct3 = instr[14:12];
  assign f7_alt = instr[30];

  always_comb begin
    reg_write = 1'b0;
    mem_read  = 1'b0;
    mem_write = 1'b0;
    branch    = 1'b0;
    jump      = 1'b0;
    alu_src   = 2'd0;
    alu_op    = 4'd0;
    imm_sel   = 3'd0;
    illegal   = 1'b0;
    casez (opcode)
      7'b0110011: begin                       // OP
        reg_write = 1'b1;
        alu_op    = {f7_alt, funct3};
      end
      7'b0010011: begin                       // OP-IMM
        reg_write = 1'b1;
        alu_src   = 2'd1;
        alu_op    = {funct3 == 3'b101 ? f7_alt : 1'b0, funct3};
      end
      7'b0000011: begin                       // LOAD
        reg_write = 1'b1;
        mem_read  = 1'b1;
        alu_src   = 2'd1;
      end
      7'b0100011: begin                       // STORE
        mem_write = 1'b1;
        alu_src   = 2'd1;
        imm_sel   = 3'd1;
      end
      7'b1100011: begin                       // BRANCH
        branch    = 1'b1;
        imm_sel   = 3'd2;
        alu_op    = {1'b1, funct3};
        illegal   = funct3 == 3'b010 || funct3 == 3'b011;
      end
      7'b0?10111: begin                       // LUI and AUIPC
        reg_write = 1'b1;
        alu_src   = opcode[5] ? 2'd1 : 2'd2;
        imm_sel   = 3'd3;
      end
      7'b1101111: begin                       // JAL
        reg_write = 1'b1;
        jump      = 1'b1;
        alu_src   = 2'd2;
        imm_sel   = 3'd4;
      end
      7'b1100111: begin                       // JALR
        reg_write = 1'b1;
        jump      = 1'b1;
        alu_src   = 2'd1;
        illegal   = funct3 != 3'b000;
      end
      default: illegal = 1'b1;
    endcase
  end
endmodule
