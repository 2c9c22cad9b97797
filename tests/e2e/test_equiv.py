"""`kerf equiv` against mutants, with Icarus Verilog as the outside judge.

For every sample and shared EPFL file, kerf's own rewrite is mutated in its
generated lines (an inverter dropped or added, two literals swapped, a
product term dropped — the classic mutation operators of hardware test
practice). Icarus Verilog simulates each mutant against the original:
- a mutant that simulation shows different must be rejected by `kerf equiv`,
  with a counterexample that Icarus confirms on both files;
- `kerf equiv` may never call a mutant different without such a confirmed
  counterexample;
- the rewrite itself, an identical copy and a reformatted copy must be proved equal.
One case per design (`--list`).
"""
import json
import os
import random
import re
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402

GEN = re.compile(r"^(\s*(?:assign\s+|wire\s+)?[A-Za-z_]\w*(?:\s*\[[^\]]*\])?\s*=\s*)(.*);\s*$")
# A word operation kerf keeps (`assign a_plus_b = a + b;`): its operands may commute, so a swap
# need not change the function; such lines are not mutated.
WORD_OP = re.compile(r"[-+*/%<>]|[!=]=")
IDENT = re.compile(r"(?<![\w'])(~?)(\\\S+ |[A-Za-z_][A-Za-z0-9_$]*(?:\[\d+\])?)")
ORIGINAL = {"lines": set()}


def generated_lines(text):
    """Lines kerf wrote: single-line assignments that are not in the original file
    (comparisons with sized constants are left alone: a mutated width would not build; so are
    word operations)."""
    lines = text.split("\n")
    idx = []
    for i, l in enumerate(lines):
        if l in ORIGINAL["lines"] or "'" in l or WORD_OP.search(l.split("=", 1)[-1]):
            continue
        if GEN.match(l):
            idx.append(i)
    return lines, idx


def mutate(text, kind, rng):
    lines, idx = generated_lines(text)
    rng.shuffle(idx)
    for i in idx:
        m = GEN.match(lines[i])
        head, rhs = m.group(1), m.group(2)
        toks = [t for t in IDENT.finditer(rhs) if not t.group(2).startswith("1'b")]
        if kind == "invert" and toks:
            t = rng.choice(toks)
            new = rhs[:t.start()] + ("" if t.group(1) else "~") + t.group(2) + rhs[t.end():]
        elif kind == "swap" and len({t.group(2) for t in toks}) >= 2:
            a, b = rng.sample(toks, 2)
            if a.group(2) == b.group(2):
                continue
            if a.start() > b.start():
                a, b = b, a
            new = (rhs[:a.start()] + a.group(1) + b.group(2) + rhs[a.end():b.start()] + b.group(1) + a.group(2)
                   + rhs[b.end():])
        elif kind == "drop-term" and " | " in rhs and "(" not in rhs:
            terms = rhs.split(" | ")
            terms.pop(rng.randrange(len(terms)))
            new = " | ".join(terms)
        else:
            continue
        lines[i] = f"{head}{new};"
        return "\n".join(lines), i + 1
    return None, None


def port_bits(desc, key="ports"):
    """Map kerf's bit names to (port or signal, offset)."""
    m = {}
    for p in desc[key]:
        if p["width"] == 1 and p["msb"] == p["lsb"] == 0:
            m[p["name"]] = (p, 0)
        for off in range(p["width"]):
            idx = p["lsb"] + off if p["msb"] >= p["lsb"] else p["lsb"] - off
            m.setdefault(f"{p['name']}[{idx}]", (p, off))
    return m


def confirm(root, files, top, a_file, b_file, cex, work):
    """Icarus Verilog: apply the counterexample to both files; does the named output differ?"""
    desc = K.read_module(root, files, top)
    bits = port_bits(desc)
    mod_file = desc["module"]["src"]["file"]
    others = [f for f in files if f != mod_file]
    ra = K.renamed(open(a_file).read(), K.read_module(root, [a_file if f == mod_file else f for f in files], top), "cx_a")
    rb = K.renamed_like(open(b_file).read(), open(mod_file).read(), desc, "cx_b") or \
        K.renamed(open(b_file).read(), K.read_module(root, [b_file if f == mod_file else f for f in files], top), "cx_b")
    ext = ".sv" if mod_file.endswith(".sv") else ".v"
    pa, pb = os.path.join(work, "cx_a" + ext), os.path.join(work, "cx_b" + ext)
    open(pa, "w").write(ra)
    open(pb, "w").write(rb)
    ins = [p for p in desc["ports"] if p["direction"] == "input"]
    outs = [p for p in desc["ports"] if p["direction"] != "input"]
    tb = ["module cx_tb;"]
    for i, p in enumerate(ins):
        tb.append(f"  reg [{p['width']-1}:0] in{i} = 0;")
    for i, p in enumerate(outs):
        tb.append(f"  wire [{p['width']-1}:0] oa{i}, ob{i};")
    ca = [f".{K.vname(p['name'])}(in{i})" for i, p in enumerate(ins)] + [f".{K.vname(p['name'])}(oa{i})" for i, p in enumerate(outs)]
    cb = [f".{K.vname(p['name'])}(in{i})" for i, p in enumerate(ins)] + [f".{K.vname(p['name'])}(ob{i})" for i, p in enumerate(outs)]
    tb.append(f"  cx_a ua ({', '.join(ca)});")
    tb.append(f"  cx_b ub ({', '.join(cb)});")
    sigbits = port_bits(desc, "signals")
    tb.append("  initial begin")
    # kerf lists whole buses (bits most significant first) and only those the output depends on;
    # every other input stays 0.
    by_name = {p["name"]: i for i, p in enumerate(ins)}
    for b in cex["inputs"]:
        if b["port"] and b["name"] in by_name:
            tb.append(f"    in{by_name[b['name']]} = {b['width']}'b{b['bits']};")
        else:
            # Outputs of kept code (registers, instances) are free inputs of the proof: force them.
            for inst in ("ua", "ub"):
                tb.append(f"    force {inst}.{K.vname(b['name'])} = {b['width']}'b{b['bits']};")
    if cex["output"] in bits:
        p, off = bits[cex["output"]]
        o = outs.index(p)
        va, vb = f"oa{o}[{off}]", f"ob{o}[{off}]"
    else:
        sig, off = sigbits[cex["output"]]
        va, vb = f"ua.{K.vname(sig['name'])}[{off}]", f"ub.{K.vname(sig['name'])}[{off}]"
    tb.append(f"    #1 $display(\"CX %b %b\", {va}, {vb});")
    tb.append("    $finish;\n  end\nendmodule")
    tbp = os.path.join(work, "cx_tb.sv")
    open(tbp, "w").write("\n".join(tb) + "\n")
    sim = os.path.join(work, "cx.vvp")
    c = K.run(["iverilog", "-g2012", "-o", sim] + others + [pa, pb, tbp])
    if c.returncode != 0:
        return False, c.stderr[:1000]
    r = K.run(["vvp", "-n", sim])
    m = re.search(r"CX (\S+) (\S+)", r.stdout)
    return bool(m and m.group(1) != m.group(2) and m.group(1) == str(cex["a"]) and m.group(2) == str(cex["b"])), r.stdout


def equiv(a, files, top, other_file, mod_file):
    fa = files
    fb = [other_file if f == mod_file else f for f in files]
    # kerf equiv takes two module files; extra files (packages) are passed through -I-free lists
    extra = [f for f in files if f != mod_file]
    cmd = [a.kerf, "equiv", mod_file, other_file, "--top", top, "--json"]
    if extra:
        cmd += ["--common"] + extra
    r = K.run(cmd)
    try:
        return r.returncode, json.loads(r.stdout)
    except ValueError:
        return r.returncode, {"error": r.stderr[-1500:]}


def check_design(res, a, files, top, label, mutants_per_kind, rng, extra=()):
    if top is None:
        top = K.read_module(a.root, files, None)["module"]["name"]
    desc = K.read_module(a.root, files, top)
    mod_file = desc["module"]["src"]["file"]
    with tempfile.TemporaryDirectory() as work:
        ext = os.path.splitext(mod_file)[1]
        out = os.path.join(work, top + ext)
        r = K.run([a.kerf, "restructure", *files, "--top", top, "-o", out, *extra])
        if not res.check(r.returncode == 0, f"{label}: restructure: {r.stderr[-1500:]}"):
            return
        # Equal versions: the rewrite, an identical copy, a reformatted copy.
        same = os.path.join(work, "same" + ext)
        open(same, "w").write(open(mod_file).read())
        reform = os.path.join(work, "reform" + ext)
        open(reform, "w").write("// reformatted copy\n" + open(mod_file).read().replace(";", " ;").replace("\n", "\n\n"))
        for other, what in ((out, "rewrite"), (same, "identical copy"), (reform, "reformatted copy")):
            code, j = equiv(a, files, top, other, mod_file)
            res.check(code == 0 and j.get("verdict") == "equivalent", f"{label}: {what} proved equal: {j}")
        text = open(out).read()
        ORIGINAL["lines"] = set(open(mod_file).read().split("\n"))
        for kind in ("invert", "swap", "drop-term"):
            for n in range(mutants_per_kind):
                mutant, line = mutate(text, kind, rng)
                if mutant is None:
                    break
                mdir = os.path.join(work, f"{kind}{n}")
                os.mkdir(mdir)
                mfile = os.path.join(mdir, top + ext)
                open(mfile, "w").write(mutant)
                # 2000 vectors: a difference they miss is still checked below, by Icarus
                # replaying kerf's counterexample, so the verdict never goes unchecked.
                sim_ok, _, _ = K.simulate_equal(a.root, files, top, mfile, mdir, vectors=2000)
                code, j = equiv(a, files, top, mfile, mod_file)
                verdict = j.get("verdict")
                if not sim_ok:
                    if res.check(verdict == "different" and code == 1,
                                 f"{label}: {kind} mutant at line {line} (simulation differs) rejected: {j}"):
                        ok, log = confirm(a.root, files, top, mod_file, mfile, j["counterexample"], mdir)
                        res.check(ok, f"{label}: {kind} mutant: Icarus Verilog confirms the counterexample: {log}")
                else:
                    if verdict == "different":
                        ok, log = confirm(a.root, files, top, mod_file, mfile, j["counterexample"], mdir)
                        res.check(ok, f"{label}: {kind} mutant called different: Icarus confirms: {log}")
                    else:
                        res.check(verdict in ("equivalent", "undecided"), f"{label}: {kind} mutant verdict {j}")


S = K.Suite(__doc__)


def design_case(files, top, label, mutants_per_kind):
    def run(t):
        # Flat netlists: their numbered wires may dissolve (otherwise each one pins its logic).
        check_design(t.res, t.args, files if files else [t.epfl(label.split("/")[1])], top, label,
                     mutants_per_kind, random.Random(f"20261201-{label}"),
                     () if files else ("--dissolve-internal",))
    return run


for _files, _top in K.SAMPLES:
    S.add(f"sample_{_top}", design_case(_files, _top, _top, 3), needs=("iverilog",))
for _name in K.EPFL:
    if _name == "voter":
        continue  # covered by the round-trip proof; its simulation dominates the run time
    S.add(f"epfl_{_name}", design_case(None, None, f"epfl/{_name}", 2), needs=("iverilog", "epfl"))


# A struct port shown by member: an invented command bus (package typedef, nested struct).
# (Compilation-unit typedefs and `!` on the nested member: Icarus Verilog 11 stops on a
# struct-typed member in a package and on `~` applied to a nested member.)
STRUCT_PKG = """typedef struct packed { logic hi; logic [1:0] sel; } route_t;
typedef struct packed { logic [2:0] op; route_t route; logic valid; } cmd_t;
"""
STRUCT_MOD = """module cmd_gate (input cmd_t cmd, input logic [3:0] lanes, output logic go, output logic [1:0] pick);
  assign go = cmd.valid & (cmd.op == 3'd5) & !cmd.route.hi & (lanes != 4'd0);
  assign pick = cmd.route.sel ^ lanes[1:0];
endmodule
"""


@S.case("struct_port_members", needs=("iverilog",))
def struct_port_members(t):
    """The counterexample shows a struct port member by member; Icarus Verilog (outside
    reference), given only the members by name, sees the output differ as kerf says."""
    pkg = os.path.join(t.work, "cmd_types.sv")
    fa = os.path.join(t.work, "a", "cmd_gate.sv")
    fb = os.path.join(t.work, "b", "cmd_gate.sv")
    os.makedirs(os.path.dirname(fa))
    os.makedirs(os.path.dirname(fb))
    open(pkg, "w").write(STRUCT_PKG)
    mod_b = STRUCT_MOD.replace("!cmd.route.hi", "cmd.route.hi")
    open(fa, "w").write(STRUCT_PKG + STRUCT_MOD)   # the types in the file's own compilation unit
    open(fb, "w").write(STRUCT_PKG + mod_b)
    r = K.run([t.kerf, "equiv", fa, fb, "--top", "cmd_gate", "--json"])
    if not t.res.check(r.returncode == 1, f"exit 1 for a mutant: {r.returncode} {r.stdout[-800:]} {r.stderr[-800:]}"):
        return
    cex = json.loads(r.stdout)["counterexample"]
    buses = {b["name"]: b for b in cex["inputs"]}
    if not t.res.check("cmd" in buses and buses["cmd"].get("members"), f"cmd shown by member: {cex}"):
        return
    names = [m["name"] for m in buses["cmd"]["members"]]
    t.res.check(names == ["op", "route.hi", "route.sel", "valid"], f"members in declaration order: {names}")
    t.res.check("lanes" not in buses or not buses["lanes"].get("members"), "a plain vector has no members")
    # Icarus: set the struct through its members only, as kerf printed them.
    tb = ["module tb;", "  cmd_t c; logic [3:0] l; wire ga, gb; wire [1:0] pa, pb;",
          "  cmd_gate_a ua (.cmd(c), .lanes(l), .go(ga), .pick(pa));",
          "  cmd_gate_b ub (.cmd(c), .lanes(l), .go(gb), .pick(pb));",
          "  initial begin", "    c = '0; l = '0;"]
    for m in buses["cmd"]["members"]:
        tb.append(f"    c.{m['name']} = {m['value']};")
    if "lanes" in buses:
        tb.append(f"    l = {buses['lanes']['value']};")
    tb += ["    #1 $display(\"CX %b %b\", ga, gb);", "    $finish;", "  end", "endmodule"]
    files = []
    for tag, text in (("a", STRUCT_MOD), ("b", mod_b)):
        p = os.path.join(t.work, f"ren_{tag}.sv")
        open(p, "w").write(text.replace("module cmd_gate", f"module cmd_gate_{tag}"))
        files.append(p)
    tbp = os.path.join(t.work, "tb.sv")
    open(tbp, "w").write("\n".join(tb) + "\n")
    sim = os.path.join(t.work, "tb.vvp")
    c = K.run(["iverilog", "-g2012", "-o", sim, pkg] + files + [tbp])
    if not t.res.check(c.returncode == 0, f"iverilog: {c.stderr[:800]}"):
        return
    out = K.run(["vvp", "-n", sim]).stdout
    m = re.search(r"CX (\S+) (\S+)", out)
    t.res.check(cex["output"] == "go" and m is not None and (m.group(1), m.group(2)) == (str(cex["a"]), str(cex["b"])),
                f"Icarus Verilog gives go = {m and m.groups()} for the members shown, kerf says {cex['a']} {cex['b']}")


if __name__ == "__main__":
    S.main()
