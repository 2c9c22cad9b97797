// A wrapper that instantiates the bridge strobes with another width: the
// parameter values the written lane_mask.v must still be right for (or refuse).
module lane_mask_w8 (
  input  [1:0] size,
  input  [2:0] offset,
  input        wr, rd, err, hold,
  output [7:0] strobe,
  output       last_lane, busy, grant
);
  lane_mask #(.LANES(8), .MODE(2'd1)) u_lanes (.size(size), .offset(offset), .wr(wr), .rd(rd), .err(err),
                                                .hold(hold), .strobe(strobe), .last_lane(last_lane),
                                                .busy(busy), .grant(grant));
endmodule
