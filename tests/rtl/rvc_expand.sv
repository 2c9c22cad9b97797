// kerf-case: RISC-V compressed-instruction expander (a subset of quadrants 0 and 1 of the open
// kerf-case: RISC-V C-extension encodings, from memory): unique case on opcode fields, sign
// kerf-case: extension by replication; outside reference: Icarus simulation of both versions.
// kerf-vectors: 4000
module rvc_expand (
  input  logic [15:0] instr_i,
  output logic [31:0] instr_o,
  output logic        illegal_o
);
  localparam logic [6:0] OPC_OP_IMM = 7'b0010011;
  localparam logic [6:0] OPC_LOAD   = 7'b0000011;
  localparam logic [6:0] OPC_STORE  = 7'b0100011;
  localparam logic [6:0] OPC_LUI    = 7'b0110111;
  localparam logic [6:0] OPC_JAL    = 7'b1101111;
  always_comb begin
    illegal_o = 1'b0;
    instr_o   = {16'b0, instr_i};
    unique case (instr_i[1:0])
      2'b00: begin
        unique case (instr_i[15:13])
          3'b000: begin // c.addi4spn
            instr_o = {2'b0, instr_i[10:7], instr_i[12:11], instr_i[5], instr_i[6], 2'b00,
                       5'h02, 3'b000, 2'b01, instr_i[4:2], OPC_OP_IMM};
            if (instr_i[12:5] == 8'b0) illegal_o = 1'b1;
          end
          3'b010: begin // c.lw
            instr_o = {5'b0, instr_i[5], instr_i[12:10], instr_i[6], 2'b00, 2'b01, instr_i[9:7],
                       3'b010, 2'b01, instr_i[4:2], OPC_LOAD};
          end
          3'b110: begin // c.sw
            instr_o = {5'b0, instr_i[5], instr_i[12], 2'b01, instr_i[4:2], 2'b01, instr_i[9:7],
                       3'b010, instr_i[11:10], instr_i[6], 2'b00, OPC_STORE};
          end
          default: illegal_o = 1'b1;
        endcase
      end
      2'b01: begin
        unique case (instr_i[15:13])
          3'b000: begin // c.addi
            instr_o = {{6{instr_i[12]}}, instr_i[12], instr_i[6:2], instr_i[11:7], 3'b0,
                       instr_i[11:7], OPC_OP_IMM};
          end
          3'b001, 3'b101: begin // c.jal, c.j
            instr_o = {instr_i[12], instr_i[8], instr_i[10:9], instr_i[6], instr_i[7], instr_i[2],
                       instr_i[11], instr_i[5:3], {9{instr_i[12]}}, 4'b0, ~instr_i[15], OPC_JAL};
          end
          3'b010: begin // c.li
            instr_o = {{6{instr_i[12]}}, instr_i[12], instr_i[6:2], 5'b0, 3'b0, instr_i[11:7],
                       OPC_OP_IMM};
          end
          3'b011: begin // c.lui
            instr_o = {{15{instr_i[12]}}, instr_i[6:2], instr_i[11:7], OPC_LUI};
            if ({instr_i[12], instr_i[6:2]} == 6'b0) illegal_o = 1'b1;
          end
          default: illegal_o = 1'b1;
        endcase
      end
      default: ; // quadrant 2 and uncompressed: passed through
    endcase
  end
endmodule
