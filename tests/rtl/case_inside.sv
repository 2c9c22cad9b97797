// kerf-case: region decoder of the invented peripheral address map written with `case ...
// kerf-case: inside` and value ranges. Icarus 11 does not read `case inside`, so this case is
// kerf-case: simulated two-valued by Verilator.
// kerf-with: include/periph_pkg.sv
// kerf-simulator: verilator
module case_inside
  import periph_pkg::*;
(
  input  logic [15:0] addr,
  input  logic        valid,
  output slave_e      slave,
  output logic        cacheable,
  output logic        privileged
);
  always_comb begin
    slave = SLV_NONE;
    if (valid) begin
      case (addr[15:8]) inside
        [8'h10:8'h10]: slave = SLV_TIMER;
        8'h11:         slave = SLV_UART;
        8'h12:         slave = SLV_GPIO;
        8'h13:         slave = SLV_SPI;
        [8'h80:8'hBF]: slave = SLV_RAM;
        default:       slave = SLV_NONE;
      endcase
    end
  end

  always_comb begin
    case (addr) inside
      [16'h8000:16'hBFFF]: cacheable = 1'b1;
      default:             cacheable = 1'b0;
    endcase
    case (addr[15:12]) inside
      4'h0, 4'h1, [4'hC:4'hF]: privileged = 1'b1;
      default:                 privileged = 1'b0;
    endcase
  end
endmodule
