// kerf-case: minimal regression (F137, found by the random-module campaign, seed 85, module 14):
// kerf-case: a lane selector of an invented sensor hub. Code kept as written (a generate block)
// kerf-case: reads a wider signal through `$unsigned(...)` / `$signed(...)` into a narrower one,
// kerf-case: which keeps only the low bits (IEEE 1800-2017 10.7 and 20.5, from memory; Verilator's
// kerf-case: unused-signal check counts it so). The rewrite of `hit` no longer reads cfg[7:4] or
// kerf-case: gain[5:3]: they must be listed as unused, not left to a new Verilator -Wall warning.
module min_unused_conversion_read (
  input  logic [7:0]        cfg,
  input  logic signed [5:0] gain,
  input  logic              en,
  input  logic              arm,
  output logic [3:0]        cfg_lo,
  output logic signed [2:0] gain_lo,
  output logic              hit
);
  if (1) begin : g_kept
    assign cfg_lo  = $unsigned(cfg);
    assign gain_lo = $signed(gain);
  end
  assign hit = (en & cfg[7] & arm) | (en & ~cfg[7] & arm) | (en & gain[5] & ~gain[5]) | (en & cfg[0] & arm)
             | (en & gain[4] & gain[3] & ~gain[4]);
endmodule
