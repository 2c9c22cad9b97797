// A module with statements kerf keeps as written for different reasons, and one it rewrites:
// the summary names each kept statement's line with its reason (issue 9).
module kept_reasons (
  input  logic       clk,
  input  logic [3:0] a, b,
  input  logic       oe,
  output logic [3:0] q,
  output logic       y, v,
  output wire        z,
  output logic       w
);
  always_ff @(posedge clk) q <= a & b;
  assign z = oe ? a[0] : 1'bz;
  assign w = a[1] & b[1];
  assign y = (a[2] & b[2] & a[3] & b[3]) | (a[0] & b[0]);
  assign v = (a[2] & b[2] & a[3] & b[3]) | (a[1] ^ b[0]);
endmodule
