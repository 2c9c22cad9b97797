// kerf-case: bus-monitor checks of an invented test chip comparing against constants with z bits:
// kerf-case: == and != with a z operand bit give x or 0/1 per IEEE 1800, === and !== compare
// kerf-case: literally. Verilator does not read == against z, so the lint check is off here.
// kerf-lint: off
module eq_z_const (
  input  logic [3:0] bus,
  input  logic       probe_en,
  output logic       m_eq_z,
  output logic       m_ne_z,
  output logic       m_case_z,
  output logic       m_case_nz,
  output logic       m_guarded
);
  assign m_eq_z    = (bus == 4'b1z00);
  assign m_ne_z    = (bus != 4'bzz11);
  assign m_case_z  = (bus === 4'bz000);
  assign m_case_nz = (bus !== 4'b1z11);
  assign m_guarded = probe_en & ((bus == 4'b0z01) | (bus == 4'b0110));
endmodule
