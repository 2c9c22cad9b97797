#!/usr/bin/env python3
"""End-to-end tests of kerf's front end: the slang reader (src/reader/kerf_read.py)
and, for the constructs of reader_inputs/constructs/, kerf's lowering of them.

Run as:  python3 tests/e2e/test_reader.py --kerf <kerf binary> --root <repo root>
(most tests drive the reader directly; the construct tests run --kerf.)

References named beside the checks:
  - IEEE 1800-2017 (SystemVerilog), clauses 11.6 (expression bit lengths),
    11.8 (expression signedness), 12.5.1 (casez/casex), 11.4.5 (equality with
    x and z), 11.5.1 (selects out of range), recalled from memory;
  - IEEE 1364.1 (RTL synthesis) for x assigned as a don't-care, from memory;
  - Verilator as the linter of kerf's rewrites;
  - Icarus Verilog as the simulator: the values the reader's description
    implies are compared with Icarus' simulation of the same module;
  - the EPFL combinational benchmarks in <root>/../shared/benchmarks/epfl and
    their SOURCE.md (port counts).
Inputs are invented scenarios under tests/e2e/reader_inputs/.
The last line printed is `N passed, M failed`; the exit status is 0 only when
nothing failed.
"""

import argparse
import json
import os
import random
import re
import shutil
import subprocess
import sys
import tempfile
import time
import traceback

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import kerf_e2e as K  # noqa: E402

ROOT = None
INPUTS = None
READER = None
TESTS = []


class Skip(Exception):
    pass


def test(fn):
    TESTS.append(fn)
    return fn


def run_reader(*args, cwd=None, env=None):
    p = subprocess.run([sys.executable, READER] + list(args), cwd=cwd or INPUTS, env=env,
                       stdout=subprocess.PIPE, stderr=subprocess.PIPE, timeout=600)
    return p.returncode, p.stdout.decode("utf-8", "replace"), p.stderr.decode("utf-8", "replace")


def read(*args, cwd=None, raw=False):
    """The reader's description; unless `raw`, each member's expressions and statements
    are also expanded from the node tables into nested dicts (see `expr_tree`)."""
    rc, out, err = run_reader(*args, cwd=cwd)
    assert rc == 0, "reader exit %d for %s:\n%s" % (rc, args, err)
    d = unlinked(json.loads(out))
    return d if raw else expanded(d)


def unlinked(d):
    """`d` with every link `[l, r, end]` of `exprs` written out as the binary node it stands for
    (docs/reader-format.md, "Links"): `["binary", type(l), start(l), end, op(l), l, r]`."""
    ex = d["exprs"]
    for i, n in enumerate(ex):
        if n and isinstance(n[0], int):
            l, r, end = n
            assert 0 <= l < i and 0 <= r < i, "link %d names %s" % (i, n)
            y = ex[l]
            assert y[0] == "binary" and 0 <= y[2] <= end, "link %d continues %s" % (i, y)
            ex[i] = ["binary", y[1], y[2], end, y[4], l, r]
    return d


# ---------------------------------------------------------------------------
# the node tables as trees (docs/reader-format.md, "Expressions", "Statements")

def symbol_names(d):
    names = {s["id"]: s["name"] for s in d["signals"]}
    for m in d["members"]:
        for loc in m.get("locals", []):
            names[loc["id"]] = loc["name"]
    return names


def expr_tree(d, i, names):
    """Node i of `exprs` as a nested dict: {"op", "width", "signed", fields...}."""
    n = d["exprs"][i]
    t = d["types"][n[1]]
    op = n[0]
    r = {"op": op, "width": t["width"], "signed": t["signed"]}
    sub = lambda k: expr_tree(d, k, names)  # noqa: E731
    if op == "const":
        r["bits"] = n[4]
    elif op == "ref":
        r["name"] = names[n[4]]
    elif op == "unary":
        r.update(operator=n[4], operand=sub(n[5]))
    elif op == "binary":
        r.update(operator=n[4], lhs=sub(n[5]), rhs=sub(n[6]))
    elif op == "cond":
        r.update({"cond": sub(n[4]), "then": sub(n[5]), "else": sub(n[6])})
    elif op == "concat":
        r["parts"] = [sub(k) for k in n[4]]
    elif op == "replicate":
        r.update(count=n[4], part=sub(n[5]))
    elif op == "index":
        r.update(value=sub(n[4]), index=sub(n[5]), msb=n[6], lsb=n[7])
    elif op == "range":
        r.update(value=sub(n[4]), left=n[5], right=n[6], msb=n[7], lsb=n[8])
    elif op == "indexed":
        r.update(value=sub(n[4]), base=sub(n[5]), dir=n[6], msb=n[7], lsb=n[8])
    elif op == "convert":
        r["operand"] = sub(n[4])
    else:
        raise AssertionError("unknown node %r" % (n,))
    return r


def stmt_tree(d, i, names):
    s = d["stmts"][i]
    k = s[0]
    x = lambda j: expr_tree(d, j, names)  # noqa: E731
    st = lambda j: None if j < 0 else stmt_tree(d, j, names)  # noqa: E731
    if k == "block":
        return {"stmt": "block", "items": [st(j) for j in s[3]]}
    if k == "assign":
        return {"stmt": "assign", "lhs": x(s[3]), "rhs": x(s[4])}
    if k == "if":
        return {"stmt": "if", "cond": x(s[3]), "then": st(s[4]), "else": st(s[5]), "check": s[6]}
    if k == "case":
        return {"stmt": "case", "kind": s[3], "check": s[4], "expr": x(s[5]),
                "items": [{"exprs": [x(j) for j in it[0]], "body": st(it[1])} for it in s[6]],
                "default": st(s[7]), "attributes": s[8]}
    if k == "case_table":
        return case_table_tree(d, s, names)
    if k == "for":
        return {"stmt": "for", "init": [{"name": names[v], "value": x(e)} for v, e in s[3]],
                "cond": x(s[4]), "step": [st(j) for j in s[5]], "body": st(s[6])}
    if k == "empty":
        return {"stmt": "empty"}
    raise AssertionError("unknown statement %r" % (s,))


def case_table_tree(d, s, names):
    """A `case_table` statement as the `case` tree it stands for: per item its labels as
    constants and a block assigning each target the item's value (docs/reader-format.md,
    "Case tables"), so the checks and the evaluator below read both forms alike."""
    t = s[6]
    w = t["width"]
    labels = [t["labels"][i:i + w] for i in range(0, len(t["labels"]), w)]
    counts = t.get("counts", [1] * len(labels))
    assert sum(counts) == len(labels), "label counts do not add up"
    targets = [expr_tree(d, j, names) for j in t["targets"]]
    items = []
    first = 0
    for k, n in enumerate(counts):
        exprs = [{"op": "const", "width": w, "signed": t["signed"], "bits": b} for b in labels[first:first + n]]
        first += n
        body = []
        for lv, col in zip(targets, t["values"]):
            tw = lv["width"]
            assert len(col) == tw * len(counts), "a value column of the wrong length"
            v = col[k * tw:(k + 1) * tw]
            if v != "-" * tw:
                body.append({"stmt": "assign", "lhs": lv,
                             "rhs": {"op": "const", "width": tw, "signed": False, "bits": v}})
        items.append({"exprs": exprs, "body": {"stmt": "block", "items": body}})
    return {"stmt": "case", "kind": s[3], "check": s[4], "expr": expr_tree(d, s[5], names), "items": items,
            "default": None if s[7] < 0 else stmt_tree(d, s[7], names), "attributes": s[8], "table": True}


def expanded(d):
    names = symbol_names(d)
    for m in d["members"]:
        if m["kind"] == "assign":
            m["lhs"] = expr_tree(d, m["lhs"], names)
            m["rhs"] = expr_tree(d, m["rhs"], names)
        elif m["kind"] == "comb":
            m["body"] = stmt_tree(d, m["body"], names)
    return d


def text_of(src, base=None):
    path = os.path.join(base or INPUTS, src["file"])
    with open(path, "rb") as f:
        return f.read()[src["start"]:src["end"]].decode("utf-8")


def member_writing(desc, name, kind=None):
    found = [m for m in desc["members"] if name in m["writes"] and (kind is None or m["kind"] == kind)]
    assert len(found) == 1, "expected one member writing %r, found %d" % (name, len(found))
    return found[0]


def signal(desc, name):
    for s in desc["signals"]:
        if s["name"] == name:
            return s
    raise AssertionError("no signal %r" % name)


def eq(actual, expected, what=""):
    assert actual == expected, "%s: expected %r, got %r" % (what, expected, actual)


def line_col(path, offset):
    with open(path, "rb") as f:
        data = f.read()[:offset]
    line = data.count(b"\n") + 1
    col = offset - (data.rfind(b"\n") + 1) + 1
    return line, col


# ---------------------------------------------------------------------------
# byte ranges

@test
def statement_byte_ranges():
    d = read("byte_ranges.sv")
    eq(d["format"], "kerf-module", "format")
    eq(d["version"], 4, "version")
    eq(d["module"]["name"], "status_regs", "module name")
    eq(text_of(member_writing(d, "both")["src"]), "assign both = rx_data & tx_data;", "assign")
    both_src = [m for m in d["members"] if "sum" in m["writes"] or "parity" in m["writes"]]
    eq(len(both_src), 2, "assignments of one statement")
    for m in both_src:
        eq(m["kind"], "assign", "multi-assign member kind")
        eq(text_of(m["src"]), "assign sum = rx_data + tx_data, parity = ^rx_data;", "multi-assign")
    eq(text_of(member_writing(d, "flag[0]")["src"]), "assign \\flag[0]  = rx_data[7];", "escaped")
    comb = member_writing(d, "busy")
    eq(comb["kind"], "comb", "always_comb kind")
    eq(comb["style"], "always_comb", "style")
    eq(text_of(comb["src"]), "always_comb begin\n    busy = lo_rx[0] | lo_tx[1];\n"
       "    if (\\flag[0] ) begin\n      busy = 1'b0;\n    end\n  end", "always_comb")
    star = member_writing(d, "nibble")
    eq(star["style"], "always_star", "style of always @(*)")
    eq(text_of(star["src"]), "always @(*) nibble = lo_rx ^ lo_tx;", "always @(*)")
    ff = member_writing(d, "shadow")
    eq(ff["kind"], "kept", "always_ff kind")
    eq(text_of(ff["src"]), "always_ff @(posedge clk) shadow <= shadow + rx_data;", "always_ff")
    # line and column of a start offset, 1-based
    src = member_writing(d, "both")["src"]
    eq((src["line"], src["col"]), line_col(os.path.join(INPUTS, src["file"]), src["start"]), "line/col")
    eq([m["id"] for m in d["members"]], list(range(len(d["members"]))), "ids")
    starts = [m["src"]["start"] for m in d["members"]]
    eq(starts, sorted(starts), "members in source order")


@test
def line_and_column_on_every_line_ending():
    """The reader computes a location's line and column from the file's line starts (F276);
    slang's own source manager is the reference, on byte_ranges.sv as written and in three
    made-up variants: `\\r\\n` line ends, one line ended by a `\\r` alone (a line end for
    slang, not for a count of `\\n`), a UTF-8 byte order mark in front."""
    import pyslang
    from pyslang import driver as sdriver
    base = open(os.path.join(INPUTS, "byte_ranges.sv"), "rb").read()
    third = -1
    for _ in range(3):
        third = base.index(b"\n", third + 1)
    variants = {"as_written.sv": base, "crlf.sv": base.replace(b"\n", b"\r\n"),
                "lone_cr.sv": base[:third] + b"\r" + base[third + 1:], "bom.sv": b"\xef\xbb\xbf" + base}
    with tempfile.TemporaryDirectory() as tmp:
        for name, data in variants.items():
            with open(os.path.join(tmp, name), "wb") as f:
                f.write(data)
            d = read(name, cwd=tmp, raw=True)
            drv = sdriver.Driver()
            drv.addStandardArgs()
            assert drv.parseCommandLine("slang " + os.path.join(tmp, name), sdriver.CommandLineOptions())
            assert drv.processOptions() and drv.parseAllSources()
            sm = drv.sourceManager
            buf = drv.syntaxTrees[0].root.sourceRange.start.buffer
            srcs = [m["src"] for m in d["members"]] + [s["src"] for s in d["signals"]]
            assert len(srcs) > 10, "too few locations in %s" % name
            for src in srcs:
                loc = pyslang.SourceLocation(buf, src["start"])
                eq((src["line"], src["col"]), (sm.getLineNumber(loc), sm.getColumnNumber(loc)),
                   "%s: line/col of byte %d" % (name, src["start"]))
            if name == "lone_cr.sv":
                last = max(srcs, key=lambda s: s["start"])
                eq(last["line"], line_col(os.path.join(tmp, name), last["start"])[0] + 1,
                   "a line ended by a lone \\r counts")


@test
def declaration_byte_ranges():
    d = read("byte_ranges.sv")
    stmt = "wire [3:0] lo_rx, lo_tx = tx_data[3:0], \\flag[0] ;"
    for name, declarator in (("lo_rx", "lo_rx"), ("lo_tx", "lo_tx = tx_data[3:0]"), ("flag[0]", "\\flag[0]")):
        dc = signal(d, name)["decl"]
        assert dc is not None, "%s has no decl" % name
        data = open(os.path.join(INPUTS, dc["file"]), "rb").read().decode()
        eq(data[dc["start"]:dc["end"]], declarator, "declarator of %s" % name)
        eq(data[dc["stmt_start"]:dc["stmt_end"]], stmt, "statement of %s" % name)
        eq(dc["count"], 3, "declarators in the statement")
    dc = signal(d, "shadow")["decl"]
    data = open(os.path.join(INPUTS, dc["file"]), "rb").read().decode()
    eq(data[dc["stmt_start"]:dc["stmt_end"]], "logic [7:0] shadow;", "single declaration")
    eq(dc["count"], 1, "count")
    eq(signal(d, "rx_data")["decl"], None, "ANSI port decl")
    eq(signal(d, "rx_data")["port"], True, "port flag")
    eq(signal(d, "flag[0]")["width"], 4, "escaped signal width")
    nd = member_writing(d, "lo_tx")
    eq(nd.get("net_decl"), True, "net declaration assignment")
    eq(text_of(nd["src"]), " = tx_data[3:0]", "net declaration assignment src")
    eq([(p["name"], p["direction"], p["width"]) for p in d["ports"]],
       [("rx_data", "input", 8), ("tx_data", "input", 8), ("clk", "input", 1), ("both", "output", 8),
        ("sum", "output", 9), ("parity", "output", 1), ("busy", "output", 1), ("nibble", "output", 4)],
       "ports")
    eq(signal(d, "clk")["vector"], False, "scalar")
    eq(signal(d, "both")["vector"], True, "vector")


@test
def compact_json():
    rc, out, err = run_reader("byte_ranges.sv")
    eq(rc, 0, "exit")
    eq(out.count("\n"), 1, "one line of JSON")
    eq(out, json.dumps(json.loads(out), separators=(",", ":")) + "\n", "compact JSON")


@test
def chains_are_links():
    # docs/reader-format.md, "Links" (version 4): a binary node continuing a chain of its left
    # operand's operator, type and start is written as `[l, r, end]`; written out again it is
    # the node the language's left-to-right grouping makes (IEEE 1800-2017 11.3.2: binary
    # operators of one precedence associate to the left), with the byte range of its own text.
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "chain.sv")
        with open(path, "w") as f:
            f.write("module chain (input logic [5:0] a, input logic p, q, output logic y, output logic z,\n"
                    "              output logic [3:0] s);\n"
                    "  assign y = a[0] | a[1] | a[2] | a[3];\n"
                    "  assign z = a[4] ^ a[5] & p ^ q;\n"
                    "  assign s = a[3:0] - a[5:2] - {p, q, p, q};\n"
                    "endmodule\n")
        rc, out, err = run_reader("chain.sv", cwd=tmp)
        eq(rc, 0, "exit: " + err)
        raw = json.loads(out)
        links = [n for n in raw["exprs"] if isinstance(n[0], int)]
        # y: three ORs, the outer two continue a chain; z: the two ^ around the & (one link);
        # s: two subtractions (one link).
        eq(len(links), 4, "links")
        d = unlinked(raw)
        text = open(path, "rb").read()

        def spine(i):
            """(operator, text) of each binary node down the left operands from node i."""
            out = []
            while d["exprs"][i][0] == "binary":
                n = d["exprs"][i]
                out.append((n[4], text[n[2]:n[3]].decode()))
                i = n[5]
            return out
        eq(spine(member_writing(d, "y")["rhs"]),
           [("|", "a[0] | a[1] | a[2] | a[3]"), ("|", "a[0] | a[1] | a[2]"), ("|", "a[0] | a[1]")], "y")
        eq(spine(member_writing(d, "z")["rhs"]), [("^", "a[4] ^ a[5] & p ^ q"), ("^", "a[4] ^ a[5] & p")], "z")
        eq(spine(member_writing(d, "s")["rhs"]),
           [("-", "a[3:0] - a[5:2] - {p, q, p, q}"), ("-", "a[3:0] - a[5:2]")], "s")
        tree = expanded(d)
        y = member_writing(tree, "y")["rhs"]
        eq([y["rhs"]["op"], y["lhs"]["rhs"]["op"], y["lhs"]["lhs"]["lhs"]["op"]], ["index"] * 3, "y's operands")
        eq(y["width"], 1, "y's width")


# ---------------------------------------------------------------------------
# widths and signedness

def rhs(d, name):
    return member_writing(d, name)["rhs"]


@test
def expression_widths_ieee_11_6():
    d = read("widths.sv")
    # 11.6.1: a + b with 8-bit operands assigned to a 9-bit target is evaluated at 9 bits
    r = rhs(d, "sum9")
    eq((r["op"], r["operator"], r["width"], r["signed"]), ("binary", "+", 9, False), "a + b")
    eq((r["lhs"]["op"], r["lhs"]["width"], r["lhs"]["operand"]["width"]), ("convert", 9, 8), "a extended to 9")
    # 11.6.2: (c + d) >> 1 with 16-bit operands and target stays 16 bits (the carry is lost)
    r = rhs(d, "avg16")
    eq((r["operator"], r["width"]), (">>", 16, ), "shift")
    eq((r["lhs"]["operator"], r["lhs"]["width"]), ("+", 16), "sum inside the shift")
    # 11.6.2: adding the integer 0 makes the whole expression 32 bits
    r = rhs(d, "avg32")
    eq((r["op"], r["width"]), ("convert", 16), "truncation to the target")
    eq((r["operand"]["operator"], r["operand"]["width"]), (">>", 32), "32-bit shift")
    # 11.6.1: a relational result is 1 bit; operands sized to max(L(a), L(c)) = 16
    r = rhs(d, "lt")
    eq((r["operator"], r["width"], r["lhs"]["width"], r["rhs"]["width"]), ("<", 1, 16, 16), "a < c")
    # 11.6.1 / 11.8.1: concatenation is L(a) + L(b) and unsigned
    r = rhs(d, "cat")
    eq((r["op"], r["width"], r["signed"], len(r["parts"])), ("concat", 16, False, 2), "{a, b}")
    # 11.8.1: all operands signed -> signed result, operands sign-extended
    r = rhs(d, "ssum")
    eq((r["width"], r["signed"], r["lhs"]["signed"], r["lhs"]["operand"]["signed"]), (10, True, True, True),
       "sa + sb")
    # 11.8.1/11.8.2: one unsigned operand -> unsigned; sa is zero-extended, shown as a
    # sign change at 8 bits before the extension to 10
    r = rhs(d, "mixed")
    eq((r["width"], r["signed"]), (10, False), "sa + b")
    ext = r["lhs"]
    eq((ext["op"], ext["width"], ext["signed"]), ("convert", 10, False), "extension of sa")
    eq((ext["operand"]["op"], ext["operand"]["width"], ext["operand"]["signed"]), ("convert", 8, False),
       "sa made unsigned before the extension")
    # 11.6.1: shift amount self-determined
    r = rhs(d, "shl")
    eq((r["operator"], r["width"], r["lhs"]["width"], r["rhs"]["width"]), ("<<", 8, 8, 4), "a << n")
    # 11.6.1: reduction operators give 1 bit
    r = rhs(d, "red")
    eq((r["parts"][1]["op"], r["parts"][1]["operator"], r["parts"][1]["width"]), ("unary", "&", 1), "&a")
    eq(r["parts"][0], {"op": "const", "width": 3, "signed": False, "bits": "000"}, "3'b000")
    # a signed operand alone in a wider unsigned context is sign-extended (11.8.2), then made unsigned
    r = rhs(d, "widen")
    eq((r["op"], r["signed"], r["operand"]["op"], r["operand"]["width"], r["operand"]["signed"]),
       ("convert", False, "convert", 10, True), "widen")


# ---------------------------------------------------------------------------
# case statements

def first_case(m):
    for it in m["body"]["items"]:
        if it["stmt"] == "case":
            return it
    raise AssertionError("no case statement in member %d" % m["id"])


@test
def case_items_keep_wildcards():
    d = read("case_wild.sv")
    c = first_case(member_writing(d, "unit"))
    eq((c["kind"], c["check"]), ("casez", "none"), "casez")
    # IEEE 1800-2017 12.5.1: '?' in a casez item is z, a don't-care bit
    eq([[x["bits"] for x in it["exprs"]] for it in c["items"]], [["1zz0"], ["01z1", "0000"], ["001z"]], "items")
    eq(c["default"]["stmt"], "assign", "default")
    eq(c["expr"]["op"], "ref", "case expression")
    c = first_case(member_writing(d, "width"))
    eq(c["kind"], "casex", "casex")
    eq([x["bits"] for it in c["items"] for x in it["exprs"]], ["1x0", "0xx"], "casex items keep x")
    c = first_case(member_writing(d, "store"))
    eq((c["kind"], c["check"]), ("case", "unique"), "unique case")
    eq([x["bits"] for x in c["items"][0]["exprs"]], ["00", "01"], "two constants in one item")
    c = first_case(member_writing(d, "wide"))
    eq((c["kind"], c["default"]), ("inside", None), "case inside without default")
    eq(c["items"][0]["exprs"][0]["bits"], "11zz", "inside item")


# ---------------------------------------------------------------------------
# loops

@test
def for_loops():
    d = read("loops.sv")
    m = member_writing(d, "ones")
    eq(m["kind"], "comb", "kind")
    eq([(l["name"], l["width"], l["signed"], l["decl"]) for l in m["locals"]], [("i", 32, True, None)], "locals")
    loops = []

    def walk(s):
        if s["stmt"] == "for":
            loops.append(s)
        for k in ("items",):
            for x in s.get(k, []):
                walk(x)
        if s["stmt"] == "for":
            walk(s["body"])
    walk(m["body"])
    eq(len(loops), 1, "one for loop")
    f = loops[0]
    eq(f["init"][0]["name"], "i", "loop variable")
    eq(f["init"][0]["value"]["bits"], "0" * 32, "initial value")
    eq((f["cond"]["operator"], f["cond"]["lhs"]["name"], f["cond"]["rhs"]["bits"][-4:]), ("<", "i", "1000"), "cond")
    st = f["step"][0]
    eq((st["stmt"], st["lhs"]["name"], st["rhs"]["operator"], st["rhs"]["width"]), ("assign", "i", "+", 32), "i++")
    body = f["body"]
    eq(body["rhs"]["op"], "binary", "body")
    eq(m["reads"], ["mask", "ones"], "reads")
    eq(m["writes"], ["ones"], "writes")
    # Verilog-2001 `integer k;` loop variable of two blocks: a local of each
    for name in ("reversed", "parity_prefix"):
        m = member_writing(d, name)
        eq(m["kind"], "comb", "%s kind" % name)
        eq([l["name"] for l in m["locals"]], ["k"], "module integer as a loop local")
        assert "k" not in m["reads"] + m["writes"], "k listed as a module signal of %s" % name
    m = member_writing(d, "parity_prefix")
    f = [s for s in m["body"]["items"] if s["stmt"] == "for"][0]
    eq(f["step"][0]["rhs"]["operator"], "+", "k += 1")
    # j is read after its loop: kept
    m = member_writing(d, "last_index")
    eq(m["kind"], "kept", "loop variable used outside its loop")
    assert "j" in m["reason"], m["reason"]


# ---------------------------------------------------------------------------
# packages, structs, enums, parameters

@test
def struct_package_enum_parameter_flattening():
    # --as-built: describe this build, parameter-dependent logic included (kerf_params.py keeps
    # it otherwise; see parameter_dependent_logic_is_kept)
    d = read("--as-built", "pkg_struct.sv")
    eq(d["module"]["name"], "router", "module")
    req = signal(d, "req")
    eq((req["width"], req["msb"], req["lsb"], req["vector"]), (19, 18, 0, True), "struct flattened")
    lanes = signal(d, "lanes")
    eq((lanes["width"], lanes["msb"], lanes["lsb"]), (8, 7, 0), "2-D packed array flattened")
    asc = signal(d, "asc")
    eq((asc["msb"], asc["lsb"]), (0, 3), "ascending range kept")
    slot = signal(d, "slot")
    eq(slot["width"], 4, "$clog2(12) = 4 from a localparam")
    # req.dst == DST_IO: member access -> range [18:16]; enum member -> constant 3'b100
    r = rhs(d, "to_io")
    eq((r["lhs"]["op"], r["lhs"]["left"], r["lhs"]["right"], r["lhs"]["msb"], r["lhs"]["lsb"]),
       ("range", 18, 16, 18, 0), "struct member")
    eq(r["rhs"], {"op": "const", "width": 3, "signed": False, "bits": "100"}, "enum member")
    # parameter AW (32-bit int) is a constant
    r = rhs(d, "slot")
    eq(r["op"], "convert", "slot truncation")
    eq(r["operand"]["rhs"]["bits"], format(4, "032b"), "AW as a 32-bit constant")
    r = rhs(d, "lane2")
    eq((r["op"], r["msb"], r["lsb"], r["width"], r["index"]["op"]), ("index", 3, 0, 2, "const"), "lanes[2]")
    r = rhs(d, "window")
    eq((r["op"], r["dir"], r["width"], r["value"]["op"]), ("indexed", "+", 4, "range"), "data[pick +: 4]")
    r = rhs(d, "first")
    eq((r["lhs"]["msb"], r["lhs"]["lsb"]), (0, 3), "asc[0] select in declared coordinates")
    m = member_writing(d, "fwd")
    eq(m["kind"], "comb", "comb")
    targets = [s["lhs"] for s in m["body"]["items"]]
    eq(targets[0], {"op": "ref", "width": 19, "signed": False, "name": "fwd"}, "fwd = req")
    # fwd.data[3] = ...: a nested constant select flattened to bit 3 of fwd
    eq((targets[1]["op"], targets[1]["left"], targets[1]["right"], targets[1]["msb"], targets[1]["lsb"],
        targets[1]["value"]["name"]), ("range", 3, 3, 18, 0, "fwd"), "fwd.data[3]")
    eq((targets[2]["left"], targets[2]["right"]), (18, 16), "fwd.dst")
    # PORTS (package localparam, 6) folded into the comparison
    cond = m["body"]["items"][2]["rhs"]["cond"]
    eq(cond["rhs"]["bits"], format(6, "032b"), "package localparam")


# ---------------------------------------------------------------------------
# kept members

@test
def kept_members_reads_writes():
    d = read("kept.sv")
    by_write = {}
    for m in d["members"]:
        for w in m["writes"]:
            by_write.setdefault(w, []).append(m)
    for m in d["members"]:
        eq(m["kind"], "kept", "every member of kept.sv is kept (%s)" % text_of(m["src"])[:40])
    m = member_writing(d, "count")
    eq((m["what"], m["reads"], m["writes"]), ("always_ff", ["clk", "count", "enable", "load"], ["count"]),
       "always_ff")
    m = member_writing(d, "tick_d")
    eq(m["what"], "instance", "instance")
    eq(m["reads"], ["bus", "clk", "load"], "instance reads (inputs and the inout)")
    eq(m["writes"], ["bus", "tick_d"], "instance writes (output and the inout)")
    eq(text_of(m["src"]), "counter_cell u_cell (.clk(clk), .d(load[0]), .q(tick_d), .line(bus));", "src")
    m = member_writing(d, "mirrored")
    eq((m["what"], m["reads"]), ("generate", ["count"]), "for generate")
    assert text_of(m["src"]).startswith("for (g = 0;") and text_of(m["src"]).endswith("end"), "generate src"
    m = member_writing(d, "sel")
    eq(m["what"], "generate", "if generate: both branches in one member")
    assert text_of(m["src"]).startswith("if (USE_FAST)"), text_of(m["src"])
    m = member_writing(d, "tick_f")
    eq((m["what"], m["reads"]), ("always_comb", ["count"]), "function call")
    assert "'chain'" in m["reason"] and "recursively" in m["reason"], m["reason"]
    assert "nonblocking" in member_writing(d, "nb")["reason"], "nonblocking assignment in always_comb"
    assert "$isunknown" in member_writing(d, "ones")["reason"], "system function"
    m = member_writing(d, "tick_m")
    assert "macro" in m["reason"], m["reason"]
    eq(text_of(m["src"]), "`TICK_ASSIGN", "macro use located in the file")
    eq(m["reads"], ["count", "enable"], "reads through the macro")
    assert "attribute" in member_writing(d, "attr_y")["reason"], "attribute"
    assert "preprocessor" in member_writing(d, "dir_y")["reason"], "ifdef inside a block"
    a1, a2 = member_writing(d, "a1"), member_writing(d, "a2")
    eq(a1["src"], a2["src"], "one statement")
    assert "shares its statement" in a1["reason"], a1["reason"]
    # -D changes which branch is read; the member stays kept either way
    d2 = read("-D", "TIMER_INVERT", "kept.sv")
    eq(member_writing(d2, "dir_y")["kind"], "kept", "with -D")


# ---------------------------------------------------------------------------
# description format 2: node tables, declared types, drivers, comments

@test
def node_tables_are_children_first():
    # docs/reader-format.md: every operand, part and child names an earlier node, every
    # node names a type, and symbol ids are unique.
    for f in ("semantics.sv", "pkg_struct.sv", "loops.sv", "case_wild.sv", "widths.sv", "drivers.sv"):
        d = read(f, raw=True)
        nt = len(d["types"])
        ids = [s["id"] for s in d["signals"]] + [l["id"] for m in d["members"] for l in m.get("locals", [])]
        eq(len(ids), len(set(ids)), "%s: unique symbol ids" % f)
        for i, n in enumerate(d["exprs"]):
            assert 0 <= n[1] < nt, "%s: node %d type" % (f, i)
            kids = {"unary": n[5:6], "binary": n[5:7], "cond": n[4:7], "concat": n[4:5] and n[4],
                    "replicate": n[5:6], "index": n[4:6], "range": n[4:5], "indexed": n[4:6],
                    "convert": n[4:5]}.get(n[0], [])
            if n[0] == "concat":
                kids = n[4]
            for k in kids:
                assert 0 <= k < i, "%s: node %d names %d" % (f, i, k)
        for i, st in enumerate(d["stmts"]):
            kids = []
            if st[0] == "block":
                kids = st[3]
            elif st[0] == "if":
                kids = [x for x in st[4:6] if x >= 0]
            elif st[0] == "for":
                kids = st[5] + [st[6]]
            elif st[0] == "case":
                kids = [it[1] for it in st[6]] + ([st[7]] if st[7] >= 0 else [])
            elif st[0] == "case_table":
                kids = [st[7]] if st[7] >= 0 else []
                for k in st[6]["targets"]:
                    assert 0 <= k < len(d["exprs"]), "%s: statement %d names expression %d" % (f, i, k)
            for k in kids:
                assert 0 <= k < i, "%s: statement %d names %d" % (f, i, k)
        for t in d["types"]:
            for k in ("element", "base"):
                if k in t:
                    assert t[k] < d["types"].index(t), "%s: type names a later type" % f


def type_of(d, name):
    return d["types"][signal(d, name)["type"]]


@test
def declared_types():
    d = read("pkg_struct.sv")
    req = type_of(d, "req")
    eq((req["kind"], req["width"], req["name"], req["ref"]), ("struct", 19, "req_t", "req_t"),
       "struct type, visible by its name through the wildcard import")
    fields = {f["name"]: (f["offset"], d["types"][f["type"]]) for f in req["fields"]}
    eq(sorted(fields), ["addr", "data", "dst"], "fields")
    eq(fields["dst"][0], 16, "dst at bits 18:16")
    eq(fields["addr"][0], 8, "addr at bits 15:8")
    dst = fields["dst"][1]
    eq((dst["kind"], dst["name"], dst["width"]), ("enum", "dst_t", 3), "enum field")
    eq([(v["name"], v["bits"], v["ref"]) for v in dst["values"]],
       [("DST_NONE", "000", "DST_NONE"), ("DST_MEM", "001", "DST_MEM"), ("DST_IO", "100", "DST_IO")],
       "enum values")
    eq(d["types"][dst["base"]]["kind"], "vector", "enum base")
    eq(signal(d, "fwd")["type"], signal(d, "req")["type"], "one entry per type")
    lanes = type_of(d, "lanes")
    eq((lanes["kind"], lanes["msb"], lanes["lsb"]), ("array", 3, 0), "2-D packed array: outer dimension")
    el = d["types"][lanes["element"]]
    eq((el["kind"], el["msb"], el["lsb"], el["width"]), ("vector", 1, 0, 2), "2-D packed array: element")
    asc = type_of(d, "asc")
    eq((asc["kind"], asc["msb"], asc["lsb"]), ("vector", 0, 3), "ascending range")
    eq(type_of(d, "to_io")["kind"], "logic", "a single bit")
    d = read("drivers.sv")
    desc = type_of(d, "desc")
    eq((desc["kind"], desc["name"]), ("struct", "desc_t"), "$unit typedef")
    eq([(f["name"], f["offset"]) for f in desc["fields"]], [("tag", 9), ("len", 1), ("valid", 0)], "offsets")


@test
def kept_code_writes_bit_ranges():
    d = read("drivers.sv")
    # Offsets from the struct's LSB (IEEE 1800-2017 7.2.1: the first member is the most significant).
    by_range = {}
    for m in d["members"]:
        if m["kind"] == "kept" and m["what"] == "always_ff":
            eq(m["writes"], ["desc"], "always_ff writes desc")
            by_range[tuple(map(tuple, m["write_ranges"]["desc"]))] = text_of(m["src"])
    eq(sorted(by_range), [((0, 0),), ((1, 8),), ((9, 12),)], "valid, len and tag")
    g = [m for m in d["members"] if m.get("what") == "generate"]
    eq(len(g), 1, "one member for both branches of the if generate")
    g = g[0]
    eq(g["writes"], ["lane"], "only the active branch drives")
    eq(g["write_ranges"], {"lane": [[0, 1]]}, "lane[1:0] in the narrow branch")
    assert "spare" in g["mentions"] and "spare" not in g["writes"], g["mentions"]


@test
def comments_attached_to_members():
    d = read("comments.sv")
    data = open(os.path.join(INPUTS, "comments.sv"), "rb").read()

    def texts(m, k):
        return [data[a:b].decode() for a, b in m["comments"][k]]
    m = member_writing(d, "wrap")
    eq(texts(m, "above"), ["// wrap when the counter is all ones", "// (two lines directly above)"], "above")
    eq(texts(m, "inside"), [], "inside")
    eq(texts(m, "trailing"), ["// trailing on wrap"], "trailing")
    m = member_writing(d, "half")
    eq(texts(m, "above"), [], "the previous line's trailing comment is not above the next statement")
    eq(texts(m, "inside"), ["/* the top bit */"], "inside")
    eq(texts(m, "trailing"), ["/* trailing block comment */"], "trailing block comment")
    m = member_writing(d, "idle")
    eq(texts(m, "inside"), ["// inside the block", "// after the statement, inside"], "inside a block")
    eq(texts(m, "trailing"), [], "nothing after end")


@test
def keep_attribute_on_declarations():
    d = read("keep.sv")
    eq(signal(d, "tap").get("attributes"), ["keep"], "(* keep *)")
    eq(signal(d, "plain").get("attributes"), None, "no attribute")


@test
def reader_bugs_are_not_hidden():
    # A failure inside the conversion that is not an explicit "unsupported" is a bug of
    # the reader: exit 4 with the traceback, no description, never a quietly kept statement.
    code = ("import sys; sys.path.insert(0, %r); import kerf_convert\n"
            "def boom(self, e): raise RuntimeError('injected reader bug')\n"
            "kerf_convert.Conv.x_binary = boom\n"
            "kerf_convert._EXPR_BY_ID = {id(k): (boom if h.__name__ == 'x_binary' else h) "
            "for k, h in kerf_convert._EXPR.items()}\n"
            "import kerf_read; sys.exit(kerf_read.main(['widths.sv']))" % os.path.dirname(READER))
    p = subprocess.run([sys.executable, "-c", code], cwd=INPUTS, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    eq(p.returncode, 4, "exit code")
    eq(p.stdout, b"", "no description")
    assert b"injected reader bug" in p.stderr, p.stderr.decode()[-2000:]


# ---------------------------------------------------------------------------
# reading back kerf's own rewrite (`--read-back`, docs/reader-format.md "Reading back a rewrite")

def member_texts(d):
    """The `--read-back` list of description `d`: `LENGTH CRC32` of each member's text, as kerf
    writes it (CRC-32 of IEEE 802.3, zlib's)."""
    import zlib
    lines = set()
    for m in d["members"]:
        src = m.get("src")
        if src:
            b = open(src["file"] if os.path.isabs(src["file"]) else os.path.join(INPUTS, src["file"]),
                     "rb").read()[src["start"]:src["end"]]
            lines.add("%d %d" % (len(b), zlib.crc32(b)))
    return "".join(l + "\n" for l in sorted(lines))


def without_writer_fields(d):
    """`d` without what only the writer reads: comments, named constants, match keys."""
    d = json.loads(json.dumps(d))
    d.pop("constants", None)
    for m in d["members"]:
        for k in ("comments", "constants", "match_key"):
            m.pop(k, None)
    return d


READ_BACK_INPUTS = [["comments.sv"], ["kept.sv"], ["case_wild.sv"], ["loops.sv"], ["pkg_struct.sv"],
                    ["semantics.sv"], ["widths.sv"], ["drivers.sv"], ["byte_ranges.sv"], ["keep.sv"],
                    ["-I", "inc", "-D", "READY_EXPR=(st == 2'd3)", "includes.sv"]] + \
    [[os.path.join("..", "..", "..", "samples", f)] for f in ("dma_fsm.sv", "gpio_mux.v", "rv_decoder.sv",
                                                             "uart_regsel.v")] + \
    [[os.path.join("..", "..", "..", "samples", "irq_pkg.sv"), os.path.join("..", "..", "..", "samples", "irq_router.sv")]] + \
    [[os.path.join("..", "variants", f)] for f in ("fifo_flags.v", "lane_mask.v", "lane_mask_sv.sv")]


@test
def read_back_describes_the_same_logic():
    # The read-back description is the full one less comments and named constants (the
    # writer's), with the same match key for every member whose text is listed and a key
    # that pairs with nothing for the others. Checked on every reader input that has members.
    checked = 0
    with tempfile.TemporaryDirectory() as tmp:
        for args in READ_BACK_INPUTS:
            full = read(*args, raw=True)
            if not full["members"]:
                continue
            listed = os.path.join(tmp, "texts")
            open(listed, "w").write(member_texts(full))
            back = read("--read-back", listed, *args, raw=True)
            eq(without_writer_fields(back), without_writer_fields(full), "%s: the logic described" % args)
            for mf, mb in zip(full["members"], back["members"]):
                eq(mb.get("match_key"), mf.get("match_key"), "%s: key of the listed member at %s" % (args, mf["src"]))
                assert "comments" not in mb or mb["comments"] == {"above": [], "inside": [], "trailing": []}, mb
            open(listed, "w").write("")
            none = read("--read-back", listed, *args, raw=True)
            eq(without_writer_fields(none), without_writer_fields(full), "%s: the logic, nothing listed" % args)
            unmatched = 0
            for mf, mb in zip(full["members"], none["members"]):
                if mb["match_key"] != mf["match_key"]:
                    assert mb["match_key"].startswith("unmatched:"), (args, mb["match_key"])
                    unmatched += 1
            assert unmatched > 0, "%s: nothing listed, yet every member got its full key" % (args,)
            checked += 1
    assert checked >= 12, checked


# An invented wide mux-select block: above the size up to which kerf runs itself on the text it
# is about to write (SliceRegroupLimits::checkGates, 20,000 gates; F235), where the reading of
# the rewrite is the read-back one.
WRONG_REWRITE_UNIT = """module wide_select (input logic clk, input logic [5999:0] a, b, c, d, output logic [5999:0] y,
                    output logic [3:0] q);
  always_ff @(posedge clk) q <= a[3:0] ^ b[3:0];
  assign y = (a & b) | (c & d) | (a & d);
endmodule
"""

# A reader that damages the rewrite before describing it, as a wrong writer would have written it;
# it notes each `--read-back` reading in KERF_TEST_SEEN.
DAMAGING_READER = """import os, runpy, sys
args = sys.argv[1:]
if "--read-back" in args:
    path = args[-1]
    text = open(path).read()
    old, new = os.environ["KERF_TEST_DAMAGE"].split("=>")
    open(path, "w").write(text.replace(old, new))
    open(os.environ["KERF_TEST_SEEN"], "a").write(path + "\\n")
sys.argv = [%r] + args
runpy.run_path(%r, run_name="__main__")
"""


@test
def read_back_still_catches_a_wrong_rewrite():
    # kerf proves what it wrote by reading it back (`--read-back`). A rewrite changed before
    # that reading — in the logic kerf wrote, or in a statement kept as written, by its logic
    # or only its spacing — must be refused: exit 5 (kerf's own error), nothing written. The
    # unchanged rewrite through the same reader is the control (exit 0, written).
    with tempfile.TemporaryDirectory() as tmp:
        src = os.path.join(tmp, "wide_select.sv")
        open(src, "w").write(WRONG_REWRITE_UNIT)
        wrapper = os.path.join(tmp, "damaging_reader.py")
        open(wrapper, "w").write(DAMAGING_READER % (READER, READER))
        seen = os.path.join(tmp, "seen")
        written = None
        for damage, what in (("no such text=>", "nothing (control)"),
                             ("| (c & d)=>& (c & d)", "the rewritten logic"),
                             ("q <= a[3:0] ^ b[3:0];=>q <= a[3:0] | b[3:0];", "a kept statement's logic"),
                             ("q <= a[3:0] ^ b[3:0];=>q <= a[3:0] ^  b[3:0];", "a kept statement's spacing")):
            out = os.path.join(tmp, "out.sv")
            if os.path.exists(out):
                os.remove(out)
            if os.path.exists(seen):
                os.remove(seen)
            env = dict(os.environ, KERF_READER=wrapper, KERF_TEST_DAMAGE=damage, KERF_TEST_SEEN=seen, TMPDIR=tmp)
            p = subprocess.run([KERF, "restructure", src, "-o", out, "--min-gain", "0"], env=env,
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE, timeout=600)
            err = p.stderr.decode("utf-8", "replace")
            assert os.path.exists(seen), "%s: kerf read its rewrite back with --read-back: %s" % (what, err[-600:])
            if damage.startswith("no such"):
                eq(p.returncode, 0, "control: %s" % err[-600:])
                written = open(out).read() if os.path.exists(out) else ""
                continue
            target = damage.split("=>")[0]
            assert target in written, "the control's rewrite holds the text the damage changes (%r):\n%s" % (
                target, written)
            eq(p.returncode, 5, "%s damaged: kerf's own error: %s" % (what, err[-800:]))
            assert not os.path.exists(out), "%s damaged: nothing written" % what
            assert "kerf bug" in err, "%s damaged: the message calls it kerf's bug: %s" % (what, err[-800:])


# ---------------------------------------------------------------------------
# kerf on constructs: each module of reader_inputs/constructs/ (invented
# scenarios) restructured by kerf, the rewrite compared with the original by
# Icarus Verilog 4-state simulation wherever the original is not x (outside
# reference: the simulator), and linted by Verilator -Wall with no warning the
# original did not have (outside reference: the linter).

KERF = None
CONSTRUCTS = None


def lint_findings(files, top):
    """Verilator -Wall warnings and errors, without locations: {(code, message)}."""
    if not shutil.which("verilator"):
        raise Skip("Verilator not installed")
    p = subprocess.run(["verilator", "--lint-only", "-Wall", "--top-module", top] + files,
                       stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    found = set()
    for line in p.stderr.decode("utf-8", "replace").splitlines():
        m = re.match(r"%(Warning-[A-Z0-9_]+|Error(?:-[A-Z0-9_]+)?): (?:[^:]+:\d+:\d+: )?(.*)", line)
        if m and not m.group(2).startswith("Exiting due to"):
            found.add((m.group(1), m.group(2).strip()))
    return found


def x_aware_testbench(desc, ref_name, new_name, vectors, seed, only_when=None):
    """Both modules driven with the same 0/1 inputs; an output bit counts as different only
    where the original's bit is not x (don't-cares may take any value in the rewrite).
    `only_when`, a Verilog condition over the input ports' names, skips the other vectors
    (inputs the source declares impossible, where a simulator keeps an old value)."""
    ins = [p for p in desc["ports"] if p["direction"] == "input"]
    outs = [p for p in desc["ports"] if p["direction"] != "input"]
    total = sum(p["width"] for p in ins)
    L = ["module kerf_tb;"]
    for i, p in enumerate(ins):
        L.append("  reg [%d:0] in%d;" % (p["width"] - 1, i))
    for i, p in enumerate(outs):
        L.append("  wire [%d:0] ra%d, rb%d;" % (p["width"] - 1, i, i))
    conn = lambda side: ", ".join([".%s(in%d)" % (K.vname(p["name"]), i) for i, p in enumerate(ins)] +
                                  [".%s(r%s%d)" % (K.vname(p["name"]), side, i) for i, p in enumerate(outs)])
    L.append("  %s ua (%s);" % (ref_name, conn("a")))
    L.append("  %s ub (%s);" % (new_name, conn("b")))
    for i, p in enumerate(ins):
        L.append("  wire [%d:0] %s = in%d;" % (p["width"] - 1, K.vname(p["name"]), i))
    L.append("  integer tb_k, tb_n, tb_errors, tb_xs, tb_seed;")
    L.append("  reg [%d:0] tb_all;" % max(total - 1, 0))
    L.append("  initial begin")
    L.append("    tb_errors = 0; tb_xs = 0; tb_seed = %d;" % seed)
    exhaustive = total <= 14
    L.append("    for (tb_k = 0; tb_k < %d; tb_k = tb_k + 1) begin" % ((1 << total) if exhaustive else vectors))
    if exhaustive:
        L.append("      tb_all = tb_k;")
    else:
        for w in range((total + 31) // 32):
            L.append("      tb_all[%d:%d] = $random(tb_seed);" % (min(total, 32 * (w + 1)) - 1, 32 * w))
    pos = 0
    for i, p in enumerate(ins):
        L.append("      in%d = tb_all[%d:%d];" % (i, pos + p["width"] - 1, pos))
        pos += p["width"]
    L.append("      #1;")
    if only_when:
        L.append("      if (%s) begin" % only_when)
    for i, p in enumerate(outs):
        L.append("      for (tb_n = 0; tb_n < %d; tb_n = tb_n + 1) begin" % p["width"])
        L.append("        if (ra%d[tb_n] === 1'bx) tb_xs = tb_xs + 1;" % i)
        L.append("        else if (ra%d[tb_n] !== rb%d[tb_n]) begin tb_errors = tb_errors + 1;" % (i, i))
        L.append('          if (tb_errors < 6) $display("DIFF %s[%%0d] in=%%h: %%b vs %%b", tb_n, tb_all, ra%d[tb_n], rb%d[tb_n]); end'
                 % (p["name"], i, i))
        L.append("      end")
    if only_when:
        L.append("      end")
    L.append("    end")
    L.append('    $display("KERF_TB errors=%0d x_bits=%0d", tb_errors, tb_xs);')
    L.append("  end")
    L.append("endmodule")
    return "\n".join(L) + "\n"


def restructure_construct(name, top, *args, expect_code=0, only_when=None, reference=None):
    """Run kerf on one construct module; check exit, lint and simulation; return (stderr, rewrite text)."""
    src = os.path.join(CONSTRUCTS, name)
    with tempfile.TemporaryDirectory() as tmp:
        out = os.path.join(tmp, name)   # same file name: Verilator's file-name check stays quiet
        p = subprocess.run([KERF, "restructure", src, "--top", top, "-o", out] + list(args),
                           stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        err = p.stderr.decode("utf-8", "replace")
        eq(p.returncode, expect_code, "%s: kerf exit (stderr: %s)" % (name, err[-1500:]))
        if expect_code != 0:
            return err, None
        text = open(out).read()
        new_lint = lint_findings([out], top)
        old_lint = lint_findings([src], top)
        extra = new_lint - old_lint
        assert not extra, "%s: Verilator -Wall findings the original does not have: %s\n%s" % (name, extra, text)
        if not shutil.which("iverilog"):
            raise Skip("Icarus Verilog not installed")
        desc = K.read_module(ROOT, [src], top)
        # `reference`: the same function written another way, for constructs Icarus cannot read.
        ref = (K.renamed(open(src).read(), desc, top + "_ref") if reference is None
               else reference.replace("module %s " % top, "module %s_ref " % top, 1))
        new = K.renamed(text, K.read_module(ROOT, [out], top), top + "_new")
        ext = os.path.splitext(name)[1]
        open(os.path.join(tmp, "ref" + ext), "w").write(ref)
        open(os.path.join(tmp, "new" + ext), "w").write(new)
        open(os.path.join(tmp, "tb.sv"), "w").write(x_aware_testbench(desc, top + "_ref", top + "_new", 3000, 9,
                                                                          only_when))
        sim = os.path.join(tmp, "sim.vvp")
        c = subprocess.run(["iverilog", "-g2012", "-o", sim, os.path.join(tmp, "ref" + ext),
                            os.path.join(tmp, "new" + ext), os.path.join(tmp, "tb.sv")],
                           stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        assert c.returncode == 0, "%s: iverilog: %s" % (name, c.stderr.decode()[-2000:])
        r = subprocess.run(["vvp", "-n", sim], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        o = r.stdout.decode()
        assert "KERF_TB errors=0" in o, "%s: Icarus shows a difference:\n%s\n%s" % (name, o[-2000:], text)
        return err, text


def summary_kept(err):
    return [l for l in err.splitlines() if "left as written" in l]


@test
def construct_tristate_is_kept():
    # A statement that can drive z is kept as written, with the reason (issue 8).
    err, text = restructure_construct("pad_ctrl.sv", "pad_ctrl")
    assert "assign pad    = oe ? tx_eff : 1'bz;" in text, text
    assert any("tri-state" in l for l in summary_kept(err)), err


@test
def construct_summary_names_kept_statements():
    # Every statement kept as written is named with its line and reason on the summary's
    # "kept as written" line (issue 9); the rewritten statements (y, v) are not listed.
    err, text = restructure_construct("kept_reasons.sv", "kept_reasons")
    kept = [l for l in err.splitlines() if "module kept_reasons: kept as written:" in l]
    assert len(kept) == 1, err
    line = kept[0]
    assert re.search(r"line 12 \(always_ff: [^)]*sequential", line), line
    assert re.search(r"line 13 \(assign: [^)]*tri-state", line), line
    assert re.search(r"line 14 \([^)]*(saving|min-gain)", line), line
    assert not re.search(r"\b1[56]\b", line), line
    assert "assign y = (a[2] & b[2] & a[3] & b[3])" not in text, "y and v share a term and are rewritten: " + text
    # The source's exclusive or inside a larger sum stays an exclusive or (issue 10: logic
    # that reads well), not the two products `a[1] & ~b[0] | ~a[1] & b[0]`.
    assert re.search(r"assign v = [^;]*\^", text), text


@test
def construct_x_default_is_dont_care():
    # default: y = 'x is a don't-care (IEEE 1364.1 synthesis reading): the rewrite may
    # take any value there and matches the original everywhere else. (The block chooses among
    # bitwise word operations, which the text rule keeps as written, F307: off here.)
    err, text = restructure_construct("opcode_dc.sv", "opcode_dc", "--text-per-gate", "0")
    assert "'x" not in text.split("endmodule")[0].split("always_comb")[-1] or "default" not in text, text
    err, text = restructure_construct("opcode_dc.sv", "opcode_dc", "--keep-x")
    assert "y = 'x;" in text, "--keep-x keeps the statement: " + text
    assert any("--keep-x" in l for l in summary_kept(err)), err


@test
def construct_incomplete_unique_case_and_full_case():
    # No longer refused as latches (issue 8): the missing codes are don't-cares. Compared on
    # the codes the case lists (for the others a simulator keeps the previous value, 12.5.3).
    restructure_construct("irq_sel.sv", "irq_sel", only_when="$onehot(sel)")
    restructure_construct("strobe_dec.v", "strobe_dec", only_when="size != 2'd3")
    err, _ = restructure_construct("irq_sel.sv", "irq_sel", "--keep-x", only_when="$onehot(sel)")
    assert any("--keep-x" in l for l in summary_kept(err)), err


@test
def construct_x_and_z_in_comparisons():
    # === / !== compare x literally, == with an x bit is x or 0, ==? and casez/casex
    # wildcards (IEEE 1800 11.4.5, 11.4.6, 12.5.1): checked against Icarus.
    restructure_construct("xz_compare.sv", "xz_compare")


@test
def construct_narrow_and_out_of_range_indices():
    # y[s] with a 1-bit s writes only bits 0 and 1; a[k] out of range reads x; a part select
    # partly out of range keeps its in-range bits (IEEE 1800 11.5.1).
    restructure_construct("lane_index.sv", "lane_index")


@test
def construct_division_by_constants():
    # Division and modulo by constants (IEEE 1800 11.4.2: truncation toward zero, the
    # remainder takes the dividend's sign) are lowered; by powers of two they are wires.
    err, text = restructure_construct("clock_digits.sv", "clock_digits", "--min-gain", "0")
    assert "left as written" not in err, err


@test
def construct_functions_inlined():
    # Automatic and static functions, loops inside them, a function calling another: each
    # call lowered from the function's body (issue 9: callers are no longer kept).
    err, text = restructure_construct("flag_funcs.sv", "flag_funcs", "--min-gain", "0")
    assert "left as written" not in err, err
    d = read(os.path.join("constructs", "flag_funcs.sv"), raw=True)
    eq(sorted(f["name"] for f in d["functions"]), ["any_high", "level_band", "parity", "popcount8"],
       "functions described")
    eq([m["kind"] for m in d["members"]], ["assign", "assign", "assign", "comb"], "no member kept")


# range_class with its `case inside` written as the if chain IEEE 1800 12.5.4 defines (ranges
# as >= and <=, items as ==? with ? as wildcards): Icarus 11 does not read `case inside`.
RANGE_CLASS_BY_IF = """module range_class (
  input  logic [5:0] page,
  output logic [1:0] cls,
  output logic       io
);
  always @(*) begin
    cls = 2'd0;
    io  = 1'b0;
    if (page >= 6'd0 && page <= 6'd15) cls = 2'd1;
    else if (page == 6'd16 || (page >= 6'd32 && page <= 6'd39)) cls = 2'd2;
    else if (page ==? 6'b11????) begin cls = 2'd3; io = 1'b1; end
  end
endmodule
"""


@test
def construct_case_inside_ranges():
    err, text = restructure_construct("range_class.sv", "range_class", "--min-gain", "0",
                                      reference=RANGE_CLASS_BY_IF)
    assert "inside" not in text.split("endmodule")[0].split("module range_class")[1], text
    assert "left as written" not in err, err


@test
def construct_variable_part_select_writes():
    err, text = restructure_construct("lane_write.sv", "lane_write", "--min-gain", "0")
    assert "left as written" not in err, err


# ---------------------------------------------------------------------------
# errors, top selection, includes

@test
def syntax_error_exit_1():
    rc, out, err = run_reader("syntax_error.sv")
    eq(rc, 1, "exit code")
    eq(out, "", "no JSON on stdout")
    assert re.search(r"syntax_error\.sv:2:\d+: error: ", err), err
    assert "assign y = a &;" in err, "slang's source snippet: " + err


@test
def missing_file_exit_1():
    rc, out, err = run_reader("no_such_file.sv")
    eq(rc, 1, "exit code")
    assert "no_such_file.sv" in err, err


@test
def top_selection():
    rc, out, err = run_reader("two_tops.sv")
    eq(rc, 2, "ambiguous top exit code")
    assert "left_half" in err and "right_half" in err and "--top" in err, err
    eq(out, "", "no JSON")
    d = read("--top", "right_half", "two_tops.sv")
    eq(d["module"]["name"], "right_half", "chosen top")
    eq(len(d["members"]), 1, "members of the chosen module only")
    rc, out, err = run_reader("--top", "nope", "two_tops.sv")
    eq(rc, 2, "unknown module exit code")
    assert "module 'nope' not found" in err, err
    rc, out, err = run_reader("--bogus-option", "two_tops.sv")
    eq(rc, 2, "usage error")


@test
def include_dirs_and_defines():
    # A macro from the command line may differ between builds: kept unless --as-built.
    d = read("-I", "inc", "-D", "READY_EXPR=(st == 2'd3)", "includes.sv")
    m = member_writing(d, "ready")
    eq(m["kind"], "kept", "assign using a -D macro")
    assert "command line" in m["reason"], m["reason"]
    d = read("--as-built", "-I", "inc", "-D", "READY_EXPR=(st == 2'd3)", "includes.sv")
    m = member_writing(d, "ready")
    eq(m["kind"], "assign", "assign from an included file")
    assert m["src"]["file"].endswith("flags.svh"), m["src"]
    eq(text_of(m["src"]), "assign ready = `READY_EXPR;", "src in the included file")
    eq((m["rhs"]["operator"], m["rhs"]["rhs"]["bits"]), ("==", "11"), "macro body from -D")
    rc, out, err = run_reader("-I", "inc", "includes.sv")
    eq(rc, 1, "undefined macro is an error")
    assert "READY_EXPR" in err, err


@test
def match_keys_streamed_like_token_lists():
    # A member's match key is digested while its syntax is visited (kerf_symbols.Keys.node_key)
    # instead of from a list of its tokens (Keys.key): both must give the same key, with
    # macro uses between the tokens, package-scoped names and directives anywhere in the
    # file, and the token visit for directives is skipped only for sources without a backtick.
    # Reference: the token-list digest itself (the form every earlier key was made by).
    sys.path.insert(0, os.path.dirname(READER))
    import pyslang
    from pyslang import syntax as sx
    import kerf_symbols as ks
    with_macros = ("package cfg_pkg; localparam logic [3:0] MODE_A = 4'h3; endpackage\n"
                   "`define SEL(a, b) ((a) & ~(b))\n"
                   "module km (input logic [3:0] x, input logic s, output logic [3:0] y, output logic z);\n"
                   "  assign y = `SEL(x, cfg_pkg::MODE_A) | {4{s}};  // macro between tokens\n"
                   "  always_comb begin\n    z = 1'b0;\n`ifdef KM_WIDE\n    z = x[3];\n`endif\n"
                   "    if (x == cfg_pkg::MODE_A) z = s ^ x[0];\n  end\nendmodule\n")
    plain = with_macros.replace("`define SEL(a, b) ((a) & ~(b))\n", "").replace("`SEL(x, cfg_pkg::MODE_A)", "(x & ~cfg_pkg::MODE_A)") \
        .replace("`ifdef KM_WIDE\n    z = x[3];\n`endif\n", "")
    tmp = tempfile.mkdtemp(prefix="kerf-keys-")
    try:
        for text, directives in ((with_macros, True), (plain, False)):
            path = os.path.join(tmp, "km.sv")
            with open(path, "w") as f:
                f.write(text)
            sm = pyslang.SourceManager()   # of its own: the default one keeps every earlier file
            tree = pyslang.syntax.SyntaxTree.fromFile(path, sm)
            comp = pyslang.ast.Compilation()
            comp.addSyntaxTree(tree)
            top = comp.getRoot().topInstances[0]
            tokens = ks.Tokens(comp)
            eq(tokens.any_directives, directives, "source with a backtick")
            eq(bool(tokens.directives), directives, "directives found")
            keys = ks.Keys(comp, tokens, ks.Refs(top.body))
            members = [m for m in top.body.syntax.members]
            assert len(members) == 2, members
            seen = set()
            for m in members:
                nodes = [m] + ([m.statement] if hasattr(m, "statement") else [])
                for node in nodes:
                    if not isinstance(node, sx.SyntaxNode):
                        continue
                    want = keys.key("kept:x", ks.node_tokens(node), ["km"])
                    eq(keys.node_key("kept:x", node, ["km"]), want, "streamed key of %s" % node.kind)
                    seen.add(want)
            assert len(seen) == 3, "distinct members give distinct keys: %s" % seen
    finally:
        shutil.rmtree(tmp, ignore_errors=True)


@test
def missing_pyslang_exit_3():
    with tempfile.TemporaryDirectory() as tmp:
        os.mkdir(os.path.join(tmp, "pyslang"))
        with open(os.path.join(tmp, "pyslang", "__init__.py"), "w") as f:
            f.write("raise ImportError('pyslang hidden by test_reader.py')\n")
        env = dict(os.environ)
        env["PYTHONPATH"] = tmp + os.pathsep + env.get("PYTHONPATH", "")
        rc, out, err = run_reader("byte_ranges.sv", env=env)
    eq(rc, 3, "exit code")
    assert "pip install -r requirements.txt" in err, err


# ---------------------------------------------------------------------------
# EPFL benchmarks

# From SOURCE.md beside the benchmarks: inputs and outputs of each module.
EPFL = {"ctrl.v": (7, 26), "dec.v": (8, 256), "int2float.v": (11, 7), "router.v": (60, 30),
        "priority.v": (128, 8), "voter.v": (1001, 1)}


@test
def epfl_benchmarks_parse():
    folder = os.path.normpath(os.path.join(ROOT, "..", "shared", "benchmarks", "epfl"))
    if not os.path.isdir(folder):
        raise Skip("EPFL benchmarks not found at %s" % folder)
    for name, (n_in, n_out) in EPFL.items():
        path = os.path.join(folder, name)
        t0 = time.monotonic()
        d = read(path, cwd=folder)
        dt = time.monotonic() - t0
        data = open(path, "rb").read()
        n_assign = len(re.findall(rb"^\s*assign\b", data, re.M))
        eq(len(d["members"]), n_assign, "%s: one member per assign" % name)
        dirs = [p["direction"] for p in d["ports"]]
        eq((dirs.count("input"), dirs.count("output")), (n_in, n_out), "%s: ports (SOURCE.md)" % name)
        names = {s["name"] for s in d["signals"]}
        for m in d["members"]:
            eq(m["kind"], "assign", "%s: member kind" % name)
            t = data[m["src"]["start"]:m["src"]["end"]]
            assert t.startswith(b"assign ") and t.endswith(b";"), "%s: src %r" % (name, t)
            for s in m["reads"] + m["writes"]:
                assert s in names, "%s: %s is not a signal" % (name, s)
        for s in d["signals"]:
            assert "\\" not in s["name"] and not s["name"].endswith(" "), s["name"]
            dc = s["decl"]
            t = data[dc["start"]:dc["end"]].decode()
            assert t in (s["name"], "\\" + s["name"]), "%s: declarator %r of %s" % (name, t, s["name"])
        print("  %s: %d assigns, %d signals, read in %.2f s" % (name, n_assign, len(names), dt))


# ---------------------------------------------------------------------------
# semantics against Icarus Verilog

def _mask(w):
    return (1 << w) - 1


def _ext(v, wf, wt, signed):
    v &= _mask(wf)
    if wt <= wf:
        return v & _mask(wt)
    if signed and wf > 0 and (v >> (wf - 1)) & 1:
        v |= _mask(wt) ^ _mask(wf)
    return v


def _sval(v, w):
    return v - (1 << w) if w and (v >> (w - 1)) & 1 else v


def _dim(index, msb, lsb):
    return index - lsb if msb >= lsb else lsb - index


def ev(n, env):
    """Value (an unsigned integer of n's width) of an expression of the description,
    by the meanings docs/reader-format.md gives the nodes."""
    op, w = n["op"], n["width"]
    if op == "const":
        return int(n["bits"].replace("x", "0").replace("z", "0"), 2)
    if op == "ref":
        return env[n["name"]] & _mask(w)
    if op == "convert":
        o = n["operand"]
        return _ext(ev(o, env), o["width"], w, o["signed"])
    if op == "unary":
        o = n["operand"]
        a = ev(o, env)
        f = n["operator"]
        if f in ("~", "-", "+"):
            a = _ext(a, o["width"], w, o["signed"])
            return {"~": ~a, "-": -a, "+": a}[f] & _mask(w)
        ow = o["width"]
        r = {"&": a == _mask(ow), "|": a != 0, "^": bin(a).count("1") % 2 == 1,
             "~&": a != _mask(ow), "~|": a == 0, "~^": bin(a).count("1") % 2 == 0, "!": a == 0}[f]
        return int(r)
    if op == "binary":
        f = n["operator"]
        lo, ro = n["lhs"], n["rhs"]
        a, b = ev(lo, env), ev(ro, env)
        if f in ("&", "|", "^", "~^", "+", "-", "*"):
            a, b = _ext(a, lo["width"], w, lo["signed"]), _ext(b, ro["width"], w, ro["signed"])
            r = {"&": a & b, "|": a | b, "^": a ^ b, "~^": ~(a ^ b), "+": a + b, "-": a - b, "*": a * b}[f]
            return r & _mask(w)
        if f in ("&&", "||", "->", "<->"):
            x, y = a != 0, b != 0
            return int({"&&": x and y, "||": x or y, "->": (not x) or y, "<->": x == y}[f])
        if f in ("==", "!=", "<", "<=", ">", ">=", "==?", "!=?"):
            m = max(lo["width"], ro["width"])
            both = lo["signed"] and ro["signed"]
            a, b = _ext(a, lo["width"], m, both), _ext(b, ro["width"], m, both)
            if both:
                a, b = _sval(a, m), _sval(b, m)
            r = {"==": a == b, "!=": a != b, "<": a < b, "<=": a <= b, ">": a > b, ">=": a >= b,
                 "==?": a == b, "!=?": a != b}[f]
            return int(r)
        if f in ("<<", "<<<", ">>", ">>>"):
            a = _ext(a, lo["width"], w, lo["signed"])
            if f in ("<<", "<<<"):
                return (a << b) & _mask(w)
            if f == ">>>" and lo["signed"]:
                return (_sval(a, w) >> b) & _mask(w)
            return a >> b
        raise AssertionError("operator %s not modelled" % f)
    if op == "cond":
        t, e = n["then"], n["else"]
        br = t if ev(n["cond"], env) != 0 else e
        return _ext(ev(br, env), br["width"], w, br["signed"])
    if op == "concat":
        v = 0
        for p in n["parts"]:
            v = (v << p["width"]) | ev(p, env)
        return v & _mask(w)
    if op == "replicate":
        p = n["part"]
        v = 0
        for _ in range(n["count"]):
            v = (v << p["width"]) | ev(p, env)
        return v & _mask(w)
    if op == "index":
        i = n["index"]
        k = ev(i, env)
        k = _sval(k, i["width"]) if i["signed"] else k
        return (ev(n["value"], env) >> (_dim(k, n["msb"], n["lsb"]) * w)) & _mask(w)
    if op == "range":
        a, b = _dim(n["left"], n["msb"], n["lsb"]), _dim(n["right"], n["msb"], n["lsb"])
        ew = w // (abs(a - b) + 1)
        return (ev(n["value"], env) >> (min(a, b) * ew)) & _mask(w)
    if op == "indexed":
        bn = n["base"]
        base = ev(bn, env)
        base = _sval(base, bn["width"]) if bn["signed"] else base
        last = base + w - 1 if n["dir"] == "+" else base - w + 1
        lo = min(_dim(base, n["msb"], n["lsb"]), _dim(last, n["msb"], n["lsb"]))
        return (ev(n["value"], env) >> lo) & _mask(w)
    raise AssertionError("node %s not modelled" % op)


def store(lv, v, env, widths):
    op = lv["op"]
    v &= _mask(lv["width"])
    if op == "ref":
        env[lv["name"]] = v
        return
    if op == "concat":
        for p in reversed(lv["parts"]):
            store(p, v, env, widths)
            v >>= p["width"]
        return
    parent = lv["value"]
    assert parent["op"] == "ref", "nested target"
    name, w = parent["name"], lv["width"]
    if op == "index":
        i = lv["index"]
        k = ev(i, env)
        k = _sval(k, i["width"]) if i["signed"] else k
        lo = _dim(k, lv["msb"], lv["lsb"]) * w
    elif op == "range":
        a, b = _dim(lv["left"], lv["msb"], lv["lsb"]), _dim(lv["right"], lv["msb"], lv["lsb"])
        lo = min(a, b) * (w // (abs(a - b) + 1))
    else:
        raise AssertionError("target %s not modelled" % op)
    cur = env.get(name, 0)
    cur &= ~(_mask(w) << lo)
    env[name] = (cur | (v << lo)) & _mask(widths[name])


def run_stmt(s, env, widths):
    k = s["stmt"]
    if k == "block":
        for x in s["items"]:
            run_stmt(x, env, widths)
    elif k == "assign":
        r, l = s["rhs"], s["lhs"]
        store(l, _ext(ev(r, env), r["width"], l["width"], r["signed"]), env, widths)
    elif k == "if":
        if ev(s["cond"], env) != 0:
            run_stmt(s["then"], env, widths)
        elif s["else"] is not None:
            run_stmt(s["else"], env, widths)
    elif k == "case":
        sel = ev(s["expr"], env)
        sw = s["expr"]["width"]
        for it in s["items"]:
            for x in it["exprs"]:
                if x["op"] == "const":
                    bits = x["bits"]
                    ok = True
                    for i, ch in enumerate(reversed(bits)):
                        wild = (ch == "z" and s["kind"] != "case") or (ch == "x" and s["kind"] in ("casex", "inside"))
                        if not wild and (ch not in "01" or int(ch) != (sel >> i) & 1):
                            ok = False
                            break
                else:
                    ok = ev(x, env) == sel & _mask(sw)
                if ok:
                    run_stmt(it["body"], env, widths)
                    return
        if s["default"] is not None:
            run_stmt(s["default"], env, widths)
    elif k == "for":
        for init in s["init"]:
            v = init["value"]
            env[init["name"]] = _ext(ev(v, env), v["width"], widths[init["name"]], v["signed"])
        for _ in range(10000):
            if ev(s["cond"], env) == 0:
                break
            run_stmt(s["body"], env, widths)
            for st in s["step"]:
                run_stmt(st, env, widths)
    elif k != "empty":
        raise AssertionError("statement %s not modelled" % k)


def evaluate(desc, inputs):
    env = dict(inputs)
    widths = {s["name"]: s["width"] for s in desc["signals"]}
    for m in desc["members"]:
        if m["kind"] == "assign":
            r, l = m["rhs"], m["lhs"]
            store(l, _ext(ev(r, env), r["width"], l["width"], r["signed"]), env, widths)
        elif m["kind"] == "comb":
            local = dict(env)
            lw = dict(widths)
            for loc in m["locals"]:
                lw[loc["name"]] = loc["width"]
                local[loc["name"]] = 0
            run_stmt(m["body"], local, lw)
            for w in m["writes"]:
                env[w] = local[w]
        else:
            raise AssertionError("kept member in the semantics module: %s" % m["reason"])
    return env


@test
def semantics_match_icarus():
    iverilog, vvp = shutil.which("iverilog"), shutil.which("vvp")
    if not iverilog or not vvp:
        raise Skip("Icarus Verilog (iverilog, vvp) not installed")
    d = read("semantics.sv")
    ins = [p for p in d["ports"] if p["direction"] == "input"]
    outs = [p for p in d["ports"] if p["direction"] == "output"]
    rng = random.Random(1800)
    vectors = []
    corners = [0, 1, 0x7F, 0x80, 0xFF]
    for i in range(300):
        vec = {}
        for p in ins:
            if i < 25:
                vec[p["name"]] = corners[(i + len(vec)) % len(corners)] & _mask(p["width"])
            else:
                vec[p["name"]] = rng.getrandbits(p["width"])
        vectors.append(vec)
    lines = ["module tb;"]
    for p in d["ports"]:
        lines.append("  logic %s[%d:0] %s;" % ("signed " if p["signed"] else "", p["width"] - 1, p["name"]))
    lines.append("  semantics dut(%s);" % ", ".join(".%s(%s)" % (p["name"], p["name"]) for p in d["ports"]))
    lines.append("  initial begin")
    for vec in vectors:
        lines.append("    " + " ".join("%s = %d'h%x;" % (n, next(p["width"] for p in ins if p["name"] == n), v)
                                      for n, v in vec.items()))
        lines.append('    #1 $display("%s", %s);' % (" ".join(["%h"] * len(outs)), ", ".join(p["name"] for p in outs)))
    lines.append("  end")
    lines.append("endmodule")
    with tempfile.TemporaryDirectory() as tmp:
        tb = os.path.join(tmp, "tb.sv")
        with open(tb, "w") as f:
            f.write("\n".join(lines) + "\n")
        exe = os.path.join(tmp, "sim.vvp")
        p = subprocess.run([iverilog, "-g2012", "-o", exe, tb, os.path.join(INPUTS, "semantics.sv")],
                           stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        assert p.returncode == 0, "iverilog failed:\n" + p.stderr.decode()
        p = subprocess.run([vvp, "-n", exe], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        assert p.returncode == 0, "vvp failed:\n" + p.stderr.decode()
    sim = [l.split() for l in p.stdout.decode().splitlines() if l.strip() and not l.startswith("VCD")]
    eq(len(sim), len(vectors), "simulated vectors")
    mismatches = []
    for vec, row in zip(vectors, sim):
        env = evaluate(d, vec)
        for port, hx in zip(outs, row):
            want = int(hx, 16) if re.fullmatch(r"[0-9a-fA-F]+", hx) else None
            got = env[port["name"]] & _mask(port["width"])
            if want != got:
                mismatches.append("%s with %s: Icarus %s, description %x" % (port["name"], vec, hx, got))
    assert not mismatches, "%d mismatches, first: %s" % (len(mismatches), "; ".join(mismatches[:5]))
    print("  %d vectors x %d outputs agree with Icarus" % (len(vectors), len(outs)))


# ---------------------------------------------------------------------------

def main():
    global ROOT, INPUTS, READER, KERF, CONSTRUCTS
    ap = argparse.ArgumentParser()
    ap.add_argument("--kerf", help="the kerf binary (tests of constructs run it; the others run the reader)")
    ap.add_argument("--root", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
    ap.add_argument("-k", "--only", dest="only", help="run only tests whose name contains this")
    # The harness protocol of tests/e2e/kerf_e2e.py: one ctest entry per test.
    ap.add_argument("--list", action="store_true", help="print the test names and exit")
    ap.add_argument("--case", action="append", default=[], help="run this test (exact name)")
    ap.add_argument("--cache", help="directory caching descriptions for the construct tests' simulations")
    args = ap.parse_args()
    if args.list:
        print("\n".join(fn.__name__ for fn in TESTS))
        return 0
    ROOT = os.path.abspath(args.root)
    INPUTS = os.path.join(ROOT, "tests", "e2e", "reader_inputs")
    CONSTRUCTS = os.path.join(INPUTS, "constructs")
    KERF = os.path.abspath(args.kerf) if args.kerf else os.path.join(ROOT, "build", "kerf")
    if args.cache:
        os.environ["KERF_E2E_CACHE"] = os.path.abspath(args.cache)
    READER = os.path.join(ROOT, "src", "reader", "kerf_read.py")
    passed = failed = skipped = 0
    for fn in TESTS:
        if args.only and args.only not in fn.__name__:
            continue
        if args.case and fn.__name__ not in args.case:
            continue
        try:
            fn()
        except Skip as s:
            if os.environ.get("CI"):
                failed += 1   # CI installs every tool: a skip there would hide a gap
                print("FAIL %s: required under CI: %s" % (fn.__name__, s))
            else:
                skipped += 1
                print("SKIP %s: %s" % (fn.__name__, s))
        except AssertionError as e:
            failed += 1
            print("FAIL %s: %s" % (fn.__name__, e))
        except Exception:
            failed += 1
            print("FAIL %s: unexpected error\n%s" % (fn.__name__, traceback.format_exc()))
        else:
            passed += 1
            print("ok   %s" % fn.__name__)
        sys.stdout.flush()
    print("%d passed, %d failed%s" % (passed, failed, ", %d skipped" % skipped if skipped else ""))
    if failed == 0 and passed == 0 and skipped:
        return 77   # ctest's skip code: shown as skipped, not passed
    return 0 if failed == 0 else 1


if __name__ == "__main__":
    sys.exit(main())
