// kerf-case: Small ALU front end of an invented accelerator: a truncating net declaration
// kerf-case: assignment (`wire [3:0] narrow = a + b;`), a concatenation on the left of an assign
// kerf-case: ({c, y} = ...), a `unique0 case` without default (no match keeps the default value),
// kerf-case: and a `priority casez` with wildcard items.
module unique0_concat_lhs (
  input  logic [3:0] op,
  input  logic [7:0] a, b,
  input  logic       en,
  output logic [7:0] y,
  output logic       c,
  output logic [2:0] z,
  output logic [1:0] q
);
  wire [3:0] narrow = a + b;       // truncated net declaration assignment
  assign {c, y} = en ? a + b : {1'b0, a ^ b};
  always_comb begin
    z = 3'd0;
    unique0 case (op)
      4'd1: z = narrow[2:0];
      4'd2: z = 3'd5;
      4'd3: z = a[2:0] & b[2:0];
    endcase
  end
  always_comb begin
    q = 2'b00;
    priority casez (op)
      4'b1???: q = 2'd3;
      4'b01??: q = 2'd2;
      4'b001?: q = 2'd1;
      default: q = 2'd0;
    endcase
  end
endmodule
