// kerf-case: two versions of an invented lane-clear helper that differ only inside a block kerf
// kerf-case: may keep as written (a variable part-select write): `kerf equiv` must not call
// kerf-case: them equivalent.
// kerf-equiv-against: include/equiv_kept_block_b.sv
module equiv_kept_block (
  input  logic [7:0] a,
  input  logic [1:0] s,
  output logic [7:0] y
);
  always_comb begin
    y = a;
    y[s*2 +: 2] = 2'b00;
  end
endmodule
