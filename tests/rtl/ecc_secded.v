// kerf-case: single-error-correcting, double-error-detecting code for a 4-bit data nibble of an
// kerf-case: invented sensor interface (extended Hamming(8,4) construction), Verilog-2001 style
// kerf-case: with a function, `always @(*)`, reg declarations and a case on the syndrome.
module ecc_secded (data_in, code_in, code_out, data_out, single_err, double_err);
  input  [3:0] data_in;
  input  [7:0] code_in;
  output [7:0] code_out;
  output [3:0] data_out;
  output       single_err;
  output       double_err;

  reg [3:0] data_out;
  reg       single_err;
  reg       double_err;

  function [7:0] encode;
    input [3:0] d;
    reg p1, p2, p4;
    begin
      p1 = d[0] ^ d[1] ^ d[3];
      p2 = d[0] ^ d[2] ^ d[3];
      p4 = d[1] ^ d[2] ^ d[3];
      encode[6:0] = {d[3], d[2], d[1], p4, d[0], p2, p1};
      encode[7]   = ^{d[3], d[2], d[1], p4, d[0], p2, p1};
    end
  endfunction

  assign code_out = encode(data_in);

  wire [2:0] syndrome;
  wire       overall;
  assign syndrome[0] = code_in[0] ^ code_in[2] ^ code_in[4] ^ code_in[6];
  assign syndrome[1] = code_in[1] ^ code_in[2] ^ code_in[5] ^ code_in[6];
  assign syndrome[2] = code_in[3] ^ code_in[4] ^ code_in[5] ^ code_in[6];
  assign overall     = ^code_in;

  reg [6:0] fixed;
  always @(*) begin
    fixed = code_in[6:0];
    case (syndrome)
      3'd1: fixed[0] = ~code_in[0];
      3'd2: fixed[1] = ~code_in[1];
      3'd3: fixed[2] = ~code_in[2];
      3'd4: fixed[3] = ~code_in[3];
      3'd5: fixed[4] = ~code_in[4];
      3'd6: fixed[5] = ~code_in[5];
      3'd7: fixed[6] = ~code_in[6];
      default: fixed = code_in[6:0];
    endcase
    data_out   = {fixed[6], fixed[5], fixed[4], fixed[2]};
    single_err = overall;
    double_err = !overall && syndrome != 3'd0;
  end
endmodule
