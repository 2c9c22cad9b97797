// kerf-case: ALU-control decoder of an invented 8-bit microcontroller: unused operation codes
// kerf-case: assign 'x (a don't-care in the synthesis reading of IEEE 1364.1/1800); with
// kerf-case: --keep-x the statement must stay as written and match the original exactly.
// kerf-flags: -
// kerf-flags: --keep-x
module x_default_case (
  input  logic [3:0] opcode,
  input  logic       carry_in,
  output logic [2:0] alu_sel,
  output logic       use_carry,
  output logic       write_acc,
  output logic       write_flags
);
  always_comb begin
    write_acc   = 1'b1;
    write_flags = 1'b1;
    case (opcode)
      4'h0: begin alu_sel = 3'd0; use_carry = 1'b0; end            // add
      4'h1: begin alu_sel = 3'd0; use_carry = carry_in; end        // add with carry
      4'h2: begin alu_sel = 3'd1; use_carry = 1'b0; end            // sub
      4'h3: begin alu_sel = 3'd1; use_carry = carry_in; end        // sub with borrow
      4'h4: begin alu_sel = 3'd2; use_carry = 1'b0; end            // and
      4'h5: begin alu_sel = 3'd3; use_carry = 1'b0; end            // or
      4'h6: begin alu_sel = 3'd4; use_carry = 1'b0; end            // xor
      4'h7: begin alu_sel = 3'd5; use_carry = 1'b0; write_flags = 1'b0; end  // move
      4'h8: begin alu_sel = 3'd1; use_carry = 1'b0; write_acc = 1'b0; end    // compare
      4'h9: begin alu_sel = 3'd2; use_carry = 1'b0; write_acc = 1'b0; end    // test
      default: begin
        alu_sel     = 'x;
        use_carry   = 'x;
        write_acc   = 1'b0;
        write_flags = 1'b0;
      end
    endcase
  end
endmodule
