// Fill controller of an invented rain-water tank ("Wren tank"), Verilog-2001: the state is a
// plain reg vector, its values localparams, and the logic compares it with those names only.
module tank_ctrl (
    input  wire       clk,
    input  wire       rst_n,
    input  wire       low,
    input  wire       high,
    input  wire       leak,
    input  wire       ack,
    output reg        pump,
    output reg        valve,
    output reg        alarm,
    output wire       active
);
  localparam [2:0] T_IDLE = 3'd0, T_FILL = 3'd1, T_SETTLE = 3'd2, T_DRAIN = 3'd3, T_ALARM = 3'd4;

  reg [2:0] state, next;

  always @(posedge clk or negedge rst_n)
    if (!rst_n) state <= T_IDLE;
    else        state <= next;

  always @(*) begin
    next = state;
    case (state)
      T_IDLE:   if (leak) next = T_ALARM;
                else if (low) next = T_FILL;
      T_FILL:   if (leak) next = T_ALARM;
                else if (high) next = T_SETTLE;
      T_SETTLE: if (leak) next = T_ALARM;
                else if (high) next = T_DRAIN;
                else next = T_IDLE;
      T_DRAIN:  if (!high) next = T_IDLE;
      T_ALARM:  if (ack) next = T_IDLE;
      default:  next = T_IDLE;
    endcase
  end

  always @(*) begin
    pump  = 1'b0;
    valve = 1'b0;
    alarm = 1'b0;
    if (state == T_FILL && !high) pump = 1'b1;
    if (state == T_DRAIN || (state == T_SETTLE && high)) valve = 1'b1;
    if (state == T_ALARM && !ack) alarm = 1'b1;
  end

  assign active = state != T_IDLE && state != T_ALARM;
endmodule
