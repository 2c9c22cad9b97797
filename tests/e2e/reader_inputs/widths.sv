// Expression bit lengths and signedness, IEEE 1800-2017 clauses 11.6 and 11.8.
module widths (
  input  logic [7:0]        a, b,
  input  logic [15:0]       c, d,
  input  logic signed [7:0] sa, sb,
  input  logic [3:0]        n,
  output logic [8:0]        sum9,
  output logic [15:0]       avg16,
  output logic [15:0]       avg32,
  output logic              lt,
  output logic [15:0]       cat,
  output logic signed [9:0] ssum,
  output logic [9:0]        mixed,
  output logic [7:0]        shl,
  output logic [3:0]        red,
  output logic [9:0]        widen
);
  assign sum9  = a + b;             // max(L(a), L(b), L(sum9)) = 9 bits
  assign avg16 = (c + d) >> 1;      // 11.6.2: evaluated at 16 bits, the carry is lost
  assign avg32 = (c + d + 0) >> 1;  // 11.6.2: the integer 0 makes the sum 32 bits
  assign lt    = a < c;             // operands at max(L(a), L(c)) = 16, result 1 bit
  assign cat   = {a, b};            // L(a) + L(b), always unsigned (11.8.1)
  assign ssum  = sa + sb;           // all operands signed: signed, sign-extended
  assign mixed = sa + b;            // one unsigned operand: unsigned, sa zero-extended (11.8.2)
  assign shl   = a << n;            // the shift amount is self-determined
  assign red   = {3'b000, &a};      // a reduction is 1 bit
  assign widen = sa;                // a signed operand alone is sign-extended to 10 bits
endmodule
