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

  // kerf: 1 of 4 groups rewritten, gates 93 -> 60, depth 7 -> 7, proved equivalent
  wire opcode_1_0_is_11 = opcode[1:0] == 2'b11;
  wire opcode_3_0_is_0x11 = ~opcode[3] & opcode_1_0_is_11;
  wire nopcode6_nopcode2 = ~(opcode[6] | opcode[2]);
  wire opcode_is_33 = (opcode[5:4] == 2'b11) & opcode_3_0_is_0x11 & nopcode6_nopcode2;
  wire opcode_is_13 = (opcode[5:4] == 2'b01) & opcode_3_0_is_0x11 & nopcode6_nopcode2;
  wire opcode_5_4_is_10 = opcode[5:4] == 2'b10;
  wire opcode_is_23 = opcode_3_0_is_0x11 & nopcode6_nopcode2 & opcode_5_4_is_10;
  wire opcode_is_63 = opcode[6] & ~opcode[2] & opcode_3_0_is_0x11 & opcode_5_4_is_10;
  wire opcode_is_0x10111 = ~opcode[6] & opcode[4] & opcode[2] & opcode_3_0_is_0x11;
  wire opcode_6_2_is_110x1 = opcode[6] & opcode[2] & opcode_5_4_is_10;
  wire opcode_is_6f = opcode[3] & opcode_1_0_is_11 & opcode_6_2_is_110x1;
  wire opcode_is_67 = opcode_3_0_is_0x11 & opcode_6_2_is_110x1;
  wire opcode_is_6f_or_67 = opcode_is_6f | opcode_is_67;
  wire opcode_is_33_or_13 = opcode_is_33 | opcode_is_13;
  wire reg_write_t0 = opcode_is_6f_or_67 | opcode_is_33_or_13;
  wire opcode_is_63_or_33_or_13 = opcode_is_63 | opcode_is_33_or_13;
  wire alu_op3_t0 = opcode_is_33 | ((funct3 == 3'b101) & opcode_is_13);
  wire imm_sel0_t0 = opcode_is_23 | opcode_is_0x10111;
  wire funct3_not_000 = funct3 != 3'b000;
  always_comb begin
    // comments of the replaced code, each after the code it was on or above:
    //   7'b0110011: begin  // OP
    //   7'b0010011: begin  // OP-IMM
    //   7'b0000011: begin  // LOAD
    //   7'b0100011: begin  // STORE
    //   7'b1100011: begin  // BRANCH
    //   7'b0?10111: begin  // LUI and AUIPC
    //   7'b1101111: begin  // JAL
    //   7'b1100111: begin  // JALR
    mem_read = (opcode[5:4] == 2'b00) & opcode_3_0_is_0x11 & nopcode6_nopcode2;
    reg_write = opcode_is_0x10111 | reg_write_t0 | mem_read;
    mem_write = opcode_is_23;
    branch = opcode_is_63;
    jump = opcode_is_6f_or_67;
    alu_src[0] = opcode_is_13
               | opcode_is_23
               | opcode_is_67
               | mem_read
               | (opcode[5] & opcode_is_0x10111);
    alu_src[1] = opcode_is_6f | (~opcode[5] & opcode_is_0x10111);
    alu_op[2:0] = funct3 & {3{opcode_is_63_or_33_or_13}};
    alu_op[3] = opcode_is_63 | (f7_alt & alu_op3_t0);
    imm_sel[0] = imm_sel0_t0;
    imm_sel[1] = opcode_is_63 | opcode_is_0x10111;
    imm_sel[2] = opcode_is_6f;
    illegal = ((funct3[2:1] == 2'b01) & opcode_is_63)
            | (opcode_is_67 & funct3_not_000)
            | ~(opcode_is_63 | reg_write_t0 | imm_sel0_t0 | mem_read);
  end
endmodule
