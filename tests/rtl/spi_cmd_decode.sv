// kerf-case: invented serial-flash command decoder with casez, x default and a struct output
// kerf-simulator: verilator
// kerf-with: include/spi_cmd_pkg.sv
module spi_cmd_decode import spi_cmd_pkg::*; (
  input  logic [7:0] cmd,
  input  logic       qpi,
  output dec_t       d,
  output logic       legal
);
  always_comb begin
    d = '{kind: NONE, addr4: 1'b0, dummy: 1'b0, lanes: 2'd0};
    legal = 1'b1;
    casez (cmd)
      8'h03: d.kind = RD;
      8'h0B: begin d.kind = RD; d.dummy = 1'b1; end
      8'h6B: begin d.kind = RD; d.dummy = 1'b1; d.lanes = 2'd2; end
      8'hEB: begin d.kind = RD; d.dummy = 1'b1; d.lanes = qpi ? 2'd2 : 2'd1; end
      8'h13: begin d.kind = RD; d.addr4 = 1'b1; end
      8'h02: d.kind = WR;
      8'h12: begin d.kind = WR; d.addr4 = 1'b1; end
      8'h32: begin d.kind = WR; d.lanes = 2'd2; end
      8'b0010_0000, 8'b1101_1000, 8'hC7: d.kind = ER;
      8'b1111_????: begin d = 'x; legal = 1'b0; end
      default: legal = 1'b0;
    endcase
  end
endmodule
