// Invented scenario: the pad control of a small serial port. The pad is driven
// only while the output enable is on (a tri-state driver kerf keeps as written).
module pad_ctrl (
  input  logic       oe,
  input  logic       tx,
  input  logic       invert,
  input  logic [1:0] mode,
  output tri         pad,
  output logic       tx_eff,
  output logic       idle
);
  assign tx_eff = (mode == 2'b01) ? ~tx : (invert ? ~tx : tx);
  assign pad    = oe ? tx_eff : 1'bz;
  assign idle   = ~oe & (mode != 2'b11);
endmodule
