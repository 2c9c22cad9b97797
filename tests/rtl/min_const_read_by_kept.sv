// kerf-case: F323 (F169, F184): a signal whose logic is constant (`a & ~a`) read by a comparison
// kerf-case: in code kept as written (it depends on a parameter an instance can set). Written as
// kerf-case: a constant, the kept comparison `w <= b[P:0]` would draw Verilator's UNSIGNED
// kerf-case: warning that the input does not have; its statement stays as written.
module min_const_read_by_kept #(
  parameter int P = 2
) (
  input  logic [3:0] a,
  input  logic [3:0] b,
  output logic       y,
  output logic       z
);
  logic [1:0] w;
  assign w = a[1:0] & ~a[1:0];
  assign y = (w <= b[P:0]);
  assign z = (a[2] & a[3]) | (a[2] & b[0]) | (a[3] & b[0] & a[2]);
endmodule
