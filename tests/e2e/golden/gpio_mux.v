// Pin multiplexer of an invented sensor-hub MCU ("Plover"): each pad picks
// one of four functions; the output-enable follows the chosen function.
// Plain Verilog-2005 with reg outputs assigned in always @(*).
module gpio_mux (
    input  wire [7:0] func_sel,     // 2 bits per pad, pads 0..3
    input  wire [3:0] gpio_out,
    input  wire [3:0] gpio_oe,
    input  wire       uart_tx,
    input  wire       spi_sck,
    input  wire       spi_mosi,
    input  wire       pwm0,
    input  wire       pwm1,
    input  wire       test_mode,
    output reg  [3:0] pad_out,
    output reg  [3:0] pad_oe
);
  integer p;

  always @(*) begin
    pad_out = 4'b0000;
    pad_oe  = 4'b0000;
    for (p = 0; p < 4; p = p + 1) begin
      case (func_sel[2*p +: 2])
        2'd0: begin
          pad_out[p] = gpio_out[p];
          pad_oe[p]  = gpio_oe[p];
        end
        2'd1: begin
          pad_out[p] = (p == 0) ? uart_tx : (p == 1) ? spi_sck : spi_mosi;
          pad_oe[p]  = 1'b1;
        end
        2'd2: begin
          pad_out[p] = p[0] ? pwm1 : pwm0;
          pad_oe[p]  = 1'b1;
        end
        default: begin
          pad_out[p] = 1'b0;
          pad_oe[p]  = 1'b0;
        end
      endcase
      if (test_mode) begin
        pad_out[p] = gpio_out[p] ^ gpio_oe[p];
        pad_oe[p]  = 1'b1;
      end
    end
  end
endmodule
