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

  always_comb begin
    src_id = 3'd7;
    for (int i = NSRC - 1; i >= 0; i--) begin
      if (live[i]) src_id = i[2:0];
    end
  end
endmodule
