// kerf-case: response builder of the invented peripheral bus: two always_comb blocks write
// kerf-case: different fields of one packed struct (header flags in one, the tag in the other);
// kerf-case: kerf must see two drivers of different bits, not two drivers of one signal.
// kerf-with: include/periph_pkg.sv
module struct_two_blocks
  import periph_pkg::*;
(
  input  bus_req_t  req,
  input  logic      ready,
  input  logic      error,
  output req_hdr_t  rsp_hdr,
  output logic      hold
);
  req_hdr_t hdr;

  always_comb begin
    hdr.valid = req.hdr.valid & ready;
    hdr.write = req.hdr.write & ~error;
    hdr.size  = error ? 2'd0 : req.hdr.size;
  end

  always_comb begin
    hdr.tag = req.hdr.tag;
    if (error) hdr.tag = 4'hF;
    else if (req.addr[15:12] == 4'h8) hdr.tag = {req.hdr.tag[3:1], 1'b1};
  end

  assign rsp_hdr = hdr;
  assign hold    = req.hdr.valid & ~ready & ~error;
endmodule
