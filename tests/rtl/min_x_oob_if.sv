// kerf-case: minimal regression: an out-of-range bit select (x, IEEE 1800 11.5.1) as an `if`
// kerf-case: condition: the original takes the else branch (an x condition is false, 12.4),
// kerf-case: so y = b for s = 2, 3; reading the x as 0 makes the condition true instead.
module min_x_oob_if (
  input  logic [1:0] a,
  input  logic [1:0] s,
  input  logic       b,
  output logic       y
);
  always_comb begin
    if (a[s] <= 1'b0) y = 1'b1;
    else              y = b;
  end
endmodule
