"""kerf_e2e — the harness and shared helpers of the end-to-end tests.

The outside reference for behaviour is Icarus Verilog (the simulator
`iverilog`/`vvp` from Debian's packages); for lint cleanliness it is
Verilator (`verilator --lint-only -Wall`). The module's ports and byte
ranges come from kerf's own slang reader.

A driver (tests/<dir>/test_*.py) declares its cases on a `Suite`:

    S = K.Suite(__doc__)

    @S.case("uart_regsel", needs=("iverilog",))
    def _(t):                      # t.kerf, t.root, t.res (check/skip), t.work (a fresh directory)
        t.res.check(..., "what is checked (outside reference)")

    if __name__ == "__main__":
        S.main()

`S.main()` understands `--list` (case names, one a line: CMake registers one
ctest entry per case), `--case NAME` (run one case), `--only TEXT` (cases
whose name contains TEXT) and `--kerf/--root/--cache`. It ends with the line
`N passed, M failed, K skipped` and exits 1 on a failure, 77 (ctest's skip)
when every case was skipped, else 0. A case whose tool (`iverilog`,
`verilator`) or data (`epfl`: ../shared/benchmarks/epfl) is missing is
skipped with the reason printed — except under CI (environment CI set),
where a missing requirement fails, so CI never passes by skipping.

The reader's description of a set of files is cached on disk (`--cache`, by
the content of the files and of the reader), so a test run reads each design
once however many checks look at it.
"""
import argparse
import hashlib
import json
import os
import re
import random
import shutil
import subprocess
import sys
import tempfile
import traceback

SAMPLES = [
    # (files, top) — every sample shipped in samples/
    (["samples/uart_regsel.v"], "uart_regsel"),
    (["samples/rv_decoder.sv"], "rv_decoder"),
    (["samples/dma_fsm.sv"], "dma_fsm"),
    (["samples/irq_pkg.sv", "samples/irq_router.sv"], "irq_router"),
    (["samples/gpio_mux.v"], "gpio_mux"),
]
EPFL = ["ctrl", "dec", "int2float", "router", "priority", "voter"]


class Results:
    def __init__(self):
        self.passed = 0
        self.failed = 0
        self.skipped = 0

    def check(self, cond, what):
        if cond:
            self.passed += 1
        else:
            self.failed += 1
            print(f"FAIL: {what}", flush=True)
        return cond

    def skip(self, what):
        self.skipped += 1
        print(f"SKIPPED: {what}", flush=True)

    def finish(self):
        print(f"{self.passed} passed, {self.failed} failed, {self.skipped} skipped")
        sys.exit(1 if self.failed else 0)


def args():
    p = argparse.ArgumentParser()
    p.add_argument("--kerf", required=True)
    p.add_argument("--root", required=True)
    p.add_argument("--only", default="")
    return p.parse_args()


def epfl_dir(root):
    d = os.path.normpath(os.path.join(root, "..", "shared", "benchmarks", "epfl"))
    return d if os.path.isdir(d) else None


def run(cmd, **kw):
    return subprocess.run(cmd, capture_output=True, text=True, **kw)


_MEMO = {}


def _digest(root, files, top):
    h = hashlib.sha256()
    reader_dir = os.path.join(root, "src", "reader")
    for name in sorted(os.listdir(reader_dir)):
        if name.endswith(".py"):
            h.update(name.encode() + b"\0" + open(os.path.join(reader_dir, name), "rb").read())
    h.update(b"top\0" + (top or "").encode())
    for f in files:
        h.update(b"file\0" + f.encode() + b"\0" + open(f, "rb").read())
    return h.hexdigest()


def read_module(root, files, top):
    """The module description from kerf's slang reader (docs/reader-format.md), cached."""
    key = _digest(root, files, top)
    if key in _MEMO:
        return json.loads(_MEMO[key])
    cache = os.environ.get("KERF_E2E_CACHE")
    path = os.path.join(cache, key + ".json") if cache else None
    if path and os.path.exists(path):
        text = open(path).read()
    else:
        cmd = [sys.executable, os.path.join(root, "src/reader/kerf_read.py")] + (["--top", top] if top else []) + files
        r = run(cmd)
        if r.returncode != 0:
            raise RuntimeError(f"reader failed on {files}: {r.stderr}")
        text = r.stdout
        if path:
            os.makedirs(cache, exist_ok=True)
            fd, tmp = tempfile.mkstemp(dir=cache)
            with os.fdopen(fd, "w") as f:
                f.write(text)
            os.replace(tmp, path)   # atomic: parallel tests may write the same entry
    _MEMO[key] = text
    return json.loads(text)


# docs/guide.md "Names of new wires": the cap on a name kerf gives a new wire (the --wire-prefix
# is not counted).
MAX_WIRE_NAME = 26
GUARD_WIRE = re.compile(r"kerf_restructured_for_other_\w+_values")


def new_wires(src_text, out_text):
    """Names of the wires kerf declared: `wire [..] name` on lines the source does not have,
    with a name the source does not use (an author's declaration rewritten keeps its name)."""
    old = set(src_text.split("\n"))
    own = set(re.findall(r"[A-Za-z_][A-Za-z0-9_$]*", src_text))
    found = []
    for line in out_text.split("\n"):
        if line in old:
            continue
        m = re.match(r"\s*wire\s+(?:\[[^\]]*\]\s*)?([A-Za-z_][A-Za-z0-9_$]*)\b", line)
        if m and m.group(1) not in own:
            found.append(m.group(1))
    return found


def wire_name_problems(src_text, out_text):
    """What is wrong with the names of the wires kerf declared in out_text: names over
    MAX_WIRE_NAME characters, and names not declared exactly once. Empty when all is well."""
    # The --param guard's wire (docs/guide.md: `kerf_restructured_for_other_N_values`, inside the
    # `kerf_parameter_guard` block) is a message Icarus prints when it stops, not a name of logic.
    wires = [w for w in new_wires(src_text, out_text) if not GUARD_WIRE.fullmatch(w)]
    problems = []
    long = [w for w in wires if len(w) > MAX_WIRE_NAME]
    if long:
        problems.append(f"generated names over {MAX_WIRE_NAME} characters: {long}")
    declared = re.findall(r"(?m)^\s*(?:wire|logic|reg)\b\s*(?:signed\s*)?(?:\[[^\]]*\]\s*)*([A-Za-z_][A-Za-z0-9_$]*)",
                          out_text)
    twice = sorted({w for w in wires if declared.count(w) != 1})
    if twice:
        problems.append(f"generated names not declared exactly once: {twice}")
    return problems


def port_signature(desc):
    return [(p["name"], p["direction"], p["width"], p["signed"]) for p in desc["ports"]]


def renamed(text, desc, new_name):
    """The module's source with only its name changed, located by the reader's byte range."""
    raw = text.encode()
    start = desc["module"]["src"]["start"]
    name = desc["module"]["name"].encode()
    pos = raw.index(name, start)
    return (raw[:pos] + new_name.encode() + raw[pos + len(name):]).decode()


def renamed_like(text, original, desc, new_name):
    """renamed(text, ...) without reading `text`: when its bytes up to the end of the module's
    name are the original's (a rewrite or a mutant of it leaves everything before the module's
    name as it was), the name is where the reader found it in the original. None otherwise
    (then read the text)."""
    raw, orig = text.encode(), original.encode()
    name = desc["module"]["name"].encode()
    try:
        pos = orig.index(name, desc["module"]["src"]["start"])
    except ValueError:
        return None
    end = pos + len(name)
    ident = re.compile(rb"[A-Za-z0-9_$]")
    if raw[:end] != orig[:end] or end >= len(raw) or end >= len(orig) or raw[end:end + 1] != orig[end:end + 1] \
            or ident.match(raw[end:end + 1]):
        return None
    return (raw[:pos] + new_name.encode() + raw[end:]).decode()


def vname(n):
    ok = (n[:1].isalpha() or n[:1] == "_") and all(c.isalnum() or c in "_$" for c in n)
    return n if ok else "\\" + n + " "


def testbench(desc, ref_name, new_name, exhaustive_limit=16, vectors=10000, seed=1):
    """A testbench driving both modules with the same inputs and comparing every output.

    Exhaustive up to `exhaustive_limit` input bits, otherwise `vectors` patterns
    mixing uniform, mostly-zero and mostly-one words (trade practice for
    random simulation of control logic). It stops after ten mismatches: a
    verdict of "different" needs no more, and mutants end early."""
    ins = [p for p in desc["ports"] if p["direction"] == "input"]
    outs = [p for p in desc["ports"] if p["direction"] != "input"]
    total = sum(p["width"] for p in ins)
    lines = ["`timescale 1ns/1ps", "module kerf_tb;"]
    for i, p in enumerate(ins):
        lines.append(f"  reg [{p['width']-1}:0] in{i};")
    for i, p in enumerate(outs):
        lines.append(f"  wire [{p['width']-1}:0] ra{i}, rb{i};")
    conn_a = [f".{vname(p['name'])}(in{i})" for i, p in enumerate(ins)] + \
             [f".{vname(p['name'])}(ra{i})" for i, p in enumerate(outs)]
    conn_b = [f".{vname(p['name'])}(in{i})" for i, p in enumerate(ins)] + \
             [f".{vname(p['name'])}(rb{i})" for i, p in enumerate(outs)]
    lines.append(f"  {ref_name} ua ({', '.join(conn_a)});")
    lines.append(f"  {new_name} ub ({', '.join(conn_b)});")
    lines.append("  integer k, errors, mode;")
    lines.append(f"  reg [{max(total,1)-1}:0] all_in;")
    lines.append("  task compare; begin")
    for i, p in enumerate(outs):
        lines.append(f"    if (ra{i} !== rb{i}) begin errors = errors + 1; "
                     f"if (errors < 10) $display(\"MISMATCH {p['name']} vector %0d: %b vs %b\", k, ra{i}, rb{i}); end")
    lines.append("  end endtask")
    # Split all_in into the inputs.
    assign = []
    pos = 0
    for i, p in enumerate(ins):
        assign.append(f"in{i} = all_in[{pos + p['width'] - 1}:{pos}];")
        pos += p["width"]
    words = (max(total, 1) + 31) // 32
    lines.append("  initial begin")
    lines.append(f"    errors = 0; k = {seed}; mode = $random(k);")
    if total <= exhaustive_limit:
        lines.append(f"    for (k = 0; k < {1 << total} && errors < 10; k = k + 1) begin")
        lines.append("      all_in = k;")
    else:
        lines.append(f"    for (k = 0; k < {vectors} && errors < 10; k = k + 1) begin")
        lines.append("      mode = k % 3;")
        for w in range(words):
            hi = min(total, 32 * (w + 1)) - 1
            lo = 32 * w
            lines.append(f"      all_in[{hi}:{lo}] = mode == 0 ? $random : mode == 1 ? "
                         f"($random & $random & $random) : ($random | $random | $random);")
    lines.append("      " + " ".join(assign))
    lines.append("      #1; compare;")
    lines.append("    end")
    lines.append("    $display(\"KERF_TB errors=%0d\", errors);")
    lines.append("    $finish;")
    lines.append("  end")
    lines.append("endmodule")
    return "\n".join(lines) + "\n", total


def simulate_equal(root, files, top, out_file, workdir, vectors=10000):
    """Icarus Verilog (outside reference): the rewrite matches the original on every output."""
    desc = read_module(root, files, top)
    mod_file = desc["module"]["src"]["file"]
    original = open(mod_file).read()
    ref = renamed(original, desc, top + "_ref")
    new = renamed_like(open(out_file).read(), original, desc, top + "_new")
    if new is None:
        new = renamed(open(out_file).read(), read_module(root, [out_file if f == mod_file else f for f in files], top),
                      top + "_new")
    ext = ".sv" if mod_file.endswith(".sv") else ".v"
    ref_path = os.path.join(workdir, "ref" + ext)
    new_path = os.path.join(workdir, "new" + ext)
    open(ref_path, "w").write(ref)
    open(new_path, "w").write(new)
    tb, bits = testbench(desc, top + "_ref", top + "_new", vectors=vectors)
    tb_path = os.path.join(workdir, "tb.sv")
    open(tb_path, "w").write(tb)
    others = [f for f in files if f != mod_file]
    sim = os.path.join(workdir, "sim.vvp")
    c = run(["iverilog", "-g2012", "-o", sim] + others + [ref_path, new_path, tb_path])
    if c.returncode != 0:
        return False, f"iverilog failed: {c.stderr[:2000]}", bits
    r = run(["vvp", "-n", sim])
    ok = "KERF_TB errors=0" in r.stdout
    return ok, r.stdout[-2000:], bits


# ---------------------------------------------------------------- the harness

REQUIREMENTS = {
    "iverilog": lambda root: (shutil.which("iverilog") and shutil.which("vvp"),
                              "Icarus Verilog (iverilog, vvp) is not installed"),
    "verilator": lambda root: (shutil.which("verilator"), "Verilator is not installed"),
    "epfl": lambda root: (epfl_dir(root), "the EPFL benchmarks are not at ../shared/benchmarks/epfl"),
}


class Case:
    """What a case body gets: paths, a fresh work directory and the results."""

    def __init__(self, name, args, res, work):
        self.name = name
        self.kerf = args.kerf
        self.root = args.root
        self.args = args
        self.res = res
        self.work = work

    def epfl(self, name):
        return os.path.join(epfl_dir(self.root), name + ".v")


class Suite:
    def __init__(self, doc=""):
        self.doc = doc
        self.cases = []

    def case(self, name, needs=()):
        def register(fn):
            if any(c[0] == name for c in self.cases):
                raise ValueError(f"duplicate case name {name}")
            self.cases.append((name, tuple(needs), fn))
            return fn
        return register

    def add(self, name, fn, needs=()):
        self.case(name, needs)(fn)

    def main(self, argv=None):
        p = argparse.ArgumentParser(description=(self.doc or "").strip().split("\n")[0])
        p.add_argument("--kerf", help="the kerf binary")
        p.add_argument("--root", help="the repository root")
        p.add_argument("--list", action="store_true", help="print the case names and exit")
        p.add_argument("--case", action="append", default=[], help="run this case (exact name; repeatable)")
        p.add_argument("--only", default="", help="run the cases whose name contains this")
        p.add_argument("--cache", default="", help="directory caching the reader's descriptions")
        a = p.parse_args(argv)
        if a.list:
            for name, _, _ in self.cases:
                print(name)
            return 0
        if not a.kerf or not a.root:
            p.error("--kerf and --root are required")
        a.kerf = os.path.abspath(a.kerf)
        a.root = os.path.abspath(a.root)
        if a.cache:
            os.environ["KERF_E2E_CACHE"] = os.path.abspath(a.cache)
        os.chdir(a.root)
        chosen = [c for c in self.cases if (not a.case or c[0] in a.case) and a.only in c[0]]
        unknown = [n for n in a.case if n not in {c[0] for c in self.cases}]
        res = Results()
        for n in unknown:
            res.check(False, f"no case named {n}")
        in_ci = bool(os.environ.get("CI"))
        ran = 0
        for name, needs, fn in chosen:
            missing = []
            for need in needs:
                ok, why = REQUIREMENTS[need](a.root)
                if not ok:
                    missing.append(why)
            if missing:
                if in_ci:
                    res.check(False, f"{name}: required under CI: {'; '.join(missing)}")
                else:
                    res.skip(f"{name}: {'; '.join(missing)}")
                continue
            ran += 1
            with tempfile.TemporaryDirectory(prefix="kerf-e2e-") as work:
                try:
                    fn(Case(name, a, res, work))
                except Exception:
                    res.check(False, f"{name}: exception\n{traceback.format_exc()}")
        # Nothing ran, or what ran skipped itself (e.g. a limit the sanitizer build cannot
        # honour) and checked nothing: a visible skip, not a pass and not a failure.
        if res.skipped and not res.failed and res.passed == 0:
            print(f"{res.passed} passed, {res.failed} failed, {res.skipped} skipped")
            sys.exit(77)
        if ran and res.passed == 0 and not res.failed:
            res.check(False, "the selected cases checked nothing")
        res.finish()
