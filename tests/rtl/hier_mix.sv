// kerf-case: a top with a submodule instance, LHS concatenation, wildcard equality, unique0 case
// kerf-case: and priority if (unique0 needs Verilator: Icarus 11 does not read it).
// kerf-simulator: verilator
// kerf-top: hier_mix
module parity8 (input logic [7:0] d, output logic p);
  assign p = ^d;
endmodule

module hier_mix (
  input  logic [7:0] a, b,
  input  logic [3:0] op,
  input  logic [1:0] mode,
  output logic [7:0] sum,
  output logic       carry,
  output logic       par,
  output logic       is_mul, is_shift,
  output logic [2:0] cls,
  output logic       hit
);
  parity8 u_par (.d(a ^ b), .p(par));
  assign {carry, sum} = a + b;
  assign is_mul   = op ==? 4'b10?1;
  assign is_shift = (op ==? 4'b01??) && mode != 2'b11;
  always_comb begin
    cls = 3'd0;
    unique0 case (op[3:2])
      2'b00: cls = 3'd1;
      2'b01: cls = {1'b0, mode};
      2'b11: cls = 3'd7;
    endcase
  end
  always_comb begin
    priority if (mode == 2'b00) hit = a[0] & b[0];
    else if (mode == 2'b01)     hit = a[1] | b[1];
    else                        hit = (a[0] & b[0]) | (a[1] & b[1] & op[0]);
  end
endmodule
