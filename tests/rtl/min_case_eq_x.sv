// kerf-case: minimal regression: === and !== against a constant with an x bit are literal
// kerf-case: comparisons (always 0 / always 1 for 0/1 inputs); lowering x as 0 compares with 4'b1000.
module min_case_eq_x (
  input  logic [3:0] a,
  output logic       same,
  output logic       differs
);
  assign same    = a === 4'b1x00;
  assign differs = a !== 4'b0x01;
endmodule
