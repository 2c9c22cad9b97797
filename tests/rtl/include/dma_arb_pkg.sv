// Types of the invented DMA arbiter (tests/rtl/dma_status_builtins.sv).
package dma_arb_pkg;
  typedef enum logic [2:0] {IDLE=3'd0, FETCH=3'd1, XFER=3'd2, WAIT=3'd3, DONE=3'd4} st_e;
  typedef struct packed { logic vld; logic [1:0] prio; logic [3:0] id; } req_t;
endpackage
