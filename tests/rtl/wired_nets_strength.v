// kerf-case: interrupt and ready lines of an invented I2C-style peripheral written with wired
// kerf-case: nets (Verilog-2001 style): a `wor` interrupt with two drivers, a `wand` ready line
// kerf-case: with a declaration initializer and a second driver (IEEE 1800-2017 6.6.3: the drivers
// kerf-case: resolve together; kerf refused the module as "more than one driver"), and an assign
// kerf-case: with a drive strength (F119: the reader crashed on it, a pyslang conversion error).
// kerf-case: Those are kept with their reasons; the decode beside them is restructured.
// kerf-case: Verilator 5 does not read wor/wand nets ("Unsupported: wor"): no lint compare.
// kerf-lint: off
module wired_nets_strength (
  input  wire       scl_low,
  input  wire       sda_low,
  input  wire       rx_full,
  input  wire       tx_empty,
  input  wire       ie_rx,
  input  wire       ie_tx,
  input  wire [1:0] mode,
  output wor        irq,
  output wire       bus_idle,
  output wire       stretch,
  output wire       sel_std,
  output wire       sel_fast
);
  wand ready = ~scl_low | ~sda_low;
  assign ready = ~rx_full;
  assign irq = rx_full & ie_rx & mode[0] | rx_full & ie_rx & mode[1];
  assign irq = tx_empty & ie_tx & mode[0] | tx_empty & ie_tx & mode[1];
  assign (strong0, weak1) stretch = rx_full & scl_low | rx_full & sda_low;
  assign bus_idle = ready & ~scl_low & ~sda_low | ready & ~scl_low & sda_low;
  assign sel_std  = ~mode[1] & ~mode[0] | ~mode[1] & mode[0] & ~scl_low;
  assign sel_fast = mode[1] & ~mode[0] | mode[1] & mode[0] & ~scl_low;
endmodule
