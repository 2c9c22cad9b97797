// kerf-case: Register-file write-enable and read-port bypass decode of an invented 16-entry
// kerf-case: register file, in the style of hand-written datapaths: a one-hot decode written as a
// kerf-case: shift (`1 << waddr`), a byte-lane mask from a size code, and a same-address bypass.
module rf_we_decode (
  input  logic        we,
  input  logic [3:0]  waddr,
  input  logic [3:0]  raddr,
  input  logic [1:0]  size,     // 0: byte, 1: half, 2: word, 3: reserved
  input  logic [1:0]  lane,
  output logic [15:0] row_we,
  output logic [3:0]  byte_we,
  output logic        bypass
);
  wire [15:0] onehot = 16'd1 << waddr;
  assign row_we = we ? onehot : 16'd0;

  always_comb begin
    unique case (size)
      2'd0:    byte_we = 4'b0001 << lane;
      2'd1:    byte_we = lane[1] ? 4'b1100 : 4'b0011;
      2'd2:    byte_we = 4'b1111;
      default: byte_we = 4'b0000;
    endcase
    if (!we) byte_we = 4'b0000;
  end

  assign bypass = we && (waddr == raddr);
endmodule
