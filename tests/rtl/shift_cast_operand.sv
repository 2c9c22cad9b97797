// kerf-case: a shift stage and an offset adder beside their enable decode: shift amounts and an
// kerf-case: offset come from signed fields read unsigned ($unsigned), and the decode logic they
// kerf-case: share makes the statements' group gain, so kerf writes the operands (F123).
module shift_cast_operand (
  input  logic [7:0]        data,
  input  logic signed [2:0] amt,
  input  logic signed [3:0] bias,
  input  logic [2:0]        ushift,
  input  logic [3:0]        op,
  input  logic [3:0]        mode,
  input  logic              en,
  output logic [7:0]        shifted,
  output logic [7:0]        offset,
  output logic [7:0]        plain,
  output logic              sel0, sel1, sel2
);
  assign shifted = (data & {8{(op[0] & en & mode[1]) | (op[0] & op[1] & mode[1])}}) >> $unsigned(amt);
  assign offset  = (data & {8{(op[0] & en & mode[1]) | (op[0] & op[2] & mode[1]) | mode[2]}}) + $unsigned(bias);
  assign plain   = (data | {8{((op[0] & en & mode[1]) | (op[0] & op[3] & mode[1])) & mode[0]}}) << ushift;
  assign sel0 = (op[0] & en & mode[1]) | (op[0] & op[1] & mode[1]) | (op[0] & mode[3] & mode[1]);
  assign sel1 = (op[0] & en & mode[1]) | (op[0] & op[2] & mode[1]) | (op[0] & mode[3] & mode[1]);
  assign sel2 = (op[0] & en & mode[1]) | (op[0] & op[3] & mode[1]) | (op[0] & mode[3] & mode[1]);
endmodule
