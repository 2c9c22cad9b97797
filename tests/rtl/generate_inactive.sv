// kerf-case: receive path of an invented memory controller with an optional parity check chosen
// kerf-case: by a generate `if`: the declarations only the inactive branch names must survive,
// kerf-case: so the rewrite still builds and behaves with the other parameter value.
// kerf-params: USE_PARITY=0
// kerf-params: USE_PARITY=1 ODD=1
module generate_inactive #(
  parameter bit USE_PARITY = 1'b1,
  parameter bit ODD        = 1'b0
) (
  input  logic [7:0] data,
  input  logic       par_in,
  input  logic       valid,
  input  logic [1:0] kind,
  output logic       accept,
  output logic       err,
  output logic       is_ctrl
);
  logic par_ok;
  logic par_calc;

  if (USE_PARITY) begin : g_par
    assign par_calc = (^data) ^ ODD;
    assign par_ok   = (par_calc == par_in);
  end else begin : g_nopar
    assign par_calc = 1'b0;
    assign par_ok   = 1'b1;
  end

  assign is_ctrl = valid & (kind == 2'd3) & (data[7:4] == 4'hA);
  assign accept  = valid & par_ok & (kind != 2'd0);
  assign err     = valid & (~par_ok | (kind == 2'd0 & data[0])) & ~par_calc | (valid & ~par_ok & par_calc);
endmodule
