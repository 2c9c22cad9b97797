// Package of the member_order test case (tests/rtl/min_member_bit_order.sv).
package member_order_pkg;
  typedef struct packed { logic [1:0] f0; logic [2:0] f1; logic [3:0] f2; } st_t;
endpackage
