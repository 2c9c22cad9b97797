// kerf-case: found by the random-module campaign (seed 96, module 57), reduced: a state register
// kerf-case: compared with named enum constants (`st3 != STATE2_A`, `st3 != STATE2_D`) in a block
// kerf-case: whose outputs are partly overwritten in a loop. The writer, naming the comparisons,
// kerf-case: took a single exclusion (`st3 != STATE2_A`, an OR of differing bits) for a sum of
// kerf-case: one term per value and read past its terms: kerf crashed or ran out of memory.
// kerf-top: min_named_exclusion
// kerf-clock: clk
// kerf-reset: rst_n 0
module min_named_exclusion (
  input  logic       clk,
  input  logic       rst_n,
  input  logic [7:0] in0,
  input  logic [3:0] in1,
  input  logic       in2,
  input  logic [5:0] in3,
  input  logic [4:0] in4,
  input  logic [2:0] in5,
  output logic [2:0] out0
);
  typedef enum logic [1:0] {STATE2_A = 2'd1, STATE2_B = 2'd0, STATE2_C = 2'd3, STATE2_D = 2'd2} state2_e;
  logic [7:0] w0;
  state2_e st3;
  assign w0 = in0;
  always_ff @(posedge clk or negedge rst_n)
    if (!rst_n) st3 <= STATE2_B;
    else
      case (in1[3:2])
        2'd0:    st3 <= STATE2_B;
        2'd1:    st3 <= STATE2_A;
        2'd2:    st3 <= STATE2_D;
        default: st3 <= STATE2_C;
      endcase
  always_comb begin
    out0 = ~in1[2:0];
    if (~w0[in4[2:0]]) begin
      if ((in3 | {3'b000, in5}) <= 6'h34) begin
        if (st3 != STATE2_A) begin
          out0 = {in5[1:0], in2};
        end
      end
    end
    casez (in4)
      5'b10011: begin
        for (int i5 = 0; i5 < 3; i5++) begin
          out0[i5] = out0[i5] ^ (in3[4] | (st3 != STATE2_D));
        end
      end
    endcase
  end
endmodule
