"""Bad input: a located message (file:line), a non-zero exit code, nothing written.

The designs under tests/e2e/bad each hold one defect that any RTL lint or
synthesis flow rejects (common trade practice): a syntax error, a
combinational loop, two drivers on one signal, an inferred latch; plus a
module name that does not exist.
"""
import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402

CASES = [
    # (file, extra args, expected exit, regex the message must match)
    ("syntax_error.v", [], 2, r"syntax_error\.v:2:\d+: error"),
    ("comb_loop.v", [], 2, r"comb_loop\.v:\d+:\d+: error: combinational loop"),
    ("two_drivers.sv", [], 2, r"two_drivers\.sv:\d+:\d+: error: .*(more than one driver|multiple|driven)"),
    ("latch.v", [], 2, r"latch\.v:2:\d+: error: 'q' is not assigned on every path"),
    ("comb_loop.v", ["--top", "no_such_module"], 2, r"no_such_module"),
]


def main():
    a = K.args()
    os.chdir(a.root)
    res = K.Results()
    for name, extra, code, pattern in CASES:
        path = os.path.join("tests/e2e/bad", name)
        before = open(path, "rb").read()
        with tempfile.TemporaryDirectory() as work:
            out = os.path.join(work, "out.v")
            r = K.run([a.kerf, "restructure", path, "-o", out] + extra)
            res.check(r.returncode == code, f"{name} {extra}: exit {r.returncode}, expected {code}; stderr: {r.stderr[-1500:]}")
            res.check(re.search(pattern, r.stderr) is not None, f"{name} {extra}: message matches /{pattern}/: {r.stderr[-1500:]}")
            res.check(not os.path.exists(out), f"{name} {extra}: nothing written")
            res.check(os.listdir(work) == [], f"{name} {extra}: no stray files")
        res.check(open(path, "rb").read() == before, f"{name}: input untouched")
    # --in-place with a failing input leaves the file as it was.
    with tempfile.TemporaryDirectory() as work:
        import shutil
        p = os.path.join(work, "latch.v")
        shutil.copy("tests/e2e/bad/latch.v", p)
        r = K.run([a.kerf, "restructure", p, "--in-place"])
        res.check(r.returncode == 2 and open(p).read() == open("tests/e2e/bad/latch.v").read(),
                  "--in-place on bad input leaves the file untouched")
    # stats: the same diagnostics
    r = K.run([a.kerf, "stats", "tests/e2e/bad/syntax_error.v"])
    res.check(r.returncode == 2 and "syntax_error.v:2" in r.stderr, f"stats on a syntax error: {r.stderr[-500:]}")
    # Missing reader gives a clear install hint.
    env = dict(os.environ, KERF_PYTHON="/nonexistent/python3")
    r = K.run([a.kerf, "stats", "samples/uart_regsel.v"], env=env)
    res.check(r.returncode == 4 and "Python" in r.stderr, f"missing Python: exit {r.returncode} {r.stderr[-500:]}")
    res.finish()


if __name__ == "__main__":
    main()
