// Invented scenario: byte-lane strobes of a bus bridge whose data width is a
// parameter. Instances set LANES and MODE; the strobe logic depends on both,
// the request/grant logic on neither.
module lane_mask #(parameter LANES = 4, parameter [1:0] MODE = 2'd0) (
  input      [1:0]       size,      // 0 byte, 1 half, 2 word, 3 every lane
  input      [2:0]       offset,
  input                  wr,
  input                  rd,
  input                  err,
  input                  hold,
  output reg [LANES-1:0] strobe,
  output                 last_lane,
  output                 busy,
  output                 grant
);
  localparam HALF = LANES / 2;
  integer i;
  always @(*) begin
    for (i = 0; i < LANES; i = i + 1) begin
      case (size)
        2'd0:    strobe[i] = (wr | rd) & (offset == i);
        2'd1:    strobe[i] = (wr | rd) & (offset[2:1] == (i >> 1));
        2'd2:    strobe[i] = (wr | rd) & (offset[2] == (i >> 2));
        default: strobe[i] = wr | rd;
      endcase
      // MODE 1 holds the upper half of the lanes while `hold` is set
      if (MODE == 2'd1 && i >= HALF) strobe[i] = strobe[i] & ~hold;
    end
  end
  assign last_lane = strobe[LANES-1] & ~hold & ~err;
  // Request handshake: the same whatever the width
  assign busy  = (wr & ~err) | (rd & ~err) | (wr & rd & hold);
  assign grant = (wr | rd) & ~hold & ~err | (wr & rd & ~err & ~hold);
endmodule
