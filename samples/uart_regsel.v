// Register-select logic of an invented UART peripheral ("Wren UART").
// Written the way a table-driven generator emits it: flat sums of products,
// one output per line, with the same address terms repeated everywhere.
module uart_regsel (
    input  wire       psel,
    input  wire       penable,
    input  wire       pwrite,
    input  wire [5:0] paddr,
    input  wire       lcr_dlab,     // divisor-latch access bit
    output wire       we_thr,       // transmit holding register
    output wire       we_ier,       // interrupt enable
    output wire       we_fcr,       // FIFO control
    output wire       we_lcr,       // line control
    output wire       we_mcr,       // modem control
    output wire       we_dll,       // divisor latch low
    output wire       we_dlm,       // divisor latch high
    output wire       re_rbr,       // receive buffer
    output wire       re_iir,       // interrupt identification
    output wire       re_lsr,       // line status
    output wire       re_msr,       // modem status
    output wire       pslverr
);

  wire acc_w = psel & penable & pwrite;
  wire acc_r;
  assign acc_r = psel & penable & ~pwrite;

  assign we_thr = psel & penable & pwrite & ~paddr[5] & ~paddr[4] & ~paddr[3] & ~paddr[2] & ~lcr_dlab;
  assign we_dll = psel & penable & pwrite & ~paddr[5] & ~paddr[4] & ~paddr[3] & ~paddr[2] & lcr_dlab;
  assign we_ier = psel & penable & pwrite & ~paddr[5] & ~paddr[4] & ~paddr[3] & paddr[2] & ~lcr_dlab;
  assign we_dlm = psel & penable & pwrite & ~paddr[5] & ~paddr[4] & ~paddr[3] & paddr[2] & lcr_dlab;
  assign we_fcr = psel & penable & pwrite & ~paddr[5] & ~paddr[4] & paddr[3] & ~paddr[2];
  assign we_lcr = acc_w & ~paddr[5] & ~paddr[4] & paddr[3] & paddr[2];
  assign we_mcr = acc_w & ~paddr[5] & paddr[4] & ~paddr[3] & ~paddr[2];

  assign re_rbr = acc_r & ~paddr[5] & ~paddr[4] & ~paddr[3] & ~paddr[2] & ~lcr_dlab;
  assign re_iir = acc_r & ~paddr[5] & ~paddr[4] & paddr[3] & ~paddr[2];
  assign re_lsr = acc_r & ~paddr[5] & paddr[4] & ~paddr[3] & paddr[2]
                | acc_r & ~paddr[5] & paddr[4] & ~paddr[3] & paddr[2] & lcr_dlab;
  assign re_msr = acc_r & ~paddr[5] & paddr[4] & paddr[3] & ~paddr[2];

  // Unaligned or out-of-window accesses answer with an error.
  assign pslverr = psel & penable & paddr[1]
                 | psel & penable & paddr[0]
                 | psel & penable & paddr[5];

endmodule
