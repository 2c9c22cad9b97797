// kerf-case: transmit controller of an invented UART: enum state register in always_ff beside
// kerf-case: next-state and output logic in always_comb (the controller style of real cores).
// kerf-clock: clk
// kerf-reset: rst_ni 0
module uart_ctrl_fsm (
  input  logic       clk,
  input  logic       rst_ni,
  input  logic       tx_start,
  input  logic       baud_tick,
  input  logic [2:0] bit_idx,
  input  logic       parity_en,
  input  logic       cts_n,
  output logic       tx_busy,
  output logic       load_shift,
  output logic       shift_en,
  output logic       tx_line_sel_data,
  output logic       tx_line_sel_par,
  output logic       done
);
  typedef enum logic [2:0] {IDLE, WAIT_CTS, START, DATA, PARITY, STOP} state_e;
  state_e state_q, state_d;

  always_ff @(posedge clk or negedge rst_ni) begin
    if (!rst_ni) state_q <= IDLE;
    else         state_q <= state_d;
  end

  always_comb begin
    state_d = state_q;
    unique case (state_q)
      IDLE:     if (tx_start) begin
                  if (cts_n) state_d = WAIT_CTS;
                  else       state_d = START;
                end
      WAIT_CTS: if (!cts_n) state_d = START;
      START:    if (baud_tick) state_d = DATA;
      DATA:     if (baud_tick && bit_idx == 3'd7) begin
                  if (parity_en) state_d = PARITY;
                  else           state_d = STOP;
                end
      PARITY:   if (baud_tick) state_d = STOP;
      STOP:     if (baud_tick) state_d = IDLE;
      default:  state_d = IDLE;
    endcase
  end

  assign tx_busy          = state_q != IDLE;
  assign load_shift       = state_q == START && baud_tick;
  assign shift_en         = state_q == DATA && baud_tick && bit_idx != 3'd7;
  assign tx_line_sel_data = state_q == DATA;
  assign tx_line_sel_par  = state_q == PARITY;
  assign done             = state_q == STOP && baud_tick;
endmodule
