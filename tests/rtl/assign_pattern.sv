// kerf-case: CSR select of an invented core written with assignment patterns (`'{field: v}`,
// kerf-case: `'{default: '0}`) as real code does. Icarus 11 does not read assignment patterns,
// kerf-case: so this case is simulated two-valued by Verilator. Covers named members, `default:`
// kerf-case: beside named members, positional patterns and a replicated pattern of a 2-D packed
// kerf-case: array (IEEE 1800 10.9: the first element is the most significant).
// kerf-with: include/csr_pkg.sv
// kerf-simulator: verilator
module assign_pattern
  import csr_pkg::*;
(
  input  logic [11:0] csr_addr,
  input  logic        csr_we,
  input  logic        csr_re,
  output csr_sel_t    sel,
  output csr_sel_t    shadow,
  output logic [1:0][2:0] lanes
);
  // positional, and default beside a named member
  always_comb begin
    if (csr_addr[11:10] == 2'b11) shadow = '{csr_re, 1'b0, csr_addr[1:0]};
    else                          shadow = '{default: '0, write: csr_we & csr_re};
  end
  assign lanes = csr_we ? '{2{{csr_re, csr_addr[0], 1'b1}}} : '{3'd0, {csr_re, 2'b01}};
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
