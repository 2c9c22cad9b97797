// kerf-case: minimal regression: an indexed part-select read that is partly out of range keeps
// kerf-case: its in-range bits (IEEE 1800 11.5.1): with s = 3, a[s*2 +: 4] is {x, x, a[7:6]}.
module min_partsel_partial (
  input  logic [7:0] a,
  input  logic [1:0] s,
  output logic [3:0] y
);
  assign y = a[s*2 +: 4];
endmodule
