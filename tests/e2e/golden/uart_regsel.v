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

  // kerf: 2 of 2 groups rewritten, gates 67 -> 31, depth 4 -> 4, proved equivalent
  wire psel_penable = psel & penable;
  wire paddr5_or_paddr1 = paddr[5] | paddr[1];
  wire paddr5_or_paddr1_or_paddr0 = paddr5_or_paddr1 | paddr[0];
  wire acc_w = psel_penable & pwrite;
  wire acc_r;
  assign acc_r = psel_penable & ~pwrite;

  wire paddr_5_4_is_00 = paddr[5:4] == 2'b00;
  wire acc_w_paddr_5_4_is_00 = acc_w & paddr_5_4_is_00;
  wire paddr_3_2_is_00 = paddr[3:2] == 2'b00;
  wire paddr_3_2_is_00_nlcr_dlab = paddr_3_2_is_00 & ~lcr_dlab;
  wire paddr_3_2_is_01 = paddr[3:2] == 2'b01;
  wire paddr_3_2_is_10 = paddr[3:2] == 2'b10;
  wire paddr_5_4_is_01 = paddr[5:4] == 2'b01;
  wire acc_r_paddr_5_4_is_00 = acc_r & paddr_5_4_is_00;
  wire acc_r_paddr_5_4_is_01 = acc_r & paddr_5_4_is_01;
  assign we_thr = acc_w_paddr_5_4_is_00 & paddr_3_2_is_00_nlcr_dlab;
  assign we_dll = acc_w_paddr_5_4_is_00 & paddr_3_2_is_00 & lcr_dlab;
  assign we_ier = acc_w_paddr_5_4_is_00 & paddr_3_2_is_01 & ~lcr_dlab;
  assign we_dlm = acc_w_paddr_5_4_is_00 & paddr_3_2_is_01 & lcr_dlab;
  assign we_fcr = acc_w_paddr_5_4_is_00 & paddr_3_2_is_10;
  assign we_lcr = acc_w_paddr_5_4_is_00 & (paddr[3:2] == 2'b11);
  assign we_mcr = acc_w & paddr_3_2_is_00 & paddr_5_4_is_01;

  assign re_rbr = paddr_3_2_is_00_nlcr_dlab & acc_r_paddr_5_4_is_00;
  assign re_iir = paddr_3_2_is_10 & acc_r_paddr_5_4_is_00;
  assign re_lsr = paddr_3_2_is_01 & acc_r_paddr_5_4_is_01;
  assign re_msr = paddr_3_2_is_10 & acc_r_paddr_5_4_is_01;

  // Unaligned or out-of-window accesses answer with an error.
  assign pslverr = psel_penable & paddr5_or_paddr1_or_paddr0;

endmodule
