"""outside_check — compare an original and a rewritten module with tools that are not kerf.

Used by the test-design corpus (tests/e2e/test_rtl_corpus.py, designs in tests/rtl/) and by
the random-module generator (tests/randrtl/). kerf's own proof reads both sides through kerf's
lowering, so it cannot see a lowering mistake; these checks can:

- Ports come from slang (pyslang) elaborating the module directly, with the parameter
  overrides of the run (`-G NAME=VALUE`), not from kerf's reader.
- Behaviour is compared by Icarus Verilog (outside reference: the simulator `iverilog`/`vvp`)
  in its four-valued semantics: inputs are driven with 0/1 only, every output bit is compared
  wherever the original is not x (kerf's documented don't-care policy: an x the original shows
  lets the rewrite show anything), and exactly (`!==`) when the run used `--keep-x`. A z in
  the original must be a z in the rewrite (tri-state logic is kept as written).
- Lint is Verilator's (outside reference: `verilator --lint-only`); a rewrite may not add a
  warning the original does not have.

Many module pairs can be compared in one simulator run: every pair gets its own testbench
module, all of them top-level, so Icarus runs them side by side and prints one result line each.
"""
import os
import shutil
import re
import subprocess
import tempfile

# ---------------------------------------------------------------------------------------------
# slang: ports and module names


def _quote(arg):
    """One argument for slang's command-line splitter (which honours quotes and backslashes)."""
    if arg and not any(c in arg for c in ' \t\r\n"\'\\#'):
        return arg
    return '"' + arg.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _slang_compile(files, top, defines=(), params=(), include_dirs=()):
    from pyslang import driver as sdriver
    cmd = ["outside_check"]
    for d in include_dirs:
        cmd += ["-I", d]
    for d in defines:
        cmd += ["-D", d]
    for p in params:
        cmd += ["-G", p]
    # A module with interface ports is elaborated on its own, as kerf's reader does (F29).
    cmd += ["--allow-toplevel-iface-ports", "--top", top] + list(files)
    drv = sdriver.Driver()
    drv.addStandardArgs()
    if not drv.parseCommandLine(" ".join(_quote(a) for a in cmd), sdriver.CommandLineOptions()) \
            or not drv.processOptions():
        raise RuntimeError(f"slang rejected the command line {cmd}")
    drv.parseAllSources()
    comp = drv.createCompilation()
    errors = [d for d in comp.getAllDiagnostics() if d.isError()]
    if errors:
        raise RuntimeError(f"slang reports {len(errors)} error(s) on {files} (top {top}, defines {list(defines)}, "
                           f"params {list(params)})")
    return comp


def signals(files, top, defines=(), params=(), include_dirs=()):
    """(ports, internals) of `top` as slang elaborates it.

    ports: dicts with name, dir (in/out/inout), width, signed, in declaration order. An
    interface port with a modport gives one entry per modport member, named `port.member`, with
    "iface": (port name, interface name) — a testbench instantiates the interface per side and
    drives or reads the member through it.
    internals: dicts with name and width of the nets and variables declared directly in the
    module body (not in generate blocks) with an integral type — the names a testbench can
    refer to, which a rewrite must keep declared and driven with the same values."""
    from pyslang import ast
    comp = _slang_compile(files, top, defines, params, include_dirs)
    tops = [t for t in comp.getRoot().topInstances if t.name == top]
    if not tops:
        raise RuntimeError(f"slang finds no top module {top} in {files}")
    out = []
    for p in tops[0].body.portList:
        if p.kind == ast.SymbolKind.InterfacePort:
            out += _interface_members(p, tops[0].body)
            continue
        d = str(p.direction).split(".")[-1]
        out.append({"name": p.name, "dir": {"In": "in", "Out": "out", "InOut": "inout"}.get(d, d.lower()),
                    "width": p.type.bitWidth, "signed": bool(p.type.isSigned)})
    names = {p["name"] for p in out}
    internals = []
    for m in tops[0].body:
        if m.kind in (ast.SymbolKind.Net, ast.SymbolKind.Variable) and m.name and m.name not in names \
                and m.type.isIntegral:
            internals.append({"name": m.name, "width": m.type.bitWidth})
    return out, internals


def _interface_members(port, body):
    """The members of an interface port as port entries (see `signals`): those of its modport,
    with their directions; without a modport every integral variable and net of the interface,
    an output where the module assigns it (a hierarchical target `port.member`), else an input."""
    from pyslang import ast
    inst = port.connection[0] if isinstance(port.connection, tuple) else port.connection
    if inst is None:
        raise RuntimeError(f"interface port {port.name}: slang gives it no interface instance")
    found = []
    if not port.modport:
        written = set()

        def visit(n):
            if isinstance(n, ast.AssignmentExpression):
                t = n.left
                while t.kind in (ast.ExpressionKind.ElementSelect, ast.ExpressionKind.RangeSelect,
                                 ast.ExpressionKind.MemberAccess):
                    t = t.value
                if t.kind == ast.ExpressionKind.HierarchicalValue:
                    written.add(t.symbol.name)
            return True
        body.visit(visit)
        for m in inst.body:
            if m.kind in (ast.SymbolKind.Variable, ast.SymbolKind.Net) and m.type.isIntegral:
                found.append({"name": f"{port.name}.{m.name}", "dir": "out" if m.name in written else "in",
                              "width": m.type.bitWidth, "signed": bool(m.type.isSigned),
                              "iface": (port.name, port.interfaceDef.name)})
        return found
    for m in inst.body:
        if m.kind == ast.SymbolKind.Modport and m.name == port.modport:
            for mm in m:
                d = str(mm.direction).split(".")[-1]
                found.append({"name": f"{port.name}.{mm.name}",
                              "dir": {"In": "in", "Out": "out", "InOut": "inout"}.get(d, d.lower()),
                              "width": mm.type.bitWidth, "signed": bool(mm.type.isSigned),
                              "iface": (port.name, port.interfaceDef.name)})
    return found


def ports(files, top, defines=(), params=(), include_dirs=()):
    """The ports of `top` as slang elaborates it: dicts with name, dir (in/out/inout), width, signed."""
    return signals(files, top, defines, params, include_dirs)[0]


def module_names(text):
    """(name, byte offset of the name) of every module declared in `text`, from slang's syntax tree."""
    from pyslang import syntax
    tree = syntax.SyntaxTree.fromText(text)
    root = tree.root
    members = [root] if root.kind == syntax.SyntaxKind.ModuleDeclaration else list(getattr(root, "members", []) or [])
    found = []
    for m in members:
        if m.kind == syntax.SyntaxKind.ModuleDeclaration:
            found.append((m.header.name.valueText, m.header.name.location.offset))
    return found


def renamed(text, old, new):
    """`text` with the declaration of module `old` renamed to `new` (located by slang; nothing else changes)."""
    raw = text.encode()
    hits = [off for name, off in module_names(text) if name == old]
    if len(hits) != 1:
        raise RuntimeError(f"expected one declaration of module {old}, found {len(hits)}")
    off = hits[0]
    assert raw[off:off + len(old)] == old.encode()
    return (raw[:off] + new.encode() + raw[off + len(old):]).decode()


def if_qualifiers_dropped(text):
    """`text` with the `unique`/`unique0`/`priority` qualifiers of if statements removed.

    A workaround for Icarus Verilog 11, which does not parse them (a syntax error). Only for
    if statements every input leaves through one branch (one condition and an else, as the
    random modules write them): there the qualifiers change nothing a simulation shows (IEEE
    1800-2017 12.4.2 reports a violation only for no branch or overlapping conditions). The
    qualifiers are found by slang's syntax tree; both sides of a comparison get the same treatment."""
    from pyslang import syntax
    raw = text.encode()
    cuts = []

    def visit(n):
        if getattr(n, "kind", None) == syntax.SyntaxKind.ConditionalStatement:
            tok = n.uniqueOrPriority
            if tok.rawText:
                cuts.append((tok.location.offset, len(tok.rawText.encode())))
        return True
    syntax.SyntaxTree.fromText(text).root.visit(visit)
    for off, n in sorted(cuts, reverse=True):
        raw = raw[:off] + raw[off + n:].lstrip(b" ")
    return raw.decode()


def always_comb_as_always_star(text):
    """`text` with every `always_comb` block that reads a signal written `always @(*)`.

    A workaround for Icarus Verilog 11, which can loop forever at one time step on
    `always_comb` blocks that are not in a loop at all, e.g. (reduced from a random module):
        always_comb begin o = a[1]; o = b[1]; end
        always_comb begin w3 = o; w3 = b[0]; end
        always_comb begin w5[1] = w3[0]; end
    With `always @(*)` it simulates. The two forms differ at time zero (always_comb runs once
    then, `always @(*)` waits for a change of what it reads), so a block that reads nothing
    (constant assignments only) keeps `always_comb`; and in what functions read, which the
    generated modules do not depend on. Both sides of a comparison get the same treatment.
    Blocks are found and their reads told apart from their targets by slang's syntax tree."""
    from pyslang import syntax
    names = (syntax.SyntaxKind.IdentifierName, syntax.SyntaxKind.IdentifierSelectName)
    assigns = (syntax.SyntaxKind.AssignmentExpression, syntax.SyntaxKind.NonblockingAssignmentExpression)
    tree = syntax.SyntaxTree.fromText(text)
    offsets = []
    # Names of constants (enum values, parameters) are not reads: a block that assigns only
    # them reads nothing and keeps `always_comb`.
    constants = set()

    def constant_names(n):
        k = getattr(n, "kind", None)
        if k == syntax.SyntaxKind.EnumType:
            for m in n.members:
                if getattr(m, "kind", None) == syntax.SyntaxKind.Declarator:
                    constants.add(m.name.valueText)
        elif k in (syntax.SyntaxKind.ParameterDeclaration, syntax.SyntaxKind.TypeParameterDeclaration):
            for d in n.declarators:
                if getattr(d, "kind", None) == syntax.SyntaxKind.Declarator:
                    constants.add(d.name.valueText)
        return True
    tree.root.visit(constant_names)

    def count(node, into):
        def visit(n):
            if getattr(n, "kind", None) in names and n.identifier.valueText not in constants:
                into.append(n)
            return True
        node.visit(visit)

    def visit(node):
        if getattr(node, "kind", None) == syntax.SyntaxKind.AlwaysCombBlock:
            every, targets = [], []
            count(node, every)

            def lefts(n):
                if getattr(n, "kind", None) in assigns:
                    count(n.left, targets)
                return True
            node.visit(lefts)
            if len(every) > len(targets):
                offsets.append(node.keyword.location.offset)
        return True
    tree.root.visit(visit)
    raw = text.encode()
    for off in sorted(offsets, reverse=True):
        assert raw[off:off + 11] == b"always_comb"
        raw = raw[:off] + _CONVERTED.encode() + raw[off + 11:]
    return raw.decode()


# A converted block carries a mark, so that `simulate` can turn it back when Icarus finds it
# reads nothing after all: Icarus leaves reads under a constant condition out of `@(*)`
# (`st1 = '0; if (2'h0) st1.f0[1] = in2;`), warns "@* found no sensitivities so it will never
# trigger", and the block's variables stay x, where always_comb runs once at time zero
# (IEEE 1800-2017 9.2.2.2.2). Such a block cannot loop, so always_comb is safe for it.
_CONVERTED = "always @(*) /* always_comb */"
_NO_SENSITIVITY = re.compile(r"^(.*?):(\d+): warning: @\* found no sensitivities so it will never trigger", re.M)


def _restore_idle_blocks(warnings):
    """Turn converted blocks Icarus says never trigger back into always_comb; True if any."""
    changed = False
    for path, line in {(m.group(1), int(m.group(2))) for m in _NO_SENSITIVITY.finditer(warnings)}:
        if not os.path.isfile(path):
            continue
        with open(path) as f:
            lines = f.read().split("\n")
        if 0 < line <= len(lines) and _CONVERTED in lines[line - 1]:
            lines[line - 1] = lines[line - 1].replace(_CONVERTED, "always_comb", 1)
            with open(path, "w") as f:
                f.write("\n".join(lines))
            changed = True
    return changed


# ---------------------------------------------------------------------------------------------
# Icarus Verilog


def run(cmd, timeout=None, **kw):
    return subprocess.run(cmd, capture_output=True, text=True, timeout=timeout, **kw)


def _vname(n):
    ok = (n[:1].isalpha() or n[:1] == "_") and all(c.isalnum() or c in "_$" for c in n)
    return n if ok else "\\" + n + " "


class Pair:
    """One comparison: module `ref` (the original) against `new` (the rewrite), same ports.

    params: list of "NAME=VALUE" overrides applied to both instances.
    exact:  compare every bit with !== (runs with --keep-x); otherwise skip bits where ref is x.
    clock:  name of a clock input (toggled after each vector) or None.
    reset:  (name, active value) of a reset input held active for the first cycles, or None.
    internals: internal signals (name, width) compared like outputs through hierarchical
            references (ua.NAME against ub.NAME): testbenches of real projects probe them.
    care:   a Verilog condition (referring to the original instance as `ua`, e.g. `ua.op != 3`)
            outside which nothing is compared: inputs the design declares impossible, such as
            a `unique case` selector that matches no item (the language's reading: no item
            matches only on an illegal input).
    """

    def __init__(self, tag, ref, new, port_list, params=(), exact=False, clock=None, reset=None,
                 vectors=2000, exhaustive_limit=14, seed=1, care=None, internals=()):
        self.tag, self.ref, self.new, self.ports = tag, ref, new, port_list
        self.care = care
        self.internals = list(internals)
        self.params, self.exact, self.clock, self.reset = list(params), exact, clock, reset
        self.vectors, self.exhaustive_limit, self.seed = vectors, exhaustive_limit, seed


def _param_text(params):
    if not params:
        return ""
    parts = []
    for p in params:
        k, v = p.split("=", 1)
        parts.append(f".{k}({v})")
    return " #(" + ", ".join(parts) + ")"


def testbench_module(pair, name, finish=False):
    """A testbench module for one pair; prints `KERF_TB <tag> errors=E xonly=X known=K total=T`.

    errors counts compared bits that differ; xonly how many of them are a 0/1 in the original
    shown as x by the rewrite (x-pessimism, e.g. an `if` on an x condition written as gates)."""
    special = {pair.clock} | ({pair.reset[0]} if pair.reset else set())
    ins = [p for p in pair.ports if p["dir"] == "in" and p["name"] not in special]
    outs = [p for p in pair.ports if p["dir"] != "in"]
    total = sum(p["width"] for p in ins)
    L = [f"module {name};"]
    for i, p in enumerate(ins):
        L.append(f"  reg [{p['width'] - 1}:0] in{i};")
    if pair.clock:
        L.append("  reg clk_r;")
    if pair.reset:
        L.append("  reg rst_r;")
    for i, p in enumerate(outs):
        L.append(f"  wire [{p['width'] - 1}:0] ra{i}, rb{i};")

    # Interface ports: one interface instance per side, its modport members driven and read
    # through hierarchical references.
    ifaces = {}
    for p in pair.ports:
        if "iface" in p:
            ifaces.setdefault(p["iface"][0], p["iface"][1])
    for port, idef in ifaces.items():
        L.append(f"  {idef} ifa_{port} ();")
        L.append(f"  {idef} ifb_{port} ();")
    for side in "ab":
        for i, p in enumerate(ins):
            if "iface" in p:
                L.append(f"  assign if{side}_{p['name']} = in{i};")
        for i, p in enumerate(outs):
            if "iface" in p:
                L.append(f"  assign r{side}{i} = if{side}_{p['name']};")

    def conns(side):
        c = [f".{_vname(p['name'])}(in{i})" for i, p in enumerate(ins) if "iface" not in p]
        c += [f".{_vname(p['name'])}(r{side}{i})" for i, p in enumerate(outs) if "iface" not in p]
        c += [f".{_vname(port)}(if{side}_{port})" for port in ifaces]
        if pair.clock:
            c.append(f".{_vname(pair.clock)}(clk_r)")
        if pair.reset:
            c.append(f".{_vname(pair.reset[0])}(rst_r)")
        return ", ".join(c)

    for j, s in enumerate(pair.internals):
        L.append(f"  wire [{s['width'] - 1}:0] ia{j} = ua.{_vname(s['name'])};")
        L.append(f"  wire [{s['width'] - 1}:0] ib{j} = ub.{_vname(s['name'])};")
    L.append(f"  {pair.ref}{_param_text(pair.params)} ua ({conns('a')});")
    L.append(f"  {pair.new}{_param_text(pair.params)} ub ({conns('b')});")
    L.append("  integer k, b, errors, xonly, known, total, seed, mode;")
    L.append(f"  reg [{max(total, 1) - 1}:0] all_in;")
    L.append("  task compare; begin")
    if pair.care:
        L.append(f"    if ({pair.care}) begin")
    compared = [(f"ra{i}", f"rb{i}", p["name"], p["width"]) for i, p in enumerate(outs)]
    compared += [(f"ia{j}", f"ib{j}", "internal " + s["name"], s["width"]) for j, s in enumerate(pair.internals)]
    for ra, rb, pname, w in compared:
        L.append(f"    for (b = 0; b < {w}; b = b + 1) begin")
        L.append("      total = total + 1;")
        L.append(f"      if ({ra}[b] !== 1'bx) known = known + 1;")
        if pair.exact:
            L.append(f"      if ({ra}[b] !== {rb}[b]) begin")
        else:
            L.append(f"      if ({ra}[b] !== 1'bx && {ra}[b] !== {rb}[b]) begin")
        L.append("        errors = errors + 1;")
        L.append(f"        if ({rb}[b] === 1'bx && ({ra}[b] === 1'b0 || {ra}[b] === 1'b1)) xonly = xonly + 1;")
        L.append(f"        if (errors <= 8) $display(\"KERF_MISMATCH {pair.tag} vector %0d: {pname}[%0d] "
                 f"original %b rewrite %b (original %b, rewrite %b, inputs %b)\", k, b, {ra}[b], {rb}[b], "
                 f"{ra}, {rb}, all_in);")
        L.append("      end")
        L.append("    end")
    if pair.care:
        L.append("    end")
    L.append("  end endtask")
    split = []
    pos = 0
    for i, p in enumerate(ins):
        split.append(f"in{i} = all_in[{pos + p['width'] - 1}:{pos}];")
        pos += p["width"]
    words = (max(total, 1) + 31) // 32
    L.append("  initial begin")
    L.append(f"    errors = 0; xonly = 0; known = 0; total = 0; seed = {pair.seed}; all_in = 0;")
    L.append("    " + " ".join(split))
    if pair.clock:
        L.append("    clk_r = 0;")
    if pair.reset:
        L.append(f"    rst_r = {pair.reset[1]};")
        if pair.clock:
            L.append("    #1 clk_r = 1; #1 clk_r = 0; #1 clk_r = 1; #1 clk_r = 0;")
        L.append(f"    #1 rst_r = {1 - pair.reset[1]};")
    exhaustive = total <= pair.exhaustive_limit and not pair.clock
    if exhaustive:
        L.append(f"    for (k = 0; k < {1 << total}; k = k + 1) begin")
        L.append("      all_in = k;")
    else:
        L.append(f"    for (k = 0; k < {pair.vectors}; k = k + 1) begin")
        # Uniform, mostly-zero and mostly-one words: common trade practice for random
        # simulation of control logic (decoders see few ones, enables many).
        L.append("      mode = k % 3;")
        for w in range(words):
            hi = min(total, 32 * (w + 1)) - 1
            lo = 32 * w
            L.append(f"      all_in[{hi}:{lo}] = mode == 0 ? $random(seed) : mode == 1 ? "
                     f"($random(seed) & $random(seed) & $random(seed)) : "
                     f"($random(seed) | $random(seed) | $random(seed));")
    L.append("      " + " ".join(split))
    L.append("      #1 compare;")
    if pair.clock:
        L.append("      clk_r = 1; #1 compare; clk_r = 0;")
    L.append("    end")
    L.append(f"    $display(\"KERF_TB {pair.tag} errors=%0d xonly=%0d known=%0d total=%0d\", errors, xonly, known, total);")
    if finish:
        L.append("    $finish;")
    L.append("  end")
    L.append("endmodule")
    return "\n".join(L) + "\n"


_RESULT = re.compile(r"^KERF_TB (\S+) errors=(\d+) xonly=(\d+) known=(\d+) total=(\d+)$", re.M)
_MISMATCH = re.compile(r"^KERF_MISMATCH (\S+) (.*)$", re.M)


class SimResult:
    def __init__(self, ok, errors=0, known=0, total=0, detail="", xonly=0):
        self.ok, self.errors, self.known, self.total, self.detail = ok, errors, known, total, detail
        self.xonly = xonly

    def __repr__(self):
        return f"SimResult(ok={self.ok}, errors={self.errors}, known={self.known}/{self.total}, {self.detail[:200]!r})"


# Verilator's run-time library (verilated.cpp and friends) is the same C++ for every testbench and
# costs most of a small build; with a cache directory it is compiled once per test run and copied
# into each build directory, where make finds it newer than its sources and does not rebuild it.
VERILATOR_OPT = "OPT_FAST=-O0 OPT_SLOW=-O0 OPT_GLOBAL=-O0"
RUNTIME_CACHE = {"dir": ""}


def use_runtime_cache(directory):
    """Let `simulate` keep Verilator's compiled run-time library under `directory`."""
    RUNTIME_CACHE["dir"] = directory


def _verilator_build(top, args, obj, timeout, runtime):
    """Verilate and build an executable (what `--binary` does), with the run-time objects of
    `runtime` copied in after verilating, so that they are newer than every file make compares."""
    c = run(["verilator", "--cc", "--exe", "--main", "--timing", "-Wno-fatal", "--top-module", top,
             "-Mdir", obj] + args, timeout=timeout)
    if c.returncode != 0:
        return c
    if runtime:
        for o in os.listdir(runtime):
            if o.endswith(".o"):
                shutil.copy(os.path.join(runtime, o), os.path.join(obj, o))
    return run(["make", "-s", "-C", obj, "-f", f"V{top}.mk"] + VERILATOR_OPT.split(), timeout=timeout)


def _verilator_runtime(timeout):
    """The directory holding the compiled run-time objects, built on first use (None: no cache)."""
    base = RUNTIME_CACHE["dir"]
    if not base:
        return None
    version = run(["verilator", "--version"]).stdout.strip().replace(" ", "_").replace("/", "_")
    rt = os.path.join(base, "verilator-runtime-" + re.sub(r"[^A-Za-z0-9_.-]", "", version))
    done = os.path.join(rt, "done")
    if os.path.exists(done):
        return rt
    import fcntl
    os.makedirs(base, exist_ok=True)
    with open(os.path.join(base, "verilator-runtime.lock"), "w") as lock:
        fcntl.flock(lock, fcntl.LOCK_EX)   # parallel tests wait for the first build
        if os.path.exists(done):
            return rt
        build = tempfile.mkdtemp(dir=base, prefix="verilator-runtime-build-")
        top = os.path.join(build, "kerf_rt.sv")
        with open(top, "w") as f:
            f.write("module kerf_rt; initial begin #1; $finish; end endmodule\n")   # with timing
        c = _verilator_build("kerf_rt", [top], os.path.join(build, "obj"), timeout, None)
        objs = [o for o in os.listdir(os.path.join(build, "obj")) if o.startswith("verilated")
                and o.endswith(".o")] if c.returncode == 0 else []
        if not objs:
            return None
        os.makedirs(rt, exist_ok=True)
        for o in objs:
            shutil.copy2(os.path.join(build, "obj", o), os.path.join(rt, o))
        shutil.rmtree(build, ignore_errors=True)
        open(done, "w").close()
    return rt


def simulate(pairs, sources, workdir, defines=(), include_dirs=(), timeout=600, simulator="icarus"):
    """Compile `sources` (files holding every ref and new module and what they need) with one
    testbench per pair, run them in one simulator run, and return {tag: SimResult}.

    simulator "icarus" (the default and the reference: four-valued) or "verilator" (two-valued,
    only for the few constructs Icarus 11 does not read: `case inside`, packed arrays of packed
    structs; one pair per run). A compile failure returns the same failing SimResult for every
    pair (callers split the batch to find the culprit)."""
    tb_path = os.path.join(workdir, "kerf_outside_tb.sv")
    with open(tb_path, "w") as f:
        f.write("`timescale 1ns/1ps\n")
        for i, p in enumerate(pairs):
            f.write(testbench_module(p, f"kerf_tb_{i}", finish=simulator == "verilator"))
    if simulator == "verilator":
        assert len(pairs) == 1
        obj = os.path.join(workdir, "kerf_outside_obj")
        # An unoptimised C++ build: the testbench runs briefly, the compile is what costs.
        cmd = ["-Wno-lint", "-Wno-style"] + [f"-I{d}" for d in include_dirs] + [f"-D{d}" for d in defines]
        c = _verilator_build("kerf_tb_0", cmd + list(sources) + [tb_path], obj, timeout, _verilator_runtime(timeout))
        if c.returncode != 0:
            msg = "verilator failed to compile: " + (c.stderr + c.stdout)[-3000:]
            return {p.tag: SimResult(False, detail=msg) for p in pairs}
        r = run([os.path.join(obj, "Vkerf_tb_0")], timeout=timeout)
    else:
        sim = os.path.join(workdir, "kerf_outside.vvp")
        cmd = ["iverilog", "-g2012", "-o", sim]
        for d in include_dirs:
            cmd += ["-I", d]
        for d in defines:
            cmd += ["-D", d]
        cmd += list(sources) + [tb_path]
        c = run(cmd, timeout=timeout)
        if c.returncode == 0 and _restore_idle_blocks(c.stderr):
            c = run(cmd, timeout=timeout)
        if c.returncode != 0:
            msg = "iverilog failed to compile: " + (c.stderr + c.stdout)[-3000:]
            return {p.tag: SimResult(False, detail=msg) for p in pairs}
        try:
            r = run(["vvp", "-n", sim], timeout=timeout)
        except subprocess.TimeoutExpired:
            return {p.tag: SimResult(False, detail=f"the simulation did not finish within {timeout} s "
                                                   "(a zero-delay loop?)") for p in pairs}
    found = {m.group(1): m for m in _RESULT.finditer(r.stdout)}
    mism = {}
    for m in _MISMATCH.finditer(r.stdout):
        mism.setdefault(m.group(1), []).append(m.group(2))
    out = {}
    for p in pairs:
        m = found.get(p.tag)
        if m is None:
            out[p.tag] = SimResult(False, detail="the simulation printed no result: " + (r.stdout + r.stderr)[-2000:])
            continue
        e, x, k, t = int(m.group(2)), int(m.group(3)), int(m.group(4)), int(m.group(5))
        out[p.tag] = SimResult(e == 0, e, k, t, "\n".join(mism.get(p.tag, [])), xonly=x)
    return out


# ---------------------------------------------------------------------------------------------
# Verilator


_WARN = re.compile(r"^%(Warning|Error)(?:-([A-Z0-9_]+))?: (?:[^:\n]+:\d+:(?:\d+:)? )?(.*)$", re.M)


_UNUSED_BITS = re.compile(r"Bits of signal are not used: '([^']+)'\[([0-9:,]+)\]$")
_UNUSED_ALL = re.compile(r"Signal is not used: '([^']+)'$")


def _unused_bits(warnings):
    """{signal: set of bit indices, or None for the whole signal} from UNUSEDSIGNAL warnings."""
    out = {}
    for code, msg in warnings:
        if code != "UNUSEDSIGNAL":
            continue
        m = _UNUSED_ALL.search(msg)
        if m:
            out[m.group(1)] = None
            continue
        m = _UNUSED_BITS.search(msg)
        if m:
            bits = set()
            for part in m.group(2).split(","):
                hi, _, lo = part.partition(":")
                lo = lo or hi
                bits.update(range(min(int(lo), int(hi)), max(int(lo), int(hi)) + 1))
            out[m.group(1)] = bits
    return out


def new_warnings(original, rewrite):
    """Warnings of the rewrite the original does not have, sorted. Verilator gives one unused-bits
    message per signal, so a rewrite that leaves some of the same bits unused (no bit the original
    read) prints a different message that is not a new warning."""
    before = _unused_bits(original)
    added = []
    for w in sorted(rewrite - original):
        got = _unused_bits([w])
        if got:
            (name, bits), = got.items()
            if name in before and (before[name] is None or (bits is not None and bits <= before[name])):
                continue
        added.append(w)
    return added


def lint(files, top, defines=(), params=(), include_dirs=(), wall=True):
    """Verilator lint (warnings never fatal): (no errors, set of (code, message) warnings, raw text).

    Warnings are keyed by code and message (which names the signal), not by line, so the
    warnings of an original and of its rewrite can be compared."""
    cmd = ["verilator", "--lint-only", "-Wno-fatal", "--top-module", top]
    if wall:
        cmd.append("-Wall")
    for d in include_dirs:
        cmd += [f"-I{d}"]
    for d in defines:
        cmd += [f"-D{d}"]
    for p in params:
        cmd += [f"-G{p}"]
    r = run(cmd + list(files))
    warnings = set()
    errors = []
    for m in _WARN.finditer(r.stderr):
        if m.group(1) == "Error":
            if not m.group(3).startswith("Exiting due to"):
                errors.append(m.group(0))
        else:
            warnings.add((m.group(2) or "", m.group(3).strip()))
    return r.returncode == 0 and not errors, warnings, r.stderr
