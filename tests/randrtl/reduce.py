#!/usr/bin/env python3
"""reduce — shrink a random module that kerf gets wrong to a small one that still fails.

Delta debugging on lines (after Zeller and Hildebrandt, "Simplifying and isolating
failure-inducing input", IEEE TSE 2002, from memory): repeatedly delete a statement line, or a
whole `begin ... end` block (the generator writes one statement per line and indents blocks),
and keep the deletion when the failure persists. The text is never parsed here: every candidate
goes through kerf, and the failure is judged by Icarus Verilog exactly as in the campaign
(outside reference), so a deletion that makes the module invalid simply does not stick.

    python3 tests/randrtl/reduce.py --kerf build/kerf --seed 11 --index 19 [--features all] [-o min.sv]
    python3 tests/randrtl/reduce.py --kerf build/kerf --file saved/rm_11_19.src.sv [--params P0=9]

Prints the reduced module and the failure it still shows.
"""
import argparse
import os
import shutil
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
sys.path.insert(0, os.path.join(HERE, "..", "e2e"))
import campaign  # noqa: E402
import randmod  # noqa: E402


def outcome(kerf, text, desc, work, lint=False):
    """The campaign's verdict on one module text: (kind, detail)."""
    d = tempfile.mkdtemp(dir=work)
    try:
        res = campaign.check_modules(kerf, [(text, desc)], d, lint=lint)
        return res[0].kind, res[0].detail or res[0].reason
    finally:
        shutil.rmtree(d, ignore_errors=True)


def describe_file(text, params):
    """The generator's description of a module read back from its text (slang elaborates it):
    the generator's conventions name the clock `clk` and the active-low reset `rst_n`."""
    import outside_check as O
    name = O.module_names(text)[0][0]
    d = tempfile.mkdtemp(prefix="kerf-reduce-desc-")
    try:
        path = os.path.join(d, name + ".sv")
        open(path, "w").write(text)
        ports, internals = O.signals([path], name)
    finally:
        shutil.rmtree(d, ignore_errors=True)
    names = {p["name"] for p in ports}
    return {"name": name, "ports": ports, "internals": internals,
            "clock": "clk" if "clk" in names else None,
            "reset": ("rst_n", 0) if "rst_n" in names else None,
            "param_sets": [[]] + ([params] if params else []), "constructs": []}


def blocks(lines):
    """(start, end) line ranges that can be deleted: statement lines and indented blocks."""
    out = []
    for i, line in enumerate(lines):
        s = line.strip()
        if not s or s.startswith(("module", "input", "output", "endmodule", ")", "function", "endfunction",
                                   "logic", "localparam", "parameter", "return", "//")):
            continue
        indent = len(line) - len(line.lstrip())
        if s.endswith("begin"):
            j = i + 1
            while j < len(lines):
                t = lines[j]
                ind = len(t) - len(t.lstrip())
                if ind == indent and t.strip().startswith("end") and not t.strip().startswith("end else"):
                    break
                j += 1
            if j < len(lines):
                out.append((i, j + 1))
        elif s.endswith(";") or s.endswith("endcase"):
            out.append((i, i + 1))
    return out


def reduce(kerf, text, desc, kind, work, log=print, lint=False):
    lines = text.splitlines()
    changed = True
    tries = 0
    while changed:
        changed = False
        # Big blocks first: they remove the most in one try.
        for start, end in sorted(blocks(lines), key=lambda r: r[0] - r[1]):
            if end > len(lines):
                continue
            cand = lines[:start] + lines[end:]
            tries += 1
            k, _ = outcome(kerf, "\n".join(cand) + "\n", desc, work, lint)
            if k == kind:
                lines = cand
                changed = True
                log(f"  kept deletion of lines {start + 1}-{end} ({len(lines)} lines left, {tries} tries)")
                break
    return "\n".join(lines) + "\n"


def main():
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--kerf", required=True)
    p.add_argument("--seed", type=int)
    p.add_argument("--index", type=int)
    p.add_argument("--features", default="all")
    p.add_argument("--file", default="", help="reduce this generated module instead (e.g. one a campaign saved)")
    p.add_argument("--params", default="", help="with --file: a parameter set to simulate too, e.g. P0=9")
    p.add_argument("--lint", action="store_true", help="also compare Verilator warnings (to reduce a lint finding)")
    p.add_argument("-o", "--output", default="")
    a = p.parse_args()
    kerf = os.path.abspath(a.kerf)
    if a.file:
        text = open(a.file).read()
        desc = describe_file(text, a.params.split() if a.params else [])
    else:
        if a.seed is None or a.index is None:
            p.error("give --seed and --index, or --file")
        text, desc = randmod.generate(a.seed, a.index, randmod.parse_features(a.features))
    work = tempfile.mkdtemp(prefix="kerf-reduce-")
    try:
        kind, detail = outcome(kerf, text, desc, work, a.lint)
        print(f"module {desc['name']}: {kind}")
        if kind not in campaign.BUG_KINDS:
            return
        small = reduce(kerf, text, desc, kind, work, log=lambda m: print(m, file=sys.stderr), lint=a.lint)
        kind2, detail2 = outcome(kerf, small, desc, work, a.lint)
        if a.output:
            open(a.output, "w").write(small)
        print(small)
        print(f"// still {kind2}: {detail2.splitlines()[0] if detail2 else ''}")
    finally:
        shutil.rmtree(work, ignore_errors=True)


if __name__ == "__main__":
    main()
