// kerf-case: a loop between statements through code kept as written (F136; found by the random-
// kerf-case: module campaign, seed 85, module 38). The block writing out0 is kept (it holds an
// kerf-case: `ifdef`) and reads st1; w4's block is not rewritten and reads out0, although w4 ends
// kerf-case: up a copy of in1[1]. Lending w4's name to in1[1] inside the rewrite of st1 made st1
// kerf-case: read w4: no loop bit by bit, but one between the statements (Verilator UNOPTFLAT).
// kerf-defines: -
// kerf-defines: KERF_RAND_ALT
module min_loop_through_kept (
  input  logic [5:0] in0,
  input  logic [4:0] in1,
  output logic [7:0] out0
);
  typedef struct packed { logic [3:0] f0; logic [1:0] f1; } st1_t;
  logic [1:0] w0;
  logic w2;
  logic w3;
  logic [2:0] w4;
  logic [3:0] w5b;
  logic w5;
  st1_t st1;
  always_comb begin
    st1 = '0;
    if (in0) st1.f0[2] = (|{3{in0[in1[3:2]]}});
    st1.f1[1] = in1[in0[2:1] +: 1];
  end
  for (genvar g2 = 0; g2 < 2; g2++) begin : gen_w0
    assign w0[g2] = in1[g2] | ^((in0 && in1[in1[3:2] +: 1]));
  end
  always_comb begin
    out0 = (w0 ^ w0);
`ifdef KERF_RAND_ALT
    casex (in1)
      5'b01111: begin
        if ((in0 != in1)) begin
          out0 = (in0 ^ {st1.f0, in1[4]});
        end else begin
          out0 = (^((st1 == w0[1:0]) ? in1 : st1));
        end
      end
      default: begin
        unique case (in1)
          5'b01110: begin
            out0 = ((^st1.f1) <= 1'b0);
          end
          5'b10010: begin
            out0 = ((~|in1) & in0);
          end
          5'b00010: begin
            out0[3] = (~in1);
          end
          5'b00111: begin
            out0 = ((8'h9f >> w0) < (in1[4:1] ? st1.f0 : in1[3:3]));
          end
          5'b11010: begin
            out0 = st1.f0[1];
          end
          default: begin
            out0 = (^(in1 * w0));
          end
        endcase
      end
    endcase
`else
    out0 = st1.f1;
`endif
    if ((in1[in0[2:1] +: 2] < (in1 | st1.f0))) begin
      out0[6:0] = st1.f0;
      out0 = st1.f0;
    end else begin
      out0 = (in1[in1[1:0] +: 2] << 1);
    end
  end
  assign w2 = (((&w0) >> 0) >> 0);
`ifdef KERF_RAND_ALT
  assign w3 = (~(~st1));
`else
  assign w3 = (^in0[in0[1:0]]);
`endif
  always_comb begin
    w4 = (in0 ? 4'd15 : in0);
    w4 = out0[w0[1]*3 +: 3];
    case (w0)
      2'b10: begin
        w4 = (~(~&w0));
      end
      2'b00: begin
        w4[2:1] = (w2 == 1'b0);
      end
      2'b11: begin
        w4[2:0] = ((w0 >>> 0) | (&4'b1011));
      end
      default: begin
        w4 = ((w0 || w0[1]) + in0[5]);
      end
    endcase
    w4 = ((in1[1] > 1'b0) << 0);
  end
  always_comb begin
    w5 = (st1.f0[1] * st1.f1);
    w5b = in1[2];
`ifdef KERF_RAND_ALT
    w5b[2] = w4[0];
`endif
    w5 = $signed((w0 ~^ st1));
    w5 = (^(out0[5:3] | w3));
  end
endmodule
