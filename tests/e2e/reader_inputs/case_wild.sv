// Invented scenario: the instruction decoder of a tiny accumulator machine.
module decode (
  input  logic [3:0] opcode,
  input  logic [2:0] mode,
  input  logic [1:0] sel,
  output logic [2:0] unit,
  output logic [1:0] width,
  output logic       store,
  output logic       wide
);
  always_comb begin
    unit = 3'd0;
    casez (opcode)
      4'b1??0: unit = 3'd1;
      4'b01?1, 4'b0000: unit = 3'd2;
      4'b001?: unit = 3'd3;
      default: unit = 3'd7;
    endcase
  end
  always_comb begin
    casex (mode)
      3'b1x0: width = 2'd2;
      3'b0xx: width = 2'd1;
      default: width = 2'd0;
    endcase
  end
  always_comb begin
    unique case (sel)
      2'd0, 2'd1: store = 1'b0;
      2'd2: store = 1'b1;
      default: store = 1'b0;
    endcase
  end
  always_comb begin
    wide = 1'b0;
    case (opcode) inside
      4'b11??: wide = 1'b1;
      4'd3, 4'd5: wide = 1'b1;
    endcase
  end
endmodule
