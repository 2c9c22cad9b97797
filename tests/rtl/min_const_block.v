// kerf-case: minimal regression (random modules rm_62_17 and rm_62_145, seed 62): a Verilog-2001
// kerf-case: block whose value is a constant once a debug switch is off — a common way to leave
// kerf-case: an observation mux in the source. Rewritten as constants only, the `always @(*)` block
// kerf-case: read nothing, so it never ran (IEEE 1364-2005 9.7.5) and `dbg_sel` stayed x in
// kerf-case: simulation (Icarus Verilog showed the mismatch; the proof, on 0/1 values, could not).
// kerf-case: Such a block is now kept as written; the decode beside it is still restructured.
// kerf-case: The rewrite of hit[2] no longer names TRACE and PROBE, which the unused-signal wire
// kerf-case: then reads; unsized parameters are not allowed in a concatenation (IEEE 1800
// kerf-case: 11.4.12; Verilator WIDTHCONCAT), so they are read as TRACE[31:0] and PROBE[31:0].
module min_const_block (
  input  wire [7:0] addr,
  input  wire       sel,
  input  wire       wr,
  output reg  [3:0] dbg_sel,
  output wire [2:0] hit
);
  localparam DEBUG = 0;
  localparam TRACE = 0;
  localparam PROBE = 0;
  always @(*) begin
    dbg_sel = 4'd0;
    if (DEBUG) dbg_sel = addr[3:0];
  end
  assign hit[0] = sel & wr & addr[7] & addr[6] & ~addr[0];
  assign hit[1] = sel & wr & addr[7] & addr[6] & ~addr[1];
  assign hit[2] = (TRACE || PROBE) ? 1'b0 : sel & wr & addr[7] & addr[6] & ~addr[2];
endmodule
