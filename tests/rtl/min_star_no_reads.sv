// kerf-case: F185: an `always @*` block that reads no signal waits on nothing, so a simulator
// kerf-case: never runs it and `mode` stays x (IEEE 1364-2005 9.7.5; Icarus warns "@* found no
// kerf-case: sensitivities so it will never trigger"), while synthesis reads it as a constant.
// kerf-case: kerf keeps that block as written and treats `mode` as possibly x, so the `if`
// kerf-case: on it (x takes the else branch) is not rewritten as if `mode` were 1.
module min_star_no_reads (
  input  logic a,
  input  logic b,
  input  logic c,
  output logic [1:0] mode,
  output logic y,
  output logic z
);
  always @* begin
    mode = 2'd2;
    mode = 2'd1;
  end
  always_comb begin
    if (mode == 2'd1) y = a & b | a & c;
    else y = b;
  end
  assign z = a & b | a & c;
endmodule
