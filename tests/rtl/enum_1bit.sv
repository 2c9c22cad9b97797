// kerf-case: direction and state outputs of an invented DMA engine typed as 1-bit and 2-bit
// kerf-case: enums: a 1-bit enum output must be written as a scalar (never `sel_o[0]`), enum
// kerf-case: targets with the cast the language needs.
// kerf-with: include/dma_pkg.sv
module enum_1bit
  import dma_pkg::*;
(
  input  logic       req_rd,
  input  logic       req_wr,
  input  logic       err,
  input  logic [1:0] prio,
  output dir_e       dir_o,
  output phase_e     phase_o,
  output logic       active_o
);
  always_comb begin
    dir_o = DIR_READ;
    if (req_wr && !req_rd) dir_o = DIR_WRITE;
    else if (req_wr && req_rd && prio[0]) dir_o = DIR_WRITE;
  end

  always_comb begin
    if (err)                      phase_o = PH_ERROR;
    else if (req_rd || req_wr)    phase_o = (prio == 2'd3) ? PH_DATA : PH_ADDR;
    else                          phase_o = PH_IDLE;
  end

  assign active_o = (phase_o == PH_ADDR) || (phase_o == PH_DATA);
endmodule
