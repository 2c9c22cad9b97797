// Invented scenario: the digit split of a stopwatch display and the word and
// lane of a byte address (division and modulo by constants, IEEE 1800 11.4.2).
module clock_digits (
  input  logic [6:0]        seconds,
  input  logic [9:0]        addr,
  input  logic signed [7:0] offset,
  output logic [3:0]        tens,
  output logic [3:0]        ones,
  output logic [7:0]        word,
  output logic [1:0]        lane,
  output logic [6:0]        third,
  output logic signed [7:0] sq,
  output logic signed [7:0] sr
);
  assign tens  = 4'(seconds / 7'd10);
  assign ones  = 4'(seconds % 7'd10);
  assign word  = 8'(addr / 10'd4);
  assign lane  = 2'(addr % 10'd4);
  assign third = seconds / 7'd3;
  assign sq    = offset / 8'sd3;      // truncates toward zero
  assign sr    = offset % 8'sd3;      // takes the dividend's sign
endmodule
