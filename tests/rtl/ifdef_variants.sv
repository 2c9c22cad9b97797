// kerf-case: command decoder of an invented SPI flash controller built in three variants by
// kerf-case: `ifdef/`else (quad I/O, a fast-read path, a plain build); the rewrite made under one
// kerf-case: define set must still be right when built with each of the others.
// kerf-defines: -
// kerf-defines: QUAD_IO
// kerf-defines: QUAD_IO FAST_READ
module ifdef_variants (
  input  logic [7:0] cmd,
  input  logic       busy,
  output logic       is_read,
  output logic       is_write,
  output logic [1:0] lanes,
  output logic       dummy_cycles
);
  logic is_erase;

`ifdef QUAD_IO
  assign lanes = (cmd == 8'h6B || cmd == 8'hEB || cmd == 8'h32) ? 2'd2 :
                 (cmd == 8'h3B) ? 2'd1 : 2'd0;
`else
  assign lanes = (cmd == 8'h3B) ? 2'd1 : 2'd0;
`endif

  assign is_erase = (cmd == 8'h20) | (cmd == 8'hD8) | (cmd == 8'hC7);

`ifdef FAST_READ
  assign is_read      = ~busy & ((cmd == 8'h03) | (cmd == 8'h0B) | (cmd == 8'h3B) | (cmd == 8'h6B));
  assign dummy_cycles = (cmd == 8'h0B) | (cmd == 8'h3B) | (cmd == 8'h6B);
`else
  assign is_read      = ~busy & (cmd == 8'h03);
  assign dummy_cycles = 1'b0;
`endif

  assign is_write = ~busy & ((cmd == 8'h02) | is_erase
`ifdef QUAD_IO
                             | (cmd == 8'h32)
`endif
                            );
endmodule
