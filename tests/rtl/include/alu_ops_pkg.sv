package alu_ops_pkg;
  typedef enum logic [3:0] {
    OP_ADD = 4'h0, OP_SUB = 4'h1, OP_AND = 4'h2, OP_OR = 4'h3, OP_XOR = 4'h4,
    OP_SLL = 4'h5, OP_SRL = 4'h6, OP_SLT = 4'h7, OP_PASS = 4'h8
  } op_e;
  typedef struct packed { logic zero; logic neg; logic carry; } flags_t;
  function automatic logic is_shift(op_e op);
    return op inside {OP_SLL, OP_SRL};
  endfunction
endpackage
