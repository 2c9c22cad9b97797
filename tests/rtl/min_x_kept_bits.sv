// kerf-case: minimal regression (F19, per bit): a status register whose data bits are loaded
// kerf-case: with 'x while not valid (kept code can make them x) beside mode bits that are always
// kerf-case: 0/1. A block reading only the mode bits is restructured; the block whose `if` reads
// kerf-case: a data bit stays as written (an `if` on x takes the else branch, IEEE 1800 12.4;
// kerf-case: gates in its place would pass the x on). Checked by Icarus Verilog (four-valued).
// kerf-clock: clk
// kerf-reset: rst_n 0
module min_x_kept_bits (
  input  logic       clk,
  input  logic       rst_n,
  input  logic       ld,
  input  logic [1:0] d,
  input  logic [1:0] mode,
  input  logic       a,
  input  logic       b,
  input  logic       c,
  output logic       y,
  output logic       z
);
  logic [3:0] st;   // [3:2] data, [1:0] mode
  always @(posedge clk or negedge rst_n)
    if (!rst_n) st[3:2] <= 2'b00;
    else        st[3:2] <= ld ? d : 2'bxx;   // data is a don't-care while not loaded
  always @(posedge clk or negedge rst_n)
    if (!rst_n) st[1:0] <= 2'b00;
    else        st[1:0] <= mode;
  // Reads the mode bits only: restructured.
  always_comb begin
    case (st[1:0])
      2'b01:   y = a & b | a & b & c;
      2'b10:   y = b & c | a & b & c;
      default: y = a & c | a & b & c;
    endcase
  end
  // Reads a data bit, which can be x: kept as written.
  always_comb begin
    if (st[3]) z = a | b;
    else       z = a & c | b & c | a & b & c;
  end
endmodule
