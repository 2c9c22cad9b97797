// kerf-case: limit checker of an invented motor-control block: signed ports, comparisons of
// kerf-case: signed values against constants, sign extension and an arithmetic shift by a constant.
module signed_cmp (
  input  logic signed [7:0] speed,
  input  logic signed [3:0] trim,
  input  logic              reverse_ok,
  output logic              over_limit,
  output logic              reversing,
  output logic              near_zero,
  output logic signed [7:0] halved,
  output logic signed [7:0] trimmed_sign
);
  assign over_limit   = (speed > 8'sd100) || (speed < -8'sd100);
  assign reversing    = (speed < 0) & reverse_ok;
  assign near_zero    = (speed >= -8'sd3) && (speed <= 8'sd3);
  assign halved       = speed >>> 1;
  assign trimmed_sign = (trim < 0) ? -8'sd1 : (trim == 0) ? 8'sd0 : 8'sd1;
endmodule
