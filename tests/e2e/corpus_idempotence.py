#!/usr/bin/env python3
"""kerf on its own output, over the tests/rtl corpus: a survey, not a registered test.

For each case (its first define set and flag set; equivalence cases aside) kerf restructures
the module twice (the two outputs must be byte-identical: deterministic) and then restructures
its own output (nothing may change: idempotent). Prints one line per case that is not both, and
a closing count. Since F235 (kerf runs itself on the text it is about to write and adopts
that run's rewrite) none is known; the corpus driver checks the same under its kind
`idempotence` (tests/rtl/known-failures.txt, docs/findings.md F197).

    tests/e2e/corpus_idempotence.py --kerf build/kerf --root . [--only SUBSTRING] [--kerf-args "--min-gain 0"]
"""
import argparse
import os
import shlex
import subprocess
import sys
import tempfile

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import test_rtl_corpus as C  # noqa: E402


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--kerf", required=True)
    ap.add_argument("--root", default=".")
    ap.add_argument("--only", default="")
    ap.add_argument("--kerf-args", default="",
                    help="more restructure options for every run, e.g. '--min-gain 0'")
    a = ap.parse_args()
    kerf = os.path.abspath(a.kerf)
    passed = failed = 0
    with tempfile.TemporaryDirectory(prefix="kerf-idem-") as work:
        for c in C.cases(os.path.abspath(a.root)):
            if c.equiv_against or a.only not in c.name:
                continue
            opts = ["--top", c.top] + ["--include=" + d for d in c.include_dirs] + \
                   ["--define=" + d for d in c.define_sets[0]] + c.flag_sets[0] + shlex.split(a.kerf_args)
            ext = os.path.splitext(c.path)[1]
            out = [os.path.join(work, f"{c.name}.{k}{ext}") for k in ("1", "1b", "2")]

            def run(src, dst):
                return subprocess.run([kerf, "restructure", *c.with_files, src, *opts, "-o", dst],
                                      capture_output=True, text=True)
            r = run(c.path, out[0])
            if r.returncode != 0:
                print(f"{c.name}: first run exit {r.returncode}: {r.stderr.strip()[-300:]}")
                failed += 1
                continue
            run(c.path, out[1])
            r2 = run(out[0], out[2])
            text = [open(p, "rb").read() if os.path.exists(p) else None for p in out]
            same, idem = text[0] == text[1], r2.returncode == 0 and text[0] == text[2]
            if same and idem:
                passed += 1
                continue
            failed += 1
            print(f"{c.name}: deterministic={same} idempotent={idem} (second run exit {r2.returncode})")
    print(f"corpus_idempotence: {passed} passed, {failed} failed")
    return 0 if failed == 0 else 1


if __name__ == "__main__":
    sys.exit(main())
