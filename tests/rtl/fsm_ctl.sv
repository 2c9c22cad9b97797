// kerf-case: next-state and output logic of an invented DMA-channel controller: a local enum,
// kerf-case: defaults first, unique case on the state, x default for unreachable codes.
// kerf-case: (the x default is used as a don't-care; a --keep-x run keeps the block as written)
module fsm_ctl (
  input  logic [2:0] state_q,
  input  logic       start, done, err, abort,
  output logic [2:0] state_d,
  output logic       busy, irq, clr
);
  typedef enum logic [2:0] {IDLE=3'd0, LOAD=3'd1, RUN=3'd2, DRAIN=3'd3, FAULT=3'd4} st_e;
  always_comb begin
    state_d = state_q;
    busy = 1'b0; irq = 1'b0; clr = 1'b0;
    unique case (state_q)
      IDLE:  if (start) state_d = LOAD;
      LOAD:  begin busy = 1'b1; state_d = abort ? IDLE : RUN; end
      RUN:   begin
               busy = 1'b1;
               if (err) state_d = FAULT;
               else if (done || abort) state_d = DRAIN;
             end
      DRAIN: begin busy = 1'b1; if (!start) begin state_d = IDLE; irq = 1'b1; end end
      FAULT: begin irq = 1'b1; clr = abort; if (abort) state_d = IDLE; end
      default: begin state_d = 3'bx; busy = 1'bx; end
    endcase
  end
endmodule
