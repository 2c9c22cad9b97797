// kerf-case: invented microcode-ROM style control table as a table-driven generator emits it:
// kerf-case: a 6-bit opcode, one case item per code with a full 10-bit control word, unused
// kerf-case: codes x, and outputs sliced from the control word by continuous assigns (F190, fixed).
module ucode_table (
  input  logic [5:0] op,
  output logic [2:0] alu_fn,
  output logic [1:0] src_sel,
  output logic       wr_en, rd_en, br, trap, halt
);
  logic [9:0] cw;
  always_comb begin
    unique case (op)
      6'd0: cw = 10'b0000000001;
      6'd1: cw = 10'b0000110000;
      6'd2: cw = 10'b0001010000;
      6'd3: cw = 10'b0001110000;
      6'd4: cw = 10'b0000010000;
      6'd5: cw = 10'b0000010000;
      6'd6: cw = 10'b0001010000;
      6'd7: cw = 10'b0001100000;
      6'd8: cw = 10'b0010010000;
      6'd9: cw = 10'b0010110000;
      6'd10: cw = 10'b0010010000;
      6'd11: cw = 10'b0011110000;
      6'd12: cw = 10'b0010010000;
      6'd14: cw = 10'b0011000000;
      6'd15: cw = 10'b0010010000;
      6'd16: cw = 10'b0100011000;
      6'd17: cw = 10'b0100111000;
      6'd18: cw = 10'b0101011000;
      6'd19: cw = 10'b0101111000;
      6'd20: cw = 10'b0100011000;
      6'd21: cw = 10'b0100101000;
      6'd22: cw = 10'b0101011000;
      6'd23: cw = 10'b0101111000;
      6'd24: cw = 10'b0110011000;
      6'd25: cw = 10'b0110011000;
      6'd26: cw = 10'b0111011000;
      6'd27: cw = 10'b0111111000;
      6'd28: cw = 10'b0110001000;
      6'd30: cw = 10'b0110011000;
      6'd31: cw = 10'b0111111000;
      6'd32: cw = 10'b1000010000;
      6'd33: cw = 10'b1000110000;
      6'd34: cw = 10'b1001010000;
      6'd35: cw = 10'b1000000000;
      6'd36: cw = 10'b1000010000;
      6'd37: cw = 10'b1000110000;
      6'd38: cw = 10'b1001010000;
      6'd39: cw = 10'b1001110000;
      6'd40: cw = 10'b1010000000;
      6'd41: cw = 10'b1010100000;
      6'd42: cw = 10'b1011000000;
      6'd43: cw = 10'b1011100000;
      6'd44: cw = 10'b1010000000;
      6'd46: cw = 10'b1011000000;
      6'd47: cw = 10'b1011100001;
      6'd48: cw = 10'b0000000100;
      6'd49: cw = 10'b0000100000;
      6'd50: cw = 10'b0000000100;
      6'd51: cw = 10'b0001100000;
      6'd52: cw = 10'b0000000100;
      6'd53: cw = 10'b0000100000;
      6'd54: cw = 10'b0001000100;
      6'd55: cw = 10'b0000000000;
      6'd56: cw = 10'b0000000100;
      6'd57: cw = 10'b0000100000;
      6'd58: cw = 10'b0001000100;
      6'd59: cw = 10'b0001100000;
      6'd60: cw = 10'b0000000100;
      6'd63: cw = 10'b0001100010;
      default: cw = 'x;
    endcase
  end
  assign alu_fn  = cw[9:7];
  assign src_sel = cw[6:5];
  assign wr_en   = cw[4];
  assign rd_en   = cw[3];
  assign br      = cw[2];
  assign trap    = cw[1];
  assign halt    = cw[0];
endmodule
