// Invented scenario: a request router with a typed request.
package router_pkg;
  localparam int PORTS = 6;
  typedef enum logic [2:0] {DST_NONE = 3'd0, DST_MEM = 3'd1, DST_IO = 3'd4} dst_t;
  typedef struct packed {
    dst_t       dst;     // bits 18:16
    logic [7:0] addr;    // bits 15:8
    logic [7:0] data;    // bits 7:0
  } req_t;
endpackage

module router import router_pkg::*; #(
  parameter int DEPTH = 12,
  localparam int AW = $clog2(DEPTH)
) (
  input  req_t             req,
  input  logic [3:0][1:0]  lanes,
  input  logic [0:3]       asc,
  input  logic [2:0]       pick,
  output req_t             fwd,
  output logic [AW-1:0]    slot,
  output logic             to_io,
  output logic [1:0]       lane2,
  output logic [3:0]       window,
  output logic             first
);
  assign to_io  = req.dst == DST_IO;
  assign slot   = req.addr[AW-1:0] + AW;
  assign lane2  = lanes[2];
  assign window = req.data[pick +: 4];
  assign first  = asc[0] ^ lanes[1][0];
  always_comb begin
    fwd = req;
    fwd.data[3] = 1'b0;
    fwd.dst = (req.addr > PORTS) ? DST_NONE : req.dst;
  end
endmodule
