// kerf-case: request arbiter front end of the invented peripheral bus: a packed array of packed
// kerf-case: structs (`bus_req_t [3:0]`) read and written by field; references must name
// kerf-case: element and member, never flat offsets. Icarus 11 does not read packed arrays of
// kerf-case: structs, so this case is simulated two-valued by Verilator.
// kerf-with: include/periph_pkg.sv
// kerf-simulator: verilator
module struct_array
  import periph_pkg::*;
(
  input  bus_req_t [3:0] reqs,
  input  logic [3:0]     stall,
  output req_hdr_t [3:0] fwd_hdr,
  output logic [3:0]     is_ram,
  output logic [3:0]     wr_to_uart
);
  always_comb begin
    for (int i = 0; i < 4; i++) begin
      fwd_hdr[i]       = reqs[i].hdr;
      fwd_hdr[i].valid = reqs[i].hdr.valid & ~stall[i];
      if (reqs[i].hdr.size == 2'd3) fwd_hdr[i].tag = 4'h0;
    end
  end

  for (genvar i = 0; i < 4; i++) begin : g_dec
    assign is_ram[i]     = reqs[i].hdr.valid & reqs[i].addr[15];
    assign wr_to_uart[i] = reqs[i].hdr.valid & reqs[i].hdr.write & (reqs[i].addr[15:8] == UART_BASE[15:8]);
  end
endmodule
