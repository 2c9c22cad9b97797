// kerf-case: address decoder of an invented AXI-lite crossbar, in the style of open cores: a
// kerf-case: package with an enum of targets and a struct type, a mask-and-compare function
// kerf-case: called per rule, a parameter switching a rule off (kept unless pinned), a `unique
// kerf-case: casez` priority over the hit vector assigning enum values, and an `inside` check
// kerf-case: on the enum. Icarus Verilog 11 cannot simulate `inside`: simulated by Verilator.
// kerf-simulator: verilator
// kerf-top: axi_dec
// kerf-with: include/xbar_pkg.sv
// kerf-params: ENABLE_TIMER=0
// kerf-pin: ENABLE_TIMER=1 other ENABLE_TIMER=0
module axi_dec
  import xbar_pkg::*;
#(
  parameter bit ENABLE_TIMER = 1'b1
) (
  input  logic [31:0] aw_addr,
  input  logic        aw_valid,
  input  logic [2:0]  aw_prot,
  output slv_e        aw_sel,
  output logic        aw_dec_err,
  output logic [NRULES-1:0] aw_hit
);
  function automatic logic match(input logic [31:0] a, input logic [31:0] base, input logic [31:0] mask);
    return ((a ^ base) & mask) == '0;
  endfunction

  always_comb begin
    aw_hit[0] = match(aw_addr, 32'h0000_0000, 32'hFFFF_0000);
    aw_hit[1] = match(aw_addr, 32'h2000_0000, 32'hFFF0_0000);
    aw_hit[2] = match(aw_addr, 32'h4000_0000, 32'hFFFF_F000);
    aw_hit[3] = match(aw_addr, 32'h4000_1000, 32'hFFFF_F000);
    aw_hit[4] = ENABLE_TIMER && match(aw_addr, 32'h4000_2000, 32'hFFFF_F000);
  end

  always_comb begin
    aw_sel     = SLV_ERR;
    aw_dec_err = 1'b0;
    unique casez (aw_hit)
      5'b????1: aw_sel = SLV_ROM;
      5'b???10: aw_sel = SLV_RAM;
      5'b??100: aw_sel = SLV_UART;
      5'b?1000: aw_sel = SLV_GPIO;
      5'b10000: aw_sel = SLV_TIMER;
      default:  aw_dec_err = aw_valid;
    endcase
    // privileged-only targets
    if (aw_sel inside {SLV_TIMER, SLV_GPIO} && !aw_prot[0]) begin
      aw_sel     = SLV_ERR;
      aw_dec_err = aw_valid;
    end
  end
endmodule
