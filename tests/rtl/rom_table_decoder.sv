// kerf-case: Microcode ROM of an invented stack machine, written the way table generators emit it:
// kerf-case: case items whose bodies only assign constants (the reader's compact case table).
// kerf-case: Items with several labels, items that leave a field at its earlier value, a field
// kerf-case: written through a part select and a bit select, an item assigning a field twice,
// kerf-case: an x don't-care value, a casez table with wildcards and one without a default,
// kerf-case: a table inside a function and one inside a loop writing a block-local variable.
// kerf-case: Icarus compares every output where the original is not x.
module rom_table_decoder (
  input  logic [4:0] op,
  input  logic [3:0] flags,
  input  logic [2:0] page,
  output logic [7:0] ctl,
  output logic [1:0] src_sel,
  output logic       push,
  output logic [2:0] cls,
  output logic [3:0] bank,
  output logic [5:0] lat,
  output logic [3:0] hot
);
  function automatic logic [2:0] cycles(input logic [1:0] kind);
    case (kind)
      2'd0: cycles = 3'd1;
      2'd1: cycles = 3'd2;
      2'd2: cycles = 3'd4;
      default: cycles = 3'd7;
    endcase
  endfunction

  always_comb begin
    ctl = 8'h00;
    src_sel = 2'd3;
    push = 1'b0;
    unique case (op)
      5'd0:        begin ctl = 8'h11; src_sel = 2'd0; push = 1'b1; end
      5'd1, 5'd9:  begin ctl = 8'h22; push = 1'b1; end
      5'd2:        ctl[7:4] = 4'ha;
      5'd3:        begin ctl[0] = 1'b1; ctl[7:4] = 4'h5; end
      5'd4:        begin src_sel = 2'd1; src_sel = 2'd2; end
      5'd5, 5'd17, 5'd30: begin ctl = 8'h3c; src_sel = 2'd0; end
      5'd6:        ;
      5'd7:        push = 1'b1;
      5'd12:       src_sel = 2'bxx;
      default:     ctl = 8'hff;
    endcase
  end

  always_comb begin
    cls = 3'd0;
    casez (flags)
      4'b1???: cls = 3'd4;
      4'b01??: cls = 3'd3;
      4'b001?: cls = 3'd2;
      4'b0001: cls = 3'd1;
    endcase
  end

  always_comb begin
    bank = 4'h0;
    case (page)
      3'd0, 3'd1: bank = 4'h1;
      3'd2:       bank = 4'h2;
      3'd5:       bank = 4'h8;
    endcase
  end

  always_comb begin
    lat = {cycles(op[1:0]), cycles(op[3:2])};
  end

  always_comb begin
    logic [1:0] grp;
    hot = 4'h0;
    for (int i = 0; i < 2; i++) begin
      grp = 2'd0;
      case (flags[2*i +: 2])
        2'b01: grp = 2'd1;
        2'b10: grp = 2'd2;
        2'b11: grp = 2'd3;
      endcase
      hot[2*i +: 2] = grp;
    end
  end
endmodule
