// kerf-case: Status display decoder of an invented bench instrument: a hex digit to seven-segment
// kerf-case: pattern (segments a..g, active low as on common-anode displays), a blanking input and
// kerf-case: a lamp test, in the style of hand-written display drivers: a case with one item per
// kerf-case: digit written as binary literals, then the overrides as an if chain.
module seg7_status (
  input  logic [3:0] digit,
  input  logic       blank,
  input  logic       lamp_test,
  output logic [6:0] seg_n,
  output logic       dp_n
);
  logic [6:0] seg;  // active high, bit 6 = a ... bit 0 = g

  always_comb begin
    case (digit)
      4'h0: seg = 7'b1111110;
      4'h1: seg = 7'b0110000;
      4'h2: seg = 7'b1101101;
      4'h3: seg = 7'b1111001;
      4'h4: seg = 7'b0110011;
      4'h5: seg = 7'b1011011;
      4'h6: seg = 7'b1011111;
      4'h7: seg = 7'b1110000;
      4'h8: seg = 7'b1111111;
      4'h9: seg = 7'b1111011;
      4'hA: seg = 7'b1110111;
      4'hB: seg = 7'b0011111;
      4'hC: seg = 7'b1001110;
      4'hD: seg = 7'b0111101;
      4'hE: seg = 7'b1001111;
      default: seg = 7'b1000111;  // F
    endcase
  end

  always_comb begin
    if (lamp_test)  seg_n = 7'b0000000;
    else if (blank) seg_n = 7'b1111111;
    else            seg_n = ~seg;
    dp_n = ~lamp_test;
  end
endmodule
