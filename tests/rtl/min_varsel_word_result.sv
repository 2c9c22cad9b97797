// kerf-case: minimal regression (F353): a window select of an internal word result. `span` is an
// kerf-case: adder's result kept as written; the rewritten block reads it through a variable
// kerf-case: part select whose base reaches bits 0..5 only. Verilator -Wall counts a variable
// kerf-case: select as reading the whole vector, so span[7:6] must not become newly unused: the
// kerf-case: kept adder's own result bits are not reads of the rewritten text.
module min_varsel_word_result (
  input  logic [7:0] base_addr,
  input  logic [7:0] limit,
  input  logic [1:0] lane,
  output logic [2:0] window,
  output logic       nonzero_mid
);
  logic [7:0] span;
  assign span = base_addr - limit;
  always_comb begin
    window = span[lane +: 3];
    nonzero_mid = (span[2:1] > 2'd0) ^ lane[0];
  end
endmodule
