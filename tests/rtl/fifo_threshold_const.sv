// kerf-case: threshold check of an invented FIFO whose generated threshold word has a top bit
// kerf-case: that is 0 for every mode (set only under `mode == 2'b01`, from `mode[1]`): only the
// kerf-case: engine finds it constant, so `thr[4] > level` is always 0. The rewrite must not
// kerf-case: write that comparison with a constant operand (`5'b00000 > level`: Verilator's
// kerf-case: UNSIGNED warning, a term that is always 0); F167, emit/word_fold.cpp.
module fifo_threshold_const (
  input  logic [1:0] mode,
  input  logic [4:0] level,
  input  logic [2:0] spare,
  input  logic       push,
  output logic       warn,
  output logic       full
);
  logic [4:0] thr;
  always_comb begin
    thr = {spare, mode};
    if (mode == 2'b01) thr[4] = mode[1];
    else thr[4] = 1'b0;
  end
  assign warn = push & ((thr[4] > level) | (mode == 2'b11));
  assign full = push & (level == 5'd31) | (mode == 2'b10) & push & spare[0];
endmodule
