// kerf-case: credit counter of an invented DMA arbiter: the increment is a kept adder whose
// kerf-case: operand is constant in its upper bits and logic below (F80: the written operand
// kerf-case: carries its constant bits in one vector expression, no padding statement per bit).
module credit_pad_operand (
  input  logic [7:0] credit,
  input  logic [2:0] grant,
  input  logic [2:0] mask,
  input  logic [2:0] pend,
  input  logic       hold,
  output logic [7:0] credit_next
);
  assign credit_next = credit + {4'b0000, ~hold, (grant & mask) | (grant & ~mask & pend)};
endmodule
