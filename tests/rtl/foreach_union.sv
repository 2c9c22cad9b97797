// kerf-case: command unpacker of an invented DMA engine: a packed union gives two views of one
// kerf-case: command word, `foreach` walks a packed array of per-channel enables (IEEE 1800
// kerf-case: 7.3.1, 12.7.3), and a function returns a packed struct.
// kerf-case: Icarus Verilog 11 does not elaborate the packed union and foreach: simulated by Verilator.
// kerf-simulator: verilator
module foreach_union (
  input  logic [15:0]      cmd_word,
  input  logic [3:0][1:0]  ch_cfg,
  input  logic             go,
  output logic [3:0]       ch_start,
  output logic [7:0]       len,
  output logic             is_copy
);
  typedef struct packed {
    logic [3:0] op;
    logic [3:0] chan;
    logic [7:0] len;
  } xfer_t;
  typedef struct packed {
    logic [7:0] hi;
    logic [7:0] lo;
  } bytes_t;
  typedef union packed {
    xfer_t  xfer;
    bytes_t raw;
  } cmd_u;

  typedef struct packed {
    logic copy;
    logic fill;
  } kind_t;

  function automatic kind_t decode_op(input logic [3:0] op);
    kind_t k;
    k.copy = op == 4'h1 || op == 4'h3;
    k.fill = op == 4'h2;
    return k;
  endfunction

  cmd_u cmd;
  kind_t kind;
  assign cmd  = cmd_word;
  assign kind = decode_op(cmd.xfer.op);
  assign len  = cmd.raw.lo;
  assign is_copy = kind.copy;

  always_comb begin
    ch_start = '0;
    foreach (ch_cfg[i])
      ch_start[i] = go & ch_cfg[i][0] & (kind.copy | kind.fill & ch_cfg[i][1]) & (cmd.xfer.chan[i] | cmd.xfer.chan == 4'hf);
  end
endmodule
