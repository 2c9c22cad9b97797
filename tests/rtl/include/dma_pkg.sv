// dma_pkg — types of an invented DMA engine used by the enum designs in tests/rtl.
package dma_pkg;
  typedef enum logic {DIR_READ = 1'b0, DIR_WRITE = 1'b1} dir_e;
  typedef enum logic [1:0] {PH_IDLE, PH_ADDR, PH_DATA, PH_ERROR} phase_e;
endpackage
