// kerf-case: a request summary beside its decode: `any_req = |req` is what the author means;
// kerf-case: a fragment of it (`req[7] | req[6]`) is shared with other outputs. The reduction
// kerf-case: stays whole unless its fragments save the --min-gain margin (reductions.cpp).
module req_summary (
  input  logic [7:0] req,
  input  logic [3:0] mask,
  input  logic       en,
  input  logic       urgent,
  output logic       any_req,
  output logic       hi_grant,
  output logic       hi_urgent,
  output logic       lo_idle
);
  assign any_req   = |req;
  assign hi_grant  = (req[7] | req[6]) & mask[3] & mask[2] & en;
  assign hi_urgent = (req[7] | req[6]) & mask[3] & mask[2] & urgent;
  assign lo_idle   = ~|req[3:0] & en;
endmodule
