// kerf-case: minimal regression: named constants (localparams) used only by restructured logic
// kerf-case: must not be left unused by the rewrite (Verilator -Wall: UNUSEDPARAM): a comparison
// kerf-case: the rewrite keeps is written with the constant's name (cmd == CMD_RD); one it merges
// kerf-case: away (CMD_WR, in is_access) is read by the written `unused` wire instead.
module min_localparam_fold (
  input  logic [1:0] cmd,
  input  logic       valid,
  input  logic       force_rd,
  output logic       is_rd,
  output logic       is_access
);
  localparam logic [1:0] CMD_RD = 2'd2;
  localparam logic [1:0] CMD_WR = 2'd3;
  assign is_rd     = valid & (cmd == CMD_RD) | force_rd & (cmd == CMD_RD);
  assign is_access = (cmd == CMD_RD) | (cmd == CMD_WR);
endmodule
