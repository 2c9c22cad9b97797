// Stage control and forwarding select of the invented pipeline of tests/rtl/rv_fwd_hazard.sv.
package fwd_pkg;
  typedef enum logic [1:0] { FWD_NONE = 2'd0, FWD_MEM = 2'd1, FWD_WB = 2'd2 } fwd_sel_e;
  typedef struct packed {
    logic       reg_we;
    logic       mem_rd;
    logic [4:0] rd;
  } stage_ctl_t;
endpackage
