// Invented scenario: status checks of a register file port, written with
// x and z in the constants they compare against (IEEE 1800 11.4.5, 11.4.6, 12.5.1).
module xz_compare (
  input  logic [3:0] a,
  input  logic [3:0] b,
  output logic       same_case,
  output logic       diff_case,
  output logic       eq_x,
  output logic       wild,
  output logic [1:0] zsel,
  output logic [1:0] xsel
);
  assign same_case = a === 4'b1x00;          // never 1 for 0/1 inputs
  assign diff_case = b !== 4'b0z01;          // always 1 for 0/1 inputs
  assign eq_x      = (a == 4'b1x00) | b[0];  // x or 0 from the comparison
  assign wild      = a ==? 4'b1x0z;          // x and z bits of the pattern are wildcards
  always_comb begin
    casez (a)
      4'b1??0: zsel = 2'd1;
      4'b01?1: zsel = 2'd2;
      default: zsel = 2'd0;
    endcase
  end
  always_comb begin
    casex (b)
      4'b1x0x: xsel = 2'd3;
      4'b0xx1: xsel = 2'd1;
      default: xsel = 2'd0;
    endcase
  end
endmodule
