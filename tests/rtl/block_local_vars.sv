// kerf-case: Command classifier of an invented storage controller, in the style of hand-written
// kerf-case: control code with scratch variables declared inside always_comb blocks: an unnamed
// kerf-case: block (its variables have no name outside it: restructured), a named block whose
// kerf-case: variables testbenches can reach by name (`p_route.grp`: kept as written, F324), and
// kerf-case: a named block without declarations (restructured, its label kept).
module block_local_vars (
  input  logic [7:0] opcode,
  input  logic       busy,
  input  logic       wr_prot,
  output logic       is_read,
  output logic       is_write,
  output logic       is_admin,
  output logic       accept,
  output logic [1:0] queue,
  output logic       is_vendor,
  output logic       is_flush
);
  always_comb begin
    logic [3:0] grp;
    logic       rw;
    grp      = opcode[7:4];
    rw       = opcode[0];
    is_read  = (grp == 4'h2) && !rw;
    is_write = (grp == 4'h2) && rw;
    is_admin = (grp == 4'hC) || (grp == 4'hD) || (grp == 4'hE);
  end

  always_comb begin : p_route
    logic [3:0] grp;
    logic       urgent;
    grp    = opcode[7:4];
    urgent = opcode[3];
    accept = !busy && !(wr_prot && grp == 4'h2 && opcode[0]);
    if (grp >= 4'hC)   queue = 2'd3;
    else if (urgent)   queue = 2'd1;
    else if (grp == 0) queue = 2'd0;
    else               queue = 2'd2;
  end

  always_comb begin : p_misc
    is_vendor = (opcode[7:6] == 2'b11) && (opcode[5] || opcode[4]) && !(opcode[5] && opcode[4]);
    is_flush  = (opcode[7:6] == 2'b11) && (opcode[5] || opcode[4]) && opcode[0];
  end : p_misc
endmodule
