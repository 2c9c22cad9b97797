#!/usr/bin/env python3
"""campaign — random modules through `kerf restructure`, compared with Icarus Verilog.

Generates modules with tests/randrtl/randmod.py (or control decoders with randdec.py, `--shape
decoder`), restructures each with kerf, and compares
original and rewrite by four-valued simulation in Icarus Verilog (outside reference), many
modules per simulator run: every pair gets its own testbench, all compiled together. Outputs
and internal signals are compared bit by bit wherever the original is not x; registers are
reset first; parameterised modules are also simulated with an overriding value. A batch that
Icarus cannot compile is split in halves until the rewrite at fault is found.

    python3 tests/randrtl/campaign.py --kerf build/kerf --seed 1 --count 3000 [--batch 100]
        [--features default|all|name,-name] [--shape mixed|decoder] [--jobs 2] [--lint] [--save DIR]
        [--kerf-args="--effort thorough --goal depth"]   (with `=`: the value starts with `--`)

Prints counts: modules, passed, rewritten, unchanged, mismatches, failures to build, deleted
declarations, comments the rewrite lost, repeated or parted from their signal's assignment (the
generator's "comment" construct), internal errors, failures on kerf's own output, refusals by reason, undecided
proofs, time, and how many modules contain each construct. Exit status 1 when any module
mismatches, fails on kerf's own output or hits an internal error.
"""
import argparse
import collections
import concurrent.futures
import json
import os
import re
import shlex
import shutil
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
sys.path.insert(0, os.path.join(HERE, "..", "e2e"))
import randmod  # noqa: E402
import randdec  # noqa: E402
import outside_check as O  # noqa: E402

# Outcome kinds of one module. The first group are kerf bugs; the second are accepted answers.
BUG_KINDS = ("mismatch", "x-pessimism", "build", "decl", "comment", "internal", "own-output", "lint")
OK_KINDS = ("pass", "unchanged", "refused", "undecided")


class Outcome:
    def __init__(self, module, kind, detail="", reason=""):
        self.module, self.kind, self.detail, self.reason = module, kind, detail, reason


_TEMP = re.compile(r"kerf-\d+-\d+\.s?v")


def refusal_reason(stderr):
    """A short key for why kerf refused: its first error message with names and numbers masked."""
    for line in stderr.splitlines():
        m = re.search(r"error: (.*)", line)
        if m:
            text = re.sub(r"(?<=[\s(])'[A-Za-z_][^']*'", "'…'", m.group(1))   # names, not operators
            text = re.sub(r"\(driven at [^)]*\)", "", text)
            text = re.sub(r"module \S+", "module …", text)
            text = re.sub(r"\b\d+\b", "N", text)
            return text.strip()[:120]
    return (stderr.strip().splitlines() or ["(no message)"])[-1][:120]


def declared_names(text):
    """Names declared by data and net declarations directly in the module (slang's syntax tree)."""
    from pyslang import syntax
    tree = syntax.SyntaxTree.fromText(text)
    root = tree.root
    mods = [root] if root.kind == syntax.SyntaxKind.ModuleDeclaration else \
        [m for m in root.members if m.kind == syntax.SyntaxKind.ModuleDeclaration]
    names = set()
    for m in mods:
        for item in m.members:
            if item.kind in (syntax.SyntaxKind.DataDeclaration, syntax.SyntaxKind.NetDeclaration):
                for d in item.declarators:
                    if d.kind == syntax.SyntaxKind.Declarator:    # (the list holds the commas too)
                        names.add(d.name.valueText)
    return names


def restructure(kerf, src, out, extra=(), tmpdir=None):
    # kerf keeps the evidence of an internal error under TMPDIR: keep it inside the work area.
    env = dict(os.environ, TMPDIR=tmpdir) if tmpdir else None
    # --min-gain 0: rewrite every statement group that does not grow, so that each module
    # exercises the writer even where the rewrite would not pay (the default keeps those).
    r = O.run([kerf, "restructure", src, "--min-gain", "0", "-o", out, *extra], timeout=600, env=env)
    return r.returncode, r.stderr


def internal_reason(stderr):
    """A short key for an internal error: what kerf says, with the first slang error on its own
    output when the rewrite did not read back."""
    if "does not read back" in stderr:
        first = refusal_reason("\n".join(l for l in stderr.splitlines() if "does not read back" not in l))
        return "rewrite does not read back: " + first
    if "is NOT equivalent" in stderr:
        return "kerf's own proof refutes its rewrite"
    return refusal_reason(stderr)


def classify_run(name, code, stderr):
    if code == 0:
        return None
    if code == 2 and (_TEMP.search(stderr) or "reported above by slang" in stderr):
        # kerf blamed the design for a fault in the file it wrote itself (an internal error).
        return Outcome(name, "own-output", stderr.strip()[-1500:], refusal_reason(stderr))
    if code == 2:
        return Outcome(name, "refused", stderr.strip()[-1500:], refusal_reason(stderr))
    if code == 3:
        return Outcome(name, "undecided", stderr.strip()[-800:])
    return Outcome(name, "internal", f"exit {code}: {stderr.strip()[-1500:]}", f"exit {code}: {internal_reason(stderr)}")


def pairs_for(desc, work):
    """Icarus pairs (one per parameter set) for a generated module whose ref/new files exist."""
    name = desc["name"]
    out = []
    for i, params in enumerate(desc["param_sets"]):
        out.append(O.Pair(f"{name}#{i}", name + "_ref", name + "_new", desc["ports"], params=params,
                          clock=desc["clock"], reset=tuple(desc["reset"]) if desc["reset"] else None,
                          vectors=desc.get("vectors", 300), exhaustive_limit=10, seed=1 + i,
                          internals=desc["internals"]))
    return out


def simulate_group(items, work):
    """items: [(desc, ref_path, new_path)]. Returns {module name: SimResult-like (ok, detail)}."""
    pairs, sources = [], []
    for desc, ref, new in items:
        pairs += pairs_for(desc, work)
        sources += [ref, new]
    d = tempfile.mkdtemp(dir=work)
    res = O.simulate(pairs, sources, d, timeout=30 + 3 * len(items))
    shutil.rmtree(d, ignore_errors=True)
    compile_failed = any("failed to compile" in r.detail or "did not finish" in r.detail for r in res.values())
    if compile_failed and len(items) > 1:
        half = len(items) // 2
        out = simulate_group(items[:half], work)
        out.update(simulate_group(items[half:], work))
        return out
    out = {}
    for desc, _, _ in items:
        rs = [res[p.tag] for p in pairs_for(desc, work)]
        bad = [r for r in rs if not r.ok]
        if not bad:
            out[desc["name"]] = ("pass", "")
        elif compile_failed:
            out[desc["name"]] = ("build", bad[0].detail)
        else:
            # Only x where the original shows 0/1: x-pessimism, counted apart from wrong values.
            kind = "x-pessimism" if all(r.errors == r.xonly for r in bad) else "mismatch"
            out[desc["name"]] = (kind, "\n".join(f"{desc['param_sets'][i] or 'defaults'}: {r.detail}"
                                                  for i, r in enumerate(rs) if not r.ok))
    return out


NOTE = re.compile(r"note (c\d+): (drives (\w+)|item)")


def comment_problems(text, new_text):
    """The author's comments the rewrite lost, repeated or parted from their logic (issue 10: no
    comment is deleted or left orphaned; one on or above an assignment goes above the new
    assignment of the same signal, or into the block's note of replaced code when that signal
    has no assignment of its own in the new text; docs/guide.md). The generator's comments
    (randmod "comment") name the signal their line drives."""
    lines = new_text.split("\n")
    problems = []
    for m in NOTE.finditer(text):
        tag, signal = m.group(1), m.group(3)
        at = [i for i, ln in enumerate(lines) if re.search(r"note %s:" % tag, ln)]
        if len(at) != 1:
            problems.append(f"comment {tag} appears {len(at)} times")
            continue
        if not signal:
            continue
        i = at[0]
        drives = re.compile(r"\b%s\b(\s*\[[^\]]*\])*\s*=(?!=)" % signal)

        def code(ln):
            return re.sub(r"/\*.*?\*/", " ", ln).split("//")[0]
        # the comment's line with the lines of the statement it ends (a rewrite's statement can
        # span lines; a trailing comment stays on its last line)
        k = i
        while k > 0 and code(lines[k - 1]).strip() and \
                not code(lines[k - 1]).rstrip().endswith((";", "begin", "end")) and \
                not code(lines[k - 1]).lstrip().startswith(("`", "module", "//")):
            k -= 1
        if drives.search(" ".join(code(ln) for ln in lines[k:i + 1])):
            continue
        j = i + 1
        while j < len(lines) and (not lines[j].strip() or lines[j].strip().startswith("//")):
            j += 1
        if j < len(lines) and drives.search(code(lines[j])):
            continue
        k = i
        while k >= 0 and lines[k].strip().startswith("//"):
            if "comments of the replaced code" in lines[k]:
                break
            k -= 1
        if k >= 0 and "comments of the replaced code" in lines[k]:
            continue
        problems.append(f"comment {tag} (drives {signal}) is at line {i + 1}, away from {signal}'s assignment")
    return problems


def check_modules(kerf, modules, work, jobs=1, lint=False, batch=100, progress=None, extra=()):
    """Run every (text, desc) through kerf and Icarus; returns [Outcome]."""
    src_dir = os.path.join(work, "src")
    out_dir = os.path.join(work, "out")
    sim_dir = os.path.join(work, "sim")
    for d in (src_dir, out_dir, sim_dir, os.path.join(work, "tmp")):
        os.makedirs(d, exist_ok=True)

    def one(item):
        text, desc = item
        name = desc["name"]
        src = os.path.join(src_dir, name + ".sv")
        out = os.path.join(out_dir, name + ".sv")
        with open(src, "w") as f:
            f.write(text)
        tmp = os.path.join(work, "tmp", name)
        os.makedirs(tmp, exist_ok=True)
        code, err = restructure(kerf, src, out, extra=extra, tmpdir=tmp)
        return item, src, out, code, err

    outcomes = []
    to_sim = []
    with concurrent.futures.ThreadPoolExecutor(max_workers=max(1, jobs)) as pool:
        for n, (item, src, out, code, err) in enumerate(pool.map(one, modules), 1):
            text, desc = item
            name = desc["name"]
            bad = classify_run(name, code, err)
            if bad:
                outcomes.append(bad)
            else:
                new_text = open(out).read()
                if new_text == text:
                    outcomes.append(Outcome(name, "unchanged"))
                else:
                    # A deleted declaration is a bug of its own; the signals that are left are
                    # still compared, so a wrong rewrite is not hidden behind it.
                    declared = declared_names(new_text)
                    lost = [s["name"] for s in desc["internals"] if s["name"] not in declared]
                    # A block's label names a scope (waveforms, coverage, `disable`): a rewritten
                    # block keeps it (F324).
                    lost += ["the block label " + lb for lb in re.findall(r"\bbegin\s*:\s*(\w+)", text)
                             if not re.search(r"\bbegin\s*:\s*" + lb + r"\b", new_text)]
                    notes = comment_problems(text, new_text)
                    sim_desc = dict(desc, internals=[s for s in desc["internals"] if s["name"] in declared])
                    ref = os.path.join(sim_dir, name + "_ref.sv")
                    new = os.path.join(sim_dir, name + "_new.sv")
                    ref_text = O.always_comb_as_always_star(O.renamed(text, name, name + "_ref"))
                    new_text = O.always_comb_as_always_star(O.renamed(new_text, name, name + "_new"))
                    if "uniqueif" in desc["constructs"]:
                        ref_text = O.if_qualifiers_dropped(ref_text)
                        new_text = O.if_qualifiers_dropped(new_text)
                    if desc.get("package"):
                        # both files declare the module's package: one copy each under its own name
                        # (the generator makes the name unique, so a whole-word replace is exact)
                        pkg = re.compile(r"\b%s\b" % re.escape(desc["package"]))
                        ref_text = pkg.sub(desc["package"] + "_ref", ref_text)
                        new_text = pkg.sub(desc["package"] + "_new", new_text)
                    open(ref, "w").write(ref_text)
                    open(new, "w").write(new_text)
                    to_sim.append((sim_desc, ref, new, src, out, lost, notes))
            if progress:
                progress(n)
    for i in range(0, len(to_sim), batch):
        group = to_sim[i:i + batch]
        res = simulate_group([(d, r, n) for d, r, n, _, _, _, _ in group], work)
        for desc, ref, new, src, out, lost, notes in group:
            kind, detail = res[desc["name"]]
            if kind == "pass" and lost:
                kind, detail = "decl", "the rewrite no longer declares " + ", ".join(lost)
            if kind == "pass" and notes:
                kind, detail = "comment", "; ".join(notes)
            if kind == "pass" and lint:
                ok_a, warn_a, _ = O.lint([src], desc["name"])
                ok_b, warn_b, text_b = O.lint([out], desc["name"])
                added = O.new_warnings(warn_a, warn_b)
                if (ok_a and not ok_b) or added:
                    kind, detail = "lint", f"Verilator: {added or text_b[-1500:]}"
            outcomes.append(Outcome(desc["name"], kind, detail))
    return outcomes


def summarize(outcomes, modules, seconds):
    kinds = collections.Counter(o.kind for o in outcomes)
    n = len(outcomes)
    lines = [f"modules: {n}",
             f"  passed (rewritten, Icarus agrees): {kinds['pass']}",
             f"  unchanged (nothing to restructure): {kinds['unchanged']}",
             f"  mismatches against Icarus (a 0/1 differs): {kinds['mismatch']}",
             f"  x-pessimism (original 0/1 where the rewrite shows x): {kinds['x-pessimism']}",
             f"  rewrites Icarus cannot build: {kinds['build']}",
             f"  rewrites that delete a declaration: {kinds['decl']}",
             f"  rewrites that lose, repeat or misplace a comment: {kinds['comment']}",
             f"  new Verilator warnings: {kinds['lint']}",
             f"  internal errors (exit 5 or a crash): {kinds['internal']}",
             f"  failures on kerf's own output reported as bad input (exit 2): {kinds['own-output']}",
             f"  undecided proofs (exit 3): {kinds['undecided']}",
             f"  refused (exit 2): {kinds['refused']}"]
    reasons = collections.Counter(o.reason for o in outcomes if o.kind == "refused")
    for r, c in reasons.most_common():
        lines.append(f"    {c:6d}  {r}")
    own = collections.Counter(o.reason for o in outcomes if o.kind == "own-output")
    if own:
        lines.append("  kerf's own output rejected, by message:")
        for r, c in own.most_common():
            lines.append(f"    {c:6d}  {r}")
    lines.append(f"time: {seconds:.0f} s ({seconds / max(n, 1):.2f} s per module)")
    cover = collections.Counter(c for _, d in modules for c in d["constructs"])
    lines.append("constructs (modules containing each):")
    for c in sorted(randmod.FEATURES.keys() | set(cover)):
        lines.append(f"  {c:12s} {cover.get(c, 0)}")
    return "\n".join(lines)


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--kerf", required=True)
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--count", type=int, default=200)
    p.add_argument("--start", type=int, default=0, help="first module index")
    p.add_argument("--batch", type=int, default=100, help="modules per simulator run")
    p.add_argument("--features", default="default")
    p.add_argument("--shape", choices=("mixed", "decoder"), default="mixed",
                   help="mixed: randmod's modules of every construct; decoder: randdec's control decoders")
    p.add_argument("--jobs", type=int, default=1, help="kerf runs in parallel")
    p.add_argument("--lint", action="store_true", help="also compare Verilator -Wall warnings")
    p.add_argument("--save", default="", help="copy every failing module, rewrite and log here")
    p.add_argument("--json", default="", help="write the outcomes as JSON to this file")
    p.add_argument("--kerf-args", default="", help="more restructure options, e.g. --kerf-args='--effort thorough' (--min-gain 0 is always given)")
    a = p.parse_args()
    features = randmod.parse_features(a.features)
    kerf = os.path.abspath(a.kerf)
    t0 = time.time()
    gen = randdec.generate if a.shape == "decoder" else randmod.generate
    modules = [gen(a.seed, i, features) for i in range(a.start, a.start + a.count)]
    work = tempfile.mkdtemp(prefix="kerf-campaign-")
    outcomes = []
    try:
        for i in range(0, len(modules), a.batch):
            chunk = modules[i:i + a.batch]
            outcomes += check_modules(kerf, chunk, work, jobs=a.jobs, lint=a.lint, batch=a.batch,
                                      extra=shlex.split(a.kerf_args))
            done = i + len(chunk)
            bugs = sum(1 for o in outcomes if o.kind in BUG_KINDS)
            print(f"[{done}/{len(modules)}] {time.time() - t0:.0f} s, kerf bugs so far: {bugs}",
                  file=sys.stderr, flush=True)
            if a.save:
                os.makedirs(a.save, exist_ok=True)
                for o in outcomes[-len(chunk):]:
                    if o.kind in BUG_KINDS:
                        for sub in ("src", "out"):
                            f = os.path.join(work, sub, o.module + ".sv")
                            if os.path.exists(f):
                                shutil.copy(f, os.path.join(a.save, f"{o.module}.{sub}.sv"))
                        with open(os.path.join(a.save, o.module + ".log"), "w") as f:
                            f.write(f"{o.kind}\n{o.reason}\n{o.detail}\n")
            for sub in ("src", "out", "sim", "tmp"):
                shutil.rmtree(os.path.join(work, sub), ignore_errors=True)
    finally:
        shutil.rmtree(work, ignore_errors=True)
    seconds = time.time() - t0
    print(f"campaign: seed {a.seed}, modules {a.start}..{a.start + a.count - 1}, "
          + ("decoders (randdec)" if a.shape == "decoder" else f"features {','.join(sorted(features))}"))
    print(summarize(outcomes, modules, seconds))
    bugs = [o for o in outcomes if o.kind in BUG_KINDS]
    for o in bugs[:50]:
        print(f"{o.kind}: {o.module}: {o.reason or (o.detail.splitlines()[0] if o.detail else '')}"[:300])
    if a.json:
        with open(a.json, "w") as f:
            json.dump([{"module": o.module, "kind": o.kind, "reason": o.reason, "detail": o.detail}
                       for o in outcomes], f, indent=1)
    sys.exit(1 if bugs else 0)


if __name__ == "__main__":
    main()
