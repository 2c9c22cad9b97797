// kerf-case: barrel-free byte-steering of an invented load unit: shifts by constants and by
// kerf-case: variable amounts, concatenation and replication for sign/zero extension, reductions.
module shift_select (
  input  logic [31:0] word,
  input  logic [1:0]  offset,
  input  logic [1:0]  size,
  input  logic        sign_ext,
  output logic [31:0] loaded,
  output logic        misaligned,
  output logic        all_ones,
  output logic [7:0]  flags
);
  logic [31:0] shifted;
  assign shifted = word >> {offset, 3'b000};

  always_comb begin
    case (size)
      2'd0: loaded = {{24{sign_ext & shifted[7]}}, shifted[7:0]};
      2'd1: loaded = {{16{sign_ext & shifted[15]}}, shifted[15:0]};
      default: loaded = shifted;
    endcase
  end

  assign misaligned = (size == 2'd1 && offset[0]) || (size[1] && offset != 2'd0);
  assign all_ones   = &word[15:0];
  assign flags      = {word[31:28] << 1, 1'b0, ^word, |word[7:0], ~|word};
endmodule
