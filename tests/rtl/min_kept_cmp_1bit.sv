// kerf-case: minimal regression: the 1-bit result of a kept word comparison of two signals,
// kerf-case: read by restructured logic, must be written as a scalar (never `w[0]`).
module min_kept_cmp_1bit (
  input  logic [3:0] a,
  input  logic [3:0] b,
  input  logic       en,
  output logic       hit
);
  assign hit = en & (a == b);
endmodule
