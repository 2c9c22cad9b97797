// kerf-case: minimal regression: an x (a don't-care default) reaching an `if` condition. IEEE
// kerf-case: 1800 takes the else branch on an x condition, so the original shows y = b; a rewrite
// kerf-case: into gates shows x (or a) there.
module min_x_if_condition (
  input  logic [1:0] sel,
  input  logic       a,
  input  logic       b,
  output logic       y
);
  logic [1:0] m;
  always_comb begin
    case (sel)
      2'd0: m = 2'b01;
      2'd1: m = 2'b10;
      default: m = 'x;
    endcase
  end
  always_comb begin
    if (m[0]) y = a;
    else      y = b;
  end
endmodule
