// kerf-case: status flags of an invented 8-entry FIFO: pointer registers in always_ff, full and
// kerf-case: empty from kept word comparisons, almost-full thresholds and push/pop qualifiers.
// kerf-clock: clk
// kerf-reset: rst_ni 0
module fifo_flags (
  input  logic       clk,
  input  logic       rst_ni,
  input  logic       push,
  input  logic       pop,
  input  logic [2:0] afull_level,
  output logic       full,
  output logic       empty,
  output logic       almost_full,
  output logic       do_push,
  output logic       do_pop,
  output logic [3:0] count
);
  logic [3:0] wr_ptr_q, rd_ptr_q;

  assign count       = wr_ptr_q - rd_ptr_q;
  assign empty       = wr_ptr_q == rd_ptr_q;
  assign full        = (wr_ptr_q[2:0] == rd_ptr_q[2:0]) && (wr_ptr_q[3] != rd_ptr_q[3]);
  assign almost_full = full || (count >= {1'b0, afull_level});
  assign do_push     = push && (!full || pop);
  assign do_pop      = pop && !empty;

  always_ff @(posedge clk or negedge rst_ni) begin
    if (!rst_ni) begin
      wr_ptr_q <= '0;
      rd_ptr_q <= '0;
    end else begin
      if (do_push) wr_ptr_q <= wr_ptr_q + 4'd1;
      if (do_pop)  rd_ptr_q <= rd_ptr_q + 4'd1;
    end
  end
endmodule
