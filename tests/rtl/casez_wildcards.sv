// kerf-case: RISC-V instruction-class decoder (open standard opcode map) with casez items
// kerf-case: whose wildcard bits are written both as ? and as z; the wildcards must stay
// kerf-case: wildcards (never compared as 0).
module casez_wildcards (
  input  logic [31:0] instr,
  output logic [2:0]  cls,
  output logic        is_compressed,
  output logic        is_mul
);
  always_comb begin
    casez (instr[6:0])
      7'b0?00011: cls = 3'd1;   // load / store
      7'b0z10011: cls = 3'd2;   // op-imm / op
      7'b0?10111: cls = 3'd3;   // auipc / lui
      7'b110?111: cls = 3'd4;   // jalr / jal
      7'b1100011: cls = 3'd5;   // branch
      7'b11100zz: cls = 3'd6;   // system (and reserved neighbours)
      default:    cls = 3'd0;
    endcase
  end

  always_comb begin
    casez (instr[1:0])
      2'b11:   is_compressed = 1'b0;
      default: is_compressed = 1'b1;
    endcase
  end

  // M extension: opcode OP with funct7 = 0000001
  always_comb begin
    casez ({instr[31:25], instr[6:0]})
      14'b0000001_0110011: is_mul = 1'b1;
      14'b0000001_0111011: is_mul = 1'b1;
      default:             is_mul = 1'b0;
    endcase
  end
endmodule
