// A loop whose step leaves its variable as it was (i = i + 0): it never ends. kerf refuses it
// with its location at the first repeated iteration, not after an iteration limit (F65).
module endless_loop (input logic [1:0] pair, output logic [3:0] sel);
  always_comb begin
    sel = '0;
    for (int i = 0; i < 4; i = i + 0) sel[i] = pair == 2'(i / 2);
  end
endmodule
