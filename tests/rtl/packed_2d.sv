// kerf-case: lane-steering logic of an invented 4-lane serial link: 2-D packed arrays
// kerf-case: (`logic [3:0][7:0]`) whose bits must be written as lanes[i][j], never as a flat
// kerf-case: offset (SystemVerilog reads lanes[12] as element 12).
module packed_2d (
  input  logic [3:0][7:0] lanes_in,
  input  logic [1:0]      swap_mode,
  input  logic [3:0]      lane_en,
  output logic [3:0][7:0] lanes_out,
  output logic [3:0]      lane_sync,
  output logic [1:0][3:0] nibble_par,
  output logic [3:0]      lane_flip
);
  for (genvar i = 0; i < 4; i++) begin : g_lane
    always_comb begin
      case (swap_mode)
        2'd0: lanes_out[i] = lane_en[i] ? lanes_in[i] : 8'h00;
        2'd1: lanes_out[i] = lane_en[i] ? lanes_in[3 - i] : 8'h00;
        2'd2: lanes_out[i] = lane_en[i] ? {lanes_in[i][3:0], lanes_in[i][7:4]} : 8'hFF;
        default: lanes_out[i] = lanes_in[i] & {8{lane_en[i]}};
      endcase
    end
    assign lane_sync[i] = lane_en[i] & (lanes_in[i][7:5] == 3'b101) & ~lanes_in[i][0];
  end

  assign nibble_par[0] = {^lanes_in[3][3:0], ^lanes_in[2][3:0], ^lanes_in[1][3:0], ^lanes_in[0][3:0]};
  assign nibble_par[1] = {^lanes_in[3][7:4], ^lanes_in[2][7:4], ^lanes_in[1][7:4], ^lanes_in[0][7:4]};
  assign lane_flip     = {lanes_in[0][7], lanes_in[1][7], lanes_in[2][7], lanes_in[3][7]} ^ lane_en;
endmodule
