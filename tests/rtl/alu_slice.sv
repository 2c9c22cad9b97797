// kerf-case: 8-bit ALU slice of an invented microcontroller: word arithmetic that must be kept
// kerf-case: (add, subtract, signed/unsigned compare, variable shifts) beside flag and
// kerf-case: select logic that kerf restructures.
module alu_slice (
  input  logic [7:0] a,
  input  logic [7:0] b,
  input  logic [2:0] op,
  input  logic       carry_in,
  output logic [7:0] result,
  output logic       zero,
  output logic       negative,
  output logic       carry_out,
  output logic       lt_signed
);
  logic [8:0] sum;
  logic [8:0] diff;

  assign sum       = {1'b0, a} + {1'b0, b} + {8'd0, carry_in};
  assign diff      = {1'b0, a} - {1'b0, b};
  assign lt_signed = $signed(a) < $signed(b);

  always_comb begin
    carry_out = 1'b0;
    case (op)
      3'd0: begin result = sum[7:0];  carry_out = sum[8]; end
      3'd1: begin result = diff[7:0]; carry_out = diff[8]; end
      3'd2: result = a & b;
      3'd3: result = a | b;
      3'd4: result = a ^ b;
      3'd5: result = a << b[2:0];
      3'd6: result = a >> b[2:0];
      default: result = {7'd0, lt_signed};
    endcase
  end

  assign zero     = result == 8'd0;
  assign negative = result[7];
endmodule
