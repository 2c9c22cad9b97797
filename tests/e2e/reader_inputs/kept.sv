// Invented scenario: a timer block mixing logic kerf keeps as written.
`define TICK_ASSIGN assign tick_m = enable & count[0];
module timer #(parameter int N = 4, parameter bit USE_FAST = 0) (
  input  logic         clk,
  input  logic         enable,
  input  logic [N-1:0] load,
  output logic [N-1:0] count,
  output logic         tick_m,
  output logic         tick_f,
  output logic         tick_d,
  output logic [N-1:0] mirrored,
  output logic [N-1:0] sel,
  output logic         nb,
  output logic [2:0]   ones,
  output logic         attr_y,
  output logic         dir_y,
  output logic         a1, a2,
  inout  wire          bus
);
  // A function that calls itself is not inlined: its callers are kept.
  function automatic logic chain(input logic [N-1:0] v);
    return v == 0 ? 1'b1 : ~chain(v - 1'b1);
  endfunction
  always_ff @(posedge clk) count <= enable ? count + 1'b1 : load;
  counter_cell u_cell (.clk(clk), .d(load[0]), .q(tick_d), .line(bus));
  genvar g;
  for (g = 0; g < N; g++) begin : mirror
    assign mirrored[g] = count[N - 1 - g];
  end
  if (USE_FAST) begin : fast
    assign sel = load;
  end else begin : slow
    assign sel = ~load;
  end
  always_comb tick_f = chain(count);
  always_comb nb <= enable;
  assign ones = {2'b00, $isunknown(load)};
  `TICK_ASSIGN
  (* keep *) assign attr_y = enable;
  always_comb begin
`ifdef TIMER_INVERT
    dir_y = ~enable;
`else
    dir_y = enable;
`endif
  end
  assign a1 = enable, a2 = chain(load);
endmodule

module counter_cell (input logic clk, input logic d, output logic q, inout wire line);
  always_ff @(posedge clk) q <= d;
  assign line = 1'bz;
endmodule
