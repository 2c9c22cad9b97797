// csr_pkg — control/status register numbers of an invented machine-mode register file (values
// from the open RISC-V privileged specification's CSR map) and helpers used by tests/rtl.
package csr_pkg;
  localparam logic [11:0] CSR_MSTATUS  = 12'h300;
  localparam logic [11:0] CSR_MIE      = 12'h304;
  localparam logic [11:0] CSR_MTVEC    = 12'h305;
  localparam logic [11:0] CSR_MSCRATCH = 12'h340;
  localparam logic [11:0] CSR_MEPC     = 12'h341;
  localparam logic [11:0] CSR_MCAUSE   = 12'h342;
  localparam logic [11:0] CSR_MIP      = 12'h344;
  localparam logic [11:0] CSR_MCYCLE   = 12'hB00;

  // Read-only registers have the top two address bits set (privileged spec convention).
  function automatic logic csr_read_only(input logic [11:0] addr);
    return addr[11:10] == 2'b11;
  endfunction

  typedef struct packed {
    logic       valid;
    logic       write;
    logic [1:0] kind;     // 0 none, 1 trap setup, 2 trap handling, 3 counter
  } csr_sel_t;
endpackage
