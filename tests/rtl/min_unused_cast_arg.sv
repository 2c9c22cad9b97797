// kerf-case: minimal regression (F187, found by the lead's campaign seed 212 module 40): a block
// kerf-case: the writer keeps as written (its rewrite would leave the author's `mix` unread)
// kerf-case: passes `$unsigned(code)` to a function whose argument is two bits wide (`code` is
// kerf-case: signed, so the cast is a real conversion). The argument is truncated to the formal's
// kerf-case: width, so that block reads only code[1:0] (Verilator's unused-signal check counts it
// kerf-case: so); the rewrite of `low` no longer reads code[7:4], which must be listed as unused
// kerf-case: rather than left to a new Verilator -Wall warning.
module min_unused_cast_arg (
  input  logic signed [7:0] code,
  input  logic       s,
  input  logic       t,
  output logic [3:0] low,
  output logic       par
);
  function automatic logic par2(input logic [1:0] v);
    return v[0] ^ v[1];
  endfunction
  assign low = (code & {8{s}}) | (code & {8{~s}}) | (code & {8{s & t}});
  wire [1:0] mix = code[1:0] ^ {2{t}};
  always_comb par = par2($unsigned(code)) | (mix[0] & mix[1] & ~mix[0]);
endmodule
