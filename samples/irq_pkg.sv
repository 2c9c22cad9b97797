// Shared definitions of an invented interrupt controller ("Kestrel PIC").
package irq_pkg;
  typedef enum logic [1:0] {PRIO_LOW = 2'd0, PRIO_MID = 2'd1, PRIO_HIGH = 2'd2, PRIO_NMI = 2'd3} prio_t;
  typedef struct packed {
    logic  enable;
    logic  level;       // level (1) or edge (0) triggered
    prio_t prio;
  } irq_cfg_t;
endpackage
