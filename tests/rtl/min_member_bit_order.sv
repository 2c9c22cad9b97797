// kerf-case: minimal regression (F81): a block assigns one bit of a struct member (and of a 2-D
// kerf-case: packed array element) and then reads it to compute another bit of the same member.
// kerf-case: Reading `st.f2[1]` must read only that bit, not the whole member, whose other bits
// kerf-case: the block assigns later (kerf refused this valid code as a loop or latch, and failed
// kerf-case: on its own rewrite when it wrote such a block bit by bit).
// kerf-with: include/member_order_pkg.sv
module min_member_bit_order
  import member_order_pkg::*;
(
  input  logic [3:0]      a,
  input  logic [7:0]      b,
  output st_t             st,
  output logic [1:0][3:0] m,
  output logic            any_o
);
  always_comb begin
    st.f2[1] = a[1];
    st.f2[0] = st.f2[1] ^ a[0];
    st.f2[3:2] = a[3:2] & b[1:0];
    st.f1 = {st.f2[3], 2'b01} | b[4:2];
    st.f0 = (a[1] & a[2]) | (a[1] & b[7]) ? 2'd1 : 2'd2;
  end
  always_comb begin
    m[1][2] = b[6];
    m[0] = {m[1][2], a[2:0] ^ b[2:0]};
    m[1][3] = (m[0][0] & m[0][3]) | (m[0][0] & b[5]);
    m[1][1:0] = {m[0][1], m[1][2] | m[1][3]};
  end
  assign any_o = (a[1] & a[2]) | (a[1] & b[7]) | |m;
endmodule
