// kerf-case: status summariser of an invented 8-channel ADC front end using `function
// kerf-case: automatic` with constant-bound loops (population count, highest set bit, parity,
// kerf-case: one-hot check) called from continuous assignments and an always_comb block.
module func_loops (
  input  logic [7:0] ch_ready,
  input  logic [7:0] ch_error,
  input  logic       summary_en,
  output logic [3:0] ready_count,
  output logic [2:0] top_ready,
  output logic       any_error,
  output logic       err_parity,
  output logic       single_ready
);
  function automatic logic [3:0] popcount8(input logic [7:0] v);
    logic [3:0] n;
    n = '0;
    for (int i = 0; i < 8; i++) n = n + 4'(v[i]);
    return n;
  endfunction

  function automatic logic [2:0] highest(input logic [7:0] v);
    logic [2:0] idx;
    idx = 3'd0;
    for (int i = 0; i < 8; i++)
      if (v[i]) idx = 3'(i);
    return idx;
  endfunction

  function automatic logic parity(input logic [7:0] v);
    logic p;
    p = 1'b0;
    for (int i = 0; i < 8; i++) p ^= v[i];
    return p;
  endfunction

  assign ready_count = summary_en ? popcount8(ch_ready) : 4'd0;
  assign top_ready   = highest(ch_ready & ~ch_error);
  assign err_parity  = parity(ch_error);

  always_comb begin
    any_error    = |ch_error;
    single_ready = (popcount8(ch_ready) == 4'd1) & ~any_error;
  end
endmodule
