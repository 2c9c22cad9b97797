// kerf-case: minimal regression (F116): a mode decoder of an invented fan controller. Code
// kerf-case: kept as written reads a wider signal through a truncating assignment (`speed_lo =
// kerf-case: mode` into one bit, `pick = level` into two), which reads only the low bits it
// kerf-case: keeps (IEEE 1800-2017 10.7, from memory; Verilator's unused-signal check counts it
// kerf-case: so). The rewrite of `fan_on` no longer reads mode[3] or level[3]: they must be
// kerf-case: listed as unused, not left to a new Verilator -Wall warning. With --keep-x the
// kerf-case: case block is kept through its statements, without it the generate through the
// kerf-case: reader's read ranges: both ways of telling what kept code reads are exercised.
// kerf-case: A truncated select (`trim_lo = trim[2:0]`) reads all the bits it selects
// kerf-case: (Verilator agrees): its rewrite reads trim[0] only, so trim[2:1] must be listed.
// kerf-flags: -
// kerf-flags: --keep-x
module min_unused_truncated_read (
  input  logic [3:0] mode,
  input  logic [3:0] level,
  input  logic [1:0] sel,
  input  logic       en,
  input  logic [2:0] trim,
  output logic       trim_lo,
  output logic       speed_lo,
  output logic [1:0] pick,
  output logic       fan_on
);
  if (1) begin : g_kept
    assign speed_lo = mode;
  end
  always_comb begin
    case (sel)
      2'b00:   pick = level;
      2'b01:   pick = ~level[1:0];
      default: pick = 'x;
    endcase
  end
  assign fan_on = (en & mode[3] & level[2]) | (en & ~mode[3] & level[2]) | (en & level[3] & ~level[3]) | (en & sel[0] & level[2]);
  always_comb begin
    trim_lo = trim[2:0];
    if (en & ~en) trim_lo = 1'b0;
  end
endmodule
