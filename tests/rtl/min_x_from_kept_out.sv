// kerf-case: minimal regression (F19): x produced by kept code (a register loaded with 'x when
// kerf-case: its data is not valid, and one loaded from an index that can fall out of range) read
// kerf-case: by an `if` and a `case` that kerf could restructure. The registers are outputs, so no
// kerf-case: rule of the writer keeps the readers: only the front end's own rule does. An `if`/`case`
// kerf-case: on x takes the else branch / no item (IEEE 1800 12.4, 12.5); gates written in their
// kerf-case: place would propagate the x instead. Checked by Icarus Verilog (four-valued).
// kerf-clock: clk
// kerf-reset: rst_n 0
module min_x_from_kept_out (
  input  logic       clk,
  input  logic       rst_n,
  input  logic       ld,
  input  logic [1:0] d,
  input  logic [5:0] v,
  input  logic [2:0] idx,
  input  logic       a,
  input  logic       b,
  input  logic       c,
  output logic [1:0] q,
  output logic       r,
  output logic       y,
  output logic       z,
  output logic       w
);
  always_ff @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      q <= 2'b00;
      r <= 1'b0;
    end else begin
      q <= ld ? d : 2'bxx;   // data is a don't-care while not loaded
      r <= v[idx];           // idx 6 and 7 read x
    end
  always_comb begin
    if (q[1]) y = a & b;
    else      y = b & c | a & b & c;
  end
  always_comb begin
    case ({q[0], r})
      2'b11:   z = a | b;
      default: z = a & c | b & c;
    endcase
  end
  // w reads only ports: it is restructured as usual.
  assign w = a & b | a & c | a & b & c;
endmodule
