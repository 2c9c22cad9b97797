// kerf-case: write-enable and byte-lane decoder of an invented SRAM controller whose width,
// kerf-case: lane count and address decode depend on parameters an instance overrides; the
// kerf-case: rewrite must stay right for every value (or keep that logic as written), and a
// kerf-case: rewrite pinned with --param must refuse to build with another value.
// kerf-params: LANES=2 BASE=3
// kerf-params: LANES=8
// kerf-params: BASE=0 HIGH_WIN=1
// kerf-pin: LANES=2 other LANES=4
module param_override #(
  parameter int LANES    = 4,
  parameter int BASE     = 5,
  parameter bit HIGH_WIN = 1'b0
) (
  input  logic [3:0]       addr_hi,
  input  logic [1:0]       size,       // 0 byte, 1 half, 2 word, 3 double
  input  logic [2:0]       offset,
  input  logic             wr,
  output logic [LANES-1:0] lane_we,
  output logic             hit
);
  localparam int LAST = LANES - 1;

  assign hit = HIGH_WIN ? (addr_hi >= 4'(BASE)) : (addr_hi == 4'(BASE));

  always_comb begin
    lane_we = '0;
    for (int i = 0; i < LANES; i++) begin
      case (size)
        2'd0: lane_we[i] = wr && hit && (offset == 3'(i));
        2'd1: lane_we[i] = wr && hit && (offset[2:1] == 2'(i / 2));
        2'd2: lane_we[i] = wr && hit && (offset[2] == 1'(i / 4));
        default: lane_we[i] = wr && hit && (i <= LAST);
      endcase
    end
  end
endmodule
