// kerf-case: F186: `always @*` and a continuous assignment wait on the arguments of a function
// kerf-case: call but not on the module signals the function reads by name (IEEE 1364-2005 9.7.5,
// kerf-case: IEEE 1800-2017 10.3.2; `always_comb` does wait on them, 9.2.2.2.1). A simulator
// kerf-case: holds `y` and `v` when only `en` changes: kerf keeps both as written. With `en`
// kerf-case: also read in the block itself (`w`) the block is combinational and restructured.
// kerf-case: (Icarus Verilog 11 does not re-run an `always_comb` on such a signal either, against
// kerf-case: IEEE 1800: kerf follows the standard there, so this case has no `always_comb` call.)
module min_star_fn_reads (
  input  logic en,   // first: the exhaustive testbench then changes it alone (vector 2 -> 3)
  input  logic a,
  input  logic b,
  output logic y,
  output logic v,
  output logic w
);
  function automatic logic gate_sel(input logic p, input logic q);
    return p & en | q & en;
  endfunction
  always @* y = gate_sel(a, b);
  assign v = gate_sel(b, a) | (a & b);
  always @* w = gate_sel(a, b) | (a & en & ~b);
endmodule
