// kerf-case: CSR access checker of an invented RISC-V machine-mode core: the `inside` operator
// kerf-case: with value lists and ranges, a package function, a named always_comb block with a
// kerf-case: local variable, and package constants as case items. Icarus 11 does not read
// kerf-case: `inside` expressions, so this case is simulated two-valued by Verilator.
// kerf-simulator: verilator
// kerf-with: include/csr_pkg.sv
module inside_pkg_func
  import csr_pkg::*;
(
  input  logic [11:0] csr_addr,
  input  logic        csr_we,
  input  logic        csr_re,
  input  logic [1:0]  priv,      // 3 = machine
  output logic        illegal,
  output logic        is_trap_reg,
  output logic [1:0]  sel_kind,
  output logic        counter
);
  assign is_trap_reg = csr_addr inside {CSR_MTVEC, CSR_MEPC, CSR_MCAUSE, [12'h340:12'h343]};
  assign counter     = csr_addr inside {[12'hB00:12'hB1F], [12'hC00:12'hC1F]};

  always_comb begin : check
    logic known;
    known = 1'b1;
    sel_kind = 2'd0;
    case (csr_addr)
      CSR_MSTATUS, CSR_MIE, CSR_MTVEC: sel_kind = 2'd1;
      CSR_MSCRATCH, CSR_MEPC, CSR_MCAUSE, CSR_MIP: sel_kind = 2'd2;
      CSR_MCYCLE: sel_kind = 2'd3;
      default: known = counter;
    endcase
    illegal = (csr_we | csr_re) & (~known | (priv != 2'd3) | (csr_we & csr_read_only(csr_addr)));
  end
endmodule
