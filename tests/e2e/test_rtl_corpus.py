#!/usr/bin/env python3
"""The test-design corpus: every module in tests/rtl/ through `kerf restructure`, checked by
tools that are not kerf.

Each case is one file tests/rtl/<case>.sv or .v (helpers it needs live in tests/rtl/include/).
A few comment lines at its top say how to run it (a test-harness convention of ours):

    // kerf-case: what the design is and what it exercises
    // kerf-top: NAME              module to restructure (default: the only module in the file)
    // kerf-with: include/x.sv     files compiled before the case (packages), relative to tests/rtl
    // kerf-defines: A B=2         one line per define set ('-' = none); default: one empty set
    // kerf-params: W=8 N=2        one line per parameter set simulated besides the defaults
    // kerf-flags: --keep-x        one line per restructure variant ('-' = none); default: none
    // kerf-pin: W=8 other W=4     restructure with --param W=8; the rewrite must match with W=8
                                   and refuse to build with W=4
    // kerf-clock: clk             clock input (toggled after every vector)
    // kerf-reset: rst_ni 0        reset input and its active value (held for two cycles)
    // kerf-equiv-against: F       an equivalence case: `kerf equiv` of this file and F
    // kerf-care: EXPR            compare only where EXPR holds (the original instance is `ua`)
    // kerf-simulator: verilator   two-valued Verilator simulation for what Icarus 11 cannot read
    // kerf-lint: off              Verilator cannot read the original (say why in the case)
    // kerf-vectors: N             random vectors when the inputs are too wide for all of them

For every define set D and variant F, kerf restructures the module (the first D and F's rewrite is
restructured once more under the default --min-gain, which must change nothing: idempotence);
then, for every define set
D2 and parameter set P (a rewrite must be right for every build of the file, not just the one it
was made under), the original and the rewrite are compared by
- Icarus Verilog (outside reference, four-valued simulation): every output bit, and every bit
  of every internal signal declared in the module body, where the original is not x; exactly
  with --keep-x (the rewrite must keep every declaration: slang lists the signals of both);
- Verilator (outside reference, lint): `--lint-only -Wall` of the rewrite adds no warning the
  original does not have.
Each rewrite's lines stay within 100 columns, and the names it gives new wires within the cap
docs/guide.md states (26 characters), each declared once (common trade practice for review).
An equivalence case runs `kerf equiv` on two versions and Icarus on the same two: when Icarus
sees a difference kerf must not say "equivalent" (exit 0); when Icarus sees none on every input
vector kerf must not say "different" (exit 1).

Cases that fail today are listed in tests/rtl/known-failures.txt, one line per case and kind of
failure (see KINDS) with the reason. The driver fails when a case fails in a way not listed for
it, and when a listed failure no longer occurs (the list must stay honest).
A case whose original does not compile in slang, Icarus or Verilator is broken, listed or not.

    test_rtl_corpus.py --kerf build/kerf --root . [--only SUBSTRING | --case NAME] [--list]

The harness (tests/CMakeLists.txt) registers one ctest entry per case, e2e.rtl_corpus.<case>.
"""
import argparse
import json
import os
import shlex
import shutil
import sys
import tempfile

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import kerf_e2e as K  # noqa: E402
import outside_check as O  # noqa: E402


class Case:
    def __init__(self, path):
        self.path = path
        self.name = os.path.splitext(os.path.basename(path))[0]
        self.meta = {}
        with open(path) as f:
            for line in f:
                s = line.strip()
                if not s.startswith("// kerf-"):
                    if s and not s.startswith("//"):
                        break
                    continue
                key, _, val = s[len("// kerf-"):].partition(":")
                self.meta.setdefault(key.strip(), []).append(val.strip())
        d = os.path.dirname(path)
        self.with_files = [os.path.join(d, w) for line in self.meta.get("with", []) for w in line.split()]
        self.files = self.with_files + [path]
        self.include_dirs = [d, os.path.join(d, "include")]
        self.define_sets = [self._words(v) for v in self.meta.get("defines", [])] or [[]]
        self.param_sets = [[]] + [self._words(v) for v in self.meta.get("params", [])]
        self.flag_sets = [self._words(v) for v in self.meta.get("flags", [])] or [[]]
        self.pins = []
        for v in self.meta.get("pin", []):
            pinned, _, other = v.partition(" other ")
            self.pins.append((pinned.split(), other.split()))
        self.clock = (self.meta.get("clock") or [None])[0]
        r = (self.meta.get("reset") or [None])[0]
        self.reset = (r.split()[0], int(r.split()[1])) if r else None
        eq = (self.meta.get("equiv-against") or [None])[0]
        self.equiv_against = os.path.join(d, eq) if eq else None
        self.lint = (self.meta.get("lint") or ["on"])[0] != "off"
        self.care = (self.meta.get("care") or [None])[0]
        self.simulator = (self.meta.get("simulator") or ["icarus"])[0]
        self.vectors = int((self.meta.get("vectors") or ["3000"])[0])
        self.top = (self.meta.get("top") or [None])[0]
        if self.top is None:
            names = [n for n, _ in O.module_names(open(path).read())]
            if len(names) != 1:
                raise RuntimeError(f"{path}: name the module with // kerf-top: (found {names})")
            self.top = names[0]

    @staticmethod
    def _words(v):
        return [] if v.strip() == "-" else v.split()


KINDS = {
    "refused": "kerf exits 2 (bad input) on the case",
    "internal": "kerf exits with another non-zero code or crashes",
    "kept": "kerf restructures nothing (every statement kept as written)",
    "report": "kerf's JSON report lacks the count of restructured statements",
    "build": "the rewrite does not build or run under Icarus Verilog (or slang rejects it)",
    "decl": "the rewrite deletes the declaration of an internal signal",
    "sim": "Icarus Verilog shows the rewrite behaving differently from the original",
    "lint": "Verilator -Wall warns about the rewrite where it did not about the original",
    "guard": "a rewrite pinned with --param still builds with another value",
    "layout": "a line kerf wrote is longer than 100 columns",
    "names": "a name kerf gave a new wire is over the cap (26 characters) or not declared exactly once",
    "idempotence": "kerf (default --min-gain) on its own rewrite of the first build would rewrite it again",
    "equiv": "kerf equiv gives a verdict that Icarus Verilog contradicts",
    "equiv-error": "kerf equiv fails instead of giving a verdict",
}


def known_failures(root):
    """{(case, kind): reason} from tests/rtl/known-failures.txt (lines: CASE KIND REASON...)."""
    path = os.path.join(root, "tests", "rtl", "known-failures.txt")
    out = {}
    if os.path.exists(path):
        for n, line in enumerate(open(path), 1):
            s = line.strip()
            if s and not s.startswith("#"):
                parts = s.split(None, 2)
                if len(parts) < 3 or parts[1] not in KINDS:
                    raise RuntimeError(f"{path}:{n}: expected 'CASE KIND REASON' with KIND one of {sorted(KINDS)}")
                out[(parts[0], parts[1])] = parts[2]
    return out


def cases(root):
    d = os.path.join(root, "tests", "rtl")
    return [Case(os.path.join(d, f)) for f in sorted(os.listdir(d)) if f.endswith((".sv", ".v"))]


def dflags(defs):
    return [x for d in defs for x in ("-D", d)]


def idirs(case):
    return [x for d in case.include_dirs for x in ("-I", d)]


def label(defs, params=(), flags=()):
    parts = []
    if defs:
        parts.append("defines " + " ".join(defs))
    if params:
        parts.append("params " + " ".join(params))
    if flags:
        parts.append("flags " + " ".join(flags))
    return "[" + ("; ".join(parts) or "defaults") + "]"


class Run:
    """The outcome of one case: problems with kerf (failures) and problems with the case itself."""

    def __init__(self, case):
        self.case = case
        self.problems = []     # (kind, text)
        self.broken = []
        self.notes = []
        self.original_lint = {}   # (defines, params) -> Verilator -Wall warnings of the original

    def problem(self, kind, text):
        self.problems.append((kind, text))

    def kinds(self):
        return sorted({k for k, _ in self.problems})


def check_original(run, work):
    """The case must be valid Verilog for every build it declares (slang, Icarus, Verilator)."""
    c = run.case
    for defs in c.define_sets:
        for params in c.param_sets:
            try:
                O.ports(c.files, c.top, defs, params, c.include_dirs)
            except RuntimeError as e:
                run.broken.append(f"{label(defs, params)}: {e}")
                continue
            if not c.lint:
                continue
            ok, warnings, text = O.lint(c.files, c.top, defs, params, c.include_dirs)
            if not ok:
                run.broken.append(f"{label(defs, params)}: Verilator rejects the original: {text[-1500:]}")
            run.original_lint[(tuple(defs), tuple(params))] = warnings
    for defs in c.define_sets if c.simulator == "icarus" else []:
        r = O.run(["iverilog", "-g2012", "-o", os.path.join(work, "orig.vvp")] + idirs(c) + dflags(defs) + c.files)
        if r.returncode != 0:
            run.broken.append(f"{label(defs)}: Icarus rejects the original: {r.stderr[-1500:]}")


def compare(run, out_path, work, defs, params, exact, what, ref_files=None):
    """Icarus and Verilator on the original against the file `out_path` under one build."""
    c = run.case
    ref_files = ref_files or c.files
    if open(out_path, "rb").read() == open(ref_files[-1], "rb").read():
        run.notes.append(f"{what}: the rewrite is byte-identical to the original (nothing to compare)")
        return
    try:
        plist, internals = O.signals(ref_files, c.top, defs, params, c.include_dirs)
    except RuntimeError as e:
        run.broken.append(f"{what}: {e}")
        return
    # No declaration is ever deleted (issue 9): testbenches refer to internal names.
    try:
        _, new_internals = O.signals(c.with_files + [out_path], c.top, defs, params, c.include_dirs)
    except RuntimeError as e:
        run.problem("build", f"{what}: slang rejects the rewrite in this build: {e}")
        return
    kept_names = {s["name"] for s in new_internals}
    lost = [s["name"] for s in internals if s["name"] not in kept_names]
    if lost:
        run.problem("decl", f"{what}: the rewrite no longer declares {', '.join(lost)}")
    internals = [s for s in internals if s["name"] in kept_names]
    sim_dir = tempfile.mkdtemp(dir=work)
    ext = os.path.splitext(c.path)[1]
    ref = os.path.join(sim_dir, "ref" + ext)
    new = os.path.join(sim_dir, "new" + ext)
    try:
        # Both sides get the same Icarus workaround as the random modules (see
        # always_comb_as_always_star): Icarus 11 can loop forever on always_comb blocks that
        # are not in a loop (min_false_loop's original does).
        fix = O.always_comb_as_always_star if c.simulator == "icarus" else (lambda t: t)
        open(ref, "w").write(fix(O.renamed(open(ref_files[-1]).read(), c.top, c.top + "_kerf_ref")))
        open(new, "w").write(fix(O.renamed(open(out_path).read(), c.top, c.top + "_kerf_new")))
    except RuntimeError as e:
        run.problem("build", f"{what}: cannot locate the module in the rewrite: {e}")
        return
    pair = O.Pair("case", c.top + "_kerf_ref", c.top + "_kerf_new", plist, params=params, exact=exact,
                  clock=c.clock, reset=c.reset, vectors=c.vectors, care=c.care, internals=internals)
    res = O.simulate([pair], c.with_files + [ref, new], sim_dir, defines=defs, include_dirs=c.include_dirs,
                     simulator=c.simulator)["case"]
    if not res.ok and ("failed to compile" in res.detail or "printed no result" in res.detail):
        run.problem("build", f"{what}: the rewrite does not build or run under Icarus Verilog: {res.detail}")
    elif not res.ok:
        run.problem("sim", f"{what}: {'Icarus Verilog' if c.simulator == 'icarus' else 'Verilator'}: "
                           f"the rewrite differs from the original "
                            f"({res.errors} output bits):\n{res.detail}")
    elif res.known == 0:
        run.broken.append(f"{what}: the original's outputs are x on every vector; the comparison checks nothing")
    else:
        sim = "Icarus Verilog" if c.simulator == "icarus" else "Verilator (two-valued)"
        run.notes.append(f"{what}: {sim}: {res.known} of {res.total} compared bits known in the "
                         f"original, all equal")
    # Verilator: no new warnings (the rewrite sits in a file of the case's name, as -Wall expects).
    if not c.lint:
        return
    key = (tuple(defs), tuple(params))
    if key not in run.original_lint:   # a pinned value (kerf-pin) that no kerf-params line lists
        run.original_lint[key] = O.lint(c.files, c.top, defs, params, c.include_dirs)[1]
    keys_a = run.original_lint[key]
    ok_b, keys_b, text_b = O.lint(c.with_files + [out_path], c.top, defs, params, c.include_dirs)
    added = O.new_warnings(keys_a, keys_b)
    if added:
        run.problem("lint", f"{what}: Verilator -Wall warns about the rewrite where it did not about the "
                            f"original: {added}\n{text_b[-1500:]}")
    elif not ok_b:
        run.problem("lint", f"{what}: Verilator -Wall rejects the rewrite: {text_b[-1500:]}")


# Options added to every `kerf restructure` of the run (--kerf-args), e.g. another effort or goal.
RUN_ARGS = []


def restructure(kerf, run, work, defs, flags, tag, extra=()):
    c = run.case
    out_dir = os.path.join(work, tag)
    os.makedirs(out_dir, exist_ok=True)
    out = os.path.join(out_dir, os.path.basename(c.path))
    # --min-gain 0: rewrite every group that does not grow, so that the writer is exercised
    # on each case even where the rewrite would not pay (by default such statements stay as written).
    extra = [*extra, *RUN_ARGS]
    cmd = [kerf, "restructure", *c.files, "--top", c.top, *idirs(c), *dflags(defs), *flags, *extra,
           "--min-gain", "0", "-o", out]
    report = os.path.join(out_dir, "report.json")
    # kerf keeps the evidence of an internal error under TMPDIR: keep it in the case's work area.
    r = K.run(cmd + ["--report", report], env=dict(os.environ, TMPDIR=out_dir))
    what = f"restructure {label(defs, (), list(flags) + list(extra))}"
    if r.returncode != 0:
        # Exit 2 is kerf's "bad input": a refusal of the case (or kerf blaming the design for a
        # fault in its own output); anything else is a failure of kerf itself.
        kind = "refused" if r.returncode == 2 else "internal"
        run.problem(kind, f"{what}: kerf exit {r.returncode}: {r.stderr.strip()[-2000:]}")
        return None, what
    # The summary line (a "kept as written" line may follow it).
    summary = next((l for l in reversed(r.stderr.strip().splitlines()) if ": gates " in l), "")
    run.notes.append(f"{what}: {summary}")
    # The case exists to have its logic restructured: kerf keeping every statement as written
    # is a refusal in disguise (README: kept code is left byte for byte).
    try:
        replaced = json.load(open(report)).get("statements_replaced")
    except (OSError, ValueError):
        replaced = None
    if replaced is None:
        run.problem("report", f"{what}: the JSON report has no statements_replaced count")
    elif replaced == 0:
        run.problem("kept", f"{what}: kerf kept every statement as written (0 statements restructured)")
    # Lines kerf wrote stay within 100 columns (common trade practice for review; issue 10).
    src_lines = set(open(c.path, "rb").read().split(b"\n"))
    long = [l for l in open(out, "rb").read().split(b"\n") if l not in src_lines and len(l.expandtabs(8)) > 100]
    if long:
        run.problem("layout", f"{what}: {len(long)} written line(s) longer than 100 columns: {long[:2]}")
    # Names of new wires (issue 10): within the cap docs/guide.md states, each declared once and
    # distinct from the module's own. This run writes every group that does not grow
    # (--min-gain 0), the most new wires; the writer caps every name it gives whatever the options.
    names = K.wire_name_problems(open(c.path).read(), open(out).read())
    if names:
        run.problem("names", f"{what}: " + "; ".join(names))
    return out, what


def check_idempotent(kerf, run, out, defs, flags, what):
    """kerf on its own output changes nothing (issue 10; F195): the rewrite, restructured again
    under the default --min-gain, is left as it is (`--check` exits 0; 1 means it would rewrite).
    Issue 10's requirement; a second run being a no-op is common trade practice for source
    rewriters. The rewrite was made under --min-gain 0, so every group kerf would rewrite at all
    is already rewritten: a second run that still finds a group worth --min-gain is not at a
    fixed point.
    No proof is needed: a run that changes nothing has nothing to prove."""
    c = run.case
    if open(out, "rb").read() == open(c.path, "rb").read():
        return   # nothing rewritten: nothing of kerf's to run on
    r = K.run([kerf, "restructure", *c.with_files, out, "--top", c.top, *idirs(c), *dflags(defs), *flags,
               *RUN_ARGS, "--check", "--skip-proof"])
    if r.returncode == 1:
        said = [l for l in r.stderr.splitlines() if "would restructure" in l]
        run.problem("idempotence", f"{what}: kerf on its own rewrite would rewrite it again: "
                                   f"{(said or [r.stderr.strip()[-300:]])[0]}")
    elif r.returncode != 0:
        run.problem("internal", f"{what}: kerf on its own rewrite: exit {r.returncode}: {r.stderr.strip()[-2000:]}")
    else:
        run.notes.append(f"{what}: kerf on its own rewrite changes nothing")


def run_restructure_case(kerf, run, work):
    c = run.case
    n = 0
    for defs in c.define_sets:
        for flags in c.flag_sets:
            n += 1
            out, what = restructure(kerf, run, work, defs, flags, f"v{n}")
            if out is None:
                continue
            if n == 1:
                check_idempotent(kerf, run, out, defs, flags, what)
            exact = "--keep-x" in flags
            for defs2 in c.define_sets:
                for params in c.param_sets:
                    compare(run, out, work, defs2, params, exact,
                            f"{what}, built {label(defs2, params)}")
    for pinned, other in c.pins:
        n += 1
        defs = c.define_sets[0]
        extra = [x for p in pinned for x in ("--param", p)]
        out, what = restructure(kerf, run, work, defs, [], f"v{n}", extra)
        if out is None:
            continue
        compare(run, out, work, defs, pinned, False, f"{what}, built {label(defs, pinned)}")
        if other:
            # The pinned rewrite must refuse to build with another value (Icarus as the outside tool).
            r = O.run(["iverilog", "-g2012", "-o", os.path.join(work, "guard.vvp"), *idirs(c), *dflags(defs),
                       *[f"-P{c.top}.{p}" for p in other], *c.with_files, out])
            if r.returncode == 0:
                run.problem("guard", f"{what}: the rewrite pinned to {pinned} still builds with {other} under Icarus "
                                    f"(no elaboration-time guard)")


def run_equiv_case(kerf, run, work):
    c = run.case
    other = c.equiv_against
    for defs in c.define_sets:
        r = K.run([kerf, "equiv", c.path, other, "--top", c.top, *idirs(c), *dflags(defs),
                   *[x for w in c.with_files for x in ("--common", w)]])
        what = f"equiv {os.path.basename(c.path)} {os.path.basename(other)} {label(defs)}"
        # Icarus decides what the truth is, comparing every bit exactly.
        plist = O.ports(c.files, c.top, defs, (), c.include_dirs)
        sim_dir = tempfile.mkdtemp(dir=work)
        ext = os.path.splitext(c.path)[1]
        a = os.path.join(sim_dir, "a" + ext)
        b = os.path.join(sim_dir, "b" + ext)
        open(a, "w").write(O.renamed(open(c.path).read(), c.top, c.top + "_kerf_a"))
        open(b, "w").write(O.renamed(open(other).read(), c.top, c.top + "_kerf_b"))
        pair = O.Pair("eq", c.top + "_kerf_a", c.top + "_kerf_b", plist, exact=True, clock=c.clock,
                      reset=c.reset, vectors=c.vectors, care=c.care)
        res = O.simulate([pair], c.with_files + [a, b], sim_dir, defines=defs, include_dirs=c.include_dirs,
                         simulator=c.simulator)["eq"]
        if "failed to compile" in res.detail:
            run.broken.append(f"{what}: {res.detail}")
            continue
        run.notes.append(f"{what}: kerf exit {r.returncode}; Icarus: {res.errors} differing bits")
        if res.errors and r.returncode == 0:
            run.problem("equiv", f"{what}: kerf says equivalent (exit 0) but Icarus Verilog shows {res.errors} "
                                f"differing output bits:\n{res.detail}\nkerf: {r.stdout[-800:]}{r.stderr[-800:]}")
        elif not res.errors and r.returncode == 1:
            run.problem("equiv", f"{what}: kerf says different (exit 1) but Icarus Verilog shows none: {r.stdout[-800:]}")
        elif r.returncode not in (0, 1, 3):
            run.problem("equiv-error", f"{what}: kerf equiv exit {r.returncode}: {r.stderr[-1500:]}")


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--kerf")
    p.add_argument("--root", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
    p.add_argument("--cache", default="", help="directory for objects shared by the cases (Verilator's run-time library)")
    p.add_argument("--only", default="", help="run the cases whose name contains this")
    p.add_argument("--case", default="", help="run exactly this case")
    p.add_argument("--list", action="store_true", help="print the case names and exit")
    p.add_argument("--keep", action="store_true", help="keep the work directory and print its path")
    p.add_argument("--kerf-args", default="", help="more restructure options for every run, e.g. '--effort thorough'")
    a = p.parse_args()
    RUN_ARGS[:] = shlex.split(a.kerf_args)
    root = os.path.abspath(a.root)
    if a.cache:
        O.use_runtime_cache(a.cache)
    all_cases = cases(root)
    if a.list:
        for c in all_cases:
            print(c.name)
        return
    if not a.kerf:
        p.error("--kerf is required")
    kerf = os.path.abspath(a.kerf)
    for tool in ("iverilog", "vvp", "verilator"):
        if shutil.which(tool) is None:
            print(f"SKIPPED: {tool} is not installed (needed as the outside reference)")
            if os.environ.get("CI"):
                sys.exit(1)
            sys.exit(77)
    known = known_failures(root)
    names = {c.name for c in all_cases}
    res = K.Results()
    for stale in sorted({c for c, _ in known} - names):
        res.check(False, f"known-failures.txt lists '{stale}', which is not a case in tests/rtl")
    selected = [c for c in all_cases if (a.case and c.name == a.case) or (not a.case and a.only in c.name)]
    if not selected:
        res.check(False, f"no case matches {a.case or a.only!r}")
    for c in selected:
        work = tempfile.mkdtemp(prefix=f"kerf-rtl-{c.name}-")
        run = Run(c)
        check_original(run, work)
        if not run.broken:
            if c.equiv_against:
                run_equiv_case(kerf, run, work)
            else:
                run_restructure_case(kerf, run, work)
        for n in run.notes:
            print(f"{c.name}: {n}", flush=True)
        listed = {k: r for (cn, k), r in known.items() if cn == c.name}
        print(f"{c.name}: outcome: {'broken case' if run.broken else ' '.join(run.kinds()) or 'pass'}", flush=True)
        if run.broken:
            res.check(False, f"{c.name}: the case itself is broken:\n  " + "\n  ".join(run.broken))
        else:
            unlisted = [t for k, t in run.problems if k not in listed]
            res.check(not unlisted, f"{c.name}:\n  " + "\n  ".join(unlisted))
            for k, reason in sorted(listed.items()):
                seen = [t for kk, t in run.problems if kk == k]
                if seen:
                    print(f"{c.name}: known failure '{k}' ({reason}); today:\n  " +
                          "\n  ".join(t.splitlines()[0] for t in seen), flush=True)
                res.check(bool(seen), f"{c.name} no longer fails with '{k}' ({KINDS[k]}): remove that line "
                                      f"from tests/rtl/known-failures.txt")
        if a.keep:
            print(f"{c.name}: work files kept in {work}")
        else:
            shutil.rmtree(work, ignore_errors=True)
    res.finish()


if __name__ == "__main__":
    main()
