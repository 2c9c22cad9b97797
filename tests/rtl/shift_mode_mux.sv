// kerf-case: barrel shifter select and a mux written with ?: chains, inside operator
// kerf-simulator: verilator
module shift_mode_mux (
  input  logic [15:0] d,
  input  logic [3:0]  sh,
  input  logic [1:0]  mode,
  input  logic [4:0]  code,
  output logic [15:0] q,
  output logic        is_special
);
  assign q = mode == 2'd0 ? d << sh :
             mode == 2'd1 ? d >> sh :
             mode == 2'd2 ? $unsigned($signed(d) >>> sh) : {d[7:0], d[15:8]};
  assign is_special = code inside {5'd0, 5'd3, [5'd8:5'd11], 5'd31};
endmodule
