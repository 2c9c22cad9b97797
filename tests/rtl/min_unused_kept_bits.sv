// kerf-case: minimal regression (F103): a lane arbiter slice. A generate loop (kept as written)
// kerf-case: reads lane_en[1:0]; the rewritten `any_hi` read lane_en[3:2] only in a branch a
// kerf-case: localparam switches off, and `hi_req` reads req[3:2] beside a kept statement that
// kerf-case: reads req[1:0]. Verilator -Wall must not see lane_en[3:2] or req bits newly unused:
// kerf-case: what kept code reads is told by bit, not by signal.
module min_unused_kept_bits (
  input  logic [3:0] lane_en,
  input  logic [3:0] req,
  input  logic       mode,
  output logic [1:0] grant_lo,
  output logic       any_hi,
  output logic       lo_busy
);
  localparam bit WIDE = 1'b0;
  for (genvar g = 0; g < 2; g++) begin : gen_lo
    assign grant_lo[g] = req[g] & lane_en[g];
  end
  assign lo_busy = req[0] | req[1];
  assign any_hi = mode & req[2] & (WIDE ? lane_en[2] : 1'b1)
                | mode & req[3] & (WIDE ? lane_en[3] : 1'b1)
                | mode & req[2] & req[3];
endmodule
