// `include and -D handling; the include directory is given with -I.
module includes (input logic [1:0] st, output logic ready);
`include "flags.svh"
endmodule
