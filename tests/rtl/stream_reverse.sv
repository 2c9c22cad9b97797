// kerf-case: bit-order adapter of an invented serial peripheral: streaming concatenations
// kerf-case: (IEEE 1800 11.4.14) reverse bits (`{<<{d}}`), swap bytes (`{<<8{w}}`), reorder
// kerf-case: uneven 3-bit slices (`{<<3{d}}`, the short slice last) and pack two fields
// kerf-case: (`{>>{hdr, d}}`), selected by mode bits; the style open cores use for MSB/LSB-first
// kerf-case: shifters and endianness swaps. Icarus Verilog 11 does not read streaming
// kerf-case: concatenations: simulated by Verilator (which fills a wider target on the left,
// kerf-case: against IEEE 1800 11.4.14 and slang: F28, so every target here is as wide as its stream).
// kerf-simulator: verilator
module stream_reverse (
  input  logic [7:0]  d,
  input  logic [15:0] w,
  input  logic [7:0]  hdr,
  input  logic        lsb_first,
  input  logic        swap,
  input  logic        tri_order,
  output logic [7:0]  d_out,
  output logic [15:0] w_out,
  output logic [15:0] packed_out,
  output logic [7:0]  d_rev,
  output logic [7:0]  d_tri,
  output logic [15:0] w_swap,
  output logic [15:0] packed_word
);
  assign d_rev       = {<<{d}};
  assign d_tri       = {<<3{d}};
  assign w_swap      = {<<8{w}};
  assign packed_word = {>>{hdr, d}};
  always_comb begin
    d_out = lsb_first ? d_rev : (tri_order ? d_tri : d);
    w_out = swap ? w_swap : w;
    packed_out = swap ? packed_word : w;
  end
endmodule
