// kerf-case: minimal regression: named constants (localparams) used only by restructured logic
// kerf-case: must not be left unused by the rewrite (Verilator -Wall: UNUSEDPARAM).
module min_localparam_fold (
  input  logic [1:0] cmd,
  output logic       is_rd,
  output logic       is_wr
);
  localparam logic [1:0] CMD_RD = 2'd1;
  localparam logic [1:0] CMD_WR = 2'd2;
  assign is_rd = cmd == CMD_RD;
  assign is_wr = cmd == CMD_WR;
endmodule
