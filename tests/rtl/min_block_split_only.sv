// kerf-case: readability of the F30 rule: a block whose assignments cannot all be written as
// kerf-case: vectors in order. y is a ripple of its own bits (its vector template would read bits it
// kerf-case: assigns), so y is written bit by bit; z reads none of them and keeps one vector
// kerf-case: assignment (before: every signal of the block was written bit by bit).
module min_block_split_only (
  input  logic [3:0] a,
  input  logic [3:0] b,
  input  logic       s,
  output logic [3:0] y,
  output logic [3:0] z
);
  always_comb begin
    y[0] = a[0] & s;
    y[1] = y[0] ^ a[1];
    y[2] = y[1] ^ a[2];
    y[3] = y[2] ^ a[3];
    z = (a & b) | (a & ~b & {4{s}});
  end
endmodule
