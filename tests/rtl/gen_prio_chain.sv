// kerf-case: priority grant chain: generate loop with named blocks, read hierarchically; one-hot to binary
module gen_prio_chain (
  input  logic [7:0] req,
  input  logic [7:0] mask,
  output logic [7:0] gnt_oh,
  output logic [2:0] gnt_id,
  output logic       any
);
  for (genvar i = 0; i < 8; i++) begin : g_bit
    logic below;
    if (i == 0) begin : g_first
      assign below = 1'b0;
    end else begin : g_rest
      assign below = |(req[i-1:0] & mask[i-1:0]);
    end
    assign gnt_oh[i] = req[i] & mask[i] & ~below;
  end
  assign any = g_bit[7].below | (req[7] & mask[7]);
  always_comb begin
    gnt_id = '0;
    for (int k = 0; k < 8; k++) if (gnt_oh[k]) gnt_id |= 3'(k);
  end
endmodule
