// Invented scenario: byte-lane strobes of a bus bridge whose data width is a
// parameter. Instances set LANES and MODE; the strobe logic depends on both,
// the request/grant logic on neither.
module lane_mask #(parameter LANES = 4, parameter [1:0] MODE = 2'd0) (
  input  [1:0]       size,      // 0 byte, 1 half, 2 word, 3 every lane
  input  [2:0]       offset,
  input              wr,
  input              rd,
  input              err,
  input              hold,
  output [LANES-1:0] strobe,
  output             last_lane,
  output             busy,
  output             grant
);
  localparam HALF = LANES / 2;
  wire [LANES-1:0] base;
  assign base = (size == 2'd0) ? 1 :
                (size == 2'd1) ? 3 :
                (size == 2'd2) ? 15 : {LANES{1'b1}};
  // MODE 1 mirrors the lanes of the upper half
  assign strobe = (wr | rd) ? ((MODE == 2'd1 && offset >= HALF) ? ~(base << offset) : (base << offset))
                            : {LANES{1'b0}};
  assign last_lane = strobe[LANES-1] & ~hold;
  // Request handshake: the same whatever the width
  assign busy  = (wr & ~err) | (rd & ~err) | (wr & rd & hold);
  assign grant = (wr | rd) & ~hold & ~err | (wr & rd & ~err & ~hold);
endmodule

