// kerf-case: round-robin grant of an invented DMA channel arbiter, in the style of open cores: a
// kerf-case: function with a downward for loop that finds the first request (`'0 | (1 << i)`),
// kerf-case: called twice in a `?:` over a masked and an unmasked vector, a `$clog2`-sized index
// kerf-case: from a second loop, and `|req` beside it. N is a module parameter: by default the
// kerf-case: logic is kept (a fixed-width priority flag beside it is not); the pinned variant
// kerf-case: restructures it for 4 and the guard stops 8.
// kerf-params: N=8
// kerf-pin: N=4 other N=8
module rr_grant #(
  parameter int N = 4
) (
  input  logic [N-1:0]         req,
  input  logic [N-1:0]         mask,
  output logic [N-1:0]         grant,
  output logic [$clog2(N)-1:0] grant_idx,
  output logic                 any_req,
  input  logic [1:0]           prio_cfg,
  output logic                 prio_hi
);
  logic [N-1:0] masked;

  function automatic logic [N-1:0] first_one(input logic [N-1:0] v);
    logic [N-1:0] r;
    r = '0;
    for (int i = N - 1; i >= 0; i--) begin
      if (v[i]) r = '0 | (1 << i);
    end
    return r;
  endfunction

  assign prio_hi = prio_cfg[1] & ~prio_cfg[0] | prio_cfg[1] & prio_cfg[0];
  assign masked  = req & mask;
  assign any_req = |req;
  assign grant   = (|masked) ? first_one(masked) : first_one(req);

  always_comb begin
    grant_idx = '0;
    for (int i = 0; i < N; i++) begin
      if (grant[i]) grant_idx = i[$clog2(N)-1:0];
    end
  end
endmodule
