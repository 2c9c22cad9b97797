#!/usr/bin/env python3
"""New wires kerf names by output and index (`<output>_tN`), over samples/ and the tests/rtl corpus.

A survey, not a registered test: kerf restructures each sample (the golden tests' options) and
each corpus case (its first define set and flag set, with --min-gain 0 as the corpus test runs
it; equivalence cases aside), and the wires it declares are listed by kind of name: descriptive
(said from the signals they combine) or indexed (`_tN`, named after the first output they feed).
With --show, each indexed wire's definition is printed, so that what they compute can be read.
It also counts the `~` in the written logic and the new wires read two or more times and every
time complemented (`~w`, `~{4{w}}`: issue 10's polarity rule, F359), listed with --show.

    tests/e2e/wire_name_survey.py --kerf build/kerf [--root .] [--show] [--only SUBSTRING]
"""
import argparse
import os
import re
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import kerf_e2e as K  # noqa: E402
import test_rtl_corpus as C  # noqa: E402

# `wire [3:0] name = ...;` or `wire name = ...;` as kerf writes a new wire (its definition may go
# on over continuation lines up to the `;`).
WIRE = re.compile(r"^\s*wire\s+(?:\[[^\]]*\]\s*)?([A-Za-z_][A-Za-z0-9_$]*)\s*=\s*(.*?);", re.S | re.M)
INDEXED = re.compile(r"_t\d+$|^(?:kf_)?t\d+$")


def wires(text, source):
    """(name, definition) of each wire the output declares that the source does not."""
    have = set(m.group(1) for m in WIRE.finditer(source))
    return [(m.group(1), " ".join(m.group(2).split())) for m in WIRE.finditer(text)
            if m.group(1) not in have and "unused" not in m.group(1)]


def inverted_only(text, names):
    """Of the new wires `names`, those `text` reads two or more times, every time complemented."""
    out = []
    for n in names:
        m = re.search(r"^\s*wire\s+(?:\[[^\]]*\]\s*)?" + re.escape(n) + r"\s*=", text, re.M)
        uses = re.findall(r"(~?)(?:\{\d+\{)?\b" + re.escape(n) + r"\b", text[m.end():]) if m else []
        if len(uses) >= 2 and all(u == "~" for u in uses):
            out.append(n)
    return out


def tildes(text):
    """`~` in the text outside comments."""
    return sum(line.split("//")[0].count("~") for line in text.splitlines())


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--kerf", required=True)
    ap.add_argument("--root", default=".")
    ap.add_argument("--only", default="")
    ap.add_argument("--show", action="store_true", help="print each indexed wire's definition")
    a = ap.parse_args()
    kerf, root = os.path.abspath(a.kerf), os.path.abspath(a.root)
    jobs = []   # (label, source path, command without -o)
    for files, top in K.SAMPLES:
        params = {"irq_router": ["--param", "NSRC=6"]}.get(top, [])
        jobs.append((f"samples/{top}", os.path.join(root, files[-1]),
                     [kerf, "restructure", *[os.path.join(root, f) for f in files], "--top", top, *params]))
    for c in C.cases(root):
        if c.equiv_against:
            continue
        jobs.append((f"rtl/{c.name}", c.path,
                     [kerf, "restructure", *c.files, "--top", c.top, *["--include=" + d for d in c.include_dirs],
                      *["--define=" + d for d in c.define_sets[0]], *c.flag_sets[0], "--min-gain", "0"]))
    total = indexed = inverted = tilde = 0
    per_case = []
    with tempfile.TemporaryDirectory(prefix="kerf-names-") as work:
        for label, src, cmd in jobs:
            if a.only not in label:
                continue
            out = os.path.join(work, label.replace("/", "_") + os.path.splitext(src)[1])
            r = subprocess.run(cmd + ["-o", out], capture_output=True, text=True, cwd=root)
            if r.returncode != 0 or not os.path.exists(out):
                print(f"{label}: exit {r.returncode}: {r.stderr.strip()[-200:]}")
                continue
            text = open(out).read()
            ws = wires(text, open(src).read())
            idx = [(n, d) for n, d in ws if INDEXED.search(n)]
            inv = inverted_only(text, [n for n, _ in ws])
            inverted += len(inv)
            tilde += tildes(text)
            if a.show:
                for n in inv:
                    print(f"{label}: {n} is read only complemented")
            total += len(ws)
            indexed += len(idx)
            if idx:
                per_case.append((label, len(idx), len(ws)))
            if a.show:
                for n, d in idx:
                    print(f"{label}: {n} = {d}")
    for label, n, m in per_case:
        print(f"{label}: {n} of {m} new wires indexed")
    print(f"wire_name_survey: {indexed} of {total} new wires named by output and index (_tN)")
    print(f"wire_name_survey: {inverted} new wires read two or more times, only complemented; "
          f"{tilde} `~` in the written files")
    return 0


if __name__ == "__main__":
    sys.exit(main())
