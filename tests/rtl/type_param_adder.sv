// kerf-case: type parameter, concatenation on the left, signed compare, priority if
// kerf-simulator: verilator
module type_param_adder #(
  parameter type word_t = logic [7:0]
) (
  input  word_t       a,
  input  word_t       b,
  input  logic [2:0]  op,
  input  logic        en,
  output logic        carry,
  output word_t       sum,
  output logic        lt_s,
  output logic [3:0]  flags
);
  assign {carry, sum} = a + b;
  assign lt_s = $signed(a) < $signed(b);
  always_comb begin
    flags = '0;
    priority if (!en)            flags = 4'b0000;
    else if (op == 3'd0 || op == 3'd1) flags = {1'b0, a[7], b[7], 1'b1};
    else if (op[2] && op[0])     flags = {2'b10, ^a, &b[3:0]};
    else if (op[2])              flags = {2'b11, ^a, |b[3:0]};
    else                         flags = 4'b0110;
  end
endmodule
