package spi_cmd_pkg;
  typedef enum logic [1:0] {NONE = 2'd0, RD = 2'd1, WR = 2'd2, ER = 2'd3} kind_e;
  typedef struct packed { kind_e kind; logic addr4; logic dummy; logic [1:0] lanes; } dec_t;
endpackage
