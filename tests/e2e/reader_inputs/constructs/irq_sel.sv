// Invented scenario: an interrupt line select whose one-hot select the author
// declares complete with `unique case`; the missing codes are don't-cares.
module irq_sel (
  input  logic [3:0] sel,
  input  logic [3:0] lines,
  output logic       irq,
  output logic [1:0] which
);
  always_comb begin
    unique case (sel)
      4'b0001: begin irq = lines[0]; which = 2'd0; end
      4'b0010: begin irq = lines[1]; which = 2'd1; end
      4'b0100: begin irq = lines[2]; which = 2'd2; end
      4'b1000: begin irq = lines[3]; which = 2'd3; end
    endcase
  end
endmodule
