// kerf-case: constant arithmetic of loop indices (signed and unsigned division and remainder,
// kerf-case: negative operands, division by -1, wrap-around of a product) as IEEE 1800 11.4.2
// kerf-case: defines it: each output bit compares the input with a constant the loop computes.
module const_arith_fold (
  input  logic signed [7:0] v,
  output logic [15:0]       quo_hit,
  output logic [15:0]       rem_hit,
  output logic [7:0]        misc_hit
);
  always_comb begin
    for (int i = 0; i < 16; i++) begin
      quo_hit[i] = v == 8'((i - 8) / 3 + (i - 8) / -1);
      rem_hit[i] = v == 8'((i - 8) % 3 * 5 + (i * 7) % 5 - (i - 9) % -4);
    end
    for (int unsigned u = 0; u < 8; u++)
      misc_hit[u] = v == 8'((u * 32'd1073741825) / 3 + (u - 4) % 7);
  end
endmodule
