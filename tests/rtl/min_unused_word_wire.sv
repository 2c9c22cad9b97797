// kerf-case: minimal regression: a kept word operation used twice (`last + 1` as a shift amount
// kerf-case: and as an index) must not leave a declared, unused generated wire behind.
module min_unused_word_wire (
  input  logic [1:0] last,
  input  logic [3:0] req,
  output logic [3:0] rot,
  output logic [3:0] gnt
);
  assign rot = req >> (last + 2'd1);
  always_comb begin
    gnt = 4'b0000;
    gnt[last + 2'd1] = |req;
  end
endmodule
