// kerf-case: register decode of an invented timer peripheral whose bus side is a SystemVerilog
// kerf-case: interface port with a modport (the style open cores use for their bus fabrics; F29:
// kerf-case: such modules were refused, slang needs its option for interface ports on a module
// kerf-case: read on its own). Statements that name a member of the interface (bus.paddr,
// kerf-case: bus.pready) are kept as written; the rest, including logic reading a local copy of
// kerf-case: the address, is restructured. Icarus Verilog 11 does not read modport ports:
// kerf-case: simulated by Verilator (two-valued), the interface instantiated per side.
// kerf-simulator: verilator
// kerf-top: tmr_regsel
interface tmr_bus_if;
  logic [6:0] paddr;
  logic       psel;
  logic       penable;
  logic       pwrite;
  logic       pready;
  modport target (input paddr, input psel, input penable, input pwrite, output pready);
endinterface

module tmr_regsel (
  tmr_bus_if.target bus,
  input  logic       tmr_en,
  input  logic       tmr_irq_mask,
  input  logic [1:0] tmr_mode,
  output logic       sel_ctrl,
  output logic       sel_count,
  output logic       sel_cmp,
  output logic       wr_ctrl,
  output logic       wr_cmp,
  output logic       irq_live
);
  wire [6:0] addr   = bus.paddr;
  wire       access = bus.psel & bus.penable;
  wire       write  = bus.pwrite;

  assign bus.pready = bus.psel;

  assign sel_ctrl  = (access & addr[6:4] == 3'h1 & addr[3:2] == 2'b00) | (access & addr[6:4] == 3'h1 & addr[3:2] == 2'b11);
  assign sel_count = access & addr[6:4] == 3'h1 & addr[3:2] == 2'b01;
  assign sel_cmp   = access & addr[6:4] == 3'h1 & addr[3:2] == 2'b10;
  assign wr_ctrl   = (access & write & addr[6:4] == 3'h1 & addr[3:2] == 2'b00) | (access & write & addr[6:4] == 3'h1 & addr[3:2] == 2'b11);
  assign wr_cmp    = access & write & addr[6:4] == 3'h1 & addr[3:2] == 2'b10;
  assign irq_live  = (tmr_en & ~tmr_irq_mask & tmr_mode[0]) | (tmr_en & ~tmr_irq_mask & tmr_mode[1]);
endmodule
