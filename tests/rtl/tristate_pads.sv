// kerf-case: GPIO pad ring of an invented peripheral: per-pin output enables, an open-drain
// kerf-case: I2C-style data line and a shared debug bus released with 'z; the tri-state
// kerf-case: statements must be kept as written, the select logic around them may change.
module tristate_pads (
  input  logic [3:0] dir_q,      // 1 = pin is an output
  input  logic [3:0] dout_q,
  input  logic [1:0] mode_q,     // 0 push-pull, 1 open-drain, 2 test, 3 off
  input  logic       sda_low,
  input  logic       dbg_en,
  input  logic [3:0] dbg_data,
  output tri   [3:0] pad,
  output tri         sda,
  output tri   [3:0] dbg_bus,
  output logic [3:0] oe_mirror
);
  logic [3:0] oe;
  logic [3:0] drive;

  always_comb begin
    oe    = 4'b0000;
    drive = dout_q;
    case (mode_q)
      2'd0: oe = dir_q;
      2'd1: begin
        oe    = dir_q & ~dout_q;
        drive = 4'b0000;
      end
      2'd2: begin
        oe    = 4'b1111;
        drive = {dout_q[0], dout_q[1], dout_q[2], dout_q[3]};
      end
      default: oe = 4'b0000;
    endcase
  end

  for (genvar i = 0; i < 4; i++) begin : g_pad
    assign pad[i] = oe[i] ? drive[i] : 1'bz;
  end

  assign sda       = sda_low ? 1'b0 : 1'bz;
  assign dbg_bus   = (dbg_en && mode_q == 2'd2) ? dbg_data : 4'bzzzz;
  assign oe_mirror = oe | {4{mode_q == 2'd2}};
endmodule
