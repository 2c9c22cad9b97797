// kerf-case: grant encoder of an invented interrupt controller: `$clog2`-sized index port of a
// kerf-case: parameterised source count, a one-hot-to-index loop that ORs positions in, `'0` fills,
// kerf-case: `$bits` in a width and a `$onehot0` sanity flag (IEEE 1800 20.9). NSRC is a module
// kerf-case: parameter, so by default the logic is kept; the pinned variant restructures it for 8.
// kerf-params: NSRC=4
// kerf-pin: NSRC=8 other NSRC=4
module clog2_onehot_enc #(
  parameter int NSRC = 8
) (
  input  logic [NSRC-1:0]         gnt,
  input  logic                    en,
  output logic [$clog2(NSRC)-1:0] idx,
  output logic                    valid,
  output logic                    multi
);
  localparam int IW = $clog2(NSRC);
  always_comb begin
    idx = '0;
    for (int i = 0; i < NSRC; i++)
      if (gnt[i]) idx = idx | IW'(i);
  end
  assign valid = en & (|gnt);
  assign multi = en & !$onehot0(gnt) & ($bits(gnt) > 1);
endmodule
