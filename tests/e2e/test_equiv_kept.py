"""`kerf equiv` never says "equivalent" with anything left uncompared.

Each case is a pair of versions of one invented module that tries to make
kerf equiv exit 0 wrongly: the two differ only inside code kerf keeps as
written (a block it cannot lower, a function body behind the same call, a
submodule behind the same instance, a macro, a parameter default, a
declared width, text the current defines leave out), or one version drives
an output the other leaves to kept code or to nothing. Controls are pairs
that really are equal (the kept code reformatted, reordered) and must be
proved.

Outside reference: Icarus Verilog simulates both versions on the same
vectors (all inputs, clock included, driven together; exhaustive where
small). A pair Icarus shows different must never get exit 0; a verdict
"different" must come with a counterexample that Icarus confirms on both
files; a control Icarus shows equal must be proved (exit 0). Each version is
also restructured, and Icarus Verilog checks the written file against its
source.
"""
import json
import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402
import test_equiv as TE  # noqa: E402  (Icarus confirmation of counterexamples)

HEAD = ("module unit (input logic clk, input logic [3:0] a, b, input logic [1:0] s, output logic [3:0] y, z,\n"
        "             output logic w);\n")
# The same restructurable output in every version, so that restructuring each version changes it.
TAIL = ("  assign w = (a[0] & b[0]) | (a[0] & b[1]) | (a[0] & s[0]) | (a[1] & b[0]) | (a[1] & b[1]) | (a[1] & s[0]);\n"
        "endmodule\n")

# name, body of A, body of B, allowed exit codes, what the pair tests
CASES = [
    ("variable_part_select",
     "  always_comb begin\n    y = a;\n    y[s +: 2] = 2'b00;\n  end\n  assign z = a & b;\n",
     "  always_comb begin\n    y = a;\n    y[s +: 2] = 2'b11;\n  end\n  assign z = a & b;\n",
     {1, 3}, "differ only inside a block kerf keeps (the case in the issue)"),
    ("function_body",
     "  function automatic logic [3:0] mix(input logic [3:0] p, q);\n    return p ^ q;\n  endfunction\n"
     "  always_ff @(posedge clk) y <= mix(a, b);\n  assign z = a | b;\n",
     "  function automatic logic [3:0] mix(input logic [3:0] p, q);\n    return p & q;\n  endfunction\n"
     "  always_ff @(posedge clk) y <= mix(a, b);\n  assign z = a | b;\n",
     {1, 3}, "the same kept call text, different function bodies"),
    ("macro_body",
     "`define NEXT(v) ((v) + 4'd1)\n  always_ff @(posedge clk) y <= `NEXT(a);\n  assign z = ~a;\n",
     "`define NEXT(v) ((v) + 4'd2)\n  always_ff @(posedge clk) y <= `NEXT(a);\n  assign z = ~a;\n",
     {1, 3}, "the same kept text, a different macro body"),
    ("parameter_default",
     "  localparam logic [3:0] STEP = 4'd1;\n  always_ff @(posedge clk) y <= a + STEP;\n  assign z = b;\n",
     "  localparam logic [3:0] STEP = 4'd3;\n  always_ff @(posedge clk) y <= a + STEP;\n  assign z = b;\n",
     {1, 3}, "the same kept text, a different constant behind a name"),
    ("declared_width",
     "  logic [1:0] t;\n  assign t = a[1:0];\n  always_ff @(posedge clk) y <= {2'b00, t} + 4'd1;\n  assign z = b;\n",
     "  logic [2:0] t;\n  assign t = a[2:0];\n  always_ff @(posedge clk) y <= {2'b00, t} + 4'd1;\n  assign z = b;\n",
     {1, 3}, "the same kept text reading a signal declared with another width"),
    ("enum_encoding",
     "  typedef enum logic [3:0] {IDLE = 4'd0, BUSY = 4'd5} st_t;\n  st_t st;\n"
     "  always_ff @(posedge clk) st <= (a == 4'd0) ? IDLE : BUSY;\n  assign y = st;\n  assign z = b;\n",
     "  typedef enum logic [3:0] {IDLE = 4'd0, BUSY = 4'd9} st_t;\n  st_t st;\n"
     "  always_ff @(posedge clk) st <= (a == 4'd0) ? IDLE : BUSY;\n  assign y = st;\n  assign z = b;\n",
     {1, 3}, "the same kept text, a different enum encoding"),
    ("kept_versus_lowered",
     "  always_comb begin\n    y = a;\n    y[s +: 2] = b[1:0];\n  end\n  assign z = a;\n",
     "  assign y = a ^ b;\n  assign z = a;\n",
     {1, 3}, "an output driven by kept code in one version and by logic in the other"),
    ("excluded_text",
     "`ifdef UNIT_ALT\n  assign y = a | b;\n`else\n  assign y = a & b;\n`endif\n  assign z = a;\n",
     "`ifdef UNIT_ALT\n  assign y = a ^ b;\n`else\n  assign y = a & b;\n`endif\n  assign z = a;\n",
     {3}, "differ only in text this build leaves out (the other build differs)"),
    ("undriven_output",
     "  assign y = a & b;\n  assign z = a | b;\n",
     "  assign y = a & b;\n",
     {1}, "one version leaves an output undriven"),
    ("logic_after_register",
     "  logic [3:0] q;\n  always_ff @(posedge clk) q <= a;\n  assign y = q & b;\n  assign z = a;\n",
     "  logic [3:0] q;\n  always_ff @(posedge clk) q <= a;\n  assign y = q | b;\n  assign z = a;\n",
     {1}, "identical registers, different logic after them: a counterexample through the register"),
    # controls: really equal
    ("reformatted_kept",
     "  always_comb begin\n    y = a;\n    y[s +: 2] = 2'b00;\n  end\n  assign z = a & b;\n",
     "  always_comb\n  begin   // the same block\n    y = a;   y[s+:2] = 2'b00;\n  end\n  assign z = b & a;\n",
     {0}, "the kept block reformatted, the logic rewritten"),
    ("reordered_kept",
     "  logic [3:0] q, r;\n  always_ff @(posedge clk) q <= a;\n  always_ff @(posedge clk) r <= b;\n"
     "  assign y = q ^ r;\n  assign z = q & r;\n",
     "  logic [3:0] q, r;\n  always_ff @(posedge clk) r <= b;\n  always_ff @(posedge clk) q <= a;\n"
     "  assign z = r & q;\n  assign y = r ^ q;\n",
     {0}, "the same kept statements in another order"),
]

SUB = {
    # submodule behind the same instance text: each version has its own definition
    "a": "module unit_cell (input logic [3:0] p, output logic [3:0] o);\n  assign o = p + 4'd1;\nendmodule\n",
    "b": "module unit_cell (input logic [3:0] p, output logic [3:0] o);\n  assign o = p - 4'd1;\nendmodule\n",
}
SUB_BODY = "  unit_cell u_cell (.p(a), .o(y));\n  assign z = b;\n"


def icarus_differs(work, fa, fb, defines=()):
    """Icarus Verilog: do the two files differ on some output for some vector (clock driven as an input)?"""
    ra = os.path.join(work, "ia.sv")
    rb = os.path.join(work, "ib.sv")
    open(ra, "w").write(re.sub(r"\bunit\b", "unit_a", re.sub(r"\bunit_cell\b", "unit_cell_a", open(fa).read())))
    open(rb, "w").write(re.sub(r"\bunit\b", "unit_b", re.sub(r"\bunit_cell\b", "unit_cell_b", open(fb).read())))
    tb = ["module tb;", "  logic clk; logic [3:0] a, b; logic [1:0] s; wire [3:0] ya, za, yb, zb; wire wa, wb;",
          "  unit_a ua (.clk(clk), .a(a), .b(b), .s(s), .y(ya), .z(za), .w(wa));",
          "  unit_b ub (.clk(clk), .a(a), .b(b), .s(s), .y(yb), .z(zb), .w(wb));",
          "  integer k, diffs;",
          "  initial begin",
          "    diffs = 0; clk = 0;",
          "    for (k = 0; k < 2048; k = k + 1) begin",
          "      {s, b, a} = k[9:0]; clk = k[10];",
          "      #1; if (ya !== yb || za !== zb || wa !== wb) diffs = diffs + 1;",
          "    end",
          "    $display(\"DIFFS %0d\", diffs);",
          "    $finish;",
          "  end",
          "endmodule"]
    tp = os.path.join(work, "tb.sv")
    open(tp, "w").write("\n".join(tb) + "\n")
    sim = os.path.join(work, "tb.vvp")
    c = K.run(["iverilog", "-g2012", "-o", sim] + [f"-D{d}" for d in defines] + [ra, rb, tp])
    if c.returncode != 0:
        raise RuntimeError("iverilog: " + c.stderr)
    out = K.run(["vvp", "-n", sim]).stdout
    m = re.search(r"DIFFS (\d+)", out)
    return int(m.group(1)) > 0


def equiv(a, fa, fb, extra=()):
    r = K.run([a.kerf, "equiv", fa, fb, "--json"] + list(extra))
    try:
        return r.returncode, json.loads(r.stdout), r.stderr
    except ValueError:
        return r.returncode, {}, r.stderr


def run_case(t, name, body_a, body_b, allowed, what):
    a, res, work = t.args, t.res, t.work
    fa = os.path.join(work, "a.sv")
    fb = os.path.join(work, "b.sv")
    sub_a = SUB["a"] if name == "submodule" else ""
    sub_b = SUB["b"] if name == "submodule" else ""
    if body_a.startswith("`define"):
        first_a, rest_a = body_a.split("\n", 1)
        first_b, rest_b = body_b.split("\n", 1)
        open(fa, "w").write(first_a + "\n" + HEAD + rest_a + TAIL + sub_a)
        open(fb, "w").write(first_b + "\n" + HEAD + rest_b + TAIL + sub_b)
    else:
        open(fa, "w").write(HEAD + body_a + TAIL + sub_a)
        open(fb, "w").write(HEAD + body_b + TAIL + sub_b)
    code, j, err = equiv(a, fa, fb, ["--top", "unit"])
    verdict = j.get("verdict")
    differs = icarus_differs(work, fa, fb)
    if name == "excluded_text":
        differs = differs or icarus_differs(work, fa, fb, ["UNIT_ALT"])
    res.check(code in allowed, f"{name} ({what}): exit {code} in {sorted(allowed)}: {j or err[-800:]}")
    res.check(not (code == 0 and differs),
              f"{name}: Icarus Verilog shows the versions differ, so exit 0 would be wrong")
    res.check(code != 0 or not differs, f"{name}: proved only what Icarus Verilog agrees with")
    if code == 3:
        res.check(bool(j.get("uncompared_statements")) or bool(j.get("one_sided_outputs")),
                  f"{name}: undecided names what was not compared: {j}")
        for u in j.get("uncompared_statements", []):
            res.check(u["line"] > 0 and u["file"] in (fa, fb), f"{name}: located at file:line: {u}")
    if code == 1:
        res.check(differs, f"{name}: Icarus Verilog confirms the versions differ")
        if "counterexample" in j:
            ok, log = TE.confirm(a.root, [fa], "unit", fa, fb, j["counterexample"], work)
            res.check(ok, f"{name}: Icarus Verilog confirms kerf's counterexample: {log}")
    if allowed == {0}:
        res.check(not differs, f"{name}: control pair, Icarus Verilog shows no difference")
    # Each version restructured: the written file behaves like its source in Icarus Verilog
    # (outputs compared with !==, so x and z count) for every define set the case uses.
    builds = [[], ["UNIT_ALT"]] if name == "excluded_text" else [[]]
    for side, src in (("first", fa), ("second", fb)):
        sub = os.path.join(work, "rs_" + side)
        os.mkdir(sub)
        out = os.path.join(sub, "unit.sv")
        r = K.run([a.kerf, "restructure", src, "--top", "unit", "-o", out, "--min-gain", "0"])
        if not res.check(r.returncode == 0, f"{name}: restructure of the {side} version: {r.stderr[-800:]}"):
            continue
        res.check(open(out).read() != open(src).read(), f"{name}: the {side} version is restructured (w at least)")
        for build in builds:
            res.check(not icarus_differs(sub, src, out, build),
                      f"{name}: the {side} version restructured simulates like its source in Icarus Verilog "
                      f"(defines: {' '.join(build) or 'none'})")


S = K.Suite(__doc__)
for _c in CASES + [("submodule", SUB_BODY, SUB_BODY, {3}, "the same instance text, different submodules")]:
    S.add(_c[0], lambda t, c=_c: run_case(t, *c), needs=("iverilog",))

if __name__ == "__main__":
    S.main()
