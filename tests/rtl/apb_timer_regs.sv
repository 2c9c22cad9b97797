// kerf-case: APB register-block decode of an invented timer peripheral, as hand-written in many
// kerf-case: open cores: an address map of localparams sized by a parameter, a default-then-case
// kerf-case: always_comb of write strobes with comments on items, assigns comparing the address
// kerf-case: with named offsets, an error term over the whole map, block and line comments, and
// kerf-case: an interrupt term with a redundant product that does not depend on the parameter.
// kerf-case: Restructured for one address width (--param); other widths keep the logic as written.
// kerf-params: ADDR_W=16
// kerf-pin: ADDR_W=12 other ADDR_W=16
module apb_timer_regs #(
  parameter int ADDR_W = 12
) (
  input  logic              psel,
  input  logic              penable,
  input  logic              pwrite,
  input  logic [ADDR_W-1:0] paddr,
  input  logic [3:0]        pstrb,
  input  logic              lock,        // configuration lock from the security block
  input  logic              ovf_flag,
  input  logic              match_flag,
  input  logic              ie_ovf,
  input  logic              ie_match,
  input  logic              irq_mask,
  output logic              wr_ctrl,
  output logic              wr_load,
  output logic              wr_prescale,
  output logic              wr_irq_clr,
  output logic              rd_count,
  output logic              rd_status,
  output logic              pslverr,
  output logic              irq
);
  // Register map (word offsets)
  localparam logic [ADDR_W-1:0] CTRL     = 'h000;
  localparam logic [ADDR_W-1:0] LOAD     = 'h004;
  localparam logic [ADDR_W-1:0] PRESCALE = 'h008;
  localparam logic [ADDR_W-1:0] COUNT    = 'h00C;
  localparam logic [ADDR_W-1:0] STATUS   = 'h010;
  localparam logic [ADDR_W-1:0] IRQ_CLR  = 'h014;

  logic access;   // the access phase of a transfer to this block
  assign access = psel & penable;

  /* Writes need all byte lanes: partial writes are errors. */
  wire full_word = &pstrb;

  always_comb begin
    wr_ctrl     = 1'b0;
    wr_load     = 1'b0;
    wr_prescale = 1'b0;
    wr_irq_clr  = 1'b0;
    if (access && pwrite && full_word) begin
      case (paddr)
        CTRL:     wr_ctrl     = ~lock;
        LOAD:     wr_load     = 1'b1;
        PRESCALE: wr_prescale = ~lock;   // locked with CTRL
        IRQ_CLR:  wr_irq_clr  = 1'b1;
        default: ;
      endcase
    end
  end

  assign rd_count  = access & ~pwrite & (paddr == COUNT);
  assign rd_status = access & ~pwrite & (paddr == STATUS);

  // Error: unknown offset, a partial write, or a write to a locked register.
  assign pslverr = access & (
                     ~((paddr == CTRL) | (paddr == LOAD) | (paddr == PRESCALE) | (paddr == COUNT)
                       | (paddr == STATUS) | (paddr == IRQ_CLR))
                   | (pwrite & ~full_word)
                   | (pwrite & lock & ((paddr == CTRL) | (paddr == PRESCALE))));

  // Interrupt: either enabled source unless masked (grown over several revisions).
  assign irq = (ie_ovf & ovf_flag & ~irq_mask) | (ie_match & match_flag & ~irq_mask)
             | (ie_ovf & ie_match & ovf_flag & match_flag & ~irq_mask);
endmodule
