// Expressions and comb statements whose values test_reader.py computes from the
// reader's description and compares with Icarus Verilog's simulation.
module semantics (
  input  logic [7:0]        a, b,
  input  logic signed [7:0] sa, sb,
  input  logic [3:0]        n,
  input  logic [2:0]        k,
  output logic [8:0]        o_sum,
  output logic [15:0]       o_mul,
  output logic [9:0]        o_mixed,
  output logic signed [9:0] o_ssum,
  output logic [9:0]        o_widen,
  output logic [7:0]        o_shl, o_shr, o_ashr_u,
  output logic signed [7:0] o_ashr,
  output logic              o_lt, o_slt, o_eq, o_land, o_red,
  output logic [15:0]       o_cat,
  output logic [11:0]       o_rep,
  output logic [7:0]        o_cond,
  output logic [3:0]        o_part, o_up, o_down,
  output logic              o_bit,
  output logic [7:0]        o_neg, o_not,
  output logic [9:0]        o_casts,
  output logic [15:0]       o_avg,
  output logic [7:0]        o_comb, o_rev,
  output logic [3:0]        o_count
);
  integer m;
  assign o_sum    = a + b;
  assign o_mul    = a * b;
  assign o_mixed  = sa + b;
  assign o_ssum   = sa + sb;
  assign o_widen  = sa;
  assign o_shl    = a << n;
  assign o_shr    = a >> n;
  assign o_ashr_u = a >>> n;
  assign o_ashr   = sa >>> n;
  assign o_lt     = a < sb;
  assign o_slt    = sa < sb;
  assign o_eq     = (a ^ b) == 8'h5a;
  assign o_land   = a && !b || (n != 4'd0);
  assign o_red    = ^a ~^ |b;
  assign o_cat    = {a[3:0], b, sa[7:4]};
  assign o_rep    = {3{n}};
  assign o_cond   = (a > b) ? a - b : b - a;
  assign o_part   = a[6:3];
  assign o_up     = b[k[1:0] +: 4];
  assign o_down   = b[k[1:0] + 3'd4 -: 4];
  assign o_bit    = a[k];
  assign o_neg    = -a;
  assign o_not    = ~(a | sb);
  assign o_casts  = $signed(a) + $unsigned(sb);
  assign o_avg    = ({8'd0, a} + {8'd0, b} + 0) >> 1;
  always_comb begin
    o_comb = 8'd0;
    casez (n)
      4'b1??1: o_comb = a;
      4'b01??: o_comb = b;
      4'b0000: o_comb = a & b;
      default: o_comb = {n, n};
    endcase
    if (k == 3'd7) o_comb = ~o_comb;
  end
  always @* begin
    o_rev = 8'd0;
    for (m = 0; m < 8; m = m + 1)
      o_rev[m] = a[7 - m];
  end
  always_comb begin
    o_count = 4'd0;
    for (int i = 0; i < 8; i++)
      if (a[i] ^ b[i]) o_count += 1'b1;
  end
endmodule
