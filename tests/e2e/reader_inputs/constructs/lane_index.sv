// Invented scenario: lane masking of a narrow data path, with indices too
// narrow or too wide for the vectors they select (IEEE 1800 11.5.1).
module lane_index (
  input  logic [3:0] a,
  input  logic       s,
  input  logic [2:0] k,
  input  logic [7:0] d,
  input  logic [1:0] p,
  output logic [3:0] masked,
  output logic       pick,
  output logic [3:0] window
);
  always_comb begin
    masked = a;
    masked[s] = 1'b0;      // a 1-bit index reaches bits 0 and 1 only
  end
  assign pick   = a[k];           // k = 4..7 reads x
  assign window = d[p*3 +: 4];    // p = 2, 3 start inside, run past bit 7: those bits read x
endmodule
