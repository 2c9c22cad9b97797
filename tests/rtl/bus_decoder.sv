// kerf-case: address decoder of the invented peripheral bus: package constants, an enum slave
// kerf-case: select, a struct request, an if/else-if priority chain and one-hot select outputs.
// kerf-with: include/periph_pkg.sv
module bus_decoder
  import periph_pkg::*;
(
  input  bus_req_t   req,
  input  logic       ram_enable,
  output slave_e     slave,
  output logic [5:0] sel_onehot,
  output logic       decode_err
);
  always_comb begin
    if (!req.hdr.valid)                             slave = SLV_NONE;
    else if (req.addr[15:8] == TIMER_BASE[15:8])     slave = SLV_TIMER;
    else if (req.addr[15:8] == UART_BASE[15:8])      slave = SLV_UART;
    else if (req.addr[15:8] == GPIO_BASE[15:8])      slave = SLV_GPIO;
    else if (req.addr[15:8] == SPI_BASE[15:8] && req.hdr.size != 2'd3) slave = SLV_SPI;
    else if (req.addr[15] && ram_enable)             slave = SLV_RAM;
    else                                             slave = SLV_NONE;
  end

  always_comb begin
    sel_onehot = '0;
    sel_onehot[slave] = 1'b1;
  end

  assign decode_err = req.hdr.valid && slave == SLV_NONE;
endmodule
