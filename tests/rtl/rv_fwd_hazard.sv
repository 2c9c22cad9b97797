// kerf-with: include/fwd_pkg.sv
// kerf-case: Operand forwarding and load-use hazard detection of an invented five-stage RV32I
// kerf-case: pipeline (register numbers and the x0 rule of the RISC-V base ISA, an open standard),
// kerf-case: in the style of hand-written cores: a packed struct per stage, equality of 5-bit
// kerf-case: register numbers, an if/else-if priority in always_comb, and a 2-bit select enum.
module rv_fwd_hazard
  import fwd_pkg::*;
(
  input  logic [4:0] id_rs1,
  input  logic [4:0] id_rs2,
  input  logic       id_uses_rs2,
  input  logic [4:0] ex_rs1,
  input  logic [4:0] ex_rs2,
  input  stage_ctl_t ex_ctl,
  input  stage_ctl_t mem_ctl,
  input  stage_ctl_t wb_ctl,
  output fwd_sel_e   fwd_a,
  output fwd_sel_e   fwd_b,
  output logic       stall_id,
  output logic       flush_ex
);
  logic mem_writes, wb_writes;

  // A write to x0 is never forwarded: x0 reads as zero.
  assign mem_writes = mem_ctl.reg_we && (mem_ctl.rd != 5'd0);
  assign wb_writes  = wb_ctl.reg_we && (wb_ctl.rd != 5'd0);

  // The nearer stage wins when both write the register read.
  always_comb begin
    if (mem_writes && (mem_ctl.rd == ex_rs1))     fwd_a = FWD_MEM;
    else if (wb_writes && (wb_ctl.rd == ex_rs1))  fwd_a = FWD_WB;
    else                                          fwd_a = FWD_NONE;

    if (mem_writes && (mem_ctl.rd == ex_rs2))     fwd_b = FWD_MEM;
    else if (wb_writes && (wb_ctl.rd == ex_rs2))  fwd_b = FWD_WB;
    else                                          fwd_b = FWD_NONE;
  end

  // Load-use: the instruction in decode needs a value still being loaded.
  always_comb begin
    stall_id = 1'b0;
    if (ex_ctl.mem_rd && (ex_ctl.rd != 5'd0)) begin
      if (ex_ctl.rd == id_rs1) stall_id = 1'b1;
      if (id_uses_rs2 && (ex_ctl.rd == id_rs2)) stall_id = 1'b1;
    end
  end
  assign flush_ex = stall_id;
endmodule
