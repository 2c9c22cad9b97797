// kerf-case: minimal regression: a 1-bit enum output driven by restructured logic must be
// kerf-case: written as a scalar with the enum cast, never as `dir_o[0]`.
// kerf-with: include/dma_pkg.sv
module min_enum1_out
  import dma_pkg::*;
(
  input  logic rd,
  input  logic wr,
  output dir_e dir_o
);
  assign dir_o = (wr & ~rd) ? DIR_WRITE : DIR_READ;
endmodule
