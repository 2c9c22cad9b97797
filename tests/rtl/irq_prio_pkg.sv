// kerf-case: invented interrupt controller's claim logic in the package-function style: a
// kerf-case: function with a loop and a return inside computes the highest pending priority,
// kerf-case: a struct output, and an x default in a unique case that leaves id 1 unlisted.
// kerf-with: include/irqc_pkg.sv
module irq_prio_pkg
  import irqc_pkg::*;
(
  input  logic [7:0] pending,
  input  logic [7:0] enable,
  input  logic [1:0] thresh,
  output claim_t     claim,
  output logic       nmi
);
  logic [7:0] live;
  assign live = pending & enable;
  always_comb begin
    claim.valid = |live;
    claim.id    = top_id(live);
    unique case (claim.id)
      3'd6, 3'd7: claim.lvl = 2'd3;
      3'd4, 3'd5: claim.lvl = 2'd2;
      3'd2, 3'd3: claim.lvl = 2'd1;
      3'd0:       claim.lvl = 2'd0;
      default:    claim.lvl = 2'bxx;
    endcase
  end
  assign nmi = claim.valid && (claim.lvl > thresh) && live[7];
endmodule
