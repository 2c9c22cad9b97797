// periph_pkg — address map and bus types of an invented peripheral subsystem (timer, UART,
// GPIO, SPI, a scratch RAM window) used by the bus-decoder designs in tests/rtl.
package periph_pkg;
  localparam logic [15:0] TIMER_BASE = 16'h1000;
  localparam logic [15:0] UART_BASE  = 16'h1100;
  localparam logic [15:0] GPIO_BASE  = 16'h1200;
  localparam logic [15:0] SPI_BASE   = 16'h1300;
  localparam logic [15:0] RAM_BASE   = 16'h8000;

  typedef enum logic [2:0] {
    SLV_NONE, SLV_TIMER, SLV_UART, SLV_GPIO, SLV_SPI, SLV_RAM
  } slave_e;

  typedef struct packed {
    logic       valid;
    logic       write;
    logic [1:0] size;
    logic [3:0] tag;
  } req_hdr_t;

  typedef struct packed {
    req_hdr_t    hdr;
    logic [15:0] addr;
  } bus_req_t;
endpackage
