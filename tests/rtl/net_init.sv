// kerf-case: status register of an invented timer: nets declared with an initialiser
// kerf-case: (`wire t = a & b;`) feed both restructured logic and kept code (a register and
// kerf-case: an instance-free always_ff); the declaration must stay before every use.
// kerf-clock: clk
// kerf-reset: rst_ni 0
module net_init (
  input  logic       clk,
  input  logic       rst_ni,
  input  logic       tick,
  input  logic       enable,
  input  logic [3:0] cnt,
  input  logic [3:0] cmp,
  output logic       fire,
  output logic       fire_q,
  output logic       half
);
  wire  run   = tick & enable;
  wire  match = (cnt == cmp);
  wire  upper = cnt[3] & enable;

  assign fire = run & match;
  assign half = upper & ~match & tick;

  always_ff @(posedge clk or negedge rst_ni) begin
    if (!rst_ni)  fire_q <= 1'b0;
    else if (run) fire_q <= match | upper;
  end
endmodule
