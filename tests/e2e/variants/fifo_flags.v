// Invented scenario: status flags of a FIFO whose counter width, almost-full
// flag and threshold are build options chosen with defines.
`ifndef THRESH
`define THRESH 3
`endif
`define PUSH_OR_POP (push | pop)
`ifdef WIDE_COUNT
`define CW 5
`else
`define CW 4
`endif
module fifo_flags (
  input  [`CW-1:0] count,
  input            push,
  input            pop,
  input            en,
  input            flush,
  input            clk,
  output           full,
  output           empty,
  output           ok,
  output           almost,
  output           err,
  output           active_o,
  output           level_hi,
  output           dbg
);
  wire active;
  assign active   = en & `PUSH_OR_POP & ~flush;           // a macro defined once: restructured
  assign active_o = active | flush & en | en & push & pop;
  assign ok       = active & ~err | flush & ~push & ~pop;
`ifdef ALMOST_FLAGS
  assign almost = (count >= `THRESH) & active;           // inside a conditional region
`else
  assign almost = 1'b0;
`endif
  assign err   = push & full | pop & empty;
  assign full  = count[`CW-1] & count[0];                // a macro defined twice
  assign empty = ~|count;                                // a width set by that macro
`ifdef WIDE_COUNT
  wire [2:0] level;
`else
  wire [1:0] level;
`endif
  assign level    = count[`CW-1 -: 2];
  assign level_hi = &level;                              // a signal declared in a region
  reg dbg_q;
  always @(posedge clk) begin
`ifdef ALMOST_FLAGS
    dbg_q <= almost;
`else
    dbg_q <= active;                                     // `active` is read only in one build
`endif
  end
  assign dbg = dbg_q;
endmodule
