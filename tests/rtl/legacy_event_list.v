// kerf-case: interrupt vector select of an invented controller in Verilog-2001 style, with
// kerf-case: explicit event lists. `always @(act or en)` names every signal its block reads,
// kerf-case: so it is combinational (IEEE 1364-2005 9.7.5) and restructured, written back with
// kerf-case: @(*); `always @(en)` leaves out `irq`, so a simulator holds `late` when only irq
// kerf-case: changes: it must stay as written (Icarus sees the difference if it does not).
module legacy_event_list (irq, mask, en, vec, pend, any, late);
  input [3:0] irq;
  input [3:0] mask;
  input en;
  output [1:0] vec;
  output pend;
  output any;
  output late;
  reg [1:0] vec;
  reg pend;
  reg late;
  wire [3:0] act;
  assign act = irq & ~mask;
  assign any = en & (act[0] | act[1] | act[2] | act[3]);
  always @(act or en) begin
    pend = 1'b0;
    vec = 2'b00;
    if (en) begin
      if (act[0]) begin vec = 2'd0; pend = 1'b1; end
      else if (act[1]) begin vec = 2'd1; pend = 1'b1; end
      else if (act[2]) begin vec = 2'd2; pend = 1'b1; end
      else if (act[3]) begin vec = 2'd3; pend = 1'b1; end
    end
  end
  always @(en)
    late = en & (irq[0] & irq[1] | irq[0] & irq[2]);
endmodule
