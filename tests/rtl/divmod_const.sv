// kerf-case: display driver of an invented clock chip: division and modulo by constants
// kerf-case: (seconds to tens and units, a bank index by a % 4, a /3 slot) restructured instead
// kerf-case: of refused.
module divmod_const (
  input  logic [5:0] seconds,
  input  logic [7:0] addr,
  input  logic [4:0] slot_raw,
  output logic [2:0] tens,
  output logic [3:0] units,
  output logic [1:0] bank,
  output logic [2:0] slot3,
  output logic       slot_rem_zero
);
  assign tens          = 3'(seconds / 10);
  assign units         = 4'(seconds % 10);
  assign bank          = 2'(addr % 4);
  assign slot3         = 3'(slot_raw / 3);
  assign slot_rem_zero = (slot_raw % 3) == 0;
endmodule
