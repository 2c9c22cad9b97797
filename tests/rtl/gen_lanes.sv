// kerf-case: per-lane valid/ready gating of an invented streaming switch: a generate `for` over
// kerf-case: a lane count that instances set (2, 4, 6), with a lane mask parameter.
// kerf-params: N=2
// kerf-params: N=6 MASK=6'b101101
// kerf-pin: N=2 other N=4
module gen_lanes #(
  parameter int          N    = 4,
  parameter logic [N-1:0] MASK = '1
) (
  input  logic [N-1:0] in_valid,
  input  logic [N-1:0] out_ready,
  input  logic         flush,
  input  logic [1:0]   policy,
  output logic [N-1:0] in_ready,
  output logic [N-1:0] out_valid,
  output logic         any_stall
);
  for (genvar i = 0; i < N; i++) begin : g_lane
    if (MASK[i]) begin : g_on
      assign out_valid[i] = in_valid[i] & ~flush;
      assign in_ready[i]  = (policy == 2'd0) ? out_ready[i]
                          : (policy == 2'd1) ? (out_ready[i] | flush)
                          : (out_ready[i] & ~flush);
    end else begin : g_off
      assign out_valid[i] = 1'b0;
      assign in_ready[i]  = flush;
    end
  end

  assign any_stall = |(in_valid & ~in_ready);
endmodule
