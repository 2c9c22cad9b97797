// kerf-case: invented shared-bus slave: address match, tri-state read data, byte enables
module shared_bus_slave (
  input  [15:0] addr,
  input         rd,
  input         wr,
  input  [1:0]  sz,
  input  [7:0]  reg_a,
  input  [7:0]  reg_b,
  output [7:0]  bus,
  output        sel_a,
  output        sel_b,
  output [1:0]  be
);
  wire hit = addr[15:8] == 8'hA5;
  assign sel_a = hit & (addr[7:1] == 7'h00);
  assign sel_b = hit & (addr[7:1] == 7'h01) | hit & (addr[7:0] == 8'h04);
  assign bus = (rd & sel_a) ? reg_a : (rd & sel_b) ? reg_b : 8'bz;
  assign be = wr ? (sz == 2'd0 ? (addr[0] ? 2'b10 : 2'b01) : 2'b11) : 2'b00;
endmodule
