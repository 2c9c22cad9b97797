// kerf-case: Request arbiter of an invented interrupt router, in the arithmetic style hardware
// kerf-case: designers use for priority picks (common trade practice): the lowest set request by
// kerf-case: `req & -req` and by `req & ~(req - 1)`, a masked round-robin pick that falls back to
// kerf-case: the unmasked one, a thermometer mask of the bits above the last grant, and
// kerf-case: one-hot checks with $onehot0 and a population limit by $countones.
// kerf-params: N=5
// kerf-pin: N=8 other N=5
module grant_lowest_set #(
  parameter int N = 8
) (
  input  logic [N-1:0] req,
  input  logic [N-1:0] last_grant,   // one-hot, or zero after reset
  output logic [N-1:0] grant,
  output logic [N-1:0] lowest,
  output logic         grant_ok,
  output logic         busy_many
);
  logic [N-1:0] above_last, masked, masked_low, plain_low;

  // Bits strictly above the last grant: ~((last_grant << 1) - 1) with the zero case all ones.
  assign above_last = (last_grant == '0) ? '1 : ~((last_grant << 1) - 1'b1);
  assign masked     = req & above_last;
  assign masked_low = masked & (~masked + 1'b1);
  assign plain_low  = req & -req;
  assign lowest     = req & ~(req - 1'b1);

  always_comb begin
    if (|masked) grant = masked_low;
    else         grant = plain_low;
  end

  assign grant_ok  = $onehot0(grant) && ((grant & ~req) == '0);
  assign busy_many = $countones(req) > 3;
endmodule
