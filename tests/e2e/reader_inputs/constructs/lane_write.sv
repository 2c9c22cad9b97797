// Invented scenario: byte-lane merging of a write buffer (a part select with a
// variable base on the left-hand side, IEEE 1800 11.5.1: out of range writes nothing).
module lane_write (
  input  logic [7:0] word_in,
  input  logic [1:0] val,
  input  logic [1:0] s,
  input  logic [2:0] t,
  output logic [7:0] merged,
  output logic [7:0] tail
);
  always_comb begin
    merged = word_in;
    merged[s*2 +: 2] = val;
  end
  always_comb begin
    tail = word_in;
    tail[t*2 -: 2] = ~val;   // t*2 - 1 below 0 or above 7: those bits are not written
  end
endmodule
