// Invented scenario: byte strobes of a bus bridge in Verilog-2001; the author
// states the case is full with the synthesis attribute.
module strobe_dec (
  input  wire [1:0] size,
  input  wire [1:0] addr,
  output reg  [3:0] strobe
);
  always @(*) begin
    (* full_case *)
    case (size)
      2'd0: strobe = 4'b0001 << addr;
      2'd1: strobe = addr[1] ? 4'b1100 : 4'b0011;
      2'd2: strobe = 4'b1111;
    endcase
  end
endmodule
