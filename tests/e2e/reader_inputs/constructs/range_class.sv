// Invented scenario: the request class of a memory-mapped bus, by address ranges
// (case inside with ranges, IEEE 1800 12.5.4).
module range_class (
  input  logic [5:0] page,
  output logic [1:0] cls,
  output logic       io
);
  always_comb begin
    cls = 2'd0;
    io  = 1'b0;
    case (page) inside
      [6'd0:6'd15]:            cls = 2'd1;
      6'd16, [6'd32:6'd39]:    cls = 2'd2;
      6'b11????:               begin cls = 2'd3; io = 1'b1; end
    endcase
  end
endmodule
