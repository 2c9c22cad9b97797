// kerf-case: minimal regression (F103): a status register's write-enable decode. `hit` is set by
// kerf-case: an always_comb whose upper bit is always 0, so the rewrite reads only hit[0]; the
// kerf-case: debug qualifier `dbg_sel` is read only in a branch a localparam switches off and in
// kerf-case: an `ifdef` the build leaves out. Verilator -Wall must not see an unused bit (hit[1])
// kerf-case: or an unused input (dbg_sel) that the original did not have.
module min_unused_folded_bits (
  input  logic [3:0] addr,
  input  logic       wr,
  input  logic       sel,
  input  logic [1:0] dbg_sel,
  output logic       we_ctrl,
  output logic       we_stat,
  output logic       we_mask
);
  localparam bit TRACE = 1'b0;
  logic [1:0] hit;
  always_comb begin
    hit = 2'b00;
    if (addr[3:2] == 2'b01) hit = 2'b01;
  end
`ifdef STATUS_DEBUG
  assign we_mask = dbg_sel[0] & wr;
`else
  assign we_mask = wr & sel;
`endif
  assign we_ctrl = wr & sel & ~addr[0] & (hit != 2'd0) & (TRACE ? dbg_sel[1] : addr[1])
                 | wr & sel & ~addr[0] & (hit != 2'd0) & (TRACE ? dbg_sel[0] : ~addr[1]) & addr[1];
  assign we_stat = wr & sel & addr[0] & (hit != 2'd0) & ~addr[1]
                 | wr & sel & addr[0] & (hit != 2'd0) & (TRACE ? dbg_sel[1] : 1'b0);
endmodule
