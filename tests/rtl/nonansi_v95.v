// kerf-case: Verilog-1995 style: non-ANSI ports, reg outputs, separate reg declarations, an
// kerf-case: explicit event list, a case inside an if, and blocking defaults.
module nonansi_v95 (sel, a, b, c, d, en, y, z, w);
  input [1:0] sel;
  input [3:0] a, b, c, d;
  input en;
  output [3:0] y;
  output z;
  output [1:0] w;
  reg [3:0] y;
  reg [1:0] w;
  wire t;
  assign t = en & (sel == 2'b10);
  assign z = t | (en & a[0] & b[0]) | (en & a[0] & c[0]);
  always @(sel or a or b or c or d or en)
    if (!en) y = 4'b0;
    else case (sel)
      2'b00: y = a;
      2'b01: y = b;
      2'b10: y = c;
      default: y = d;
    endcase
  always @(*) begin
    w = 2'b00;
    if (a[3] & en) w = 2'b01;
    if (b[3] & en & a[3]) w = 2'b11;
  end
endmodule
