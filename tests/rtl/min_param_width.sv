// kerf-case: minimal regression: logic whose shape depends on a parameter an instance overrides;
// kerf-case: a rewrite specialised to the default N=4 is wrong (or x) when built with N=2.
// kerf-params: N=2
// kerf-params: N=3
// kerf-pin: N=2 other N=4
module min_param_width #(parameter int N = 4) (
  input  logic [N-1:0] v,
  input  logic [N-1:0] m,
  output logic         any,
  output logic         all
);
  assign any = |(v & m);
  assign all = &(v | ~m);
endmodule
