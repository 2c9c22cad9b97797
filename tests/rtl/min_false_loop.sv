// kerf-case: minimal regression (reduced from random module 1429 of campaign seed 21): the writer
// kerf-case: reuses an internal signal (w4b[2]) inside the logic that computes that signal's own
// kerf-case: block, creating a loop between statements (not between bits); the rewrite then does
// kerf-case: not read back (exit 5). Kept as a regression test; Icarus needs the always @(*) workaround on it.
module min_false_loop (
  input  logic [3:0] in0,
  input  logic in1,
  input  logic in2,
  input  logic [3:0] in3,
  output logic [2:0] out0,
  output logic [1:0] out1,
  output logic [1:0] out2
);
  logic [5:0] w3;
  logic [3:0] w4b;
  logic w4;
  assign out0 = (in1 | in3[3]);
  always_comb begin
    case (in0)
      4'b1110: begin
      end
    endcase
    out1 = in3;
    if ((6'd45 & in0)) begin
      casez (in3)
        4'b0110: begin
          out1 = (out0[2] | in3[3:1]);
        end
      endcase
    end else begin
    end
  end
  always_comb begin
    out2 = (in3 ~^ in2);
    if ((in2 <= {out1, in0[3]})) begin
      out2 = out1[0:0];
    end
  end
  always_comb begin
    w4b = (in3[3] & out2[1]);
    w4b[2] = out1[1];
  end
endmodule
