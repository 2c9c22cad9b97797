#!/usr/bin/env python3
"""Random modules (tests/randrtl/randmod.py, and control decoders from randdec.py) through
`kerf restructure`, checked by Icarus Verilog.

A fixed-seed batch small enough for the suite; the long campaign is tests/randrtl/campaign.py.
Every module is restructured, and original and rewrite are simulated side by side in one Icarus
run (outside reference, four-valued: outputs and internal signals compared wherever the
original is not x), after the rewrite is checked to keep every declaration.

Outcomes other than "pass", "unchanged" and "refused" are kerf bugs. Modules that hit one
today are listed in tests/randrtl/known-failures.txt (SEED INDEX KIND REASON); the test fails on
an unlisted bug and on a listed one that no longer occurs. A refusal is accepted but printed
with its reason (the campaign counts them).

    test_random_modules.py --kerf build/kerf --root . --seed 1 [--count 25] [--features default]
                           [--print-outcomes]

The harness registers one ctest entry per batch of SUITE (e2e.random_modules.seedN, run with
`--case seedN`).

--print-outcomes prints the lines of the known-failures file for what this run saw: use it to
update the file after a fix, but file a finding for every new kind of failure first.
"""
import argparse
import os
import shutil
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
sys.path.insert(0, os.path.join(HERE, "..", "randrtl"))
import kerf_e2e as K  # noqa: E402
import randmod  # noqa: E402
import randdec  # noqa: E402
import campaign  # noqa: E402

# The suite's batches: seed -> (count, features). Seed 1 uses the settled constructs, seed 2
# every construct the generator has, seed 3 is randdec's control decoders ("decoder").
SUITE = {1: (25, "default"), 2: (25, "all"), 3: (20, "decoder")}


def known_failures(root):
    path = os.path.join(root, "tests", "randrtl", "known-failures.txt")
    out = {}
    if os.path.exists(path):
        for n, line in enumerate(open(path), 1):
            s = line.strip()
            if s and not s.startswith("#"):
                parts = s.split(None, 3)
                if len(parts) < 4 or parts[2] not in campaign.BUG_KINDS:
                    raise RuntimeError(f"{path}:{n}: expected 'SEED INDEX KIND REASON' with KIND one of "
                                       f"{campaign.BUG_KINDS}")
                out[(int(parts[0]), int(parts[1]))] = (parts[2], parts[3])
    return out


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--kerf")
    p.add_argument("--root", default=os.path.join(HERE, "..", ".."))
    p.add_argument("--cache", default="", help="accepted for the harness (tests/e2e/kerf_e2e.py); unused")
    p.add_argument("--list", action="store_true", help="print the suite's batches (seedN) and exit")
    p.add_argument("--case", default="", help="run the suite batch seedN")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--count", type=int, default=None)
    p.add_argument("--features", default=None)
    p.add_argument("--print-outcomes", action="store_true")
    a = p.parse_args()
    if a.list:
        for seed in SUITE:
            print(f"seed{seed}")
        return
    if a.case:
        if not a.case.startswith("seed") or int(a.case[4:]) not in SUITE:
            p.error(f"no batch {a.case!r} (known: {', '.join(f'seed{s}' for s in SUITE)})")
        a.seed = int(a.case[4:])
    if not a.kerf:
        p.error("--kerf is required")
    for tool in ("iverilog", "vvp"):
        if shutil.which(tool) is None:
            print(f"SKIPPED: {tool} is not installed (needed as the outside reference)")
            sys.exit(1 if os.environ.get("CI") else 77)
    count, features = SUITE.get(a.seed, (25, "default"))
    count = a.count if a.count is not None else count
    features = a.features if a.features is not None else features
    if features == "decoder":
        modules = [randdec.generate(a.seed, i) for i in range(count)]
        again = f"tests/randrtl/randdec.py --seed {a.seed} --index {{}}"
    else:
        modules = [randmod.generate(a.seed, i, randmod.parse_features(features)) for i in range(count)]
        again = f"tests/randrtl/randmod.py --seed {a.seed} --index {{}} --features {features}"
    work = tempfile.mkdtemp(prefix=f"kerf-random-{a.seed}-")
    try:
        outcomes = campaign.check_modules(os.path.abspath(a.kerf), modules, work, jobs=1)
    finally:
        shutil.rmtree(work, ignore_errors=True)
    known = known_failures(os.path.abspath(a.root))
    res = K.Results()
    by_index = {}
    for o in outcomes:
        by_index[int(o.module.rsplit("_", 1)[1])] = o
    for i in range(count):
        o = by_index[i]
        listed = known.get((a.seed, i))
        if a.print_outcomes and o.kind in campaign.BUG_KINDS:
            why = o.reason or (o.detail.splitlines()[0][:100] if o.detail else "")
            print(f"{a.seed} {i} {o.kind} {why}")
        if o.kind == "refused":
            print(f"{o.module}: refused: {o.reason}")
        if o.kind in campaign.BUG_KINDS:
            if listed and listed[0] == o.kind:
                res.check(True, o.module)
                print(f"{o.module}: known failure '{o.kind}' ({listed[1]})")
            else:
                res.check(False, f"{o.module} (seed {a.seed}, index {i}, features {features}): {o.kind}: "
                                 f"{o.reason}\n{o.detail[:3000]}\n(reproduce: python3 {again.format(i)})")
        else:
            res.check(listed is None, f"{o.module} now gives '{o.kind}' but tests/randrtl/known-failures.txt "
                                      f"lists '{listed[0] if listed else ''}': remove that line")
    for (seed, i) in known:
        if seed == a.seed and i >= count:
            res.check(False, f"tests/randrtl/known-failures.txt lists seed {seed} index {i}, beyond this batch")
    print(f"seed {a.seed}: " + ", ".join(f"{k} {sum(1 for o in outcomes if o.kind == k)}"
                                         for k in campaign.OK_KINDS + campaign.BUG_KINDS))
    res.finish()


if __name__ == "__main__":
    main()
