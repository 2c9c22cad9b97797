// kerf-case: status and grant decode of an invented DMA arbiter: package struct and enum types,
// kerf-case: $onehot0 and $countones, 'inside' with a set of enum constants and a value range,
// kerf-case: a priority casez. Icarus 11 does not read 'inside', so Verilator simulates it.
// kerf-with: include/dma_arb_pkg.sv
// kerf-simulator: verilator
// Invented: a DMA channel arbiter's grant and status decode.
module dma_status import dma_arb_pkg::*; (
  input  req_t [3:0] req,
  input  st_e        st,
  input  logic [7:0] lvl,
  output logic       any_hi,
  output logic       one_hot_ok,
  output logic [2:0] cnt,
  output logic       busy,
  output logic       lvl_mid,
  output logic [1:0] sel
);
  logic [3:0] vld;
  always_comb begin
    for (int i = 0; i < 4; i++) vld[i] = req[i].vld;
  end
  assign any_hi = |{req[0].prio == 2'b11 && req[0].vld, req[1].prio == 2'b11 && req[1].vld,
                    req[2].prio[1] & req[2].vld, req[3].prio[1] & req[3].vld};
  assign one_hot_ok = $onehot0(vld);
  assign cnt = $countones(vld);
  assign busy = st inside {FETCH, XFER, WAIT};
  assign lvl_mid = lvl inside {[8'd16:8'd200]};
  always_comb begin
    sel = 2'd0;
    priority casez (vld)
      4'b???1: sel = 2'd0;
      4'b??10: sel = 2'd1;
      4'b?100: sel = 2'd2;
      4'b1000: sel = 2'd3;
      default: sel = 2'd0;
    endcase
  end
endmodule
