// kerf-case: minimal regression (F31): a sensor-threshold encoder whose alarm output reads the
// kerf-case: encoded level and is a don't-care ('x default) unless the op is 4'hf. The node
// kerf-case: "op == 0" feeds both code (always cared for) and alarm; when kerf's don't-care
// kerf-case: search proved by SAT that dropping op[3] from it was safe, the condition of alarm's
// kerf-case: don't-care landed inside another clause and forced op == 4'hf, so code changed for
// kerf-case: op 4'h8 with sel 4'hd and level 5'h1f. The limits make the search use SAT (not
// kerf-case: every pattern) on so few inputs that Icarus Verilog checks all of them (four-valued).
// kerf-flags: -
// kerf-flags: --limit dc-exhaustive-inputs=8 --limit dc-simulation-words=1
module min_dc_care_clause (
  input  logic [3:0] op,
  input  logic [3:0] sel,
  input  logic [4:0] level,
  input  logic       en,
  output logic [5:0] code,
  output logic       alarm
);
  always_comb begin
    code = 6'd0;
    if (sel == 4'hd) begin
      unique case (op)
        4'h0:    code = 6'h28;
        default: if (level != 5'h1f) code = {{2{op[3]}}, op};
      endcase
    end
  end
  always_comb begin
    case (op)
      4'hf:    alarm = ~(code[5] & en);
      default: alarm = 1'bx;
    endcase
  end
endmodule
