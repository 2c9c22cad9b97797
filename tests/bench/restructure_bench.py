#!/usr/bin/env python3
"""End-to-end figures of `kerf restructure`: size, depth, time and memory.

Runs kerf on the shared EPFL random/control files (published sizes in
../shared/benchmarks/epfl/SOURCE.md) and on synthetic decoders generated here
(flat sums of product terms over 32-64 inputs, as table-driven generators
emit them), and prints one table. Gates are two-input AND/OR (inverters free)
as `kerf stats` counts them.

    python3 tests/bench/restructure_bench.py [--kerf build/kerf] [--effort default]
           [--only NAME] [--synthetic 1000,10000,100000] [--no-proof]
"""
import argparse
import json
import math
import os
import random
import re
import subprocess
import sys
import tempfile
import time

ROOT = os.path.normpath(os.path.join(os.path.dirname(__file__), "..", ".."))


def decoder(path, terms, inputs, outputs, seed):
    """A decoder-like module: `outputs` sums of random product terms over `inputs` bits."""
    rng = random.Random(seed)
    per = max(1, terms // outputs)
    # Terms share prefixes (field decodes), as real instruction/address decoders do.
    prefixes = []
    for _ in range(max(4, terms // 50)):
        k = rng.randint(3, 6)
        bits = rng.sample(range(inputs), k)
        prefixes.append([(b, rng.random() < 0.5) for b in bits])
    with open(path, "w") as f:
        f.write(f"module synth_dec (input wire [{inputs-1}:0] i, output wire [{outputs-1}:0] o);\n")
        for k in range(outputs):
            cubes = []
            for _ in range(per):
                lits = dict(rng.choice(prefixes))
                for b in rng.sample(range(inputs), rng.randint(2, 6)):
                    lits.setdefault(b, rng.random() < 0.5)
                cubes.append(" & ".join(("~" if neg else "") + f"i[{b}]" for b, neg in sorted(lits.items())))
            f.write(f"  assign o[{k}] =\n      " + "\n    | ".join(cubes) + ";\n")
        f.write("endmodule\n")


def run_kerf(kerf, path, effort, proof, top=None):
    with tempfile.TemporaryDirectory() as work:
        out = os.path.join(work, "out.v")
        rep = os.path.join(work, "report.json")
        # --dissolve-internal: the EPFL netlists' numbered wires may dissolve into the logic
        # (otherwise each one pins its logic); the synthetic files have no internal signals.
        cmd = ["/usr/bin/time", "-v", kerf, "restructure", path, "-o", out, "--report", rep, "--effort", effort,
               "--dissolve-internal"]
        if not proof:
            cmd.append("--skip-proof")
        t0 = time.time()
        r = subprocess.run(cmd, capture_output=True, text=True)
        wall = time.time() - t0
        if r.returncode != 0:
            return None, r.stderr[-2000:]
        rss = int(re.search(r"Maximum resident set size \(kbytes\): (\d+)", r.stderr).group(1))
        j = json.load(open(rep))
        j["wall"] = wall
        j["rss_mb"] = rss / 1024
        return j, None


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--kerf", default=os.path.join(ROOT, "build", "kerf"))
    p.add_argument("--effort", default="default")
    p.add_argument("--only", default="")
    p.add_argument("--synthetic", default="1000,10000,100000")
    p.add_argument("--no-proof", action="store_true")
    a = p.parse_args()
    rows = []
    epfl = os.path.normpath(os.path.join(ROOT, "..", "shared", "benchmarks", "epfl"))
    names = ["ctrl", "dec", "int2float", "router", "priority", "voter"]
    if not os.path.isdir(epfl):
        print(f"EPFL benchmarks not found at {epfl}: skipping them")
        names = []
    for n in names:
        if a.only and a.only != n:
            continue
        j, err = run_kerf(a.kerf, os.path.join(epfl, n + ".v"), a.effort, not a.no_proof)
        rows.append((f"epfl/{n}", j, err))
        print_row(rows[-1], flush=True)
    with tempfile.TemporaryDirectory() as work:
        for t in [int(x) for x in a.synthetic.split(",") if x]:
            if a.only and a.only != f"dec{t}":
                continue
            inputs = 32 if t <= 1000 else 48 if t <= 10000 else 64
            path = os.path.join(work, f"synth_dec_{t}.v")
            decoder(path, t, inputs, 16, seed=t)
            j, err = run_kerf(a.kerf, path, a.effort, not a.no_proof)
            rows.append((f"synthetic {t} terms/{inputs} in", j, err))
            print_row(rows[-1], flush=True)
    ratios = [r[1]["after"]["gates"] / r[1]["before"]["gates"] for r in rows
              if r[1] and r[0].startswith("epfl/") and r[1]["before"]["gates"]]
    if ratios:
        g = math.exp(sum(math.log(x) for x in ratios) / len(ratios))
        print(f"\ngeometric mean of gates after/before over {len(ratios)} EPFL files: {g:.3f}")


HEADER_DONE = [False]


def print_row(row, flush=False):
    if not HEADER_DONE[0]:
        print(f"{'design':28} {'gates':>7} {'->':>7} {'ratio':>6} {'depth':>5} {'->':>4} "
              f"{'passes s':>8} {'proof s':>7} {'wall s':>7} {'peak MB':>8}")
        HEADER_DONE[0] = True
    name, j, err = row
    if j is None:
        print(f"{name:28} FAILED: {err}")
        return
    b, af = j["before"], j["after"]
    ratio = af["gates"] / b["gates"] if b["gates"] else 1.0
    proof = j.get("proof", {}).get("seconds", float("nan"))
    print(f"{name:28} {b['gates']:7} {af['gates']:7} {ratio:6.3f} {b['depth']:5} {af['depth']:4} "
          f"{j['seconds']['passes']:8.2f} {proof:7.2f} {j['wall']:7.2f} {j['rss_mb']:8.1f}", flush=flush)


if __name__ == "__main__":
    main()
