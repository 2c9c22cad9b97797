// kerf-case: Next-state logic of an invented DMA channel's one-hot controller in the reverse-case
// kerf-case: style common in hand-written RTL (common trade practice): `unique case (1'b1)` over
// kerf-case: state bits indexed by an enum of bit positions (`state[IDLE]`), next-state bits set
// kerf-case: one by one from '0, and an x default for states that are not one-hot.
module onehot_fsm_reverse_case (
  input  logic [4:0] state,     // one-hot
  input  logic       go, done, err,
  output logic [4:0] next,
  output logic       busy, irq
);
  typedef enum int unsigned { IDLE = 0, LOAD = 1, RUN = 2, DRAIN = 3, FAULT = 4 } idx_e;
  always_comb begin
    next = '0;
    busy = 1'b1;
    irq  = 1'b0;
    unique case (1'b1)
      state[IDLE]:  begin busy = 1'b0; if (go) next[LOAD] = 1'b1; else next[IDLE] = 1'b1; end
      state[LOAD]:  next[RUN] = 1'b1;
      state[RUN]:   if (err) next[FAULT] = 1'b1; else if (done) next[DRAIN] = 1'b1; else next[RUN] = 1'b1;
      state[DRAIN]: begin next[IDLE] = 1'b1; irq = 1'b1; end
      state[FAULT]: begin next[FAULT] = !go; next[IDLE] = go; irq = 1'b1; end
      default:      next = 'x;
    endcase
  end
endmodule
