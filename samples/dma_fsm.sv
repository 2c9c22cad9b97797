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

  always @(*) begin
    req      = 1'b0;
    busy     = 1'b0;
    done_irq = 1'b0;
    err_irq  = 1'b0;
    if (state_q == ARB || state_q == XFER) begin
      busy = 1'b1;
      req  = state_q == ARB || (state_q == XFER && !last_beat && !err);
    end
    if (state_q == DONE) done_irq = 1'b1;
    if (state_q == FAULT && !cancel) err_irq = 1'b1;
  end
endmodule
