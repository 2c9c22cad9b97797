// kerf-case: normaliser front of an invented fixed-point unit: a leading-zero count written as a
// kerf-case: function whose loop ends with `break`, a first-set search with `return` inside the
// kerf-case: loop, `priority if` and `unique0 case` (IEEE 1800 12.4.2, 12.5.3, 12.8).
// kerf-case: Icarus Verilog 11 does not read `priority if`: simulated by Verilator.
// kerf-simulator: verilator
module loop_break_lzc (
  input  logic [7:0] mant,
  input  logic [1:0] rmode,
  input  logic       zero_ok,
  output logic [3:0] lz,
  output logic [2:0] first,
  output logic       inexact,
  output logic [1:0] adj
);
  function automatic logic [3:0] lzc8(input logic [7:0] v);
    logic [3:0] n;
    n = 4'd8;
    for (int i = 7; i >= 0; i--) begin
      if (v[i]) begin
        n = 4'(7 - i);
        break;
      end
    end
    return n;
  endfunction

  function automatic logic [2:0] first_set(input logic [7:0] v);
    for (int i = 0; i < 8; i++)
      if (v[i]) return 3'(i);
    return 3'd0;
  endfunction

  assign lz    = lzc8(mant);
  assign first = first_set(mant);

  always_comb begin
    priority if (mant == 8'd0) inexact = ~zero_ok;
    else if (mant[0])          inexact = 1'b0;
    else                       inexact = rmode[1] & mant[1];
  end

  always_comb begin
    adj = 2'b00;
    unique0 case (rmode)
      2'd1: adj = {1'b0, mant[0]};
      2'd2: adj = {mant[0], mant[1]};
    endcase
  end
endmodule
