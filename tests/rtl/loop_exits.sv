// kerf-case: request scanner of an invented DMA arbiter: loops left early in every way open cores
// kerf-case: write them — `break` in an always_comb loop, `continue` skipping masked channels,
// kerf-case: `return` from inside nested loops of a function, and a `break` of an inner loop that
// kerf-case: must not end the outer one (IEEE 1800 12.8, 13.4.1). Icarus Verilog 11 does not read
// kerf-case: `break`: simulated by Verilator.
// kerf-simulator: verilator
module loop_exits (
  input  logic [7:0] req,
  input  logic [7:0] mask,
  input  logic [3:0] prio,
  output logic [2:0] first_req,
  output logic       found,
  output logic [3:0] unmasked,
  output logic [2:0] pair_at,
  output logic [3:0] rows_hit
);
  // First pair of adjacent requests, searched row by row (nested loops, early return).
  function automatic logic [2:0] first_pair(input logic [7:0] r);
    for (int row = 0; row < 2; row++)
      for (int col = 0; col < 3; col++)
        if (r[row*4 + col] && r[row*4 + col + 1]) return 3'(row*4 + col);
    return 3'd7;
  endfunction

  always_comb begin
    first_req = 3'd0;
    found = 1'b0;
    for (int i = 0; i < 8; i++) begin
      if (req[i]) begin
        first_req = 3'(i);
        found = 1'b1;
        break;
      end
    end
  end

  always_comb begin
    unmasked = 4'd0;
    for (int i = 0; i < 8; i++) begin
      if (mask[i]) continue;
      if (req[i] && 4'(i) >= prio) unmasked = unmasked + 4'd1;
    end
  end

  assign pair_at = first_pair(req);

  // Per row of four requests: is any set before the first masked one? (inner break only)
  always_comb begin
    rows_hit = 4'd0;
    for (int row = 0; row < 2; row++) begin
      for (int col = 0; col < 4; col++) begin
        if (mask[row*4 + col]) break;
        if (req[row*4 + col]) rows_hit[row] = 1'b1;
      end
      rows_hit[row + 2] = req[row*4 + 3];
    end
  end
endmodule
