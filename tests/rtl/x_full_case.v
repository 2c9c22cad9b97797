// kerf-case: Verilog-2001 write-strobe decoder with a (* full_case *) case and no default:
// kerf-case: the attribute says the listed items are all that occur; the others are
// kerf-case: don't-cares and must not be refused as a latch.
// kerf-care: ua.sel != 2'd3
module x_full_case (sel, wr, strobe, bank);
  input  [1:0] sel;
  input        wr;
  output [3:0] strobe;
  output [1:0] bank;
  reg    [3:0] strobe;
  reg    [1:0] bank;

  always @(*) begin
    (* full_case *)
    case (sel)
      2'd0: begin strobe = {3'b000, wr}; bank = 2'd0; end
      2'd1: begin strobe = {2'b00, wr, 1'b0}; bank = 2'd1; end
      2'd2: begin strobe = {wr, wr, 2'b00}; bank = 2'd2; end
    endcase
  end
endmodule
