// The other version of tests/rtl/equiv_kept_block.sv: the lanes are set instead of cleared.
module equiv_kept_block (
  input  logic [7:0] a,
  input  logic [1:0] s,
  output logic [7:0] y
);
  always_comb begin
    y = a;
    y[s*2 +: 2] = 2'b11;
  end
endmodule
