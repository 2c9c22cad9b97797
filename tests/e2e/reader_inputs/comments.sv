// Invented scenario: status flags of a small timer, with comments attached
// to the statements they describe.
module timer_flags (
  input  logic [3:0] count,
  input  logic       enable,
  output logic       wrap,
  output logic       half,
  output logic       idle
);
  // a section comment, separated from the statement by a blank line

  // wrap when the counter is all ones
  // (two lines directly above)
  assign wrap = &count; // trailing on wrap
  assign half = count[3] /* the top bit */ & enable;   /* trailing block comment */
  always_comb begin
    // inside the block
    idle = ~enable; // after the statement, inside
  end
endmodule
