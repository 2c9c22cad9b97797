// Types of an invented AXI-lite crossbar (tests/rtl/xbar_addr_dec.sv).
package xbar_pkg;
  typedef enum logic [2:0] {SLV_ROM, SLV_RAM, SLV_UART, SLV_GPIO, SLV_TIMER, SLV_ERR} slv_e;
  typedef struct packed {
    logic [31:0] base;
    logic [31:0] mask;
  } rule_t;
  localparam int unsigned NRULES = 5;
endpackage
