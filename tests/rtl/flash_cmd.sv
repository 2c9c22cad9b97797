// kerf-case: command decoder of an invented serial-flash cache controller, as a table-driven
// kerf-case: generator writes it: one AND of opcode literals per command beside an author's
// kerf-case: `cmd_ok` wire with a trailing comment, and a comment above two of the outputs.
module flash_cmd (
  input  logic       req,
  input  logic       busy,
  input  logic [7:0] op,
  output logic       rd,
  output logic       rd_fast,
  output logic       wr,
  output logic       erase
);
  wire cmd_ok = req & ~busy;                      // accepted this cycle

  // Reads: 0x03 plain, 0x0B fast (needs the dummy cycle).
  assign rd      = req & ~busy & ~op[7] & ~op[6] & ~op[5] & ~op[4] & ~op[2] & op[1] & op[0];
  assign rd_fast = req & ~busy & ~op[7] & ~op[6] & ~op[5] & ~op[4] & op[3] & ~op[2] & op[1] & op[0];
  assign wr      = cmd_ok & ~op[7] & ~op[6] & ~op[5] & ~op[4] & ~op[3] & ~op[2] & op[1] & ~op[0];
  assign erase   = cmd_ok & op[7] & op[6] & ~op[5] & op[4] & ~op[3] & ~op[2] & ~op[1] & ~op[0];
endmodule
