// kerf-case: health flags of an invented 8-lane link: `$countones`, `$onehot` and `$onehot0`
// kerf-case: (IEEE 1800 20.9) used in logic, not only in assertions, as many open cores do for
// kerf-case: lane-up counts and one-hot checks of state vectors. `sel` can select past the last
// kerf-case: lane: that bit reads x (IEEE 1800 11.5.1), which the system functions count as not 1
// kerf-case: (20.9), so `picked` is never x; checked by Icarus Verilog (four-valued).
module sysfunc_count (
  input  logic [7:0] lane_up,
  input  logic [3:0] state_oh,
  input  logic [1:0] min_lanes,
  input  logic [3:0] sel,
  output logic       link_ok,
  output logic       state_bad,
  output logic       state_idle,
  output logic [3:0] up_count,
  output logic [1:0] picked,
  output logic       picked_one
);
  assign up_count   = 4'($countones(lane_up));
  assign link_ok    = $countones(lane_up) >= 32'(min_lanes) * 2 + 1;
  assign state_bad  = !$onehot(state_oh);
  assign state_idle = $onehot0(state_oh) & ~state_oh[0];
  assign picked     = 2'($countones({lane_up[sel], state_oh[1:0]}));
  assign picked_one = $onehot({lane_up[sel], state_oh[0]});
endmodule
