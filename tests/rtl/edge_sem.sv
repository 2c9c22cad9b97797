// kerf-case: edge semantics (IEEE 1800 12.5, 11.4.2, 11.5.1): overlapping items of a unique case (the
// kerf-case: first match wins in simulation), casez, an output read back inside, index arithmetic,
// kerf-case: signed division by a negative constant.
module edge_sem (
  input  logic [2:0]        sel,
  input  logic [3:0]        a,
  input  logic signed [5:0] s,
  input  logic [7:0]        v,
  output logic [1:0]        y,
  output logic              z,
  output logic              zz,
  output logic              pick,
  output logic signed [5:0] q
);
  always_comb begin
    y = 2'd0;
    unique case (sel)
      3'b001, 3'b011: y = 2'd1;
      3'b011:         y = 2'd2;   // never reached: the first matching item wins
      3'b100:         y = 2'd3;
      default:        ;
    endcase
  end
  always_comb begin
    casez (a[3:1])
      3'b1?1: z = 1'b1;
      3'b0?0: z = a[0];
      default: z = 1'b0;
    endcase
  end
  assign zz = z ^ a[2];
  assign pick = v[sel + 3'd1];
  assign q = s / -6'sd3;
endmodule
