// Package of the corpus case irq_prio_pkg (an invented interrupt controller).
package irqc_pkg;
  typedef struct packed { logic valid; logic [2:0] id; logic [1:0] lvl; } claim_t;
  function automatic logic [2:0] top_id(input logic [7:0] pend);
    for (int k = 7; k >= 0; k--) if (pend[k]) return k[2:0];
    return 3'd0;
  endfunction
endpackage
