// kerf-case: two versions of an invented byte-merge helper that behave the same (the second is
// kerf-case: laid out differently): `kerf equiv` must not call them different.
// kerf-equiv-against: include/equiv_same_kept_b.sv
module equiv_same_kept (
  input  logic [15:0] a,
  input  logic [7:0]  d,
  input  logic        hi,
  output logic [15:0] y
);
  always_comb begin
    y = a;
    y[hi*8 +: 8] = d;
  end
endmodule
