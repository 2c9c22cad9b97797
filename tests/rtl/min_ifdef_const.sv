// kerf-case: minimal regression: a signal set to a constant inside `ifdef/`else and read by
// kerf-case: restructured logic; folding the constant of one define set (and deleting the wire)
// kerf-case: makes the rewrite wrong when built with the other.
// kerf-defines: -
// kerf-defines: WIDE_MODE
module min_ifdef_const (
  input  logic a,
  input  logic b,
  output logic y
);
  wire wide;
`ifdef WIDE_MODE
  assign wide = 1'b1;
`else
  assign wide = 1'b0;
`endif
  assign y = wide ? (a | b) : (a & b);
endmodule
