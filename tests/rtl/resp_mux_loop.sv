// kerf-case: Read-response multiplexer of an invented four-target peripheral bus, in the style of
// kerf-case: open interconnect code: an unpacked array of target responses, a one-hot select, and
// kerf-case: an always_comb for loop that ORs each target's data masked by its select bit
// kerf-case: (an AND-OR multiplexer), plus an error response when no target is selected.
// kerf-params: NT=3
// kerf-pin: NT=4 other NT=3
module resp_mux_loop #(
  parameter int NT = 4
) (
  input  logic [NT-1:0]       sel,
  input  logic [NT-1:0][31:0] t_rdata,
  input  logic [NT-1:0]       t_ready,
  input  logic [NT-1:0]       t_err,
  output logic [31:0]         rdata,
  output logic                ready,
  output logic                err
);
  always_comb begin
    rdata = '0;
    ready = 1'b0;
    err   = 1'b0;
    for (int i = 0; i < NT; i++) begin
      rdata |= {32{sel[i]}} & t_rdata[i];
      ready |= sel[i] & t_ready[i];
      err   |= sel[i] & t_err[i];
    end
    // No target decoded: answer at once with an error (common bus practice).
    if (sel == '0) begin
      ready = 1'b1;
      err   = 1'b1;
    end
  end
endmodule
