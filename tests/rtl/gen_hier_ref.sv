// kerf-case: Lane hit detection of an invented packet classifier, in the style of generated
// kerf-case: datapath code: a generate loop whose named blocks declare their own wires, read
// kerf-case: from outside the loop by hierarchical names (`g_lane[1].hit`), and a combined
// kerf-case: summary written with a reduction over a vector the loop fills.
module gen_hier_ref (
  input  logic [3:0][7:0] key,
  input  logic [7:0]      match,
  input  logic [3:0]      valid,
  output logic [3:0]      hits,
  output logic            lane1_hit,
  output logic            any_hit,
  output logic            two_hits
);
  for (genvar i = 0; i < 4; i++) begin : g_lane
    wire hit = valid[i] && (key[i] == match);
    assign hits[i] = hit;
  end
  assign lane1_hit = g_lane[1].hit;
  assign any_hit   = |hits;
  assign two_hits  = (g_lane[0].hit & g_lane[1].hit) | (g_lane[2].hit & g_lane[3].hit)
                   | (g_lane[0].hit & g_lane[2].hit) | (g_lane[1].hit & g_lane[3].hit)
                   | (g_lane[0].hit & g_lane[3].hit) | (g_lane[1].hit & g_lane[2].hit);
endmodule
