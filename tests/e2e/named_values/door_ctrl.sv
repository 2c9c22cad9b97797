// Door controller of an invented lift car ("Kestrel lift"): the state is an enum, the
// next-state and output logic compare it with the enum's names only.
module door_ctrl (
    input  logic clk,
    input  logic rst_n,
    input  logic open_req,
    input  logic close_req,
    input  logic at_limit,
    input  logic obstruct,
    output logic motor_open,
    output logic motor_close,
    output logic door_busy,
    output logic chime
);
  typedef enum logic [1:0] {D_SHUT, D_OPENING, D_AJAR, D_CLOSING} door_st_t;
  door_st_t st_q, st_d;

  always_ff @(posedge clk or negedge rst_n) begin
    if (!rst_n) st_q <= D_SHUT;
    else        st_q <= st_d;
  end

  always_comb begin
    st_d = st_q;
    case (st_q)
      D_SHUT:    if (open_req) st_d = D_OPENING;
      D_OPENING: if (at_limit) st_d = D_AJAR;
      D_AJAR:    if (close_req && !obstruct) st_d = D_CLOSING;
      D_CLOSING: if (obstruct || open_req) st_d = D_OPENING;
                 else if (at_limit) st_d = D_SHUT;
      default:   st_d = D_SHUT;
    endcase
  end

  assign motor_open  = (st_q == D_OPENING) && !at_limit;
  assign motor_close = (st_q == D_CLOSING) && !obstruct && !open_req;
  assign door_busy   = (st_q == D_OPENING) || (st_q == D_CLOSING);
  assign chime       = ((st_q == D_OPENING) && at_limit) || ((st_q == D_CLOSING) && at_limit && !obstruct);
endmodule
