// kerf-case: minimal regression: an internal packed-struct variable written by two blocks and
// kerf-case: read as a whole; its declaration must stay and its bits be named by member.
// kerf-with: include/periph_pkg.sv
module min_struct_internal
  import periph_pkg::*;
(
  input  req_hdr_t in_hdr,
  input  logic     kill,
  output req_hdr_t out_hdr
);
  req_hdr_t hdr;
  always_comb begin
    hdr.valid = in_hdr.valid & ~kill;
    hdr.write = in_hdr.write;
    hdr.size  = in_hdr.size;
  end
  always_comb hdr.tag = kill ? 4'h0 : in_hdr.tag;
  assign out_hdr = hdr;
endmodule
