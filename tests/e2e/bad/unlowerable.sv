// An invented status block: the divider ratio uses '/' on two variable
// operands, which kerf leaves as written (README: "division, modulo and
// power with variable operands leave their statement as written"); the
// select logic beside it is restructured.
module clkdiv_status (input logic [1:0] num, den, input logic sel, input logic [1:0] alt,
                      output logic [1:0] ratio, output logic pick);
  assign ratio = num / den;
  assign pick = sel & alt[0] | sel & alt[1];
endmodule
