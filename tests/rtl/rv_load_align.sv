// kerf-case: Load data alignment of an invented RV32I core (LB/LH/LW/LBU/LHU funct3 encodings
// kerf-case: of the RISC-V base ISA, an open standard), in the style of hand-written cores: an
// kerf-case: always_comb with a case on funct3 and a nested case on the low address bits, sign
// kerf-case: extension by replication, an x default for impossible sizes and a misalignment flag.
module rv_load_align (
  input  logic [2:0]  funct3,
  input  logic [1:0]  addr_lo,
  input  logic [31:0] rdata,
  output logic [31:0] ld_data,
  output logic        misaligned
);
  localparam logic [2:0] F3_LB = 3'b000, F3_LH = 3'b001, F3_LW = 3'b010,
                         F3_LBU = 3'b100, F3_LHU = 3'b101;
  logic [7:0]  byte_sel;
  logic [15:0] half_sel;

  // Pick the addressed byte and half word of the loaded word.
  always_comb begin
    case (addr_lo)
      2'd0: byte_sel = rdata[7:0];
      2'd1: byte_sel = rdata[15:8];
      2'd2: byte_sel = rdata[23:16];
      default: byte_sel = rdata[31:24];
    endcase
    half_sel = addr_lo[1] ? rdata[31:16] : rdata[15:0];
  end

  always_comb begin
    misaligned = 1'b0;
    case (funct3)
      F3_LB:  ld_data = {{24{byte_sel[7]}}, byte_sel};
      F3_LBU: ld_data = {24'b0, byte_sel};
      F3_LH: begin
        ld_data    = {{16{half_sel[15]}}, half_sel};
        misaligned = addr_lo[0];
      end
      F3_LHU: begin
        ld_data    = {16'b0, half_sel};
        misaligned = addr_lo[0];
      end
      F3_LW: begin
        ld_data    = rdata;
        misaligned = |addr_lo;
      end
      default: ld_data = 'x;  // not a load: the decoder never selects it
    endcase
  end
endmodule
