module two_drivers (input logic a, input logic b, output logic y);
  assign y = a & b;
  always_comb begin
    y = a | b;
  end
endmodule
