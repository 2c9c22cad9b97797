// kerf-case: nibble lanes of an invented 12-bit sensor word addressed by a 2-bit lane number:
// kerf-case: lane 3 is out of range, so an indexed part-select write there does nothing and a
// kerf-case: read gives x (IEEE 1800 11.5.1); partly out-of-range selects keep their in-range bits.
module partsel_oob (
  input  logic [11:0] word,
  input  logic [1:0]  lane,
  input  logic [3:0]  nib,
  input  logic [2:0]  off,
  output logic [11:0] patched,
  output logic [3:0]  lane_val,
  output logic [3:0]  window,
  output logic        lane_ok
);
  always_comb begin
    patched = word;
    patched[lane*4 +: 4] = nib;
  end

  assign lane_val = word[lane*4 +: 4];
  assign window   = word[off*2 +: 4];    // off = 5 reaches bits 13:10, off 6 and 7 beyond
  assign lane_ok  = lane != 2'd3;
endmodule
