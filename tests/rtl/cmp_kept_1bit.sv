// kerf-case: match and carry logic of an invented address-compare unit: 1-bit results of kept
// kerf-case: word-level logic (a != b, x == y between two signals, a 1-bit sum) feed decode
// kerf-case: logic that kerf restructures; each must be written as a valid scalar reference.
module cmp_kept_1bit (
  input  logic [7:0] tag_a,
  input  logic [7:0] tag_b,
  input  logic [3:0] id_x,
  input  logic [3:0] id_y,
  input  logic       bit_p,
  input  logic       bit_q,
  input  logic       en,
  input  logic [1:0] mode,
  output logic       hit,
  output logic       miss,
  output logic       sum1,
  output logic       select_a,
  output logic       select_b
);
  logic tags_differ;
  logic ids_equal;
  logic s;

  assign tags_differ = tag_a != tag_b;
  assign ids_equal   = id_x == id_y;
  assign s           = bit_p + bit_q;

  assign hit      = en & ~tags_differ & ids_equal;
  assign miss     = en & (tags_differ | ~ids_equal);
  assign sum1     = s ^ (mode == 2'd3);
  assign select_a = (mode == 2'd0 & ids_equal) | (mode == 2'd1 & ~tags_differ) | (mode == 2'd2 & s);
  assign select_b = (mode == 2'd0 & ~ids_equal) | (mode == 2'd1 & tags_differ) | (mode == 2'd2 & ~s);
endmodule
