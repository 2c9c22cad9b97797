// kerf-case: status-match logic of an invented protocol checker comparing against constants
// kerf-case: with x and z bits: == and != give x or 0/1 per IEEE 1800 (never compared as if x
// kerf-case: were 0), === and !== compare the bits literally, ==? treats x/z as wildcards.
module eq_xz_const (
  input  logic [3:0] status,
  input  logic [3:0] code,
  input  logic       en,
  output logic       m_eq,
  output logic       m_ne,
  output logic       m_case_eq,
  output logic       m_case_ne,
  output logic       m_wild,
  output logic       m_wild_ne,
  output logic       m_mix
);
  assign m_eq      = (status == 4'b1x00);
  assign m_ne      = (status != 4'b10x1);
  assign m_case_eq = (status === 4'b1x00);
  assign m_case_ne = (code !== 4'bz01z);
  assign m_wild    = (status ==? 4'b1x0z);
  assign m_wild_ne = (code !=? 4'b0xx1);
  assign m_mix     = en & ((code == 4'b0110) | (status ==? 4'b?1?1));
endmodule
