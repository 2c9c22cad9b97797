// kerf-case: write-data merge of an invented 32-bit register file port: variable-base part-select
// kerf-case: writes (`y[s*2 +: 2]`, byte lanes by enable in a loop) and reads (`a[s*8 +: 8]`).
module partsel_var_write (
  input  logic [31:0] old_word,
  input  logic [31:0] wdata,
  input  logic [3:0]  byte_en,
  input  logic [1:0]  pair_sel,
  input  logic [1:0]  byte_sel,
  input  logic [1:0]  pair_val,
  output logic [31:0] merged,
  output logic [7:0]  pairs,
  output logic [7:0]  picked_byte
);
  always_comb begin
    merged = old_word;
    for (int i = 0; i < 4; i++)
      if (byte_en[i]) merged[i*8 +: 8] = wdata[i*8 +: 8];
  end

  always_comb begin
    pairs = old_word[7:0];
    pairs[pair_sel*2 +: 2] = pair_val;
  end

  assign picked_byte = wdata[byte_sel*8 +: 8];
endmodule
