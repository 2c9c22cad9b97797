"""The writer keeps bus-wide logic at word level (issue 10: "a vector output whose bits share
one shape is written as one vector assignment"; findings F181, F182).

Each case restructures a design of tests/rtl/ and checks properties of the written text, not
its exact strings:
- F181 (tests/rtl/onehot_bus_mux.sv): a one-hot bus multiplexer whose select decode and data
  terms the engine shares between two outputs. Each output is assigned in one statement (not
  one per bit), and no family of scalar wires named by bit index is declared;
- F182 (tests/rtl/sbox_parity.sv): `odd = ^sub` after `sub` is written in the same block comes
  back as the reduction of the whole vector, not as an exclusive or of its bits.
Every case is also checked by outside references: Icarus Verilog (simulator: the written file
behaves like the original on every input), Verilator (`--lint-only -Wall`: no warning the
original did not have), and kerf on its own output changes nothing.
"""
import os
import re
import sys

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402
import outside_check as O  # noqa: E402

S = K.Suite(__doc__)


def rtl(t, name):
    return os.path.join(t.root, "tests", "rtl", name)


def body_of(text):
    """The text without comments (kerf's header and the author's comments name signals too)."""
    text = re.sub(r"/\*.*?\*/", "", text, flags=re.S)
    return re.sub(r"//[^\n]*", "", text)


def assignments(text, signal):
    """The statements assigning `signal` or a bit or slice of it: (target, value) pairs."""
    out = []
    for m in re.finditer(r"(?:^|[;\s])(?:assign\s+)?(" + re.escape(signal) + r"(?:\s*\[[^\]]*\])?)\s*=(?!=)([^;]*);",
                         body_of(text)):
        out.append((re.sub(r"\s+", "", m.group(1)), m.group(2)))
    return out


def scalar_wire_families(text, least=3):
    """Scalar wires (no range) whose names differ only in a trailing bit number, by stem, where
    at least `least` share one stem: the shape F181 is about (`x_d30` .. `x_d37`)."""
    stems = {}
    for m in re.finditer(r"\bwire\s+([A-Za-z_]\w*?)(\d+)\s*=", body_of(text)):
        stems.setdefault(m.group(1), []).append(int(m.group(2)))
    return {s: sorted(v) for s, v in stems.items() if len(v) >= least}


def restructure(t, src, top, out, *extra):
    return K.run([t.kerf, "restructure", src, "--top", top, "-o", out, *extra])


def outside_checks(t, src, top, out):
    """Icarus (equal on every input), Verilator (no new warning), kerf on its own output."""
    sim = os.path.join(t.work, "sim")
    os.makedirs(sim, exist_ok=True)
    ok, log, bits = K.simulate_equal(t.root, [src], top, out, sim, vectors=5000)
    t.res.check(ok, f"{top}: the written file simulates like the original (Icarus Verilog, {bits} input bits): {log}")
    ok0, w0, _ = O.lint([src], top)
    ok1, w1, raw = O.lint([out], top)
    added = O.new_warnings(w0, w1)
    t.res.check(ok0 and ok1 and not added,
                f"{top}: verilator --lint-only -Wall adds no warning (Verilator): {added} {raw[-1500:] if not ok1 else ''}")
    again = os.path.join(t.work, "again" + os.path.splitext(out)[1])
    r = restructure(t, out, top, again)
    t.res.check(r.returncode == 0 and open(again, "rb").read() == open(out, "rb").read(),
                f"{top}: kerf on its own output changes nothing: {r.stderr[-1500:]}")


@S.case("onehot_bus_mux", needs=("iverilog", "verilator"))
def _(t):
    src = rtl(t, "onehot_bus_mux.sv")
    out = os.path.join(t.work, "onehot_bus_mux.sv")
    r = restructure(t, src, "onehot_bus_mux", out)
    if not t.res.check(r.returncode == 0, f"restructure exit {r.returncode} (proved): {r.stderr[-2000:]}"):
        return
    text = open(out).read()
    t.res.check(text != open(src).read(), "the module is rewritten (the case exercises the writer)")
    for sig in ("q", "qu"):
        a = assignments(text, sig)
        # The reset value `q = 8'h00` of the source goes with the rewrite: one statement remains.
        t.res.check(len(a) == 1 and a[0][0] == sig,
                    f"{sig} is assigned in one statement, as a whole vector: {[x[0] for x in a]}")
    fam = scalar_wire_families(text)
    t.res.check(not fam, f"no family of scalar wires by bit number (F181): {fam}")
    outside_checks(t, src, "onehot_bus_mux", out)


@S.case("sbox_parity", needs=("iverilog", "verilator"))
def _(t):
    src = rtl(t, "sbox_parity.sv")
    out = os.path.join(t.work, "sbox_parity.sv")
    r = restructure(t, src, "sbox_parity", out)
    if not t.res.check(r.returncode == 0, f"restructure exit {r.returncode} (proved): {r.stderr[-2000:]}"):
        return
    text = open(out).read()
    a = assignments(text, "odd")
    t.res.check(len(a) == 1, f"odd is assigned once: {a}")
    if a:
        value = a[0][1]
        # The reduction operator on the whole vector (IEEE 1800-2017 11.4.9), no bit of it apart.
        t.res.check(re.fullmatch(r"\s*\^\s*sub\s*", value) is not None and "sub[" not in value,
                    f"odd is written as the reduction ^sub of the whole vector (F182): `{value.strip()}`")
    outside_checks(t, src, "sbox_parity", out)


if __name__ == "__main__":
    S.main()
