// kerf-case: one-hot bus multiplexers of an invented register read-back path (F181): two
// kerf-case: outputs share the select decode and the data terms of one input, which the writer
// kerf-case: must declare as vector wires so that each output stays one vector assignment.
module onehot_bus_mux (
  input  logic [3:0] sel,
  input  logic [7:0] d0, d1, d2, d3,
  output logic [7:0] q,
  output logic [7:0] qu
);
  always_comb begin
    q = 8'h00;
    case (1'b1)
      sel[0]: q = d0;
      sel[1]: q = d1;
      sel[2]: q = d2;
      sel[3]: q = d3;
    endcase
  end
  always_comb begin
    qu = 8'h00;
    unique case (1'b1)
      sel[0]: qu = d0 & d1;
      sel[1]: qu = d1 & d0 | d2;
      sel[2]: qu = d2;
      sel[3]: qu = d3;
    endcase
  end
endmodule
