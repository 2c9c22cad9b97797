// kerf-case: leading-zero count and priority index through automatic functions with constant
// kerf-case: loops (a common style in open cores' normalisers and arbiters).
module lzc_fn (
  input  logic [11:0] v,
  input  logic [3:0]  req,
  output logic [3:0]  lz,
  output logic        all_zero,
  output logic [1:0]  grant_idx
);
  function automatic logic [3:0] count_lz(input logic [11:0] x);
    logic [3:0] n;
    logic done;
    n = 4'd0; done = 1'b0;
    for (int i = 11; i >= 0; i--) begin
      if (!done && x[i]) done = 1'b1;
      else if (!done) n = n + 4'd1;
    end
    return n;
  endfunction
  function automatic logic [1:0] first_one(input logic [3:0] r);
    for (int i = 0; i < 4; i++) if (r[i]) return i[1:0];
    return 2'd0;
  endfunction
  assign lz = count_lz(v);
  assign all_zero = ~|v;
  assign grant_idx = first_one(req);
endmodule
