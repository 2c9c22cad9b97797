#!/usr/bin/env python3
"""End-to-end figures of `kerf restructure`: size, depth, time and memory.

Runs kerf on the shared EPFL random/control files (published sizes in
../shared/benchmarks/epfl/SOURCE.md) and on synthetic decoders generated here
(flat sums of product terms over 32-64 inputs, as table-driven generators
emit them), and prints one table. Gates are two-input AND/OR (inverters free)
as `kerf stats` counts them.

    python3 tests/bench/restructure_bench.py [--kerf build/kerf] [--efforts fast,default,thorough]
           [--only NAME] [--synthetic 1000,10000,100000] [--no-proof]

One row per design: the original gates and depth, then for each effort
kerf's gates and depth, its user CPU seconds (end to end, reader and proof
included: the machine is shared, so CPU time is more honest than wall time)
and peak memory (the largest of kerf's and the reader's stages).

Then a table of case decoders with an x default (`default: y = 'x`, an
invented address decoder: listed codes set the outputs, every other code
leaves them free): the original gates (x read as 0 by `kerf stats`), gates
at the default effort with the x read as a don't-care (the default), and
what --keep-x does (x kept as written: the statement is left unchanged).
Both runs are proved. passes_bench prints the engine-level comparison
(x read as 0 versus x free) on the same shapes.
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


def case_decoder(path, codes, inputs, outputs, seed):
    """`codes` listed input codes (full compares) each set the outputs; the default assigns x."""
    rng = random.Random(seed)
    listed = rng.sample(range(1 << inputs), codes)
    with open(path, "w") as f:
        f.write(f"module xdec (input logic [{inputs-1}:0] a, output logic [{outputs-1}:0] y);\n")
        f.write("  always_comb begin\n    case (a)\n")
        for c in listed:
            f.write(f"      {inputs}'d{c}: y = {outputs}'h{rng.getrandbits(outputs):x};\n")
        f.write(f"      default: y = 'x;\n    endcase\n  end\nendmodule\n")


def run_kerf(kerf, path, effort, proof, top=None, extra=()):
    with tempfile.TemporaryDirectory() as work:
        out = os.path.join(work, "out.v")
        rep = os.path.join(work, "report.json")
        # --dissolve-internal: the EPFL netlists' numbered wires may dissolve into the logic
        # (otherwise each one pins its logic); the synthetic files have no internal signals.
        cmd = ["/usr/bin/time", "-v", kerf, "restructure", path, "-o", out, "--report", rep, "--effort", effort,
               "--dissolve-internal", *extra]
        if not proof:
            cmd.append("--skip-proof")
        t0 = time.time()
        r = subprocess.run(cmd, capture_output=True, text=True)
        wall = time.time() - t0
        if r.returncode != 0:
            return None, r.stderr[-2000:]
        j = json.load(open(rep))
        j["wall"] = wall
        j["cpu"] = float(re.search(r"User time \(seconds\): ([0-9.]+)", r.stderr).group(1))
        stages = j.get("stages", [])
        j["rss_mb"] = max([s.get("peak_memory_mb", 0) for s in stages] or [0])
        return j, None


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--kerf", default=os.path.join(ROOT, "build", "kerf"))
    p.add_argument("--efforts", default="fast,default,thorough")
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
    efforts = [e for e in a.efforts.split(",") if e]
    print_header(efforts)
    for n in names:
        if a.only and a.only != n:
            continue
        path = os.path.join(epfl, n + ".v")
        rows.append((f"epfl/{n}", [run_kerf(a.kerf, path, e, not a.no_proof) for e in efforts]))
        print_row(rows[-1])
    with tempfile.TemporaryDirectory() as work:
        for t in [int(x) for x in a.synthetic.split(",") if x]:
            if a.only and a.only != f"dec{t}":
                continue
            inputs = 32 if t <= 1000 else 48 if t <= 10000 else 64
            path = os.path.join(work, f"synth_dec_{t}.v")
            decoder(path, t, inputs, 16, seed=t)
            rows.append((f"synthetic {t}/{inputs} in", [run_kerf(a.kerf, path, e, not a.no_proof) for e in efforts]))
            print_row(rows[-1])
    if not a.only or a.only == "x-default":
        print(f"\n{'case decoder, x default':28} {'gates':>6} {'x free':>7} {'--keep-x':>9} {'cpu s':>7}", flush=True)
        with tempfile.TemporaryDirectory() as work:
            for codes, inputs, outputs in [(12, 6, 4), (24, 8, 8), (40, 10, 8), (64, 12, 16), (100, 14, 16)]:
                path = os.path.join(work, f"xdec_{codes}.v")
                case_decoder(path, codes, inputs, outputs, seed=codes)
                free, err1 = run_kerf(a.kerf, path, "default", not a.no_proof)
                kept, err2 = run_kerf(a.kerf, path, "default", not a.no_proof, extra=("--keep-x",))
                label = f"{codes} codes/{inputs} in/{outputs} out"
                if free is None or kept is None:
                    print(f"{label:28} FAILED: {err1 or err2}", flush=True)
                    continue
                # With --keep-x the x stays as written: a statement holding it is kept
                # unchanged (nothing restructured, shown as "kept").
                keptCol = "kept" if kept["before"]["gates"] == 0 else str(kept["after"]["gates"])
                print(f"{label:28} {free['before']['gates']:6} {free['after']['gates']:7} {keptCol:>9} "
                      f"{free['cpu'] + kept['cpu']:7.2f}", flush=True)
    for k, e in enumerate(efforts):
        ratios = [r[1][k][0]["after"]["gates"] / r[1][k][0]["before"]["gates"] for r in rows
                  if r[1][k][0] and r[0].startswith("epfl/") and r[1][k][0]["before"]["gates"]]
        if ratios:
            g = math.exp(sum(math.log(x) for x in ratios) / len(ratios))
            print(f"geometric mean of gates after/before over {len(ratios)} EPFL files, effort {e}: {g:.3f}")


def print_header(efforts):
    head = f"{'design':24} {'gates':>6} {'depth':>5}"
    for e in efforts:
        head += f" | {e + ' gates':>14} {'depth':>5} {'cpu s':>7} {'MB':>5}"
    print(head, flush=True)


def print_row(row):
    name, results = row
    line = None
    for j, err in results:
        if j is None:
            print(f"{name:24} FAILED: {err}", flush=True)
            return
        if line is None:
            line = f"{name:24} {j['before']['gates']:6} {j['before']['depth']:5}"
        line += f" | {j['after']['gates']:14} {j['after']['depth']:5} {j['cpu']:7.2f} {j['rss_mb']:5}"
    print(line, flush=True)



if __name__ == "__main__":
    main()
