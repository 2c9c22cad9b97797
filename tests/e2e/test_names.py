"""Names in the written file that come from the source's own names (issue 10, "Names").

Outside references named beside the checks:
- Icarus Verilog (simulator): every rewrite checked here simulates like its input, and every wire
  whose name states a comparison with a named constant is compared with that comparison;
- the RISC-V privileged architecture (open standard) for the CSR addresses of
  tests/rtl/rv_csr_decode.sv.
The checks are properties (a name the source used appears where it used it, no raw position where
it used a name, a name tells the truth), never today's exact text.
"""
import os
import re
import sys

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402
import outside_check as O  # noqa: E402

S = K.Suite(__doc__)

ONEHOT = os.path.join("tests", "rtl", "onehot_fsm_reverse_case.sv")
ONEHOT_NAMES = ("IDLE", "LOAD", "RUN", "DRAIN", "FAULT")


def _restructure_simulated(t, files, top, out, *extra, simulator="icarus"):
    """Restructure `files` (the module in the last) into `out`; its text when kerf proved it and
    Icarus Verilog (or Verilator, `simulator="verilator"`, for what Icarus 11 does not read)
    simulates it like the input (random vectors; bits where the original is x are not compared:
    the source's x defaults are don't-cares), else None."""
    r = K.run([t.kerf, "restructure", *files, "--top", top, "-o", out, *extra])
    if not t.res.check(r.returncode == 0 and "proved equivalent" in r.stderr,
                       f"{top}: restructured and proved: {r.stderr[-800:]}"):
        return None
    sim = os.path.join(t.work, "sim_" + os.path.basename(out))
    os.mkdir(sim)
    plist, _ = O.signals(files, top)
    ref = os.path.join(sim, "ref.sv")
    new = os.path.join(sim, "new.sv")
    fix = O.always_comb_as_always_star   # as the corpus driver does for Icarus 11
    open(ref, "w").write(fix(O.renamed(open(files[-1]).read(), top, top + "_kerf_ref")))
    open(new, "w").write(fix(O.renamed(open(out).read(), top, top + "_kerf_new")))
    pair = O.Pair("case", top + "_kerf_ref", top + "_kerf_new", plist, vectors=3000)
    res = O.simulate([pair], files[:-1] + [ref, new], sim, simulator=simulator)["case"]
    t.res.check(res.ok and res.known > 0,
                f"{top}: the rewrite simulates like the input ({simulator}): {res.detail}")
    return open(out).read()


def _new_lines(src_text, out_text):
    """The lines of the rewrite that the source does not have."""
    old = set(src_text.splitlines())
    return [l for l in out_text.splitlines() if l not in old]


@S.case("enum_bit_positions_by_name", needs=("iverilog",))
def _(t):
    """F291: the source selects the bits of `state` and `next` only through an enum of bit
    positions (`state[IDLE]`, `next[LOAD] = 1'b1`; the reverse-case one-hot style, common trade
    practice); the rewrite selects them by the same names, never by a raw position. Control: the
    same module with one select written `state[0]` is not named (the rule needs every select of
    the signal to use a name), while `next`, still selected only by names, is."""
    src = os.path.join(t.root, ONEHOT)
    src_text = open(src).read()
    out = os.path.join(t.work, "onehot.sv")
    text = _restructure_simulated(t, [src], "onehot_fsm_reverse_case", out)
    if text is None:
        return
    new = "\n".join(_new_lines(src_text, text))
    t.res.check(new.strip(), "the block is rewritten")
    raw = re.findall(r"\b(?:state|next)\s*\[\s*\d[^\]]*\]", new)
    t.res.check(not raw, f"no raw position of `state`/`next` where the source used names: {raw}\n{text}")
    named = set(re.findall(r"\b(?:state|next)\[(\w+)\]", new))
    t.res.check(named and named <= set(ONEHOT_NAMES), f"bits selected by the enum's names: {named}\n{new}")
    t.res.check(re.search(r"\bnext\[\w+\]\s*=", new), f"next-state bits assigned by name:\n{new}")

    # Control: one raw select of `state` in the source.
    mixed = src_text.replace("state[LOAD]:  next[RUN]", "state[1]:     next[RUN]", 1)
    t.res.check(mixed != src_text, "the control variant differs from the source")
    msrc = os.path.join(t.work, "onehot_mixed_src.sv")
    open(msrc, "w").write(mixed)
    mout = os.path.join(t.work, "onehot_mixed.sv")
    mtext = _restructure_simulated(t, [msrc], "onehot_fsm_reverse_case", mout)
    if mtext is None:
        return
    mnew = "\n".join(_new_lines(mixed, mtext))
    t.res.check(not re.search(r"\bstate\[[A-Za-z_]", mnew),
                f"`state`, selected once by a raw position, is not named:\n{mnew}")
    t.res.check(not re.search(r"\bnext\s*\[\s*\d", mnew), f"`next` still selected only by names:\n{mnew}")


EARLY = """// Invented: a status flag computed above the enum of bit positions that the block below uses.
module early_enum (
  input  logic [3:0] state,
  input  logic       go,
  output logic       z,
  output logic [3:0] next
);
  assign z = (state == 4'b0001) | (state == 4'b0011 & go);
  typedef enum int unsigned { A = 0, B = 1, C = 2, D = 3 } idx_e;
  always_comb begin
    next = '0;
    if (state[A] & go) next[B] = 1'b1;
    if (state[B] | state[C]) next[C] = 1'b1;
    if (state[D] & ~go) next[A] = 1'b1;
  end
endmodule
"""


@S.case("enum_bit_names_declared_before_use", needs=("iverilog",))
def _(t):
    """F291's rule meets IEEE 1800-2017's declared-before-use: a statement above the enum's
    declaration that reads the vector (`assign z = state == 4'b0001 ...`) could not name its
    bits, so the vector keeps raw positions and the rewrite reads back (was: slang rejected
    `state[D]` above the typedef, an internal error). Icarus Verilog checks the function."""
    src = os.path.join(t.work, "early_enum.sv")
    open(src, "w").write(EARLY)
    out = os.path.join(t.work, "early_enum_out.sv")
    text = _restructure_simulated(t, [src], "early_enum", out, "--min-gain", "0")
    if text is None:
        return
    new = "\n".join(_new_lines(EARLY, text))
    t.res.check(new.strip(), "the module is rewritten")
    t.res.check(not re.search(r"\bstate\[[A-Za-z_]", new), f"no bit of `state` named above the enum:\n{new}")


@S.case("csr_constants_named", needs=("iverilog",))
def _(t):
    """F285: a `unique case (csr_addr)` over 21 package constants (RISC-V machine-level CSR
    addresses, an open standard) comes back naming the constants: shared address-prefix wires
    compare with slices of a constant the case used (`csr_addr[11:4] == CSR_MSTATUS[11:4]`) or
    are named after one (`like_CSR_MSTATUS_11_3`). Each name is checked against the wire's
    function by Icarus Verilog: a wire `is_NAME_h_l` / `<sig>_h_l_is_NAME` is exactly
    `csr_addr[h:l] == NAME[h:l]`, a wire `like_NAME_h_l` is 1 whenever csr_addr equals NAME."""
    files = [os.path.join(t.root, "tests", "rtl", "include", "rv_csr_pkg.sv"),
             os.path.join(t.root, "tests", "rtl", "rv_csr_decode.sv")]
    top = "rv_csr_decode"
    out = os.path.join(t.work, "rv_csr_decode.sv")
    text = _restructure_simulated(t, files, top, out)
    if text is None:
        return
    pkg = open(files[0]).read()
    consts = dict(re.findall(r"localparam\s+logic\s+\[11:0\]\s+(CSR_\w+)\s*=\s*12'h([0-9A-Fa-f]+)", pkg))
    t.res.check(len(consts) == 21, f"the package's 21 addresses: {sorted(consts)}")
    new = _new_lines(open(files[1]).read(), text)
    body = "\n".join(l for l in new if "kf_unused" not in l and not l.lstrip().startswith(("//", "CSR_")))
    # As a name in the logic or inside a new wire's name (`is_CSR_MSTATUS_11_2`).
    used = {c for c in consts if re.search(r"(?<![A-Za-z0-9])%s(?![A-Za-z0-9])" % c, body)}
    t.res.check(len(used) >= 3, f"the rewritten logic names constants the case used (not only kf_unused): "
                                f"{sorted(used)}\n{text}")
    # A pattern over bits from the top of csr_addr down is named after a constant that has it.
    t.res.check(not re.search(r"\bcsr_addr(?:_11_\d+)?_(?:is|not)_[01x]*x", body),
                f"no address-prefix wire named by a don't-care pattern:\n{text}")
    checks = []
    for name in re.findall(r"^\s*wire\s+(\w+)\s*=", text, re.M):
        if name.startswith("is_") or "_is_CSR_" in name:
            m1 = re.fullmatch(r"is_(CSR_\w+)_(\d+)_(\d+)", name) or \
                re.fullmatch(r"csr_addr_(\d+)_(\d+)_is_(CSR_\w+)", name)
            if not m1:
                continue
            if name.startswith("is_"):
                c, h, l = m1.group(1), int(m1.group(2)), int(m1.group(3))
            else:
                h, l, c = int(m1.group(1)), int(m1.group(2)), m1.group(3)
            if c not in consts:
                continue
            checks.append((name, f"dut.{name} !== (csr_addr[{h}:{l}] == ({int(consts[c], 16)} >> {l} & "
                                 f"{(1 << (h - l + 1)) - 1}))", None))
        elif name.startswith("like_"):
            m1 = re.fullmatch(r"like_(CSR_\w+?)(?:_(\d+)_(\d+))?", name)
            if m1 and m1.group(1) in consts:
                checks.append((name, f"dut.{name} !== 1'b1", int(consts[m1.group(1)], 16)))
    t.res.check(checks, f"wires named after the constants:\n{text}")
    # F347: two wires like the same constant are not told apart by a counter (`like_CSR_MCYCLE_2`):
    # the second is named after another constant that has its pattern.
    wires = re.findall(r"^\s*wire\s+(\w+)\s*=", text, re.M)
    suffixed = [w for w in wires if (m := re.fullmatch(r"(?:not_)?like_(CSR_\w+?)((?:_\d+)*)", w))
                and m.group(1) in consts and len(re.findall(r"_\d+", m.group(2))) % 2 == 1]
    t.res.check(not suffixed, f"no like-name told apart by a counter: {suffixed}\n{text}")
    if not checks:
        return
    tb = ["module kerf_names_tb;",
          "  reg [11:0] csr_addr; reg csr_we, cnt_en_cy, cnt_en_ir; reg [1:0] priv;",
          f"  {top} dut (.csr_addr(csr_addr), .csr_we(csr_we), .priv(priv), .cnt_en_cy(cnt_en_cy), "
          ".cnt_en_ir(cnt_en_ir));",
          "  integer n, errors;",
          "  initial begin",
          "    errors = 0; csr_we = 0; cnt_en_cy = 0; cnt_en_ir = 0; priv = 3;"]
    # Every address once (4096 values: exhaustive over the wires' only input).
    tb.append("    for (n = 0; n < 4096; n = n + 1) begin")
    tb.append("      csr_addr = n; #1;")
    for name, cond, at in checks:
        if at is None:
            cond = cond.replace("csr_addr[", "dut.csr_addr[")
            tb.append(f"      if ({cond}) begin errors = errors + 1; $display(\"NAME {name} at %h\", csr_addr); end")
        else:
            tb.append(f"      if (csr_addr == 12'h{at:03x} && {cond}) begin errors = errors + 1; "
                      f"$display(\"NAME {name} at %h\", csr_addr); end")
    tb += ["    end", "    $display(\"ERRORS %0d\", errors);", "    $finish;", "  end", "endmodule"]
    tbp = os.path.join(t.work, "names_tb.sv")
    open(tbp, "w").write("\n".join(tb) + "\n")
    vvp = os.path.join(t.work, "names_tb.vvp")
    c = K.run(["iverilog", "-g2012", "-o", vvp, files[0], out, tbp])
    if not t.res.check(c.returncode == 0, f"Icarus builds the name check: {c.stderr[-800:]}"):
        return
    s = K.run(["vvp", "-n", vvp])
    t.res.check("ERRORS 0" in s.stdout,
                f"every wire does what its name says ({[n for n, _, _ in checks]}): {s.stdout[-800:]}")


def _compared_constants(text):
    """Names of the localparams a source text declares (enum values aside: the rule is about
    localparams and package constants)."""
    names = set()
    for decl in re.findall(r"\blocalparam\b[^;]*;", text):
        names |= set(re.findall(r"\b([A-Za-z_]\w*)\s*=", decl))
    return names


def _named_in_logic(src_text, out_text, names):
    """Of `names`, those the rewrite's own lines use as identifiers (not inside a wire's name such as
    `is_CSR_MSTATUS_11_2`, not in the unused-signal wire that only keeps lint quiet)."""
    body, unused = [], False
    for line in _new_lines(src_text, out_text):
        if re.search(r"\bwire\b[^=]*\bkf_unused\w*\s*=", line):
            unused = True
        if not unused and not line.lstrip().startswith("//"):
            body.append(line)
        if unused and ";" in line:
            unused = False
    body = "\n".join(body)
    return {n for n in names if re.search(r"(?<![A-Za-z0-9_$])%s(?![A-Za-z0-9_$])" % n, body)}


CMD_PAIR = """// Invented: two command codes of a small peripheral that share one handler.
module cmd_pair (input logic [3:0] cmd, input logic en, output logic hit);
  localparam logic [3:0] CMD_RD = 4'h2, CMD_RDX = 4'h3;
  assign hit = en && (cmd == CMD_RD || cmd == CMD_RDX);
endmodule
"""


@S.case("compared_constants_named_or_kept", needs=("iverilog",))
def _(t):
    """F346: a statement group that compares signals with named constants (a `case (op)` over
    localparams, a `unique case (csr_addr)` over a package's RISC-V CSR addresses, `opcode ==
    OP_REG || opcode == OP_IMM` with RISC-V opcodes; open standard) is either written so that its
    logic names at least one of those constants where the source compared with them (`op ==
    OP_ADD`, `csr_addr[11:3] == CSR_MSTATUS[11:3]`), or kept as written — never a rewrite where
    the constants survive only in the unused-signal wire. Each rewrite simulates like its input
    (Icarus Verilog). An invented module whose only rewrite (`cmd[3:1] == 3'b001`) names neither
    of its two 4-bit codes is kept as written, with the reason; control: the same module with the
    codes written as numbers is rewritten (the rule, not the logic, keeps the named one)."""
    pair = os.path.join(t.work, "cmd_pair.sv")
    open(pair, "w").write(CMD_PAIR)
    cases = [([os.path.join(t.root, "tests", "rtl", "alu_localparam_ops.sv")], "alu_localparam_ops", True),
             ([os.path.join(t.root, "tests", "rtl", "include", "rv_csr_pkg.sv"),
               os.path.join(t.root, "tests", "rtl", "rv_csr_decode.sv")], "rv_csr_decode", True),
             ([os.path.join(t.root, "tests", "rtl", "rv_aluctl.sv")], "rv_aluctl", True),
             ([pair], "cmd_pair", False)]
    for files, top, rewritten in cases:
        src_text = open(files[-1]).read()
        consts = _compared_constants("\n".join(open(f).read() for f in files))
        t.res.check(len(consts) >= 2, f"{top}: the source declares named constants: {sorted(consts)}")
        for extra in ([], ["--min-gain", "0"]):
            out = os.path.join(t.work, f"{top}{len(extra)}.sv")
            if rewritten and not extra:
                # By default another rule may keep it (the ALU's rewrite is long text for what it
                # saves, docs/guide.md "Text for gates"): kept as written, or naming a constant.
                r = K.run([t.kerf, "restructure", *files, "--top", top, "-o", out])
                if not t.res.check(r.returncode == 0, f"{top}: restructure: {r.stderr[-600:]}"):
                    continue
                text = open(out).read()
                t.res.check(text == src_text or _named_in_logic(src_text, text, consts),
                            f"{top}: kept as written or naming constants it compared with:\n{text}")
            elif rewritten:
                text = _restructure_simulated(t, files, top, out, *extra)
                if text is None:
                    continue
                named = _named_in_logic(src_text, text, consts)
                t.res.check(named, f"{top} {extra}: the rewrite names constants the source compared with in its "
                                   f"logic, not only in kf_unused:\n{text}")
            else:
                r = K.run([t.kerf, "restructure", *files, "--top", top, "-o", out, *extra])
                t.res.check(r.returncode == 0 and open(out).read() == src_text,
                            f"{top} {extra}: kept as written, byte for byte: {r.stderr[-600:]}")
                t.res.check("would name none of the 2 named constants" in r.stderr,
                            f"{top} {extra}: the reason is stated: {r.stderr[-600:]}")
    # Control: the invented module with its codes as numbers.
    numbered = CMD_PAIR.replace("cmd == CMD_RD ||", "cmd == 4'h2 ||").replace("cmd == CMD_RDX)", "cmd == 4'h3)")
    t.res.check("== CMD_" not in numbered, "control: the codes written as numbers")
    src = os.path.join(t.work, "cmd_pair_numbers.sv")
    open(src, "w").write(numbered)
    text = _restructure_simulated(t, [src], "cmd_pair", os.path.join(t.work, "cmd_pair_numbers_out.sv"))
    if text is not None:
        t.res.check(text != numbered, "control: with numbers the module is rewritten")


@S.case("named_rewrite_also_under_min_gain_0", needs=("iverilog", "verilator"))
def _(t):
    """F357: --min-gain 0 asks for every rewrite that does not grow the logic, so a group the
    default run rewrites (naming a constant it compared with) is rewritten under --min-gain 0 too,
    its logic naming at least one of those constants: never kept as written by the named-constant
    rule (F346) while the default run found a named form. Cases: the corpus's CSR access checker
    (`csr_addr inside {CSR_MTVEC, CSR_MEPC, CSR_MCAUSE, ...}` beside a choice; RISC-V CSR
    addresses, an open standard; simulated by Verilator, since Icarus 11 does not read `inside`),
    the CSR decoder and the ALU control (RISC-V opcodes; Icarus Verilog)."""
    rtl = os.path.join(t.root, "tests", "rtl")
    cases = [([os.path.join(rtl, "include", "csr_pkg.sv"), os.path.join(rtl, "inside_pkg_func.sv")],
              "inside_pkg_func", "verilator"),
             ([os.path.join(rtl, "include", "rv_csr_pkg.sv"), os.path.join(rtl, "rv_csr_decode.sv")],
              "rv_csr_decode", "icarus"),
             ([os.path.join(rtl, "rv_aluctl.sv")], "rv_aluctl", "icarus")]
    compared = 0
    for files, top, simulator in cases:
        src_text = open(files[-1]).read()
        consts = _compared_constants("\n".join(open(f).read() for f in files))
        first = os.path.join(t.work, f"{top}_default.sv")
        r = K.run([t.kerf, "restructure", *files, "--top", top, "-o", first])
        if not t.res.check(r.returncode == 0, f"{top}: default run: {r.stderr[-600:]}"):
            continue
        default_text = open(first).read()
        if default_text == src_text or not _named_in_logic(src_text, default_text, consts):
            continue   # the property is about groups the default run rewrites with names
        compared += 1
        text = _restructure_simulated(t, files, top, os.path.join(t.work, f"{top}_g0.sv"), "--min-gain", "0",
                                      simulator=simulator)
        if text is None:
            continue
        t.res.check(text != src_text and _named_in_logic(src_text, text, consts),
                    f"{top}: under --min-gain 0 the rewrite is made and names constants the source compared "
                    f"with, as the default run's does:\n{text}")
    t.res.check(compared >= 2, f"cases whose default run rewrites with named constants: {compared}")


REGSEL_PKG = """// Invented: register block of a small timer peripheral, reached through a request struct.
package regsel_pkg;
  typedef struct packed {
    logic        valid;
    logic        write;
    logic [15:0] address;
    logic [3:0]  strobe;
  } req_t;
  localparam logic [15:0] RegCtrl  = 16'h4000;
  localparam logic [15:0] RegStat  = 16'h4004;
  localparam logic [15:0] RegLoad  = 16'h4010;
  localparam logic [15:0] RegCount = 16'h4014;
  localparam logic [15:0] RegIrqEn = 16'h4020;
endpackage
"""

REGSEL = """// Invented: register selects of a small timer peripheral, reached through a request struct.
module regsel
  import regsel_pkg::*;
(
  input  req_t req_i,
  output logic we_ctrl,
  output logic rd_timer,
  output logic we_irq
);
  assign we_ctrl  = req_i.valid & req_i.write & (req_i.address == RegCtrl || req_i.address == RegStat);
  assign rd_timer = req_i.valid & ~req_i.write & (req_i.address == RegLoad || req_i.address == RegCount);
  assign we_irq   = req_i.valid & req_i.write & (req_i.address == RegIrqEn);
endmodule
"""


def _readers(text, outputs):
    """Per new wire of a rewrite, the outputs whose assignment reads it, directly or through
    other wires (from the text: `wire w = ...;` and `assign o = ...;`)."""
    defs = {m.group(1): m.group(2) for m in re.finditer(r"^\s*wire\s+(?:\[[^\]]*\]\s*)?(\w+)\s*=\s*(.*?);",
                                                      text, re.M | re.S)}
    uses = {o: m.group(1) for o in outputs
            for m in [re.search(r"^\s*assign\s+%s\s*=\s*(.*?);" % o, text, re.M | re.S)] if m}
    reached = {w: set() for w in defs}

    def mark(expr, out, seen):
        for w in re.findall(r"\b\w+\b", expr):
            if w in defs and w not in seen:
                seen.add(w)
                reached[w].add(out)
                mark(defs[w], out, seen)
    for o, e in uses.items():
        mark(e, o, set())
    return reached


@S.case("struct_member_like_names", needs=("iverilog",))
def _(t):
    """F382, F383: an address decoder whose address is a member of a struct port (`req_i.address`,
    16 bits, at flat positions 19:4 of `req_i`) compared with package constants (an invented timer
    block). A new wire named after a constant by the address bits it is like (`like_RegCtrl_15_3`)
    gives the range in the member's own indices (`req_i.address[15:3]`), never the struct's flat
    positions (F382: `like_RegStat_19_4`); each such wire is true whenever the address equals the
    constant (not_like: false), checked with every other input random (Icarus Verilog); and it is
    named after a constant that the statements of the outputs it feeds compare with (F383: a wire
    gating only `we_irq`, whose statement compares with RegIrqEn alone, is not named after RegCtrl).
    Names are distinct (the rewrite compiles). Run by default and under --min-gain 0."""
    pkg = os.path.join(t.work, "regsel_pkg.sv")
    src = os.path.join(t.work, "regsel.sv")
    open(pkg, "w").write(REGSEL_PKG)
    open(src, "w").write(REGSEL)
    consts = {n: int(v, 16) for n, v in re.findall(r"localparam logic \[15:0\] (\w+)\s*=\s*16'h([0-9A-Fa-f]+)",
                                                    REGSEL_PKG)}
    compared = {o: set(re.findall(r"\b(Reg\w+)\b", line))
                for o, line in re.findall(r"assign\s+(\w+)\s*=(.*);", REGSEL)}
    t.res.check(len(consts) == 5 and len(compared) == 3, f"the invented block: {consts} {compared}")
    named = 0
    for extra in ([], ["--min-gain", "0"]):
        out = os.path.join(t.work, f"regsel_out{len(extra)}.sv")
        text = _restructure_simulated(t, [pkg, src], "regsel", out, *extra)
        if text is None:
            continue
        new = "\n".join(_new_lines(REGSEL, text))
        # Any range in a new wire's name that the struct's flat positions would give (19..4 for
        # the address: an index above 15 can only be flat).
        for name in re.findall(r"^\s*wire\s+(\w+)\s*=", new, re.M):
            idx = [int(x) for x in re.findall(r"_(\d+)(?=_|$)", name)]
            t.res.check(all(i <= 15 for i in idx), f"{extra} `{name}`: no flat position of req_i in the name")
        readers = _readers(text, compared)
        checks = []
        for name in re.findall(r"^\s*wire\s+(\w+)\s*=", new, re.M):
            m = re.fullmatch(r"(not_)?like_(Reg[A-Za-z]+)(?:_(\d+)_(\d+))?(?:_\d+)?", name)
            if not m or m.group(2) not in consts:
                continue
            named += 1
            c = m.group(2)
            feeds = readers.get(name, set())
            t.res.check(any(c in compared[o] for o in feeds),
                        f"{extra} `{name}` feeds {sorted(feeds)}, whose statements compare with "
                        f"{sorted(set().union(*[compared[o] for o in feeds]) if feeds else [])}:\n{text}")
            checks.append((name, 0 if m.group(1) else 1, consts[c]))
        if not checks:
            continue
        tb = ["module regsel_names_tb;", "  import regsel_pkg::*;", "  req_t req_i;",
              "  wire we_ctrl, rd_timer, we_irq;",
              "  regsel dut (.req_i(req_i), .we_ctrl(we_ctrl), .rd_timer(rd_timer), .we_irq(we_irq));",
              "  integer n, errors;", "  initial begin", "    errors = 0;",
              "    for (n = 0; n < 400; n = n + 1) begin"]
        for name, want, value in checks:
            tb.append(f"      req_i = $random; req_i.address = 16'h{value:04x}; #1;")
            tb.append(f"      if (dut.{name} !== 1'b{want}) begin errors = errors + 1; "
                      f"$display(\"NAME {name} at %h\", req_i); end")
        tb += ["    end", "    $display(\"ERRORS %0d\", errors);", "    $finish;", "  end", "endmodule"]
        tbp = os.path.join(t.work, f"regsel_tb{len(extra)}.sv")
        open(tbp, "w").write("\n".join(tb) + "\n")
        vvp = os.path.join(t.work, f"regsel_tb{len(extra)}.vvp")
        c = K.run(["iverilog", "-g2012", "-o", vvp, pkg, out, tbp])
        if not t.res.check(c.returncode == 0, f"Icarus builds the name check: {c.stderr[-800:]}"):
            continue
        r = K.run(["vvp", "-n", vvp])
        t.res.check("ERRORS 0" in r.stdout, f"{extra} every like-wire is true at its constant: {r.stdout[-800:]}")
    t.res.check(named >= 1, f"wires named after a constant by the bits they are like: {named}")


@S.case("value_set_names_tell_the_truth", needs=("iverilog",))
def _(t):
    """F384: a new wire over a few bits of one vector (at most 6) is named by the set of values
    it is true for, or false for, where that set has at most 4 values and the name fits:
    `digit_is_3_or_5_or_6_or_9` in the corpus's seven-segment decoder (invented), not an index
    (`seg0_t2`). Every wire named `<vector or slice>_is_<v>_or_<v>...` (`_not_`: none of them) in
    the rewrites of the seven-segment decoder and the corpus's 4-entry tag matcher is checked
    over every value of its bits with the other inputs random (Icarus Verilog); values are spelt
    as the printer writes comparisons (binary below five bits, hexadecimal for a multiple of four
    or five bits and more). And no wire named by an index is a function of one such input vector
    alone whose value set would give a name that fits (seen on the simulated values)."""
    rtl = os.path.join(t.root, "tests", "rtl")
    cases = [("seg7_status", ["--min-gain", "0"]), ("tag_match_cam", ["--min-gain", "0"])]
    checked = 0
    for top, extra in cases:
        src = os.path.join(rtl, top + ".sv")
        out = os.path.join(t.work, top + "_sets.sv")
        text = _restructure_simulated(t, [src], top, out, *extra)
        if text is None:
            continue
        ports = dict((n, int(h) - int(l) + 1) for h, l, n in
                     re.findall(r"input\s+logic\s+\[(\d+):(\d+)\]\s+(\w+)", open(src).read()))
        checks = []
        for name in re.findall(r"^\s*wire\s+(\w+)\s*=", "\n".join(_new_lines(open(src).read(), text)), re.M):
            m = re.fullmatch(r"(\w+?)(?:_(\d+)_(\d+))?_(is|not)_((?:[0-9a-f]+_or_)+[0-9a-f]+)", name)
            if not m or m.group(1) not in ports:
                continue
            vec = m.group(1)
            hi, lo = (int(m.group(2)), int(m.group(3))) if m.group(2) else (ports[vec] - 1, 0)
            width = hi - lo + 1
            base = 16 if (width % 4 == 0 or width >= 5) else 2
            values = [int(v, base) for v in m.group(5).split("_or_")]
            if any(v >= (1 << width) for v in values):
                continue
            checks.append((name, vec, hi, lo, values, m.group(4) == "is"))
        decls = re.findall(r"(input\s+logic\s+(?:\[\d+:\d+\]\s+)?)(\w+)", open(src).read())
        indexed = [n for n in re.findall(r"^\s*wire\s+(\w+)\s*=", "\n".join(_new_lines(open(src).read(), text)), re.M)
                   if re.search(r"_t\d+$", n)]
        outs = re.findall(r"output\s+logic\s+(\[\d+:\d+\]\s+)?(\w+)", open(src).read())
        tb = [f"module {top}_sets_tb;"]
        tb += [f"  reg {d.split('logic', 1)[1].strip()} {n};" for d, n in decls]
        tb += [f"  wire {w or ''} {n};" for w, n in outs]
        tb.append(f"  {top} dut (" + ", ".join(f".{n}({n})" for _, n in decls + outs) + ");")
        tb += ["  integer n, errors;", "  initial begin", "    errors = 0;", "    for (n = 0; n < 2000; n = n + 1) begin"]
        tb += [f"      {n} = $random;" for _, n in decls]
        tb.append("      #1;")
        # Each indexed wire with every input: whether it is a function of one small vector alone.
        for name in indexed:
            tb.append(f"      $display(\"IDX {name} %b " + " ".join(f"{n}=%0d" for _, n in decls) + "\", dut." + name +
                      "".join(f", {n}" for _, n in decls) + ");")
        for name, vec, hi, lo, values, eq in checks:
            member = " || ".join(f"{vec}[{hi}:{lo}] == {v}" for v in values)
            want = f"({member})" if eq else f"!({member})"
            tb.append(f"      if (dut.{name} !== ({want} ? 1'b1 : 1'b0)) begin errors = errors + 1; "
                      f"$display(\"NAME {name} at %h\", {vec}); end")
        tb += ["    end", "    $display(\"ERRORS %0d\", errors);", "    $finish;", "  end", "endmodule"]
        tbp = os.path.join(t.work, f"{top}_sets_tb.sv")
        open(tbp, "w").write("\n".join(tb) + "\n")
        vvp = os.path.join(t.work, f"{top}_sets_tb.vvp")
        c = K.run(["iverilog", "-g2012", "-o", vvp, out, tbp])
        if not t.res.check(c.returncode == 0, f"{top}: Icarus builds the name check: {c.stderr[-800:]}\n" + "\n".join(tb)):
            continue
        r = K.run(["vvp", "-n", vvp])
        checked += len(checks)
        t.res.check("ERRORS 0" in r.stdout, f"{top}: every set name is true exactly for its values "
                                            f"({[c[0] for c in checks]}): {r.stdout[-800:]}")
        # No indexed wire is a function of one input vector of at most 6 bits whose true (or false)
        # set has 2 to 4 values and would be named within 26 characters (the rule's promise).
        seen = {}
        for name, val, rest in re.findall(r"^IDX (\w+) ([01xz]) (.*)$", r.stdout, re.M):
            for kv in rest.split():
                n, v = kv.split("=")
                seen.setdefault((name, n), {}).setdefault(v, set()).add(val)
        for (name, vec), by in seen.items():
            width = ports.get(vec, 0)
            if not 2 <= width <= 6 or len(by) < (1 << width) or any(len(x) != 1 for x in by.values()):
                continue
            on = sorted(int(v) for v, x in by.items() if x == {"1"})
            small = min(len(on), (1 << width) - len(on))
            digits = (width + 3) // 4 if (width % 4 == 0 or width >= 5) else width
            length = len(vec) + 4 + small * digits + 4 * (small - 1)
            t.res.check(not (2 <= small <= 4 and length <= 26),
                        f"{top}: `{name}` is true for {vec} in {on} alone: named by its values, not an index")
    t.res.check(checked >= 3, f"set names checked: {checked}")


SPI_PKG = os.path.join("tests", "rtl", "include", "spi_cmd_pkg.sv")
SPI = os.path.join("tests", "rtl", "spi_cmd_decode.sv")


@S.case("enum_field_not_written_by_position")
def _(t):
    """F349 (F192's rest): the serial-flash decoder writes `d.kind`, a 2-bit enum member of a
    packed struct output, only with named values (`d.kind = RD`). The rewrite never assigns that
    member's bits by raw positions of the struct (`d[4] = ...`), and never as `d.kind[0] = ...`
    (Icarus 11 simulates that form wrongly, F192): the block is kept as written, with the reason
    stated. The corpus driver checks the function of every rewrite of this case (Verilator, since
    Icarus does not read its assignment pattern). Control: the same module with `kind` declared
    `logic [1:0]` (not an enum) is rewritten, its bits by position, as before."""
    files = [os.path.join(t.root, SPI_PKG), os.path.join(t.root, SPI)]
    src_text = open(files[-1]).read()
    for extra in ([], ["--min-gain", "0"]):
        out = os.path.join(t.work, f"spi{len(extra)}.sv")
        r = K.run([t.kerf, "restructure", *files, "--top", "spi_cmd_decode", "-o", out, *extra])
        if not t.res.check(r.returncode == 0, f"spi_cmd_decode {extra}: restructure: {r.stderr[-600:]}"):
            continue
        text = open(out).read()
        new = "\n".join(_new_lines(src_text, text))
        raw = re.findall(r"\bd\s*\[\s*[45](?::\d+)?\s*\]\s*=(?!=)|\bd\.kind\s*\[", new)
        t.res.check(not raw, f"spi_cmd_decode {extra}: no raw position of d.kind: {raw}\n{text}")
        t.res.check(text == src_text and "'d.kind' (an enum) would be written by bit positions" in r.stderr,
                    f"spi_cmd_decode {extra}: kept as written, with the reason: {r.stderr[-600:]}")
    # Control: `kind` as a plain vector.
    pkg = open(files[0]).read()
    plain = pkg.replace("typedef struct packed { kind_e kind;", "typedef struct packed { logic [1:0] kind;")
    t.res.check(plain != pkg, "control: kind declared as a plain vector")
    ppkg = os.path.join(t.work, "spi_cmd_pkg_plain.sv")
    open(ppkg, "w").write(plain)
    out = os.path.join(t.work, "spi_plain.sv")
    r = K.run([t.kerf, "restructure", ppkg, files[1], "--top", "spi_cmd_decode", "-o", out])
    t.res.check(r.returncode == 0 and "proved equivalent" in r.stderr and open(out).read() != src_text,
                f"control: with a plain vector the block is rewritten and proved: {r.stderr[-600:]}")


@S.case("choice_wires_named_by_select")
def _(t):
    """F348: a new wire that is a choice whose select has a name of its own (`b[2] ? op_2_1_is_01 :
    op_is_OP_XOR`) is named by the output it feeds and the select (`y2_sel_b2`), not by an index:
    on the corpus's ALU (under --min-gain 0) and serial-flash decoder (with `kind` a plain vector),
    every wire named `<out>_sel_<s>` is written as a choice whose select's name spells `<s>`
    (`b[2]` -> `b2`, `~x` -> `nx`), and such wires exist. The names are distinct (the writer's
    own check; wire_name_cap checks them over the corpus)."""
    pkg = open(os.path.join(t.root, SPI_PKG)).read().replace(
        "typedef struct packed { kind_e kind;", "typedef struct packed { logic [1:0] kind;")
    ppkg = os.path.join(t.work, "spi_cmd_pkg_plain.sv")
    open(ppkg, "w").write(pkg)
    cases = [([os.path.join(t.root, "tests", "rtl", "alu_localparam_ops.sv")], "alu_localparam_ops",
              ["--min-gain", "0"]),
             ([ppkg, os.path.join(t.root, SPI)], "spi_cmd_decode", [])]
    found = 0
    for files, top, extra in cases:
        out = os.path.join(t.work, top + ".sv")
        r = K.run([t.kerf, "restructure", *files, "--top", top, "-o", out, *extra])
        if not t.res.check(r.returncode == 0 and "proved equivalent" in r.stderr,
                           f"{top}: restructured and proved: {r.stderr[-600:]}"):
            continue
        text = open(out).read()
        for name, body in re.findall(r"^\s*wire\s+(\w+_sel_\w+)\s*=\s*(.*?);", text, re.M | re.S):
            found += 1
            tail = name.split("_sel_", 1)[1]
            m = re.match(r"\s*(~?)([A-Za-z_][\w.]*(?:\[\w+\])?)\s*\?", body)
            # As the writer spells a reference in a name: `.` -> `_`, `b[2]` -> `b2`, `s[IDLE]` -> `s_IDLE`.
            spelled = m and (("n" if m.group(1) else "") +
                             re.sub(r"\[(?=[A-Za-z])", "_", m.group(2).replace(".", "_")).replace("[", "").replace("]", ""))
            t.res.check(m and spelled == tail, f"{top}: `{name}` is a choice selected by what it names: {body}")
    t.res.check(found >= 2, f"choices named by their select: {found}")


if __name__ == "__main__":
    S.main()
