// kerf-case: four-requester round-robin arbiter of an invented memory port: a last-grant register
// kerf-case: in always_ff and a `unique casez` priority rotation on the requests.
// kerf-clock: clk
// kerf-reset: rst_ni 0
module arb_rr (
  input  logic       clk,
  input  logic       rst_ni,
  input  logic [3:0] req,
  input  logic       hold,
  output logic [3:0] gnt,
  output logic       busy
);
  logic [1:0] last_q;
  logic [3:0] rot;
  logic [1:0] pick;

  assign rot = {req, req} >> (last_q + 2'd1);

  always_comb begin
    pick = 2'd0;
    casez (rot)
      4'b???1: pick = 2'd0;
      4'b??10: pick = 2'd1;
      4'b?100: pick = 2'd2;
      4'b1000: pick = 2'd3;
      default: pick = 2'd0;
    endcase
  end

  always_comb begin
    gnt = 4'b0000;
    if (|req && !hold) gnt[last_q + 2'd1 + pick] = 1'b1;
  end

  assign busy = |req;

  always_ff @(posedge clk or negedge rst_ni) begin
    if (!rst_ni)          last_q <= 2'd3;
    else if (|gnt)        last_q <= last_q + 2'd1 + pick;
  end
endmodule
