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

  always_comb begin
    state_d = state_q;
    case (state_q)
      IDLE:  if (start) state_d = ARB;
      ARB:   if (cancel) state_d = IDLE;
             else if (grant) state_d = XFER;
      XFER:  if (err) state_d = FAULT;
             else if (cancel) state_d = IDLE;
             else if (last_beat) state_d = DONE;
      DONE:  state_d = IDLE;
      FAULT: if (cancel) state_d = IDLE;
      default: state_d = IDLE;
    endcase
  end

  // kerf: 1 of 1 group rewritten, gates 76 -> 73, depth 6 -> 6, proved equivalent
  wire state_q_is_ARB = state_q == ARB;
  wire state_q_is_FAULT = state_q == FAULT;
  always @(*) begin
    busy = state_q_is_ARB | (state_q == XFER);
    req = state_q_is_ARB | (~last_beat & ~err & busy);
    done_irq = state_q == DONE;
    err_irq = state_q_is_FAULT & ~cancel;
  end
endmodule
