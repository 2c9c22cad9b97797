// Invented scenario: helpers of a packet filter (population count, bit reversal).
module loops (
  input  logic [7:0] mask,
  input  logic [7:0] data,
  output logic [3:0] ones,
  output logic [7:0] reversed,
  output logic [7:0] parity_prefix,
  output logic [3:0] last_index
);
  integer k;
  integer j;
  always_comb begin
    ones = 4'd0;
    for (int i = 0; i < 8; i++)
      ones = ones + mask[i];
  end
  always @* begin
    for (k = 0; k < 8; k = k + 1)
      reversed[k] = data[7 - k];
  end
  always_comb begin
    parity_prefix[0] = data[0];
    for (k = 1; k < 8; k += 1)
      parity_prefix[k] = parity_prefix[k - 1] ^ data[k];
  end
  // j is also read after its loop: the block cannot treat it as a loop local.
  always_comb begin
    for (j = 0; j < 8; j = j + 1)
      if (mask[j]) last_index = j[3:0];
    last_index = j[3:0];
  end
endmodule
