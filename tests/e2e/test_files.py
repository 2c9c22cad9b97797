"""Files kerf writes: in place, through links, with backups, atomically, and nothing left behind.

Each check names the behaviour that common trade practice for command-line
tools that rewrite files expects (as with editors and formatters): an
in-place rewrite replaces the target of a symbolic link and keeps the link,
the file's permission bits and its line endings; a backup holds the old
text; an interrupted run (Ctrl-C, a closed pipe, a kill) leaves neither a
partial output nor a temporary file. The rewritten text itself is checked
by kerf's proof in every run and, here, by Icarus Verilog on the CR LF case.
"""
import os
import pty
import re
import select
import signal
import shutil
import stat
import subprocess
import sys
import time

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402

S = K.Suite(__doc__)
SAMPLE = "samples/uart_regsel.v"


def private_tmp(t):
    d = os.path.join(t.work, "tmp")
    os.makedirs(d, exist_ok=True)
    return d, dict(os.environ, TMPDIR=d)


@S.case("in_place_follows_symlink_keeps_mode")
def _(t):
    real = os.path.join(t.work, "rtl", "uart_regsel.v")
    os.makedirs(os.path.dirname(real))
    shutil.copy(SAMPLE, real)
    os.chmod(real, 0o640)
    link = os.path.join(t.work, "link.v")
    os.symlink(os.path.join("rtl", "uart_regsel.v"), link)
    expected = K.run([t.kerf, "restructure", SAMPLE, "-q"]).stdout
    tmp, env = private_tmp(t)
    r = K.run([t.kerf, "restructure", link, "--in-place"], env=env)
    t.res.check(r.returncode == 0, f"exit 0: {r.stderr[-800:]}")
    t.res.check(os.path.islink(link) and os.readlink(link) == os.path.join("rtl", "uart_regsel.v"),
                "the symbolic link is still the same link")
    t.res.check(open(real).read() == expected and expected != open(SAMPLE).read(),
                "its target holds the rewrite (the same text as on standard output)")
    t.res.check(stat.S_IMODE(os.stat(real).st_mode) == 0o640, "the permission bits are kept (0640)")
    t.res.check(os.listdir(os.path.dirname(real)) == ["uart_regsel.v"] and os.listdir(tmp) == [],
                "no temporary file left beside the target or in $TMPDIR")


@S.case("dash_output_is_standard_output")
def _(t):
    """`-o -` writes to standard output, as the default does (common trade practice for command-line
    tools); no file named '-' appears."""
    d = os.path.join(t.work, "run")
    os.makedirs(d)
    r = K.run([t.kerf, "restructure", os.path.abspath(SAMPLE), "-o", "-", "-q"], cwd=d)
    plain = K.run([t.kerf, "restructure", os.path.abspath(SAMPLE), "-q"], cwd=d)
    t.res.check(r.returncode == 0 and plain.returncode == 0, f"both run: {r.stderr[-400:]} {plain.stderr[-400:]}")
    t.res.check(r.stdout == plain.stdout and "endmodule" in r.stdout,
                "the rewrite goes to standard output, as without -o")
    t.res.check(not os.path.exists(os.path.join(d, "-")), "no file named '-' is written")


@S.case("backup_keeps_old_text")
def _(t):
    p = os.path.join(t.work, "uart_regsel.v")
    shutil.copy(SAMPLE, p)
    os.chmod(p, 0o600)
    old = open(p, "rb").read()
    r = K.run([t.kerf, "restructure", p, "--in-place", "--backup", ".orig"])
    t.res.check(r.returncode == 0, f"exit 0: {r.stderr[-800:]}")
    t.res.check(open(p + ".orig", "rb").read() == old, "FILE.orig holds the old text byte for byte")
    t.res.check(stat.S_IMODE(os.stat(p + ".orig").st_mode) == 0o600, "the backup has the file's mode")
    t.res.check(open(p, "rb").read() != old, "the file holds the rewrite")
    # -o onto an existing file keeps that file's old text too
    out = os.path.join(t.work, "out.v")
    open(out, "w").write("// earlier\n")
    r = K.run([t.kerf, "restructure", SAMPLE, "-o", out, "--backup", "~"])
    t.res.check(r.returncode == 0 and open(out + "~").read() == "// earlier\n", "-o with --backup keeps the old output")


@S.case("crlf_line_endings_kept", needs=("iverilog",))
def _(t):
    p = os.path.join(t.work, "uart_regsel.v")
    open(p, "wb").write(open(SAMPLE, "rb").read().replace(b"\n", b"\r\n"))
    r = K.run([t.kerf, "restructure", p, "--in-place"])
    t.res.check(r.returncode == 0, f"exit 0: {r.stderr[-800:]}")
    data = open(p, "rb").read()
    original = open(SAMPLE, "rb").read().replace(b"\n", b"\r\n")
    t.res.check(data != original, "the file was rewritten")
    t.res.check(data.count(b"\n") == data.count(b"\r\n"),
                "every line of the rewritten file ends in CR LF, the generated lines included")
    os.mkdir(os.path.join(t.work, "sim"))
    ok, log, _ = K.simulate_equal(t.root, [SAMPLE], "uart_regsel", p, os.path.join(t.work, "sim"))
    t.res.check(ok, f"Icarus Verilog: the CR LF rewrite behaves as the original: {log}")


def start_and_interrupt(t, how, sub):
    """Start a restructure, interrupt it once its work directory exists; return (status, tmp contents)."""
    tmp = os.path.join(t.work, sub)
    os.makedirs(tmp)
    env = dict(os.environ, TMPDIR=tmp)
    out = os.path.join(t.work, "out.v")
    p = subprocess.Popen([t.kerf, "restructure", "samples/rv_decoder.sv", "-o", out], env=env,
                         stdout=subprocess.PIPE, stderr=subprocess.DEVNULL,
                         preexec_fn=lambda: signal.signal(signal.SIGINT, signal.SIG_DFL))
    deadline = time.monotonic() + 60
    while not os.listdir(tmp) and p.poll() is None and time.monotonic() < deadline:
        time.sleep(0.01)
    seen = list(os.listdir(tmp))
    if how == "pipe":
        p.stdout.close()
        p.send_signal(signal.SIGPIPE)   # as a write to the closed pipe would
    else:
        p.send_signal(how)
    status = p.wait()
    return status, seen, os.listdir(tmp), os.path.exists(out)


@S.case("interrupt_leaves_nothing")
def _(t):
    for how, name in ((signal.SIGINT, "SIGINT"), (signal.SIGTERM, "SIGTERM"), ("pipe", "SIGPIPE")):
        status, seen, left, wrote = start_and_interrupt(t, how, name)
        sig = signal.SIGPIPE if how == "pipe" else how
        t.res.check(seen != [], f"{name}: kerf had a work directory when interrupted ({seen})")
        t.res.check(status == -sig, f"{name}: kerf ends by the signal (status {status})")
        t.res.check(left == [], f"{name}: its temporary files are gone: {left}")
        t.res.check(not wrote, f"{name}: no output file")


def process_state(pid):
    """The state letter of process `pid` ('R', 'S', 'T', 'Z', ...), or None when there is none."""
    try:
        text = open(f"/proc/{pid}/stat").read()
    except OSError:
        return None
    return text[text.rfind(")") + 2:].split()[0]


def children_of(pid):
    """Pids of the processes whose parent is `pid` (from /proc)."""
    out = []
    for e in os.listdir("/proc"):
        if e.isdigit():
            try:
                text = open(f"/proc/{e}/stat").read()
            except OSError:
                continue
            if int(text[text.rfind(")") + 2:].split()[1]) == pid:
                out.append(int(e))
    return out


def wait_for_owned_work_dir(tmp, p, seconds=120):
    """Wait until `p` has made its work directory in `tmp` (with its owner file); return its name."""
    deadline = time.monotonic() + seconds
    while p.poll() is None and time.monotonic() < deadline:
        for d in os.listdir(tmp):
            if os.path.exists(os.path.join(tmp, d, ".kerf-owner")):
                return d
        time.sleep(0.005)
    return None


@S.case("killed_run_swept_next_time")
def _(t):
    """SIGKILL cannot be caught, so a killed kerf leaves its work directory (with the rewrite in it);
    the next kerf run of the same user removes it, and never a live process's directory (common
    trade practice for lock and work files: the owner's pid and start time say whether it lives)."""
    if not os.path.isdir("/proc/self"):
        t.res.skip("no /proc: the sweep cannot tell a live process from a gone one here")
        return
    tmp, env = private_tmp(t)
    out = os.path.join(t.work, "out.v")
    # A run stopped (SIGSTOP) once its work directory exists is alive: no later run may touch it.
    q = subprocess.Popen([t.kerf, "restructure", "samples/rv_decoder.sv", "-o", out + ".live"], env=env,
                         stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        live = wait_for_owned_work_dir(tmp, q)
        q.send_signal(signal.SIGSTOP)
        if not t.res.check(live is not None, f"a run makes its work directory: {os.listdir(tmp)}"):
            return
        # A run killed by SIGKILL while its work directory exists leaves it behind.
        p = subprocess.Popen([t.kerf, "restructure", "samples/rv_decoder.sv", "-o", out], env=env,
                             stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        left = None
        deadline = time.monotonic() + 120
        while left is None and p.poll() is None and time.monotonic() < deadline:
            left = next((d for d in os.listdir(tmp) if d != live and
                         os.path.exists(os.path.join(tmp, d, ".kerf-owner"))), None)
            time.sleep(0.005)
        p.kill()
        p.wait()
        if not t.res.check(left is not None and os.path.isdir(os.path.join(tmp, left)),
                           f"a run killed by SIGKILL leaves its work directory: {left} {os.listdir(tmp)}"):
            return
        t.res.check(not os.path.exists(out), "and writes no output")
        r = K.run([t.kerf, "restructure", SAMPLE, "-o", os.path.join(t.work, "third.v"), "-v"], env=env)
        t.res.check(r.returncode == 0, f"the next run succeeds: {r.stderr[-600:]}")
        t.res.check(not os.path.exists(os.path.join(tmp, left)),
                    f"it removed the killed run's directory {left}: {os.listdir(tmp)}")
        t.res.check("work directory" in r.stderr and left in r.stderr,
                    f"-v names what it removed: {r.stderr[:300]}")
        t.res.check(os.path.isdir(os.path.join(tmp, live)) and
                    os.path.exists(os.path.join(tmp, live, ".kerf-owner")),
                    f"and left the live (stopped) run's directory {live} alone: {os.listdir(tmp)}")
    finally:
        q.send_signal(signal.SIGCONT)
        status = q.wait()
    t.res.check(status == 0 and os.listdir(tmp) == [],
                f"the stopped run, continued, finishes and cleans up after itself: {status} {os.listdir(tmp)}")


@S.case("killed_run_ends_its_reader")
def _(t):
    """The reader asks the kernel to end it when kerf, its parent, dies (Linux `prctl`,
    PR_SET_PDEATHSIG): a stopped reader, which cannot end by itself, is gone once kerf is killed."""
    if not sys.platform.startswith("linux"):
        t.res.skip("the parent-death signal is Linux's")
        return
    tmp, env = private_tmp(t)
    # An invented table big enough that its reading takes a while (about a second).
    src = os.path.join(t.work, "wide_table.sv")
    with open(src, "w") as f:
        f.write("module wide_table(input logic [15:0] k, output logic [7:0] v);\n  always_comb begin\n"
                "    unique case (k)\n")
        for i in range(6000):
            f.write(f"      16'd{i}: v = 8'd{(i * 37) % 256};\n")
        f.write("      default: v = 8'd0;\n    endcase\n  end\nendmodule\n")
    p = subprocess.Popen([t.kerf, "restructure", src, "-q"], env=env,
                         stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    reader = None
    deadline = time.monotonic() + 60
    while reader is None and p.poll() is None and time.monotonic() < deadline:
        kids = children_of(p.pid)
        reader = kids[0] if kids else None
        if reader is None:
            time.sleep(0.002)
    if not t.res.check(reader is not None, "kerf starts its reader"):
        p.kill()
        p.wait()
        return
    # The reader asks for the signal first and imports pyslang after: once pyslang is mapped into
    # it, stop it. Stopped, it can only end by a signal.
    mapped = False
    while not mapped and time.monotonic() < deadline:
        try:
            mapped = "pyslang" in open(f"/proc/{reader}/maps").read()
        except OSError:
            break
        if not mapped:
            time.sleep(0.002)
    os.kill(reader, signal.SIGSTOP)
    state = process_state(reader)
    stop_by = time.monotonic() + 10   # the stop is delivered asynchronously
    while state not in ("T", None, "Z") and time.monotonic() < stop_by:
        time.sleep(0.01)
        state = process_state(reader)
    if not t.res.check(mapped and state == "T", f"the reader was caught running and stopped "
                       f"(pyslang mapped: {mapped}, state {state}, kerf's status {p.poll()})"):
        p.kill()
        p.wait()
        return
    p.kill()
    p.wait()
    state = None
    deadline = time.monotonic() + 20
    while time.monotonic() < deadline:
        state = process_state(reader)
        if state in (None, "Z", "X"):
            break
        time.sleep(0.05)
    gone = state in (None, "Z", "X")
    if not gone:
        os.kill(reader, signal.SIGKILL)
    t.res.check(gone, f"the stopped reader ended with kerf (state {state})")


@S.case("closed_pipe_on_output")
def _(t):
    tmp, env = private_tmp(t)
    p = subprocess.Popen([t.kerf, "restructure", SAMPLE], env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    p.stdout.close()   # like `kerf restructure f.v | head -0`
    _, err = p.communicate()
    t.res.check(p.returncode in (0, -signal.SIGPIPE), f"ends quietly or by SIGPIPE: {p.returncode} {err[-300:]}")
    t.res.check(os.listdir(tmp) == [], "no temporary file left")


def run_on_terminal(cmd, env):
    """Run cmd with standard error on a pseudo-terminal; return what it wrote there."""
    master, slave = pty.openpty()
    p = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=slave, env=env)
    os.close(slave)
    chunks = []
    while True:
        r, _, _ = select.select([master], [], [], 0.2)
        if r:
            try:
                data = os.read(master, 4096)
            except OSError:
                break
            if not data:
                break
            chunks.append(data)
        elif p.poll() is not None:
            break
    p.wait()
    os.close(master)
    return p.returncode, b"".join(chunks).decode(errors="replace")


@S.case("progress_only_on_a_terminal")
def _(t):
    env = dict(os.environ, KERF_PROGRESS_DELAY="0")
    out = os.path.join(t.work, "o.v")
    code, text = run_on_terminal([t.kerf, "restructure", SAMPLE, "-o", out], env)
    t.res.check(code == 0 and re.search(r"kerf: (read|lower|restructure|write|second run|prove)", text) is not None,
                f"on a terminal a progress line names the stage: {text[-300:]!r}")
    t.res.check(re.search(r"\d+ s", text) is not None, f"and the elapsed time: {text[-300:]!r}")
    code, text = run_on_terminal([t.kerf, "restructure", SAMPLE, "-o", out, "--quiet"], env)
    t.res.check(code == 0 and text.strip() == "", f"--quiet: nothing at all: {text[-300:]!r}")
    r = K.run([t.kerf, "restructure", SAMPLE, "-o", out], env=env)
    t.res.check(r.returncode == 0 and "\r" not in r.stderr and "\033" not in r.stderr,
                "not a terminal: no progress line, only the summary")


def lane_selects(path, lanes=160):
    """An invented lane-select block: one assignment per lane, each a sum of products over
    a shared opcode (many members to lower, shared terms to restructure and prove)."""
    with open(path, "w") as f:
        f.write("module lane_sel (input logic [7:0] op, input logic [%d:0] req, output logic [%d:0] sel);\n"
                % (lanes - 1, lanes - 1))
        for i in range(lanes):
            f.write("  assign sel[%d] = (op[0] & op[1] & req[%d]) | (op[0] & op[1] & op[%d]) | (~op[2] & req[%d]);\n"
                    % (i, i, 2 + i % 6, (i + 1) % lanes))
        f.write("endmodule\n")


@S.case("lane_selects_share_their_common_cube", needs=("iverilog",))
def _(t):
    """One statement per lane, `op[0]&op[1]&req[i] | op[0]&op[1]&op[k] | ~op[2]&req[i+1]` (F60):
    op[0]&op[1] is worth computing once for all lanes (extraction of a cube common to several
    nodes: R. K. Brayton et al., "Multilevel logic synthesis", Proc. IEEE 1990, from memory), at no
    more depth. The rewrite has fewer gates, no more depth, is proved, and Icarus Verilog (outside
    reference) finds it equal to the original."""
    src = os.path.join(t.work, "lane_sel.sv")
    lane_selects(src)
    out = os.path.join(t.work, "o.sv")
    r = K.run([t.kerf, "restructure", src, "-o", out])
    t.res.check(r.returncode == 0 and "proved equivalent" in r.stderr, f"rewritten and proved: {r.stderr[-600:]}")
    m = re.search(r"gates (\d+) -> (\d+) .*depth (\d+) -> (\d+)", r.stderr)
    t.res.check(m is not None and int(m.group(2)) < int(m.group(1)) and int(m.group(4)) <= int(m.group(3)),
                f"fewer gates at no more depth: {m.group(0) if m else r.stderr[-300:]}")
    if r.returncode == 0:
        os.mkdir(os.path.join(t.work, "sim"))
        ok, log, _ = K.simulate_equal(t.root, [src], "lane_sel", out, os.path.join(t.work, "sim"))
        t.res.check(ok, f"Icarus Verilog: the rewrite behaves as the original: {log}")


@S.case("progress_shows_share_done")
def _(t):
    """On a terminal the line gives the stage and the share done of lowering (members) and
    of the proof (nodes swept, outputs compared), each between 0 and 100 %."""
    src = os.path.join(t.work, "lane_sel.sv")
    lane_selects(src)
    # Interval 0: the line is drawn at every change of share as well, so the proof's share is
    # seen even when its sweep lasts a few milliseconds on a loaded machine (F267).
    env = dict(os.environ, KERF_PROGRESS_DELAY="0", KERF_PROGRESS_INTERVAL="0")
    code, text = run_on_terminal([t.kerf, "restructure", src, "-o", os.path.join(t.work, "o.sv")], env)
    # A stage may name its current step in parentheses ("prove (reading the rewrite back)");
    # any step of the proof counts.
    shares = re.findall(r"kerf: (lower|prove)(?: \([^)]*\))?\s+(\d+)%", text)
    t.res.check(code == 0, f"the run succeeds: {text[-300:]!r}")
    t.res.check(any(s == "lower" for s, _ in shares), f"lowering shows its share done: {text[-600:]!r}")
    t.res.check(any(s == "prove" for s, _ in shares), f"the proof shows its share done: {text[-600:]!r}")
    t.res.check(all(0 <= int(p) <= 100 for _, p in shares), f"shares are percentages: {shares[:20]}")
    r = K.run([t.kerf, "restructure", src, "-o", os.path.join(t.work, "o2.sv")], env=env)
    t.res.check(r.returncode == 0 and "kerf: " not in r.stderr and "\r" not in r.stderr and "\033" not in r.stderr,
                f"not a terminal: no progress at all: {r.stderr[-300:]!r}")


COUNTING_READER = """import os, runpy, sys
with open(os.environ["KERF_READER_LOG"], "a") as f:
    f.write(sys.argv[-1] + "\\n")
real = os.environ["KERF_REAL_READER"]
sys.argv[0] = real
sys.path.insert(0, os.path.dirname(real))
runpy.run_path(real, run_name="__main__")
"""


@S.case("reader_runs_once_per_file")
def _(t):
    """A restructure runs the reader once on the input and once on the rewrite (for the
    proof), never again: the description is read once per run (issue 12)."""
    wrapper = os.path.join(t.work, "counting_reader.py")
    with open(wrapper, "w") as f:
        f.write(COUNTING_READER)
    log = os.path.join(t.work, "reader.log")
    env = dict(os.environ, KERF_READER=wrapper, KERF_READER_LOG=log,
               KERF_REAL_READER=os.path.join(t.root, "src/reader/kerf_read.py"))
    src = os.path.join(t.work, "lane_sel.sv")
    lane_selects(src, 8)
    r = K.run([t.kerf, "restructure", src, "-o", os.path.join(t.work, "o.sv")], env=env)
    runs = open(log).read().split() if os.path.exists(log) else []
    t.res.check(r.returncode == 0 and "proved equivalent" in r.stderr, f"the run proves its rewrite: {r.stderr[-300:]}")
    t.res.check(len(runs) == 2 and runs[0] == src and os.path.basename(runs[1]) == "lane_sel.sv" and runs[1] != src,
                f"the reader ran on the input, then on the rewrite, nothing more: {runs}")


@S.case("report_has_stage_figures")
def _(t):
    rep = os.path.join(t.work, "r.json")
    r = K.run([t.kerf, "restructure", SAMPLE, "-o", os.path.join(t.work, "o.v"), "--report", rep, "-v"])
    import json
    stages = json.load(open(rep))["stages"]
    names = [s["stage"] for s in stages]
    t.res.check(r.returncode == 0 and all(n in names for n in ("reader", "read", "lower", "restructure", "write",
                                                                 "prove")), f"every stage is reported: {names}")
    t.res.check(all(s["seconds"] >= 0 and s["peak_memory_mb"] > 0 for s in stages),
                f"each with a time and a peak memory: {stages}")
    t.res.check(all(0 <= s["cpu_seconds"] <= s["seconds"] * 2 + 0.5 for s in stages)
                and any(s["cpu_seconds"] > 0 for s in stages if s["stage"] == "reader"),
                f"and the CPU time of the process doing it: {stages}")
    t.res.check(re.search(r"^stages: reader [\d.]+ s", r.stderr, re.M) is not None, "-v prints the stage line")



@S.case("installed_kerf_runs_anywhere")
def _(t):
    """cmake --install into a fresh prefix: P/bin/kerf runs from another directory with its own reader."""
    build = os.path.dirname(os.path.abspath(t.kerf))
    if not os.path.exists(os.path.join(build, "cmake_install.cmake")):
        t.res.skip(f"{build} is not a CMake build directory")
        return
    prefix = os.path.join(t.work, "prefix")
    r = K.run(["cmake", "--install", build, "--prefix", prefix])
    if not t.res.check(r.returncode == 0, f"cmake --install: {r.stdout[-500:]} {r.stderr[-800:]}"):
        return
    kerf = os.path.join(prefix, "bin", "kerf")
    t.res.check(os.access(kerf, os.X_OK), "P/bin/kerf is installed and executable")
    t.res.check(os.path.exists(os.path.join(prefix, "share", "kerf", "reader", "kerf_read.py")),
                "the reader is installed in P/share/kerf/reader")
    # The user's Python: a stand-in interpreter that records which reader script kerf starts.
    log = os.path.join(t.work, "python.log")
    wrapper = os.path.join(t.work, "python3")
    open(wrapper, "w").write(f'#!/bin/sh\necho "$1" >> "{log}"\nexec "{sys.executable}" "$@"\n')
    os.chmod(wrapper, 0o755)
    elsewhere = os.path.join(t.work, "elsewhere")
    os.mkdir(elsewhere)
    shutil.copy(os.path.join(t.root, SAMPLE), os.path.join(elsewhere, "regsel.v"))
    env = {k: v for k, v in os.environ.items() if k not in ("KERF_READER", "KERF_PYTHON")}
    env["PATH"] = t.work + os.pathsep + env.get("PATH", "")
    c = K.run([kerf, "restructure", "regsel.v", "-o", "out.v"], cwd=elsewhere, env=env)
    t.res.check(c.returncode == 0 and os.path.exists(os.path.join(elsewhere, "out.v")) and "proved equivalent" in c.stderr,
                f"the installed kerf restructures and proves a file in another directory: {c.returncode} {c.stderr[-800:]}")
    used = open(log).read().split() if os.path.exists(log) else []
    t.res.check(bool(used) and all(u.startswith(os.path.join(prefix, "share", "kerf", "reader")) for u in used),
                f"it starts the installed reader with the python3 on PATH: {used[:3]}")
    m = K.run([kerf, "restructure", "--all-modules", "--check", "regsel.v"], cwd=elsewhere, env=env)
    t.res.check(m.returncode == 1 and "1 modules" not in m.stderr and "1 module:" in m.stderr,
                f"--all-modules lists modules with the installed script: {m.returncode} {m.stderr[-600:]}")


if __name__ == "__main__":
    S.main()
