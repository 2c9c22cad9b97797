// kerf-case: Mixed helpers of an invented packet parser, in the styles hand-written RTL uses:
// kerf-case: a function whose loop returns early (first set bit), a task with an output argument
// kerf-case: called from always_comb (saturating add), shifts by amounts past the width (zero) and
// kerf-case: an arithmetic shift of a $signed view, a string-valued parameter choosing a generate
// kerf-case: branch, and the parity of a variable part-select.
module fn_task_shift_mix #(
  parameter MODE = "FAST"
) (
  input  logic [7:0] a,
  input  logic [3:0] sh,
  input  logic [2:0] k,
  output logic [7:0] y1, y2, y3,
  output logic [3:0] y4,
  output logic       y5
);
  function automatic logic [3:0] first_one(input logic [7:0] v);
    for (int i = 0; i < 8; i++) if (v[i]) return 4'(i);
    return 4'hf;
  endfunction
  task automatic sat_add(input logic [7:0] p, input logic [7:0] q, output logic [7:0] r);
    logic [8:0] s;
    s = p + q;
    r = s[8] ? 8'hff : s[7:0];
  endtask
  assign y1 = a << sh;                   // shifts past the width give zero
  assign y2 = $signed(a) >>> sh;         // arithmetic shift of a signed view
  always_comb sat_add(a, {5'b0, k}, y3);
  assign y4 = first_one(a);
  if (MODE == "FAST") begin : g_fast
    assign y5 = ^a[k +: 2];
  end else begin : g_slow
    assign y5 = |a;
  end
endmodule
