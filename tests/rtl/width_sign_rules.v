// kerf-case: width and sign rules of IEEE 1364-2005 5.4/5.5 in an invented datapath helper: context widths, mixed signedness, power, x constant compare
module width_sign_rules (
  input  [7:0] a,
  input  [7:0] b,
  input  signed [3:0] s,
  input  [1:0] k,
  input        c,
  output [8:0] avg,
  output       lt_mixed,
  output       lt_signed,
  output [7:0] neg,
  output [9:0] sel,
  output       eqx,
  output [7:0] pw,
  output [3:0] sh
);
  assign avg = (a + b) >> 1;
  assign lt_mixed = $signed(a) < b;
  assign lt_signed = s < $signed(k);
  assign neg = ~a + 1;
  assign sel = c ? s : b;
  assign eqx = a[3:0] == 4'b1x0x;
  assign pw = k ** 2 + a[1:0] ** k;
  assign sh = s >>> k;
endmodule
