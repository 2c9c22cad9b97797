// kerf-case: minimal regression (F32): a fault-flag block whose `else` branch reads a flag
// kerf-case: taken from a variable bit-select that can fall out of range (idx 6 and 7 read x;
// kerf-case: that statement is kept as written). The branch is never taken (`lvl >= 1'b0`
// kerf-case: always holds), so the rewrite no longer reads the flag and the writer reads it in
// kerf-case: its unused wire for lint. kerf used to keep that wire as a statement reading x that
// kerf-case: the original does not have and refuse its own rewrite (exit 5). Checked by Icarus
// kerf-case: Verilog (four-valued, every input pattern).
module min_unused_x_read (
  input  logic [5:0] fault,
  input  logic [2:0] idx,
  input  logic       lvl,
  input  logic       a,
  input  logic       b,
  input  logic       c,
  output logic       trip
);
  logic sel_fault;
  assign sel_fault = fault[idx];
  always_comb begin
    if (lvl >= 1'b0) trip = a & b | a & c | a & b & c;
    else trip = sel_fault;
  end
endmodule
