// kerf-case: minimal regression (F19, per signal): one always_ff loads a data register with 'x
// kerf-case: while not valid and a flag from a select that can fall out of range, beside a mode
// kerf-case: register and a flag whose only x source is an `if` condition (an `if` on x takes the
// kerf-case: else branch, IEEE 1800 12.4, so that flag stays 0/1). The readers of the mode
// kerf-case: register and of that flag are restructured; the readers of the data register and of
// kerf-case: the out-of-range flag stay as written. Checked by Icarus Verilog (four-valued).
// kerf-clock: clk
// kerf-reset: rst_n 0
module min_x_kept_signals (
  input  logic       clk,
  input  logic       rst_n,
  input  logic       ld,
  input  logic [1:0] d,
  input  logic [1:0] mode,
  input  logic [5:0] v,
  input  logic [2:0] idx,
  input  logic       a,
  input  logic       b,
  input  logic       c,
  output logic       y,
  output logic       z,
  output logic       w,
  output logic       u
);
  logic [1:0] data, md;
  logic       r, ok;
  always_ff @(posedge clk or negedge rst_n)
    if (!rst_n) begin
      data <= 2'b00;
      md   <= 2'b00;
      r    <= 1'b0;
      ok   <= 1'b0;
    end else begin
      data <= ld ? d : 2'bxx;   // a don't-care while not loaded
      md   <= mode;
      if (v[idx]) ok <= a;      // idx 6 and 7: the condition is x, ok keeps its value
      r    <= v[idx];           // idx 6 and 7 read x
    end
  always_comb begin if (md[0]) y = a & b; else y = b & c | a & b & c; end
  always_comb begin if (data[1]) z = a | b; else z = a & c | b & c | a & b & c; end
  always_comb begin if (ok) w = a & b; else w = b & c | a & b & c; end
  always_comb begin if (r) u = a | b; else u = a & c | b & c | a & b & c; end
endmodule
