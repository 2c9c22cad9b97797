// Invented scenario: a small status block of a UART-like peripheral.
// test_reader.py locates every statement below by its exact text.
module status_regs (
  input  logic [7:0] rx_data, tx_data,
  input  logic       clk,
  output logic [7:0] both,
  output logic [8:0] sum,
  output logic       parity, busy,
  output logic [3:0] nibble
);
  wire [3:0] lo_rx, lo_tx = tx_data[3:0], \flag[0] ;
  logic [7:0] shadow;
  assign both = rx_data & tx_data;
  assign sum = rx_data + tx_data, parity = ^rx_data;
  assign lo_rx = rx_data[3:0];
  assign \flag[0]  = rx_data[7];
  always_comb begin
    busy = lo_rx[0] | lo_tx[1];
    if (\flag[0] ) begin
      busy = 1'b0;
    end
  end
  always @(*) nibble = lo_rx ^ lo_tx;
  always_ff @(posedge clk) shadow <= shadow + rx_data;
endmodule
