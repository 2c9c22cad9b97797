// kerf-case: CSR address decoder of an invented RV32 core (machine-level CSR addresses and the
// kerf-case: address-bit conventions of the RISC-V privileged architecture, an open standard):
// kerf-case: a package of address localparams and a select struct, a `unique case` with several
// kerf-case: labels per item, user counters readable below machine mode only when enabled, the
// kerf-case: read-only and privilege checks from address bits, and an access-fault output.
// kerf-with: include/rv_csr_pkg.sv
// kerf-vectors: 60000
module rv_csr_decode
  import rv_csr_pkg::*;
(
  input  logic [11:0] csr_addr,
  input  logic        csr_we,
  input  priv_t       priv,
  input  logic        cnt_en_cy,   // user access to the cycle counter
  input  logic        cnt_en_ir,   // user access to the retired-instruction counter
  output csr_sel_t    sel,
  output logic        known,
  output logic        fault
);
  logic read_only, priv_low, cnt_denied;

  always_comb begin
    sel        = '0;
    known      = 1'b1;
    cnt_denied = 1'b0;
    unique case (csr_addr)
      CSR_MSTATUS:                 sel.status  = 1'b1;
      CSR_MISA:                    sel.isa     = 1'b1;
      CSR_MIE:                     sel.ie      = 1'b1;
      CSR_MTVEC:                   sel.tvec    = 1'b1;
      CSR_MSCRATCH:                sel.scratch = 1'b1;
      CSR_MEPC:                    sel.epc     = 1'b1;
      CSR_MCAUSE:                  sel.cause   = 1'b1;
      CSR_MTVAL:                   sel.tval    = 1'b1;
      CSR_MIP:                     sel.ip      = 1'b1;
      CSR_MCYCLE:                  sel.cycle_lo = 1'b1;
      CSR_MCYCLEH:                 sel.cycle_hi = 1'b1;
      CSR_MINSTRET:                sel.instret_lo = 1'b1;
      CSR_MINSTRETH:               sel.instret_hi = 1'b1;
      CSR_CYCLE: begin
        sel.cycle_lo = 1'b1;
        cnt_denied   = priv != PRIV_M && !cnt_en_cy;
      end
      CSR_CYCLEH: begin
        sel.cycle_hi = 1'b1;
        cnt_denied   = priv != PRIV_M && !cnt_en_cy;
      end
      CSR_INSTRET: begin
        sel.instret_lo = 1'b1;
        cnt_denied     = priv != PRIV_M && !cnt_en_ir;
      end
      CSR_INSTRETH: begin
        sel.instret_hi = 1'b1;
        cnt_denied     = priv != PRIV_M && !cnt_en_ir;
      end
      CSR_MVENDORID, CSR_MARCHID, CSR_MIMPID, CSR_MHARTID: sel.id = 1'b1;
      default: known = 1'b0;
    endcase
  end

  // Address bits [11:10] == 2'b11 mark read-only CSRs; bits [9:8] give the lowest privilege.
  assign read_only = csr_addr[11:10] == 2'b11;
  assign priv_low  = priv < csr_addr[9:8];
  assign fault     = !known || priv_low || cnt_denied || (csr_we && read_only);
endmodule
