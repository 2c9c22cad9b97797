// kerf-case: minimal regression (random module rm_61_3, seed 61): an x default of one block
// kerf-case: (`default: grant = 'x`) read by an `if` condition in another block. IEEE 1800 12.4
// kerf-case: takes the else branch on an x condition, so the original has a definite value
// kerf-case: there; reading the x as a don't-care let the first block be rewritten (x -> 0) while
// kerf-case: the second, with nothing to gain, stayed as written and took the other branch
// kerf-case: (kerf's proof refuted its own rewrite: exit 5). Both statements are now kept as written;
// kerf-case: the unrelated decodes of `busy` are still restructured.
module min_x_decides (
  input  logic [7:0] req,
  input  logic [1:0] mode,
  input  logic       hold,
  input  logic [3:0] lane_q,
  output logic [3:0] pick,
  output logic [2:0] busy
);
  logic [2:0] grant;
  always_comb begin
    grant = {2'b00, ~mode[1] & req[req[5:3]]};
    case (mode)
      2'b11: ;
      default: grant = 'x;
    endcase
  end
  always_comb begin
    pick = {4{~hold}};
    if (~lane_q == {1'b0, grant}) begin
    end else begin
      pick = {{2{lane_q[1]}}, lane_q[1:0]};
    end
  end
  assign busy[0] = req[0] & req[1] & req[2] & mode[0];
  assign busy[1] = req[0] & req[1] & req[2] & mode[1];
  assign busy[2] = req[0] & req[1] & req[2] & hold;
endmodule
