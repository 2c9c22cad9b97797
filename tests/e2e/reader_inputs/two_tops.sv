module left_half (input logic a, output logic y);
  assign y = ~a;
endmodule
module right_half (input logic a, output logic y);
  assign y = a;
endmodule
