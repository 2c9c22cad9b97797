// kerf-case: register decode of an invented watchdog peripheral whose bus side is an interface
// kerf-case: port without a modport (`wdt_bus_if bus`: every member reachable, direction by use).
// kerf-case: Statements that name a member (bus.addr, bus.rdy) are kept as written ("uses a member
// kerf-case: of an interface port"); the decode reading the local copies is restructured. Icarus
// kerf-case: Verilog 11 does not read interface ports: simulated by Verilator (two-valued), the
// kerf-case: interface instantiated per side, a member the module assigns read as an output.
// kerf-simulator: verilator
// kerf-top: wdt_regsel
interface wdt_bus_if;
  logic [5:0] addr;
  logic       cs;
  logic       we;
  logic       rdy;
  logic [1:0] key;
endinterface

module wdt_regsel (
  wdt_bus_if bus,
  input  logic       wdt_armed,
  input  logic       wdt_lock,
  output logic       sel_load,
  output logic       sel_ctrl,
  output logic       wr_load,
  output logic       wr_ctrl,
  output logic       kick
);
  wire [5:0] a   = bus.addr;
  wire       cs  = bus.cs;
  wire       we  = bus.we;
  wire [1:0] key = bus.key;

  assign bus.rdy = bus.cs & ~wdt_lock;

  assign sel_load = (cs & a[5:3] == 3'b010 & a[2:1] == 2'b00) | (cs & a[5:3] == 3'b010 & a[2:1] == 2'b01);
  assign sel_ctrl = cs & a[5:3] == 3'b010 & a[2:1] == 2'b10;
  assign wr_load  = (cs & we & ~wdt_lock & a[5:3] == 3'b010 & a[2:1] == 2'b00)
                  | (cs & we & ~wdt_lock & a[5:3] == 3'b010 & a[2:1] == 2'b01);
  assign wr_ctrl  = cs & we & ~wdt_lock & a[5:3] == 3'b010 & a[2:1] == 2'b10;
  assign kick     = (wdt_armed & key == 2'b10 & cs & we) | (wdt_armed & key == 2'b10 & cs & we & a[0]);
endmodule
