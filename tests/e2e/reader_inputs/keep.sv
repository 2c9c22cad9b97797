// Invented scenario: a debug tap the author wants to keep as a named point.
module tap_point (
  input  logic a,
  input  logic b,
  input  logic c,
  output logic y
);
  (* keep *) logic tap;
  logic plain;
  assign tap = a & b;
  assign plain = tap | c;
  assign y = plain ^ a;
endmodule
