// kerf-case: invented pump controller: whole comparisons of an enum-typed state with its values
// kerf-case: are written with the values' names (st_q == PUMP_RUN), as the source does, not raw codes.
// kerf-clock: clk
// kerf-reset: rst_n 0
module enum_compare_names (
  input  logic clk,
  input  logic rst_n,
  input  logic start,
  input  logic fault,
  output logic motor_on,
  output logic alarm,
  output logic ready
);
  typedef enum logic [1:0] {PUMP_IDLE = 2'd0, PUMP_RUN = 2'd1, PUMP_TRIP = 2'd2} pump_st_t;
  pump_st_t st_q;

  always_ff @(posedge clk or negedge rst_n)
    if (!rst_n)     st_q <= PUMP_IDLE;
    else if (fault) st_q <= PUMP_TRIP;
    else if (start) st_q <= PUMP_RUN;

  assign motor_on = (st_q == PUMP_RUN & ~fault) | (st_q == PUMP_RUN & fault & start) | (st_q == PUMP_RUN & fault & ~start);
  assign alarm    = (st_q == PUMP_TRIP) | ((st_q == PUMP_TRIP) & start);
  assign ready    = (st_q == PUMP_IDLE & ~start) | (st_q == PUMP_IDLE & start);
endmodule
