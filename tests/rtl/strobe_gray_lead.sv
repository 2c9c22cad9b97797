// kerf-case: bus write strobes from size and address, gray to binary, casez leading one
module strobe_gray_lead (
  input  logic [1:0] size,
  input  logic [1:0] addr,
  input  logic [5:0] gray,
  input  logic [7:0] vec,
  output logic [3:0] strb,
  output logic [5:0] bin,
  output logic [2:0] lead,
  output logic       none
);
  always_comb begin
    case (size)
      2'd0: strb = 4'b0001 << addr;
      2'd1: strb = addr[1] ? 4'b1100 : 4'b0011;
      default: strb = 4'b1111;
    endcase
  end
  always_comb begin
    for (int i = 0; i < 6; i++) bin[i] = ^(gray >> i);
  end
  always_comb begin
    none = 1'b0;
    casez (vec)
      8'b1???????: lead = 3'd7;
      8'b01??????: lead = 3'd6;
      8'b001?????: lead = 3'd5;
      8'b0001????: lead = 3'd4;
      8'b00001???: lead = 3'd3;
      8'b000001??: lead = 3'd2;
      8'b0000001?: lead = 3'd1;
      8'b00000001: lead = 3'd0;
      default: begin lead = 3'd0; none = 1'b1; end
    endcase
  end
endmodule
