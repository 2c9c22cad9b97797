"""Bad input: a message naming the problem, a documented exit code, nothing written or lost.

The exit codes checked are those documented in README.md ("Exit codes"):
2 bad input, 4 Python or pyslang missing or of the wrong version,
5 internal error, 6 out of memory or disk space. Every case also checks that
the output file was not created (or an existing one kept intact), that the
input is unchanged and that no temporary file is left behind in $TMPDIR.

The designs under tests/e2e/bad each hold one defect that RTL lint and
synthesis flows reject (common trade practice: a syntax error, a
combinational loop, two drivers on one signal, an inferred latch). The
stand-in readers (fake_reader_*.py, via KERF_READER) play a broken reader,
and fake Python modules (via PYTHONPATH) a missing or wrong pyslang.
"""
import os
import re
import resource
import shutil
import stat
import sys
import time

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402

S = K.Suite(__doc__)
BAD = "tests/e2e/bad"
OLD_OUTPUT = "// an output file from an earlier run\n"


def expect_failure(t, inputs, extra, code, pattern, env_extra=None, keep_old_output=False, preexec=None,
                   output=None):  # noqa: C901
    """Run restructure on `inputs`; check exit code, message, output and inputs untouched, no leftovers."""
    tmp = os.path.join(t.work, "tmp")
    os.makedirs(tmp, exist_ok=True)
    out = output or os.path.join(t.work, "out.v")
    if keep_old_output:
        open(out, "w").write(OLD_OUTPUT)
    before = {}
    for p in inputs:
        try:
            before[p] = open(p, "rb").read()
        except OSError:
            pass   # missing or unreadable on purpose
    env = dict(os.environ, TMPDIR=tmp, **(env_extra or {}))
    r = K.run([t.kerf, "restructure", *inputs, "-o", out] + extra, env=env, preexec_fn=preexec)
    label = f"{t.name}: {' '.join(inputs + extra)}"
    t.res.check(r.returncode == code, f"{label}: exit {r.returncode}, expected {code}; stderr: {r.stderr[-1500:]}")
    t.res.check(re.search(pattern, r.stderr) is not None, f"{label}: message matches /{pattern}/: {r.stderr[-1500:]}")
    if keep_old_output:
        t.res.check(open(out).read() == OLD_OUTPUT, f"{label}: the earlier output file is intact")
    elif out.startswith(t.work) and not os.path.isdir(out):
        t.res.check(not os.path.exists(out), f"{label}: no output file")
    for p, data in before.items():
        t.res.check(open(p, "rb").read() == data, f"{label}: input {p} untouched")
    left = [n for n in os.listdir(tmp) if not n.startswith("kerf-report-")]
    t.res.check(left == [], f"{label}: no temporary files left in $TMPDIR: {left}")
    strays = [n for n in os.listdir(os.path.dirname(out) or ".") if ".kerf-" in n] if os.path.isdir(
        os.path.dirname(out) or ".") else []
    t.res.check(strays == [], f"{label}: no temporary files left beside the output: {strays}")
    return r


# ---------------------------------------------------------------- input files

@S.case("syntax_error")
def _(t):
    expect_failure(t, [f"{BAD}/syntax_error.v"], [], 2, r"syntax_error\.v:2:\d+: error")
    # the same diagnostics from `stats`
    r = K.run([t.kerf, "stats", f"{BAD}/syntax_error.v"])
    t.res.check(r.returncode == 2 and "syntax_error.v:2" in r.stderr, f"stats on a syntax error: {r.stderr[-500:]}")


@S.case("missing_file")
def _(t):
    expect_failure(t, [os.path.join(t.work, "no_such.v")], [], 2, r"cannot read '.*no_such\.v': no such file")


def write_only_system_file():
    """A file even root cannot open for reading: a write-only sysfs attribute (Linux)."""
    for top in ("/sys/devices", "/sys/class", "/sys/bus"):
        for dirpath, _, files in os.walk(top):
            if dirpath.count("/") > 5:
                continue
            for f in files:
                p = os.path.join(dirpath, f)
                try:
                    if stat.S_IMODE(os.lstat(p).st_mode) == 0o200:
                        return p
                except OSError:
                    pass
    return None


@S.case("unreadable_file")
def _(t):
    if os.geteuid() != 0:
        p = os.path.join(t.work, "locked.v")
        shutil.copy(f"{BAD}/nothing_to_do.sv", p)
        os.chmod(p, 0)
    else:
        p = write_only_system_file()   # root reads any file its mode forbids
        if p is None:
            t.res.skip("running as root and no write-only system file to stand for an unreadable input")
            return
    expect_failure(t, [p], [], 2, re.escape(f"cannot read '{p}': Permission denied"))


@S.case("binary_file")
def _(t):
    p = os.path.join(t.work, "image.v")
    open(p, "wb").write(b"module m;\n" + bytes(range(256)) * 4)
    expect_failure(t, [p], [], 2, r"image\.v:2: error: this is not a text file")
    # kerf's own binary, given by mistake
    expect_failure(t, [t.kerf], [], 2, r"error: this is not a text file")


@S.case("directory_input")
def _(t):
    expect_failure(t, ["samples"], [], 2, r"'samples' is a directory")


@S.case("unknown_module")
def _(t):
    expect_failure(t, [f"{BAD}/comb_loop.v"], ["--top", "no_such_module"], 2, r"module 'no_such_module' not found")


# ---------------------------------------------------------------- designs kerf must refuse

@S.case("combinational_loop")
def _(t):
    # The message names every signal on the loop with the place it is driven.
    expect_failure(t, [f"{BAD}/comb_loop.v"], [], 2,
                   r"comb_loop\.v:3:3: error: combinational loop.*'p' \(driven at [^)]*comb_loop\.v:3:3\).*"
                   r"'q' \(driven at [^)]*comb_loop\.v:4:3\)")


@S.case("endless_loop")
def _(t):
    # A loop that cannot end is refused with its location, at once (F65: before, the lowering
    # unrolled 65,536 iterations first). The time is printed, not asserted.
    start = time.monotonic()
    expect_failure(t, [f"{BAD}/endless_loop.sv"], [], 2,
                   r"endless_loop\.sv:6:\d+: error: a for loop's iteration leaves its constant variables as they "
                   r"were, so it never ends")
    print(f"endless_loop: refused in {time.monotonic() - start:.2f} s")


@S.case("multiple_drivers")
def _(t):
    expect_failure(t, [f"{BAD}/two_drivers.sv"], [], 2,
                   r"two_drivers\.sv:3:3: error: 'y' has more than one driver \(also driven at .*two_drivers\.sv:2:3\)")


@S.case("latch")
def _(t):
    expect_failure(t, [f"{BAD}/latch.v"], [], 2, r"latch\.v:2:\d+: error: 'q' is not assigned on every path")
    # --in-place on bad input leaves the file as it was.
    p = os.path.join(t.work, "latch.v")
    shutil.copy(f"{BAD}/latch.v", p)
    r = K.run([t.kerf, "restructure", p, "--in-place"])
    t.res.check(r.returncode == 2 and open(p).read() == open(f"{BAD}/latch.v").read(),
                "--in-place on bad input leaves the file untouched")


# ---------------------------------------------------------------- designs kerf accepts in part

@S.case("unlowerable_construct", needs=("iverilog",))
def _(t):
    """A statement kerf cannot restructure is kept byte for byte and named; the rest is restructured."""
    src = f"{BAD}/unlowerable.sv"
    out = os.path.join(t.work, "clkdiv_status.sv")
    r = K.run([t.kerf, "restructure", src, "-o", out])
    if not t.res.check(r.returncode == 0, f"restructure exit {r.returncode}: {r.stderr[-1500:]}"):
        return
    t.res.check(re.search(r"unlowerable\.sv:7:\d+: left as written: operator '/'", r.stderr) is not None,
                f"the kept statement is named with its location: {r.stderr[-800:]}")
    t.res.check("assign ratio = num / den;" in open(out).read(), "the kept statement is byte-identical")
    os.mkdir(os.path.join(t.work, "sim"))
    ok, log, _ = K.simulate_equal(t.root, [src], "clkdiv_status", out, os.path.join(t.work, "sim"))
    t.res.check(ok, f"Icarus Verilog: the result behaves as the original on all inputs: {log}")


@S.case("nothing_to_restructure")
def _(t):
    src = f"{BAD}/nothing_to_do.sv"
    out = os.path.join(t.work, "out.sv")
    r = K.run([t.kerf, "restructure", src, "-o", out])
    t.res.check(r.returncode == 0 and "nothing to restructure" in r.stderr,
                f"exit 0 and says so: {r.returncode} {r.stderr[-500:]}")
    t.res.check(open(out, "rb").read() == open(src, "rb").read(), "the file is written back unchanged")
    r = K.run([t.kerf, "restructure", src, "--check"])
    t.res.check(r.returncode == 0, f"--check: nothing would change (exit 0): {r.returncode}")


# ---------------------------------------------------------------- outputs

@S.case("output_directory_missing")
def _(t):
    expect_failure(t, ["samples/uart_regsel.v"], ["--skip-proof"], 2,
                   r"cannot write '.*nowhere/out\.v': the directory '.*nowhere' does not exist",
                   output=os.path.join(t.work, "nowhere", "out.v"))


@S.case("output_unwritable")
def _(t):
    if os.geteuid() != 0:
        d = os.path.join(t.work, "readonly")
        os.mkdir(d)
        os.chmod(d, 0o555)
    else:
        d = "/sys"   # root may write any directory its mode forbids, but sysfs takes no new files
    expect_failure(t, ["samples/uart_regsel.v"], ["--skip-proof"], 2,
                   r"cannot write '.*/out\.v': no file can be created in '.*': Permission denied",
                   output=os.path.join(d, "out.v"))


@S.case("output_is_directory")
def _(t):
    d = os.path.join(t.work, "adir")
    os.mkdir(d)
    expect_failure(t, ["samples/uart_regsel.v"], ["--skip-proof"], 2, r"cannot write '.*adir': it is a directory",
                   output=d)
    t.res.check(os.path.isdir(d) and os.listdir(d) == [], "the directory is left as it was")


@S.case("output_disk_full")
def _(t):
    if not os.path.exists("/dev/full"):
        t.res.skip("no /dev/full on this system")
        return
    expect_failure(t, ["samples/uart_regsel.v"], ["--skip-proof"], 6,
                   r"cannot write '/dev/full': No space left on device", output="/dev/full")
    # a report that cannot be written fails the same way and leaves the output alone
    expect_failure(t, ["samples/uart_regsel.v"], ["--skip-proof", "--report", "/dev/full"], 6,
                   r"cannot write '/dev/full': No space left on device", keep_old_output=True)


@S.case("earlier_output_kept_on_error")
def _(t):
    expect_failure(t, [f"{BAD}/latch.v"], [], 2, r"not assigned on every path", keep_old_output=True)


# ---------------------------------------------------------------- the reader and its Python

def real_reader(t):
    return {"KERF_REAL_READER": os.path.join(t.root, "src/reader/kerf_read.py")}


@S.case("reader_output_malformed")
def _(t):
    env = dict(real_reader(t), KERF_READER=os.path.join(t.root, BAD, "fake_reader_garbage.py"))
    r = expect_failure(t, ["samples/uart_regsel.v"], [], 5,
                       r"the Verilog reader's output cannot be read .*saved in .*kerf-report-\w+/ .*kerf bug",
                       env_extra=env)
    m = re.search(r"saved in (\S+)/ ", r.stderr)
    t.res.check(m is not None and os.path.isfile(os.path.join(m.group(1), "reader-output.json")),
                "the reader's output is kept for the bug report")


@S.case("reader_output_truncated")
def _(t):
    env = dict(real_reader(t), KERF_READER=os.path.join(t.root, BAD, "fake_reader_truncated.py"))
    expect_failure(t, ["samples/uart_regsel.v"], [], 5, r"the Verilog reader's output cannot be read", env_extra=env)


@S.case("reader_output_damaged_anywhere")
def _(t):
    """The description cut short, or with a NUL byte (allowed nowhere in JSON), at places spread
    over it: every one is refused as kerf's bug (exit 5), the message giving the byte where the
    damage is, nothing written. The last cases put the NUL after the closing brace, where a
    parser that takes NUL for the end of its input would read a whole description (F147)."""
    log = os.path.join(t.work, "damage.log")
    for damage in ("cut:0", "nul:1", "cut:0.13", "nul:0.29", "cut:0.41", "nul:0.58", "cut:0.77", "nul:0.9",
                   "cut:-2", "nul:-2", "nul:-1"):
        if os.path.exists(log):
            os.remove(log)
        env = dict(real_reader(t), KERF_READER=os.path.join(t.root, BAD, "fake_reader_damaged.py"),
                   KERF_DAMAGE=damage, KERF_DAMAGE_LOG=log)
        r = expect_failure(t, ["samples/uart_regsel.v"], [], 5, r"the Verilog reader's output cannot be read",
                           env_extra=env)
        at = int(open(log).read().split()[0])
        where = re.search(r"not valid JSON at byte (\d+)", r.stderr)
        t.res.check(where is not None and int(where.group(1)) == at + 1,
                    f"{damage}: the message gives the damaged byte {at + 1}: {r.stderr[-600:]}")


@S.case("rewrite_wrong_is_internal_error")
def _(t):
    """kerf's own rewrite failing its proof is kerf's bug (exit 5), with the evidence kept."""
    env = dict(real_reader(t), KERF_READER=os.path.join(t.root, BAD, "fake_reader_wrong_rewrite.py"))
    tmp = os.path.join(t.work, "tmp")
    os.makedirs(tmp)
    out = os.path.join(t.work, "out.v")
    r = K.run([t.kerf, "restructure", "samples/uart_regsel.v", "-o", out], env=dict(os.environ, TMPDIR=tmp, **env))
    t.res.check(r.returncode == 5, f"exit 5: {r.returncode} {r.stderr[-1500:]}")
    t.res.check(not os.path.exists(out), "nothing written")
    m = re.search(r"kept in (\S+)/", r.stderr)
    if t.res.check(m is not None, f"the message names where the evidence is: {r.stderr[-800:]}"):
        kept = m.group(1)
        t.res.check(os.path.isfile(os.path.join(kept, "uart_regsel.v")) and
                    os.path.isfile(os.path.join(kept, "description.json")),
                    f"the failed rewrite and the reader's description are there: {os.listdir(kept)}")
        named = re.findall(r"(?:^|(?<=\s))(/\S+?\.(?:v|sv|json))\b", r.stderr)
        t.res.check(all(os.path.exists(p) for p in named), f"every file the message names exists: {named}")


def fake_python_module(t, name, text):
    d = os.path.join(t.work, "fakepy")
    os.makedirs(d, exist_ok=True)
    open(os.path.join(d, name), "w").write(text)
    return {"PYTHONPATH": d + os.pathsep + os.environ.get("PYTHONPATH", "")}


@S.case("python_missing")
def _(t):
    expect_failure(t, ["samples/uart_regsel.v"], [], 4, r"cannot start the Verilog reader .*Install Python 3",
                   env_extra={"KERF_PYTHON": "/nonexistent/python3"})


@S.case("reader_path_is_a_directory")
def _(t):
    # Python runs a directory as a package and exits 1 on its own, the reader's code for "the
    # design has errors": kerf names the wrong setting instead of blaming the design (F356).
    expect_failure(t, ["samples/uart_regsel.v"], [], 4, r"the Verilog reader '.*' is not a file",
                   env_extra={"KERF_READER": os.path.join(t.root, "src", "reader")})


@S.case("pyslang_missing")
def _(t):
    env = fake_python_module(t, "pyslang.py", "raise ImportError('No module named pyslang (stand-in)')\n")
    expect_failure(t, ["samples/uart_regsel.v"], [], 4, r"pyslang is not installed", env_extra=env)


@S.case("pyslang_wrong_version")
def _(t):
    env = fake_python_module(t, "pyslang.py", "__version__ = '3.0.0'\n")
    expect_failure(t, ["samples/uart_regsel.v"], [], 4, r"pyslang 3\.0\.0 is installed, kerf needs", env_extra=env)


@S.case("python_too_old")
def _(t):
    # sitecustomize runs before the reader: it makes the interpreter report an old version.
    env = fake_python_module(t, "sitecustomize.py", "import sys\nsys.version_info = (3, 5, 0, 'final', 0)\n")
    expect_failure(t, ["samples/uart_regsel.v"], [], 4, r"Python 3\.8 or newer is needed", env_extra=env)


@S.case("memory_exhausted")
def _(t):
    if os.environ.get("KERF_SANITIZED"):
        t.res.skip("an address-space limit does not work with AddressSanitizer's shadow memory")
        return

    def limit():
        resource.setrlimit(resource.RLIMIT_AS, (100 << 20, 100 << 20))
    expect_failure(t, ["samples/uart_regsel.v"], [], 6, r"out of memory", preexec=limit)


# ---------------------------------------------------------------- usage

@S.case("usage_errors")
def _(t):
    out = os.path.join(t.work, "x.v")
    for args, pattern in ((["--in-place", "-o", out], r"exclude each other"),
                          (["--backup", ".orig"], r"--backup needs --in-place or --output"),
                          (["-o", out, "--effort", "extreme"], r"effort")):
        r = K.run([t.kerf, "restructure", "samples/uart_regsel.v"] + args)
        t.res.check(r.returncode == 2 and re.search(pattern, r.stderr) is not None,
                    f"usage {args}: exit 2 and /{pattern}/: {r.returncode} {r.stderr[-500:]}")
        t.res.check(not os.path.exists(out), f"usage {args}: nothing written")


if __name__ == "__main__":
    S.main()
