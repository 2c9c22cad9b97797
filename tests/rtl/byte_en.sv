// kerf-case: byte enables and write-lane steering of an invented 32-bit bus bridge: a case on the
// kerf-case: transfer size with shifts of constants by the address (kept as word operators), an
// kerf-case: override by a later if, a misalignment term, and lanes built by replication.
module byte_en (
  input  logic [1:0]  addr,
  input  logic [1:0]  size,     // 0 byte, 1 half, 2 word
  input  logic        wr,
  input  logic [31:0] wdata,
  output logic [3:0]  be,
  output logic        misaligned,
  output logic [31:0] wlane
);
  always_comb begin
    case (size)
      2'd0:    be = 4'b0001 << addr;
      2'd1:    be = 4'b0011 << {addr[1], 1'b0};
      default: be = 4'b1111;
    endcase
    if (!wr) be = 4'b0000;
    misaligned = (size == 2'd1 && addr[0]) || (size == 2'd2 && addr != 2'd0) || size == 2'd3;
    case (size)
      2'd0:    wlane = {4{wdata[7:0]}};
      2'd1:    wlane = {2{wdata[15:0]}};
      default: wlane = wdata;
    endcase
  end
endmodule
