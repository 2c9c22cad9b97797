// Invented scenario: a DMA descriptor register whose fields are written by
// separate sequential blocks, and a lane select built by a configurable
// generate branch. Kept code drives only the bits it writes.
typedef struct packed {
  logic [3:0] tag;     // bits 12:9
  logic [7:0] len;     // bits 8:1
  logic       valid;   // bit 0
} desc_t;

module dma_regs #(parameter bit WIDE = 0) (
  input  logic       clk,
  input  logic [7:0] wdata,
  input  logic       we_len,
  input  logic       we_tag,
  output desc_t      desc,
  output logic [3:0] lane,
  output logic [7:0] mirror
);
  logic [3:0] spare;   // named only by the inactive branch
  always_ff @(posedge clk) if (we_len) desc.len <= wdata;
  always_ff @(posedge clk) if (we_tag) desc.tag <= wdata[3:0];
  always_ff @(posedge clk) desc.valid <= we_len | we_tag;
  if (WIDE) begin : g_wide
    assign lane = wdata[7:4];
    assign spare = wdata[3:0];
  end else begin : g_narrow
    assign lane[1:0] = wdata[1:0];
  end
  assign lane[3:2] = wdata[3:2] ^ desc.tag[1:0];
  assign mirror = desc.len ^ {4{desc.valid, we_len}};
endmodule
