"""Builds kerf's rewrite must stay right for: other parameter values and other defines.

Outside references:
- Icarus Verilog (iverilog/vvp): 4-state simulation of the original against
  the rewrite, instantiated with each parameter value and compiled with each
  define set the case names, exhaustive over the inputs; an output bit may
  differ only where the original is x (kerf's documented don't-care policy).
- slang (through kerf's reader), Icarus Verilog and Verilator: a build that
  overrides a parameter kerf was told to pin must stop at elaboration.

Cases (designs of our own under tests/e2e/variants/):
- lane_mask.v / lane_mask_sv.sv: parameters an instance overrides
  (lane_mask_w8.v is such an instance); by default the dependent logic is
  kept, with --param it is restructured for that value and guarded.
- fifo_flags.v: `ifdef/`else regions, macros defined once, twice, inside a
  region and from the command line; every define set is built and proved.
"""
import json
import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.dirname(__file__))
import kerf_e2e as K  # noqa: E402

HERE = os.path.dirname(os.path.abspath(__file__))
VAR = os.path.join(HERE, "variants")


def reader(a, files, top=None, extra=()):
    cmd = [sys.executable, os.path.join(a.root, "src/reader/kerf_read.py")] + list(extra)
    if top:
        cmd += ["--top", top]
    r = K.run(cmd + list(files))
    if r.returncode != 0:
        raise RuntimeError(f"reader failed on {files} {extra}: {r.stderr}")
    return json.loads(r.stdout)


def renamed_copy(a, path, top, new_name, out_path, extra=()):
    desc = reader(a, [path], top, extra)
    open(out_path, "w").write(K.renamed(open(path).read(), desc, new_name))


def testbench(ports, ref, new, overrides="", exhaustive_limit=14, vectors=3000):
    """Drive `ref` and `new` with the same inputs; count output bits that differ where `ref` is not x."""
    ins = [p for p in ports if p["direction"] == "input"]
    outs = [p for p in ports if p["direction"] != "input"]
    total = sum(p["width"] for p in ins)
    par = f" #({overrides})" if overrides else ""
    t = ["`timescale 1ns/1ps", "module kt_tb;"]
    for i, p in enumerate(ins):
        t.append(f"  reg [{p['width'] - 1}:0] in{i};")
    for i, p in enumerate(outs):
        t.append(f"  wire [{p['width'] - 1}:0] ra{i}, rb{i};")
    ca = [f".{K.vname(p['name'])}(in{i})" for i, p in enumerate(ins)]
    oa = [f".{K.vname(p['name'])}(ra{i})" for i, p in enumerate(outs)]
    ob = [f".{K.vname(p['name'])}(rb{i})" for i, p in enumerate(outs)]
    t.append(f"  {ref}{par} ua ({', '.join(ca + oa)});")
    t.append(f"  {new}{par} ub ({', '.join(ca + ob)});")
    t.append(f"  integer k, j, errors;")
    t.append(f"  reg [{max(total, 1) - 1}:0] all_in;")
    t.append("  task compare; begin")
    for i, p in enumerate(outs):
        t.append(f"    for (j = 0; j < {p['width']}; j = j + 1)")
        t.append(f"      if (ra{i}[j] !== 1'bx && ra{i}[j] !== rb{i}[j]) begin errors = errors + 1;")
        t.append(f"        if (errors < 8) $display(\"MISMATCH {p['name']}[%0d] vector %0d: %b vs %b\", j, k, "
                 f"ra{i}, rb{i}); end")
    t.append("  end endtask")
    split, pos = [], 0
    for i, p in enumerate(ins):
        split.append(f"in{i} = all_in[{pos + p['width'] - 1}:{pos}];")
        pos += p["width"]
    t.append("  initial begin")
    t.append("    errors = 0;")
    if total <= exhaustive_limit:
        t.append(f"    for (k = 0; k < {1 << total}; k = k + 1) begin")
        t.append("      all_in = k;")
    else:
        t.append(f"    for (k = 0; k < {vectors}; k = k + 1) begin")
        for w in range((total + 31) // 32):
            t.append(f"      all_in[{min(total, 32 * (w + 1)) - 1}:{32 * w}] = $random;")
    t.append("      " + " ".join(split))
    t.append("      #1; compare;")
    t.append("    end")
    t.append(f"    $display(\"KT_TB vectors=%0d errors=%0d\", k, errors);")
    t.append("    $finish;")
    t.append("  end")
    t.append("endmodule")
    return "\n".join(t) + "\n"


def icarus_compare(work, files, tb, defines=(), sv=True):
    """(ok, log): compile with Icarus Verilog and run; ok when no output bit differs."""
    tbp = os.path.join(work, "kt_tb.sv")
    open(tbp, "w").write(tb)
    sim = os.path.join(work, "kt.vvp")
    cmd = ["iverilog", "-g2012" if sv else "-g2005-sv", "-o", sim, "-s", "kt_tb"]
    cmd += [f"-D{d}" for d in defines]
    c = K.run(cmd + list(files) + [tbp])
    if c.returncode != 0:
        return False, "iverilog: " + c.stderr[-2000:]
    r = K.run(["vvp", "-n", sim])
    m = re.search(r"KT_TB vectors=(\d+) errors=(\d+)", r.stdout)
    return bool(m and m.group(2) == "0" and int(m.group(1)) > 0), r.stdout[-1500:]


def kept_members(desc):
    return [m for m in desc["members"] if m["kind"] == "kept"]


# ---------------------------------------------------------------------------
# parameters

PARAM_CASES = [
    # file, top, [(parameter overrides as --param and as #(...), name)], parameters the logic uses
    ("lane_mask.v", "lane_mask", [({}, "defaults"), ({"LANES": "8", "MODE": "2'd1"}, "LANES=8 MODE=1")],
     ["LANES", "MODE"]),
    ("lane_mask_sv.sv", "lane_mask_sv", [({}, "defaults"), ({"LANES": "8"}, "LANES=8"), ({"LANES": "3"}, "LANES=3")],
     ["LANES"]),
]


# Outputs of lane_mask_sv.sv and the parameter each reaches through one channel.
CHANNELS = {
    "lane_mask_sv.sv": [("strobe", "LANES"),     # a typedef, a loop bound and widths from the parameter
                        ("wide", "LANES"),       # directly
                        ("odd_lanes", "LANES"),  # a function reading a localparam from it
                        ("mode_hit", "LANES"),   # an enum value from it
                        ("is_store", None)],     # nothing overridable: restructured
}


def overrides_text(values):
    return ", ".join(f".{k}({v})" for k, v in values.items())


def param_args(values):
    out = []
    for k, v in values.items():
        out += ["--param", f"{k}={v}"]
    return out


def check_against_settings(res, a, work, label, src, top, out_file, settings, must_match, read_args=()):
    """Icarus Verilog: the written module against the original, instantiated with each setting."""
    ext = os.path.splitext(src)[1]
    ref = os.path.join(work, "ref" + ext)
    renamed_copy(a, src, top, top + "_ref", ref, read_args)
    new = os.path.join(work, "new" + ext)
    renamed_copy(a, out_file, top, top + "_new", new, read_args)
    for values, name in settings:
        if name not in must_match:
            continue
        ports = reader(a, [src], top, param_args(values))["ports"]
        tb = testbench(ports, top + "_ref", top + "_new", overrides_text(values))
        ok, log = icarus_compare(work, [ref, new], tb)
        res.check(ok, f"{label}: Icarus Verilog, instance with {name}: the rewrite behaves like the original: {log}")


def elaborates(a, work, src, out_file, top, values, ext):
    """Whether a build instantiating the written module with `values` elaborates, per tool."""
    wrapper = os.path.join(work, "kt_top" + ext)
    ports = reader(a, [src], top)["ports"]
    conns = ", ".join(f".{K.vname(p['name'])}()" for p in ports)
    par = f" #({overrides_text(values)})" if values else ""
    open(wrapper, "w").write(f"module kt_top;\n  {top}{par} u ({conns});\nendmodule\n")
    verdicts = {}
    r = K.run([sys.executable, os.path.join(a.root, "src/reader/kerf_read.py"), "--top", "kt_top", out_file, wrapper])
    verdicts["slang"] = (r.returncode == 0, r.stderr)
    # Verilator reports the guard as a warning that is fatal by default: lint with its defaults
    # (but for WIDTH, which a block kept as written may show for some parameter values).
    r = K.run(["verilator", "--lint-only", "-Wno-WIDTH", "-Wno-PINCONNECTEMPTY", "--top-module", "kt_top", out_file, wrapper])
    verdicts["verilator"] = (r.returncode == 0, r.stderr)
    sim = os.path.join(work, "kt_top.vvp")
    r = K.run(["iverilog", "-g2012", "-o", sim, "-s", "kt_top", out_file, wrapper])
    verdicts["icarus"] = (r.returncode == 0, r.stderr)
    return verdicts


def parameter_case(res, a, file, top, settings, used):
    src = os.path.join(VAR, file)
    ext = os.path.splitext(file)[1]
    with tempfile.TemporaryDirectory() as work:
        # Default: logic depending on an overridable parameter stays as written.
        out = os.path.join(work, top + ext)
        r = K.run([a.kerf, "restructure", src, "--top", top, "-o", out])
        if not res.check(r.returncode == 0, f"{file}: restructure (defaults): {r.stderr[-1500:]}"):
            return
        res.check(all(p in r.stderr for p in used), f"{file}: the summary names {used}: {r.stderr}")
        before = reader(a, [src], top)
        after = reader(a, [out], top)
        dependent = [m for m in before["members"] if m["kind"] == "kept" and "parameter" in m["reason"]]
        res.check(len(dependent) > 0, f"{file}: some statements are kept for a parameter")
        text_in = open(src, "rb").read()
        text_out = open(out, "rb").read()
        for m in dependent:
            s = m["src"]
            res.check(text_in[s["start"]:s["end"]] in text_out,
                      f"{file}: statement at line {s['line']} kept byte for byte")
        res.check(len(kept_members(after)) == len(kept_members(before)), f"{file}: same kept statements")
        # Every way a parameter reaches logic is seen (IEEE 1800-2017 6.20: localparams, types and
        # functions are evaluated from the parameter): each output named in CHANNELS depends on it.
        for out_name, param in CHANNELS.get(file, ()):
            m = next(m for m in before["members"] if out_name in m["writes"])
            if param is None:
                res.check(m["kind"] != "kept" and m.get("parameters") == [],
                          f"{file}: '{out_name}' depends on no parameter and is restructured: {m}")
            else:
                res.check(param in m.get("parameters", []),
                          f"{file}: '{out_name}' is seen to depend on {param}: {m.get('parameters')} "
                          f"({m.get('reason')})")
        check_against_settings(res, a, work, f"{file} (defaults)", src, top, out, settings,
                               {name for _, name in settings})

        # --param: restructured for that value, guarded against every other.
        for n, (values, name) in enumerate(settings):
            if not values:
                continue
            pdir = os.path.join(work, f"pinned{n}")
            os.mkdir(pdir)
            outp = os.path.join(pdir, top + ext)
            # --min-gain 0: this checks the guard of a pinned rewrite, whatever the engine gains
            # (lane_mask.v at LANES=8: the engine gains on the strobe loop, 140 -> 37 gates, but that
            # block is kept as written, its loop variable being declared in the module; what is left
            # gains 1 gate).
            r = K.run([a.kerf, "restructure", src, "--top", top, "-o", outp, "--min-gain", "0"]
                      + param_args(values))
            if not res.check(r.returncode == 0, f"{file} --param {name}: restructure: {r.stderr[-1500:]}"):
                continue
            res.check("specialised for" in r.stderr, f"{file} --param {name}: summary says so: {r.stderr}")
            pinned = reader(a, [outp], top, param_args(values))
            res.check(len(kept_members(pinned)) < len(kept_members(before)),
                      f"{file} --param {name}: more logic restructured than by default")
            res.check("kerf_parameter_guard" in open(outp).read(), f"{file} --param {name}: guard written")
            check_against_settings(res, a, pdir, f"{file} --param {name}", src, top, outp, settings, {name},
                                   param_args(values))
            code = K.run([a.kerf, "equiv", src, outp, "--top", top, "--json"] + param_args(values))
            res.check(code.returncode == 0, f"{file} --param {name}: kerf equiv proves the rewrite: "
                                            f"{code.stdout[-800:]}{code.stderr[-800:]}")
            for other, oname in settings:
                if oname == name:
                    continue
                v = elaborates(a, pdir, src, outp, top, other, ext)
                for tool, (ok, log) in v.items():
                    res.check(not ok, f"{file} --param {name}: {tool} stops a build with {oname}: {log[-500:]}")
                    # SystemVerilog: an elaboration-time $error (IEEE 1800 20.11) whose message says
                    # why, for the tools that read it (slang, Verilator); Icarus Verilog 11 reads
                    # the plain-Verilog form of the guard instead.
                    if ext == ".sv" and tool != "icarus":
                        res.check("restructured for" in log and "run kerf restructure again" in log,
                                  f"{file} --param {name}: {tool} names kerf's reason for stopping a build "
                                  f"with {oname}: {log[-500:]}")
            v = elaborates(a, pdir, src, outp, top, values, ext)
            for tool, (ok, log) in v.items():
                res.check(ok, f"{file} --param {name}: {tool} accepts a build with {name}: {log[-800:]}")


def bad_param_values(res, a):
    """Bad --param values: clear message, exit 2, nothing written (trade practice for bad input)."""
    with tempfile.TemporaryDirectory() as work:
        out = os.path.join(work, "x.sv")
        for args, words in ((["--param", "LAST=3"], "localparam"), (["--param", "NOPE=1"], "no parameter"),
                            (["--param", "LANES"], "NAME=VALUE")):
            r = K.run([a.kerf, "restructure", os.path.join(VAR, "lane_mask_sv.sv"), "-o", out] + args)
            res.check(r.returncode == 2 and words in r.stderr and not os.path.exists(out),
                      f"--param {args[1]}: exit 2 naming the problem ({words}): {r.returncode} {r.stderr[-600:]}")


# ---------------------------------------------------------------------------
# conditional compilation

DEFINE_SETS = [[], ["ALMOST_FLAGS"], ["WIDE_COUNT"], ["WIDE_COUNT", "ALMOST_FLAGS"], ["THRESH=5", "ALMOST_FLAGS"]]


def dargs(defs):
    out = []
    for d in defs:
        out += ["-D", d]
    return out


def ifdef_variants(res, a, made_with):
    src = os.path.join(VAR, "fifo_flags.v")
    top = "fifo_flags"
    label = "fifo_flags.v made with " + (" ".join(made_with) or "no defines")
    with tempfile.TemporaryDirectory() as work:
        out = os.path.join(work, top + ".v")
        rep = os.path.join(work, "report.json")
        r = K.run([a.kerf, "restructure", src, "-o", out, "--report", rep] + dargs(made_with))
        if not res.check(r.returncode == 0, f"{label}: restructure: {r.stderr[-1500:]}"):
            return
        orig = reader(a, [src], top, dargs(made_with))
        # The report names every statement left as written, with the reader's reason.
        listed = {(k["line"], k["reason"]) for k in json.load(open(rep)).get("statements_not_restructured", [])}
        for m in orig["members"]:
            if m["kind"] == "kept":
                res.check((m["src"]["line"], m["reason"]) in listed,
                          f"{label}: report lists line {m['src']['line']} kept as written: {m['reason']}")
        new = reader(a, [out], top, dargs(made_with))
        res.check([c["text"] for c in orig["conditionals"]] == [c["text"] for c in new["conditionals"]],
                  f"{label}: the same conditional directives, in the same order")
        res.check(open(out, "rb").read() != open(src, "rb").read() and
                  sum(m["kind"] != "kept" for m in orig["members"]) > 0, f"{label}: something was restructured")
        for m in orig["members"]:
            if m["kind"] == "kept" and m["what"] != "excluded_text":
                s = m["src"]
                res.check(open(src, "rb").read()[s["start"]:s["end"]] in open(out, "rb").read(),
                          f"{label}: kept statement at line {s['line']} unchanged")
        for build in DEFINE_SETS:
            bname = " ".join(build) or "no defines"
            # kerf's own proof of that build ...
            e = K.run([a.kerf, "equiv", src, out, "--json"] + dargs(build))
            res.check(e.returncode == 0, f"{label}, built with {bname}: kerf equiv: {e.stdout[-1200:]}")
            # ... and Icarus Verilog's simulation of it.
            ref = os.path.join(work, "ref.v")
            renamed_copy(a, src, top, top + "_ref", ref, dargs(build))
            nw = os.path.join(work, "new.v")
            renamed_copy(a, out, top, top + "_new", nw, dargs(build))
            ports = reader(a, [src], top, dargs(build))["ports"]
            ok, log = icarus_compare(work, [ref, nw], testbench(ports, top + "_ref", top + "_new"),
                                     defines=build)
            res.check(ok, f"{label}, built with {bname}: Icarus Verilog agrees on every output: {log}")


S = K.Suite(__doc__)
for _file, _top, _settings, _used in PARAM_CASES:
    S.add("param_" + _top, lambda t, f=_file, tp=_top, st=_settings, u=_used: parameter_case(t.res, t.args, f, tp, st, u),
          needs=("iverilog", "verilator"))
S.add("param_bad_values", lambda t: bad_param_values(t.res, t.args))
S.add("ifdef_made_without_defines", lambda t: ifdef_variants(t.res, t.args, []), needs=("iverilog",))
S.add("ifdef_made_with_all_defines",
      lambda t: ifdef_variants(t.res, t.args, ["WIDE_COUNT", "ALMOST_FLAGS", "THRESH=5"]), needs=("iverilog",))

if __name__ == "__main__":
    S.main()
