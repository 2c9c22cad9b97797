// kerf-case: minimal regression: an output enable released with 'z (a pad driver); lowering z
// kerf-case: as 0 turns `oe ? d : 1'bz` into `oe & d`, which Icarus shows as 0 instead of z.
module min_tristate_enable (
  input  logic oe,
  input  logic d,
  input  logic inv,
  output tri   pad,
  output logic d_eff
);
  assign d_eff = d ^ inv;
  assign pad   = oe ? d_eff : 1'bz;
endmodule
