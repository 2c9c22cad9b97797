// kerf-case: CSR select of an invented core written with assignment patterns (`'{field: v}`,
// kerf-case: `'{default: '0}`) as real code does. Icarus 11 does not read assignment patterns,
// kerf-case: so this case is simulated two-valued by Verilator.
// kerf-with: include/csr_pkg.sv
// kerf-simulator: verilator
module assign_pattern
  import csr_pkg::*;
(
  input  logic [11:0] csr_addr,
  input  logic        csr_we,
  input  logic        csr_re,
  output csr_sel_t    sel
);
  always_comb begin
    sel = '{default: '0};
    if (csr_we | csr_re) begin
      unique case (csr_addr)
        CSR_MSTATUS, CSR_MIE, CSR_MTVEC:
          sel = '{valid: 1'b1, write: csr_we, kind: 2'd1};
        CSR_MEPC, CSR_MCAUSE:
          sel = '{valid: 1'b1, write: csr_we, kind: 2'd2};
        CSR_MCYCLE:
          sel = '{valid: 1'b1, write: 1'b0, kind: 2'd3};
        default:
          sel = '{valid: 1'b0, write: 1'b0, kind: 2'd0};
      endcase
    end
  end
endmodule
