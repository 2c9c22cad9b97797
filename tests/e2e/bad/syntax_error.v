module bad_syntax (input wire a, input wire b, output wire y);
  assign y = a & ;
endmodule
