// kerf-case: response shaper of the invented peripheral bus: fields of one element of a packed
// kerf-case: array of packed structs written through a variable element index
// kerf-case: (`hdr_o[kill].valid = 1'b0`), besides whole elements and constant fields; bit
// kerf-case: offsets of element and member as IEEE 1800 7.2/7.4 lay them out. Icarus 11 does not
// kerf-case: read packed arrays of structs, so this case is simulated two-valued by Verilator.
// kerf-with: include/periph_pkg.sv
// kerf-simulator: verilator
module struct_array_write
  import periph_pkg::*;
(
  input  bus_req_t [3:0] reqs,
  input  logic [1:0]     kill,
  input  logic           kill_en,
  input  logic           retag,
  input  logic [1:0]     peer,
  output req_hdr_t [3:0] hdr_o
);
  always_comb begin
    for (int i = 0; i < 4; i++) hdr_o[i] = reqs[i].hdr;
    if (kill_en) hdr_o[kill].valid = 1'b0;
    if (retag) begin
      hdr_o[kill].tag[3:2] = 2'b10;
      hdr_o[peer].size = reqs[kill].hdr.size & reqs[peer].hdr.size;
    end
  end
endmodule
