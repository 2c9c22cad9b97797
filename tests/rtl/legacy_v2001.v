// kerf-case: register-select logic of an invented 16550-like serial port in plain Verilog-2001:
// kerf-case: `always @(*)` with reg, parameters, a localparam table, nested if/case, and a
// kerf-case: scratch-register option chosen by `ifdef outside the block.
// kerf-defines: -
// kerf-defines: HAS_SCRATCH
// kerf-params: ADDR_W=4
// kerf-pin: ADDR_W=4 other ADDR_W=3
module legacy_v2001 (addr, dlab, rd, wr, sel_rbr, sel_thr, sel_ier, sel_dll, sel_dlm, sel_lcr, sel_scr, bad);
  parameter ADDR_W = 3;
  localparam RBR = 3'd0, IER = 3'd1, LCR = 3'd3, SCR = 3'd7;

  input  [ADDR_W-1:0] addr;
  input               dlab;
  input               rd;
  input               wr;
  output              sel_rbr, sel_thr, sel_ier, sel_dll, sel_dlm, sel_lcr, sel_scr;
  output              bad;

  reg sel_rbr, sel_thr, sel_ier, sel_dll, sel_dlm, sel_lcr, sel_scr, bad;

  wire scratch_present;
`ifdef HAS_SCRATCH
  assign scratch_present = 1'b1;
`else
  assign scratch_present = 1'b0;
`endif

  always @(*) begin
    sel_rbr = 1'b0; sel_thr = 1'b0; sel_ier = 1'b0; sel_dll = 1'b0;
    sel_dlm = 1'b0; sel_lcr = 1'b0; sel_scr = 1'b0; bad = 1'b0;
    case (addr)
      RBR: if (dlab) sel_dll = rd | wr;
           else begin sel_rbr = rd; sel_thr = wr; end
      IER: if (dlab) sel_dlm = rd | wr;
           else      sel_ier = rd | wr;
      LCR: sel_lcr = rd | wr;
      SCR: if (scratch_present) sel_scr = rd | wr;
           else                 bad = rd | wr;
      default: bad = rd | wr;
    endcase
  end
endmodule
