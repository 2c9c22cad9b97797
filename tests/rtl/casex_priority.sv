// kerf-case: interrupt priority encoder of an invented timer/UART subsystem using casex with
// kerf-case: x don't-care bits in the items, plus a casex whose item has a z bit.
module casex_priority (
  input  logic [7:0] irq_pending,
  input  logic [7:0] irq_mask,
  input  logic [3:0] cause_hint,
  output logic [2:0] irq_id,
  output logic       irq_valid,
  output logic [1:0] cause_class
);
  logic [7:0] active;
  assign active = irq_pending & ~irq_mask;

  always_comb begin
    irq_valid = 1'b1;
    casex (active)
      8'b1xxxxxxx: irq_id = 3'd7;
      8'b01xxxxxx: irq_id = 3'd6;
      8'b001xxxxx: irq_id = 3'd5;
      8'b0001xxxx: irq_id = 3'd4;
      8'b00001xxx: irq_id = 3'd3;
      8'b000001xx: irq_id = 3'd2;
      8'b0000001x: irq_id = 3'd1;
      8'b00000001: irq_id = 3'd0;
      default: begin irq_id = 3'd0; irq_valid = 1'b0; end
    endcase
  end

  always_comb begin
    casex (cause_hint)
      4'b1z0x: cause_class = 2'd3;
      4'b0x1x: cause_class = 2'd2;
      4'bx001: cause_class = 2'd1;
      default: cause_class = 2'd0;
    endcase
  end
endmodule
