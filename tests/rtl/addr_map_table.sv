// kerf-case: an interconnect's address map as localparam tables (an invented peripheral map):
// kerf-case: each region's base and mask live in unpacked localparam arrays read inside a
// kerf-case: counting loop (`(addr & MASK[i]) == BASE[i]`, as crossbar generators write them),
// kerf-case: plus a second loop that starts at 1 with `<=` and a register-index table read by a
// kerf-case: signal. The loop reads fold to one entry per pass (kerf of b804d21 kept both loops:
// kerf-case: "it selects from 'RegionMask', which is not a packed vector").
// kerf-case: Icarus Verilog 11 cannot read the array constants: simulated by Verilator.
// kerf-simulator: verilator
module addr_map_table (
  input  logic [31:0] haddr,
  input  logic        hsel,
  input  logic [1:0]  prot_idx,
  output logic [3:0]  region_sel,
  output logic        decode_err,
  output logic [2:0]  hi_hit,
  output logic [3:0]  prot_bits
);
  localparam int NumRegions = 4;
  localparam logic [31:0] RegionBase [NumRegions] = '{32'h4000_0000, 32'h4000_1000, 32'h4000_2000,
                                                      32'h5000_0000};
  localparam logic [31:0] RegionMask [NumRegions] = '{32'hFFFF_F000, 32'hFFFF_F000, 32'hFFFF_E000,
                                                      32'hFF00_0000};
  localparam logic [3:0] ProtTable [4] = '{4'b0001, 4'b0011, 4'b0111, 4'b1111};

  always_comb begin
    region_sel = '0;
    for (int i = 0; i < NumRegions; i++) begin
      if (hsel && ((haddr & RegionMask[i]) == RegionBase[i])) region_sel[i] = 1'b1;
    end
    decode_err = hsel && (region_sel == '0);
  end

  always_comb begin
    hi_hit = '0;
    for (int r = 1; r <= 3; r++) begin
      hi_hit[r-1] = (haddr[31:12] == RegionBase[r][31:12]);
    end
  end

  assign prot_bits = ProtTable[prot_idx];
endmodule
