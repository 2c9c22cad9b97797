// Interrupt routing of an invented interrupt controller ("Kestrel PIC"):
// per-source configuration as a packed struct from a package, a
// parameterised source count, and a combinational priority pick written
// with constant-bound loops.
module irq_router #(
    parameter int NSRC = 6
) (
    input  logic [4*NSRC-1:0] cfg_bits,   // NSRC packed irq_cfg_t records
    input  logic [NSRC-1:0]   pending,
    input  logic              mask_low,
    output logic              irq_out,
    output logic              nmi_out,
    output logic [2:0]        src_id
);
  import irq_pkg::*;

  irq_cfg_t        cfg;
  logic [NSRC-1:0] live;
  logic [NSRC-1:0] is_nmi;

  always_comb begin
    cfg = '0;
    for (int i = 0; i < NSRC; i++) begin
      cfg       = cfg_bits[4*i +: 4];
      live[i]   = pending[i] & cfg.enable & ~(mask_low & (cfg.prio == PRIO_LOW));
      is_nmi[i] = cfg.level && cfg.prio == PRIO_NMI;   // NMIs must be level triggered
    end
  end

  assign nmi_out = |(live & is_nmi);
  assign irq_out = |live;

  // kerf: 1 of 4 groups rewritten, gates 64 -> 62, depth 7 -> 7, proved equivalent
  // kerf: this logic is restructured for NSRC = 6 (--param); a build that sets other
  // values stops here: run kerf restructure again for them.
  generate
    if (NSRC !== 32'sh6) begin : kerf_parameter_guard
`ifdef __ICARUS__
      wire kerf_restructured_for_other_NSRC_values = {(0 - 1){1'b0}};  // stops elaboration
`else
      $error("kerf: restructured for %s only (--param); run kerf restructure again for others",
             "NSRC = 6");
`endif
    end
  endgenerate
  wire any_live_3_2 = |live[3:2];
  wire no_live_1_0 = ~|live[1:0];
  wire src_id1_t0 = (~|live[5:4]) | any_live_3_2;
  wire live_4_3_not_10 = live[4:3] != 2'b10;
  wire src_id0_t0 = live[1] | (~live[2] & live_4_3_not_10);
  always_comb begin
    src_id[0] = ~live[0] & src_id0_t0;
    src_id[1] = no_live_1_0 & src_id1_t0;
    src_id[2] = ~any_live_3_2 & no_live_1_0;
  end
endmodule
