// kerf-case: control tables of an invented pixel-pipeline sequencer, as table-driven generators
// kerf-case: write them: constant unpacked localparam arrays read with an input index. `CTRL[op]`
// kerf-case: (ascending, 8 entries) and `LANE_MASK[lane]` (descending range) are choices among
// kerf-case: constants and are restructured; `PART[lane]` has 3 entries for a 2-bit index, so
// kerf-case: index 3 reads out of range (x, IEEE 1800-2017 7.4.6) and stays as written;
// kerf-case: `BIG[lane]` has more entries than the index reaches (the rest are never read).
// kerf-case: Icarus Verilog 11 cannot read the array constants: simulated by Verilator.
// kerf-simulator: verilator
module const_table_lookup (
  input  logic [2:0] op,
  input  logic [1:0] lane,
  input  logic       en,
  output logic [6:0] ctrl,
  output logic [3:0] lane_mask,
  output logic [1:0] part,
  output logic [2:0] big
);
  localparam logic [6:0] CTRL [8] = '{7'b000_0001, 7'b000_0011, 7'b000_0110, 7'b000_1100,
                                      7'b001_1000, 7'b011_0000, 7'b110_0000, 7'b100_0001};
  localparam logic [3:0] LANE_MASK [3:0] = '{4'b1000, 4'b0100, 4'b0010, 4'b0001};
  localparam logic [1:0] PART [3] = '{2'd1, 2'd2, 2'd3};
  localparam logic [2:0] BIG [7:0] = '{3'd7, 3'd6, 3'd5, 3'd4, 3'd3, 3'd2, 3'd1, 3'd0};
  assign ctrl      = en ? CTRL[op] : 7'd0;
  assign lane_mask = LANE_MASK[lane] & {4{en}};
  assign part      = PART[lane];
  assign big       = BIG[lane] | {en, 2'b00};
endmodule
