// kerf-case: One byte step of a CRC-16 with the CCITT polynomial x^16 + x^12 + x^5 + 1 (a
// kerf-case: published standard polynomial) of an invented link layer, in the style generated
// kerf-case: by common CRC code generators: a function with a for loop over the data bits and a
// kerf-case: conditional XOR with the polynomial, called from a continuous assignment; plus a
// kerf-case: residue check written as a comparison with the standard's good-residue constant.
module crc16_step (
  input  logic [15:0] crc_in,
  input  logic [7:0]  data,
  input  logic        first,
  output logic [15:0] crc_out,
  output logic        residue_ok
);
  localparam logic [15:0] POLY = 16'h1021;
  localparam logic [15:0] INIT = 16'hFFFF;

  function automatic logic [15:0] crc_byte(input logic [15:0] c, input logic [7:0] d);
    logic [15:0] r;
    r = c;
    for (int i = 7; i >= 0; i--) begin
      if (r[15] ^ d[i]) r = (r << 1) ^ POLY;
      else              r = r << 1;
    end
    return r;
  endfunction

  wire [15:0] seed = first ? INIT : crc_in;
  assign crc_out    = crc_byte(seed, data);
  assign residue_ok = (crc_in == 16'h0000);
endmodule
