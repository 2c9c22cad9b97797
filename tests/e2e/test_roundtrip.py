"""Round trip: every sample and every shared EPFL file through `kerf restructure`.

For each design the rewritten file must
- simulate identically to the original on every output (outside reference:
  Icarus Verilog; exhaustive up to 16 input bits, else 10,000 mixed vectors —
  300 for voter, whose 1001 inputs make simulation slow: its proof is what
  matters there, and the proof is checked against simulation on the others),
- keep the port list identical (as read by slang through kerf's reader),
- keep every kept member (registers, instances, ...) byte-identical,
- lint clean with Verilator `--lint-only -Wall` when the original does (outside reference: Verilator),
- be deterministic (two runs give byte-identical output; checked on the
  samples, the shipped scenarios, not again on every benchmark).

One case per design (`--list`), so ctest runs them in parallel.
"""
import os
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402


def lint_clean(files, top):
    # No waiver: a named constant the rewrite no longer compares with is read by its
    # `unused` wire (docs/guide.md, "What the written logic reads").
    cmd = ["verilator", "--lint-only", "-Wall", "--top-module", top]
    r = K.run(cmd + files)
    return r.returncode == 0, r.stderr


S = K.Suite(__doc__)
SLOW_SIMULATION = {"voter": 300}


def roundtrip(res, a, files, top, label, lint=True, determinism=True, vectors=10000, extra=()):
    if top is None:
        top = K.read_module(a.root, files, None)["module"]["name"]
    with tempfile.TemporaryDirectory() as work:
        # Named after the module, as Verilator's file-name lint expects.
        ext = os.path.splitext(files[-1])[1]
        out = os.path.join(work, top + ext)
        os.mkdir(os.path.join(work, "again"))
        out2 = os.path.join(work, "again", top + ext)
        r = K.run([a.kerf, "restructure", *files, "--top", top, "-o", out, *extra])
        if not res.check(r.returncode == 0, f"{label}: kerf restructure exit {r.returncode}: {r.stderr[-3000:]}"):
            return
        print(f"{label}: {r.stderr.strip().splitlines()[-1] if r.stderr.strip() else ''}", flush=True)
        if determinism:
            r2 = K.run([a.kerf, "restructure", *files, "--top", top, "-o", out2, *extra])
            res.check(r2.returncode == 0 and open(out, "rb").read() == open(out2, "rb").read(),
                      f"{label}: output is deterministic")

        orig = K.read_module(a.root, files, top)
        mod_file = orig["module"]["src"]["file"]
        new_files = [out if f == mod_file else f for f in files]
        new = K.read_module(a.root, new_files, top)
        res.check(K.port_signature(orig) == K.port_signature(new), f"{label}: ports identical")
        src = open(mod_file, "rb").read()
        out_bytes = open(out, "rb").read()
        for m in orig["members"]:
            if m["kind"] == "kept":
                text = src[m["src"]["start"]:m["src"]["end"]]
                res.check(text in out_bytes, f"{label}: kept member at line {m['src']['line']} byte-identical")
        sim_dir = os.path.join(work, "sim")
        os.mkdir(sim_dir)
        ok, log, bits = K.simulate_equal(a.root, files, top, out, sim_dir, vectors=vectors)
        res.check(ok, f"{label}: Icarus Verilog simulation matches on every output ({bits} input bits): {log}")
        if lint:
            clean, _ = lint_clean(files, top)
            if clean:
                clean2, msg = lint_clean(new_files, top)
                res.check(clean2, f"{label}: Verilator -Wall accepts the rewrite: {msg[:2000]}")


def sample_case(files, top):
    def run(t):
        roundtrip(t.res, t.args, files, top, top)
    return run


def epfl_case(name):
    def run(t):
        # The EPFL netlists leave some inputs unused, so Verilator's -Wall is checked on samples only.
        # Flat netlists: their numbered wires may dissolve (otherwise each one pins its logic).
        roundtrip(t.res, t.args, [t.epfl(name)], None, f"epfl/{name}", lint=False, determinism=False,
                  vectors=SLOW_SIMULATION.get(name, 10000), extra=("--dissolve-internal",))
    return run


for _files, _top in K.SAMPLES:
    S.add(f"sample_{_top}", sample_case(_files, _top), needs=("iverilog", "verilator"))
for _name in K.EPFL:
    S.add(f"epfl_{_name}", epfl_case(_name), needs=("iverilog", "epfl"))

if __name__ == "__main__":
    S.main()
