// kerf-case: DMA channel-select decoder written with an incomplete `unique case` (legal selects
// kerf-case: only) and a `priority case` with an 'x default: the synthesis reading treats the
// kerf-case: unlisted selects as don't-cares, so only legal selects are compared (the original
// kerf-case: holds its last value on an illegal select in simulation).
// kerf-care: ua.chan_sel != 3'd5 && ua.chan_sel != 3'd6 && ua.chan_sel != 3'd7
// kerf-flags: -
// kerf-flags: --keep-x
module x_unique_case (
  input  logic [2:0] chan_sel,
  input  logic [3:0] req,
  output logic [3:0] grant_mask,
  output logic [1:0] burst,
  output logic [1:0] first_req
);
  always_comb begin
    unique case (chan_sel)
      3'd0: begin grant_mask = 4'b0001; burst = 2'd0; end
      3'd1: begin grant_mask = 4'b0010; burst = 2'd1; end
      3'd2: begin grant_mask = 4'b0100; burst = 2'd1; end
      3'd3: begin grant_mask = 4'b1000; burst = 2'd3; end
      3'd4: begin grant_mask = 4'b1111; burst = 2'd2; end
    endcase
  end

  always_comb begin
    priority casez (req)
      4'b???1: first_req = 2'd0;
      4'b??10: first_req = 2'd1;
      4'b?100: first_req = 2'd2;
      4'b1000: first_req = 2'd3;
      default: first_req = 'x;
    endcase
  end
endmodule
