// Channel controller of an invented two-channel DMA engine ("Heron DMA").
// The state register is clocked (kept as written); next-state and output
// logic is combinational and is what kerf restructures.
module dma_fsm (
    input  logic       clk,
    input  logic       rst_n,
    input  logic       start,
    input  logic       cancel,
    input  logic       grant,
    input  logic       last_beat,
    input  logic       err,
    output logic       req,
    output logic       busy,
    output logic       done_irq,
    output logic       err_irq,
    output logic [2:0] state_q
);
  localparam logic [2:0] IDLE = 3'd0, ARB = 3'd1, XFER = 3'd2, DONE = 3'd3, FAULT = 3'd4;

  logic [2:0] state_d;

  always_ff @(posedge clk or negedge rst_n) begin
    if (!rst_n) state_q <= IDLE;
    else        state_q <= state_d;
  end

  // kerf: 1 of 1 group rewritten, gates 76 -> 26, depth 6 -> 6, proved equivalent
  wire state_q_is_IDLE = state_q == IDLE;
  wire state_q_is_ARB = state_q == ARB;
  wire state_q_is_ARB_ncancel = state_q_is_ARB & ~cancel;
  wire state_q_is_XFER = state_q == XFER;
  wire state_q_is_XFER_nerr = state_q_is_XFER & ~err;
  wire state_d0_t0 = state_q_is_XFER_nerr & ~cancel;
  wire state_q_is_FAULT = state_q == FAULT;
  always_comb begin
    state_d[0] = (state_d0_t0 & last_beat)
               | (state_q_is_ARB_ncancel & ~grant)
               | (state_q_is_IDLE & start);
    state_d[1] = state_d0_t0 | (state_q_is_ARB_ncancel & grant);
    state_d[2] = err_irq | (state_q_is_XFER & err);
  end

  always @(*) begin
    req = state_q_is_ARB | (state_q_is_XFER_nerr & ~last_beat);
    busy = state_q_is_ARB | state_q_is_XFER;
    done_irq = state_q == DONE;
    err_irq = state_q_is_FAULT & ~cancel;
  end
endmodule
