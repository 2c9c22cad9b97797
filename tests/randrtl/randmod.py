"""randmod — a seeded generator of random SystemVerilog modules for the outside check.

Each module is valid, loop-free, latch-free RTL built from the constructs real designs use:
ports of random widths and signedness, parameters, internal signals, continuous assignments,
`always_comb` blocks with nested if/case/casez/casex (`unique`/`priority`), constant-bound
loops, whole/bit/part/variable-index writes, functions with loops, concatenation and
replication, constant and variable selects and part-selects, reductions, comparisons, shifts
by constants and by signals, word arithmetic that kerf must keep (+, -, *), division and
modulo by constants, x defaults, internal 2-D packed arrays and packed structs written and read
by element or member, `always_ff` registers beside the logic, a package (constants, an enum
type, a function) imported by the module and named by scope, `$countones`/`$onehot`/`$onehot0`,
Verilog-2001 `always @*` blocks, text macros (constants and a choice with arguments) and
unique/priority if.

A few forms are avoided on purpose because Icarus Verilog 11 (the reference simulator) gets them
wrong, not kerf: system-function arguments other than a whole signal, and `pkg::f(x)` calls.

The same (seed, index, features) always gives the same module text (Python's `random.Random`
is seeded with both), so a failure found by a campaign is reproduced by its seed and index:

    python3 tests/randrtl/randmod.py --seed 7 --index 42 [--features all|default|-name,...]

Every generated module comes with a description: ports, internal signals, clock and reset,
parameter overrides to simulate, and the constructs it contains (for the coverage counts).
"""
import argparse
import re
import random

# Constructs the generator can use. "default" is every construct whose kerf behaviour is
# settled; the rest are opted into by name (or "all").
FEATURES = {
    "signed": "signed ports and $signed/$unsigned casts",
    "case": "case statements",
    "casez": "casez/casex statements with wildcard items",
    "unique": "unique/priority case qualifiers (always with a default)",
    "loop": "constant-bound for loops in always_comb",
    "varsel": "variable-index bit selects and part-selects (in range)",
    "varwrite": "variable-index bit and part-select writes (in range)",
    "narrowwrite": "variable-index writes whose index is narrower than the target's positions",
    "shift": "shifts by constants and by signals",
    "arith": "word arithmetic kept by kerf (+, -, *)",
    "compare": "comparisons between signals and against constants",
    "concat": "concatenation and replication",
    "label": "named always blocks (`begin : p_blk3`)",
    "reduce": "reduction operators",
    "function": "function automatic with a loop",
    "param": "module parameters used by the logic (simulated with an override too)",
    "localparam": "localparams used by the logic",
    "ff": "always_ff registers with asynchronous reset beside the logic",
    "xdefault": "x assigned as a default (a don't-care)",
    "xcompare": "=== / !== / ==? against constants with x bits",
    "divconst": "division and modulo by constants",
    "oob": "variable selects and writes that can fall out of range",
    "packed2d": "internal 2-D packed arrays written and read by element and by bit",
    "struct": "internal packed structs written and read by member",
    "enum": "internal enum-typed signals: assigned by name, compared and case-selected by name",
    "generate": "generate for loops and generate if over a parameter, with named blocks",
    "ifdef": "`ifdef/`ifndef alternatives around assigns and statements (read with no defines)",
    "tristate": "outputs driven to z by a conditional continuous assignment",
    "package": "a package of constants, an enum type and a function, imported or named by scope",
    "sysfunc": "$countones, $onehot and $onehot0 on expressions",
    "alwaysstar": "Verilog-2001 `always @*` blocks beside `always_comb`",
    "comment": "the author's comments on and above assignments and case items (`// note c3: drives w2`)",
    "macro": "text macros: `define constants and a choice macro with arguments, used in expressions",
    "uniqueif": "unique/priority qualifiers on if statements that have an else",
}
DEFAULT_OFF = {"param", "xcompare", "divconst", "oob"}
# Each module draws its own subset of the enabled constructs, so that one construct that kerf
# refuses (or gets wrong) does not hide the others: the core ones always, most with
# probability 0.7, the ones that make a whole module fail or refuse today with 0.35.
CORE = {"compare", "case", "concat", "reduce", "shift"}
RARE = {"param", "xcompare", "divconst", "oob", "xdefault"}


def parse_features(text):
    """'default', 'all', or a comma list: names; '-name' / '+name' remove from / add to the
    default set; a list starting with 'all' or 'default' starts from that set."""
    if text in ("", "default"):
        return set(FEATURES) - DEFAULT_OFF
    if text == "all":
        return set(FEATURES)
    parts = [t.strip() for t in text.split(",")]
    if parts[0] in ("all", "default"):
        chosen = set(FEATURES) - (set() if parts[0] == "all" else DEFAULT_OFF)
        parts = parts[1:]
    else:
        chosen = set(FEATURES) - DEFAULT_OFF if all(t.startswith(("-", "+")) for t in parts) else set()
    for t in parts:
        name = t.lstrip("+-")
        if name not in FEATURES:
            raise ValueError(f"unknown feature '{name}' (known: {', '.join(sorted(FEATURES))})")
        if t.startswith("-"):
            chosen.discard(name)
        else:
            chosen.add(name)
    return chosen


class Sig:
    def __init__(self, name, width, signed=False):
        self.name, self.width, self.signed = name, width, signed
        self.dims = None      # (elements, element width) of a 2-D packed array
        self.fields = None    # [(member, width)] of a packed struct, most significant first
        self.type_name = None
        self.enum = None      # [(value name, value)] of an enum type

    @property
    def composite(self):
        return self.dims is not None or self.fields is not None

    @property
    def plain(self):
        """A plain vector: selects and bit writes are allowed on it."""
        return not self.composite and self.enum is None


def _decl_type(width, signed):
    s = " signed" if signed else ""
    return f"logic{s} [{width - 1}:0]" if width > 1 or signed else "logic"


class ModuleGen:
    def __init__(self, seed, index, features):
        self.rng = random.Random(f"kerf-randmod-{seed}-{index}")
        # (a draw of its own per construct, so that adding a construct leaves the others' draws alone)
        self.f = {f for f in sorted(features)
                  if f in CORE or random.Random(f"kerf-randmod-{seed}-{index}-{f}").random() <
                  (0.35 if f in RARE else 0.7)}
        self.name = f"rm_{seed}_{index}"
        self.used = set()
        self.readable = []          # signals an expression may read (inputs, registers, earlier wires)
        self.lines = []
        self.functions = []
        self.params = []            # (name, default value, override value)
        self.localparams = []
        self.counter = 0
        self.label_rng = random.Random(f"kerf-randmod-{seed}-{index}-label-draws")
        self.labels = 0
        self.comment_rng = random.Random(f"kerf-randmod-{seed}-{index}-comment-draws")
        # (macros and if qualifiers draw on their own too: they change text, never other draws)
        self.macro_rng = random.Random(f"kerf-randmod-{seed}-{index}-macro-draws")
        self.macros = []            # `define lines, in the order first used
        self.if_rng = random.Random(f"kerf-randmod-{seed}-{index}-uniqueif-draws")
        self.loop_var = None        # (name, bound) inside a generated for loop
        self.pkg = f"{self.name}_pkg"
        self.pkg_consts = []        # (name, width) of the package's constants, once it has some
        self.pkg_lines = []

    # ---- helpers -------------------------------------------------------------------------
    def on(self, feature, p=1.0):
        return feature in self.f and self.rng.random() < p

    def use(self, tag):
        self.used.add(tag)

    def fresh(self, prefix):
        self.counter += 1
        return f"{prefix}{self.counter}"

    def const(self, width, allow_x=False):
        v = self.rng.getrandbits(width)
        if allow_x and self.on("xcompare"):
            digits = ["x" if self.rng.random() < 0.25 else str((v >> (width - 1 - i)) & 1) for i in range(width)]
            if "x" in digits:
                self.use("xcompare")
                return f"{width}'b{''.join(digits)}"
        style = self.rng.random()
        if style < 0.4:
            text = f"{width}'d{v}"
        elif style < 0.7:
            text = f"{width}'h{v:x}"
        else:
            text = f"{width}'b{v:0{width}b}"
        if "macro" in self.f and self.macro_rng.random() < 0.15:
            # a named constant of the author's macro file: `define RM_K3 4'd5
            self.use("macro")
            name = f"{self.name.upper()}_K{len(self.macros)}"
            self.macros.append(f"`define {name} {text}")
            return f"`{name}"
        return text

    def pick(self, pred=lambda s: True):
        cands = [s for s in self.readable if pred(s)]
        return self.rng.choice(cands) if cands else None

    # ---- expressions: (text, width) ------------------------------------------------------
    def leaf(self):
        r = self.rng.random()
        if r < 0.12:
            w = self.rng.randint(1, 8)
            return self.const(w), w
        if r < 0.18 and (self.params or self.localparams):
            name, _ = self.rng.choice([(p[0], 0) for p in self.params] + [(p[0], 0) for p in self.localparams])
            self.use("param" if any(p[0] == name for p in self.params) else "localparam")
            return f"4'({name})", 4
        if r < 0.20 and self.pkg_consts:
            name, w = self.rng.choice(self.pkg_consts)
            self.use("package")
            return (f"{self.pkg}::{name}" if self.rng.random() < 0.4 else name), w
        if r < 0.22 and self.loop_var:
            return f"{self.loop_var[2]}'({self.loop_var[0]})", self.loop_var[2]
        s = self.pick()
        return s.name, s.width

    def composite_select(self, s):
        """An element, member or bit of a 2-D packed array or packed struct, by its own name."""
        if s.dims:
            n, m = s.dims
            i = self.rng.randrange(n)
            r = self.rng.random()
            if r < 0.4:
                return f"{s.name}[{i}]", m
            if r < 0.8 or m < 2:
                return f"{s.name}[{i}][{self.rng.randrange(m)}]", 1
            lo = self.rng.randrange(m - 1)
            hi = self.rng.randrange(lo + 1, m)
            return f"{s.name}[{i}][{hi}:{lo}]", hi - lo + 1
        f, fw = self.rng.choice(s.fields)
        if fw >= 2 and self.rng.random() < 0.4:
            return f"{s.name}.{f}[{self.rng.randrange(fw)}]", 1
        return f"{s.name}.{f}", fw

    def select(self):
        comp = self.pick(lambda s: s.composite)
        if comp is not None and self.rng.random() < 0.4:
            return self.composite_select(comp)
        s = self.pick(lambda s: s.width >= 2 and s.plain)
        if s is None:
            return self.leaf()
        r = self.rng.random()
        if r < 0.35:
            i = self.rng.randrange(s.width)
            return f"{s.name}[{i}]", 1
        if r < 0.6:
            lo = self.rng.randrange(s.width)
            hi = self.rng.randrange(lo, s.width)
            return f"{s.name}[{hi}:{lo}]", hi - lo + 1
        if not self.on("varsel"):
            return f"{s.name}[{s.width - 1}]", 1
        idx, iw = self.index_expr(s.width, 1)
        if idx is None:
            return f"{s.name}[0]", 1
        self.use("varsel")
        if r < 0.8:
            return f"{s.name}[{idx}]", 1
        k = self.rng.randint(1, max(1, s.width // 2))
        idx, iw = self.index_expr(s.width, k)
        if idx is None:
            return f"{s.name}[0]", 1
        if self.rng.random() < 0.5 and s.width >= 2 * k:
            idx2, _ = self.index_expr(s.width // k, 1, scaled=True)
            if idx2 is not None:
                return f"{s.name}[{idx2}*{k} +: {k}]", k
        return f"{s.name}[{idx} +: {k}]", k

    def index_expr(self, width, k, scaled=False, write=False):
        """An index into `width` positions for a k-bit select, in range unless 'oob' allows.

        In range means narrow where `width` is not a power of two: a 1-bit index into 3 bits.
        For writes that is a construct of its own ('narrowwrite')."""
        oob = self.on("oob", 0.3)
        span = width - k + 1 if not scaled else width
        bits = 0
        while (1 << (bits + 1)) <= span:
            bits += 1
        if oob:
            bits += 1
            self.use("oob")
        elif write and (1 << bits) < span:
            if "narrowwrite" not in self.f:
                return None, 0
            self.use("narrowwrite")
        if bits == 0:
            return None, 0
        s = self.pick(lambda s: s.width >= bits and not s.signed and s.plain)
        if s is None:
            return None, 0
        if s.width == bits:
            return s.name, bits
        lo = self.rng.randrange(s.width - bits + 1)
        return (f"{s.name}[{lo}]" if bits == 1 else f"{s.name}[{lo + bits - 1}:{lo}]"), bits

    def expr(self, depth):
        if depth <= 0 or self.rng.random() < 0.2:
            return self.leaf() if self.rng.random() < 0.6 else self.select()
        r = self.rng.random()
        a, wa = self.expr(depth - 1)
        if r < 0.22:
            b, wb = self.expr(depth - 1)
            op = self.rng.choice(["&", "|", "^", "~^"])
            return f"({a} {op} {b})", max(wa, wb)
        if r < 0.30:
            return f"(~{a})", wa
        if r < 0.38 and "reduce" in self.f:
            self.use("reduce")
            return f"({self.rng.choice(['&', '|', '^', '~&', '~|', '~^'])}{a})", 1
        if r < 0.46:
            b, _ = self.expr(depth - 1)
            c, wc = self.expr(depth - 1)
            sel = self.cond(depth - 1)
            if "macro" in self.f and self.macro_rng.random() < 0.3 and "{" not in sel + b + c:
                # a choice through a macro with arguments (no braces in them: a comma inside
                # braces splits arguments in some preprocessors)
                self.use("macro")
                name = f"{self.name.upper()}_PICK"
                if not any(m.startswith(f"`define {name}(") for m in self.macros):
                    self.macros.append(f"`define {name}(s, a, b) ((s) ? (a) : (b))")
                return f"`{name}({sel}, {b}, {c})", max(wa, wc)
            return f"({sel} ? {b} : {c})", max(wa, wc)
        if r < 0.52:
            b, _ = self.expr(depth - 1)
            return f"({a} {self.rng.choice(['&&', '||'])} {b})", 1
        if r < 0.62 and "compare" in self.f:
            return self.compare(a, wa, depth), 1
        if r < 0.70 and "concat" in self.f:
            self.use("concat")
            if self.rng.random() < 0.3 and wa <= 4:
                return f"{{{self.rng.randint(2, 3)}{{{a}}}}}", wa * 2
            b, wb = self.expr(depth - 1)
            return f"{{{a}, {b}}}", wa + wb
        if r < 0.77 and "shift" in self.f:
            self.use("shift")
            if self.rng.random() < 0.6:
                return f"({a} {self.rng.choice(['<<', '>>', '>>>'])} {self.rng.randint(0, 3)})", wa
            s = self.pick(lambda s: s.width <= 3 and not s.signed and s.plain)
            if s is not None:
                self.use("varshift")
                return f"({a} {self.rng.choice(['<<', '>>'])} {s.name})", wa
            return f"({a} << 1)", wa
        if r < 0.84 and "arith" in self.f:
            self.use("arith")
            b, wb = self.expr(depth - 1)
            op = self.rng.choice(["+", "-", "+", "-", "*"])
            if op == "*" and (wa > 6 or wb > 6):
                op = "+"
            return f"({a} {op} {b})", max(wa, wb)
        if r < 0.88 and "signed" in self.f:
            self.use("signed")
            return f"{self.rng.choice(['$signed', '$unsigned'])}({a})", wa
        if r < 0.92 and "divconst" in self.f:
            self.use("divconst")
            d = self.rng.choice([2, 3, 4, 5, 8, 10])
            dw = max(wa, d.bit_length())
            return f"({a} {self.rng.choice(['/', '%'])} {dw}'d{d})", dw
        if r < 0.94 and "sysfunc" in self.f:
            self.use("sysfunc")
            fn = self.rng.choice(["$countones", "$onehot", "$onehot0"])
            # The argument is a whole plain signal: Icarus 11 sizes an argument such as `s || b`
            # with a signed `s` wrongly (`$onehot0(s || b)` gives 0 where both are 1), and an
            # `always @*` that reads a signal only in `$onehot0(v[i*1 +: 1])` never wakes up.
            s = self.pick(lambda s: s.plain)
            if s is None:
                return self.select()
            a, wa = s.name, s.width
            if fn == "$countones":
                w = wa.bit_length()
                return f"{w}'({fn}({a}))", w
            return f"{fn}({a})", 1
        if r < 0.96 and self.functions:
            fname, fw, nargs = self.rng.choice(self.functions)
            self.use("package" if fname.startswith("pk_") else "function")
            args = [a] + [self.expr(depth - 1)[0] for _ in range(nargs - 1)]
            return f"{fname}({', '.join(args)})", fw
        return self.select()

    def enum_compare(self):
        """`e == NAME` or `e != NAME` on an enum-typed signal, or None."""
        e = self.pick(lambda s: s.enum is not None)
        if e is None:
            return None
        self.use("enum")
        names = [n for n, _ in e.enum]
        return f"({e.name} {self.rng.choice(['==', '==', '!='])} {self.rng.choice(names)})"

    def compare(self, a, wa, depth):
        if "enum" in self.f and self.rng.random() < 0.3:
            c = self.enum_compare()
            if c is not None:
                return c
        self.use("compare")
        op = self.rng.choice(["==", "!=", "<", "<=", ">", ">="])
        if self.rng.random() < 0.5:
            allow_x = op in ("==", "!=")
            c = self.const(max(1, min(wa, 8)), allow_x=allow_x)
            if "x" in c and self.rng.random() < 0.5:
                op = self.rng.choice(["===", "!==", "==?", "!=?"])
            return f"({a} {op} {c})"
        b, _ = self.expr(depth - 1)
        return f"({a} {op} {b})"

    def cond(self, depth):
        if "compare" in self.f and self.rng.random() < 0.5:
            a, wa = self.expr(max(0, depth - 1))
            return self.compare(a, wa, depth)
        a, _ = self.expr(max(0, depth - 1))
        return a

    # ---- statements ---------------------------------------------------------------------
    def target_write(self, t, depth, indent):
        """One assignment to (part of) target t."""
        r = self.rng.random()
        if t.enum is not None:
            self.use("enum")
            # (by name only: Icarus cannot simulate a cast to an enum type)
            return [f"{indent}{t.name} = {self.rng.choice(t.enum)[0]};"]
        e, _ = self.expr(depth)
        if t.width >= 2 and r < 0.2:
            i = self.rng.randrange(t.width)
            return [f"{indent}{t.name}[{i}] = {e};"]
        if t.width >= 3 and r < 0.3:
            lo = self.rng.randrange(t.width - 1)
            hi = self.rng.randrange(lo, t.width)
            return [f"{indent}{t.name}[{hi}:{lo}] = {e};"]
        if t.width >= 2 and r < 0.42 and "varwrite" in self.f:
            k = self.rng.choice([1, 1, 2])
            if k > t.width - 1:
                k = 1
            idx, _ = self.index_expr(t.width, k, write=True)
            if idx is not None:
                self.use("varwrite")
                if k == 1:
                    return [f"{indent}{t.name}[{idx}] = {e};"]
                return [f"{indent}{t.name}[{idx} +: {k}] = {e};"]
        return [f"{indent}{t.name} = {e};"]

    def stmt(self, targets, depth, indent):
        r = self.rng.random()
        t = self.rng.choice(targets)
        if depth <= 0 or r < 0.35:
            return self.target_write(t, 2, indent)
        if r < 0.6:
            out = [f"{indent}if ({self.cond(2)}) begin"]
            for _ in range(self.rng.randint(1, 2)):
                out += self.stmt(targets, depth - 1, indent + "  ")
            if self.rng.random() < 0.6:
                out.append(f"{indent}end else begin")
                for _ in range(self.rng.randint(1, 2)):
                    out += self.stmt(targets, depth - 1, indent + "  ")
                # With an else, no input leaves a unique/priority if without a branch (a
                # violation that simulators and synthesis read differently); one condition
                # cannot overlap another.
                if "uniqueif" in self.f and self.if_rng.random() < 0.35:
                    self.use("uniqueif")
                    out[0] = f"{indent}{self.if_rng.choice(['unique ', 'priority '])}{out[0][len(indent):]}"
            out.append(f"{indent}end")
            return out
        if r < 0.85 and "case" in self.f:
            return self.case_stmt(targets, depth, indent)
        if r < 0.9 and "ifdef" in self.f:
            self.use("ifdef")
            out = [f"`{self.rng.choice(['ifdef', 'ifndef'])} KERF_RAND_ALT"]
            out += self.stmt(targets, depth - 1, indent)
            if self.rng.random() < 0.5:
                out.append("`else")
                out += self.stmt(targets, depth - 1, indent)
            out.append("`endif")
            return out
        if "loop" in self.f and t.width >= 2 and t.plain:
            self.use("loop")
            iv = self.fresh("i")
            bound = t.width
            ib = max(1, (bound - 1).bit_length())
            self.loop_var = (iv, bound, ib)
            e, _ = self.expr(2)
            self.loop_var = None
            op = self.rng.choice(["^", "&", "|"])
            return [f"{indent}for (int {iv} = 0; {iv} < {bound}; {iv}++) begin",
                    f"{indent}  {t.name}[{iv}] = {t.name}[{iv}] {op} ({e});",
                    f"{indent}end"]
        return self.target_write(t, 2, indent)

    def case_stmt(self, targets, depth, indent):
        self.use("case")
        esel = self.pick(lambda s: s.enum is not None) if self.rng.random() < 0.5 else None
        if esel is not None:
            self.use("enum")
            names = [n for n, _ in esel.enum]
            qual = ""
            if "unique" in self.f and self.rng.random() < 0.3:
                qual = self.rng.choice(["unique ", "priority "])
                self.use("unique")
            out = [f"{indent}{qual}case ({esel.name})"]
            chosen = self.rng.sample(names, self.rng.randint(1, len(names)))
            while chosen:
                k = self.rng.randint(1, min(2, len(chosen)))
                out.append(f"{indent}  {', '.join(chosen[:k])}: begin")
                chosen = chosen[k:]
                out += self.stmt(targets, depth - 1, indent + "    ")
                out.append(f"{indent}  end")
            out.append(f"{indent}  default: begin")
            out += self.stmt(targets, depth - 1, indent + "    ")
            out.append(f"{indent}  end")
            out.append(f"{indent}endcase")
            return out
        sel = self.pick(lambda s: 2 <= s.width <= 5 and s.plain)
        if sel is None:
            return self.target_write(targets[0], 2, indent)
        w = sel.width
        kind = "case"
        if "casez" in self.f and self.rng.random() < 0.4:
            kind = self.rng.choice(["casez", "casez", "casex"])
            self.use(kind)
        qual = ""
        if "unique" in self.f and self.rng.random() < 0.3:
            qual = self.rng.choice(["unique ", "priority "])
            self.use("unique")
        out = [f"{indent}{qual}{kind} ({sel.name})"]
        items = []
        for _ in range(self.rng.randint(1, min(5, (1 << w) - 1))):
            if kind == "case":
                bits = f"{self.rng.getrandbits(w):0{w}b}"
            else:
                bits = "".join("?" if self.rng.random() < 0.3 else str(self.rng.getrandbits(1)) for _ in range(w))
            # Items of a `unique` case never overlap here: which one an overlapping input takes
            # is where simulation and the synthesis reading part ways.
            if any(all(x == y or "?" in (x, y) for x, y in zip(bits, o)) for o in items) and \
                    (qual == "unique " or bits in items):
                continue
            items.append(bits)
            v = f"{w}'b" + (bits.replace("?", "x") if kind == "casex" else bits)
            out.append(f"{indent}  {v}: begin")
            out += self.stmt(targets, depth - 1, indent + "    ")
            out.append(f"{indent}  end")
        out.append(f"{indent}  default: begin")
        plain = [t for t in targets if t.enum is None]   # ('x has no implicit conversion to an enum)
        if "xdefault" in self.f and plain and self.rng.random() < 0.25:
            self.use("xdefault")
            t = self.rng.choice(plain)
            out.append(f"{indent}    {t.name} = 'x;")
        else:
            out += self.stmt(targets, depth - 1, indent + "    ")
        out.append(f"{indent}  end")
        out.append(f"{indent}endcase")
        return out

    # ---- module --------------------------------------------------------------------------
    @staticmethod
    def decl_of(s):
        if s.dims:
            return f"logic [{s.dims[0] - 1}:0][{s.dims[1] - 1}:0]"
        if s.fields or s.enum:
            return s.type_name
        return _decl_type(s.width, False)

    def composite_block(self, sig):
        """An always_comb block that writes all of `sig`, then some elements or members again."""
        out = [self.block_head()]
        e, _ = self.expr(1)
        out.append(f"    {sig.name} = {e if self.rng.random() < 0.6 else chr(39) + '0'};")
        for _ in range(self.rng.randint(1, 3)):
            if sig.dims:
                n, m = sig.dims
                i = self.rng.randrange(n)
                lhs = f"{sig.name}[{i}]" if self.rng.random() < 0.5 else f"{sig.name}[{i}][{self.rng.randrange(m)}]"
            else:
                f, fw = self.rng.choice(sig.fields)
                lhs = f"{sig.name}.{f}" if fw < 2 or self.rng.random() < 0.6 else \
                    f"{sig.name}.{f}[{self.rng.randrange(fw)}]"
            e, _ = self.expr(2)
            if self.rng.random() < 0.5:
                out.append(f"    if ({self.cond(1)}) {lhs} = {e};")
            else:
                out.append(f"    {lhs} = {e};")
        out.append("  end")
        self.readable.append(sig)
        return out

    def block_head(self):
        """`always_comb begin`, or its Verilog-2001 spelling `always @* begin`; with "label" some
        blocks are named (`begin : p_blk3`), which a rewrite must keep (F324)."""
        label = ""
        # Draws and numbers of their own: labels leave every other draw of a seed as it was, so
        # the modules of earlier campaigns (and their findings' commands) stay the same.
        if "label" in self.f and self.label_rng.random() < 0.3:
            self.use("label")
            self.labels += 1
            label = f" : p_blk{self.labels}"
        if self.on("alwaysstar", 0.4):
            self.use("alwaysstar")
            return "  always @* begin" + label
        return "  always_comb begin" + label

    # An assignment line (`assign w3 = ...;` or `  w3[1] = ...;` in a block) and a case item
    # line (`4'd3: w1 = ...;`, `default: ...`).
    ASSIGN_LINE = re.compile(r"^(\s*)(?:assign\s+)?(\w+)(?:\[[^\]]*\])*\s*=[^=].*;$")
    ITEM_LINE = re.compile(r"^(\s*)(?:default|[\w'.]+(?:\s*,\s*[\w'.]+)*)\s*:\s*(?!begin\b).*;$")

    def commented(self, code):
        """The code with the author's comments: on the line of an assignment or directly above
        it, each saying which signal that assignment drives (`// note c3: drives w2`), and on
        case item lines (`// note c4: item`). Draws and numbers of their own, so every other
        draw of a seed stays as it was. The campaign checks that each comment survives once and
        stays with the signal it names (tests/randrtl/campaign.py, `comment_problems`)."""
        out, rng, n = [], self.comment_rng, 0
        for line in code:
            m = self.ASSIGN_LINE.match(line)
            item = None if m else self.ITEM_LINE.match(line)
            r = rng.random()
            if m and m.group(2) not in ("begin", "end", "if", "else", "for", "case"):
                if r < 0.2:
                    n += 1
                    line += f"  // note c{n}: drives {m.group(2)}"
                elif r < 0.35:
                    n += 1
                    out.append(f"{m.group(1)}// note c{n}: drives {m.group(2)}")
                if r < 0.35:
                    self.use("comment")
            elif item and r < 0.3:
                n += 1
                line += f"  // note c{n}: item"
                self.use("comment")
            out.append(line)
        return out

    def package(self):
        """A package with two constants, a function over one of them and (if enums are on) room for
        the enum type; the module imports it, and some reads name it by scope."""
        w = self.rng.choice([3, 4, 6, 8])
        self.pkg_consts = [(f"PK_C{i}", w) for i in range(2)]
        fname = "pk_fold"
        fw = self.rng.randint(2, 6)
        op = self.rng.choice(["^", "|", "&"])
        self.pkg_lines = [f"package {self.pkg};"]
        self.pkg_lines += [f"  localparam logic [{w - 1}:0] {n} = {self.const(w)};" for n, _ in self.pkg_consts]
        self.pkg_lines += [f"  function automatic logic [{fw - 1}:0] {fname}(input logic [{fw - 1}:0] a);",
                           f"    return a {op} {fw}'(PK_C0);",
                           "  endfunction"]
        # called by its imported name: Icarus 11 fails an internal assertion on `~pkg::f(x)` in
        # some procedural contexts (the constants are still read by scope as well)
        self.functions.append((fname, fw, 1))

    def function(self):
        fw = self.rng.randint(2, 8)
        name = self.fresh("f_mix")
        nargs = self.rng.randint(1, 2)
        args = ", ".join(f"input logic [{fw - 1}:0] a{i}" for i in range(nargs))
        op = self.rng.choice(["^", "|", "&"])
        body = [f"  function automatic logic [{fw - 1}:0] {name}({args});",
                f"    logic [{fw - 1}:0] r;",
                f"    r = a0{' ^ a1' if nargs > 1 else ''};",
                f"    for (int k = 1; k < {fw}; k++) r[k] = r[k] {op} r[k - 1];",
                "    return r;",
                "  endfunction"]
        self.functions.append((name, fw, nargs))
        return body

    def generate(self):
        rng = self.rng
        ports_in, ports_out, internals = [], [], []
        clock = reset = None
        for i in range(rng.randint(2, 6)):
            w = rng.choice([1, 1, 2, 3, 4, 4, 5, 6, 8, 8, 12])
            signed = w > 1 and self.on("signed", 0.2)
            if signed:
                self.use("signed")
            s = Sig(f"in{i}", w, signed)
            ports_in.append(s)
        self.readable = list(ports_in)
        if self.on("param", 0.6):
            default = rng.randint(0, 9)
            self.params.append(("P0", default, (default + rng.randint(1, 6)) % 16))
        if self.on("localparam", 0.4):
            self.localparams.append(("L0", rng.randint(0, 15)))
        regs = []
        if self.on("ff", 0.35):
            self.use("ff")
            clock, reset = "clk", "rst_n"
            for j in range(rng.randint(1, 2)):
                r = Sig(f"q{j}", rng.choice([1, 2, 4, 6]))
                regs.append(r)
            self.readable += regs
        if self.on("package", 0.5):
            self.use("package")
            self.package()
        if self.on("function", 0.35):
            self.lines += self.function()
        composite_blocks, composites, typedefs = [], [], []
        if self.on("packed2d", 0.6):
            self.use("packed2d")
            n, m = rng.choice([2, 3, 4]), rng.choice([2, 3, 4])
            sig = Sig(self.fresh("m"), n * m)
            sig.dims = (n, m)
            composite_blocks += self.composite_block(sig)
            composites.append(sig)
        if self.on("struct", 0.6):
            self.use("struct")
            widths = [rng.choice([1, 2, 3, 4]) for _ in range(rng.randint(2, 4))]
            sig = Sig(self.fresh("st"), sum(widths))
            sig.fields = [(f"f{i}", w) for i, w in enumerate(widths)]
            sig.type_name = sig.name + "_t"
            members = " ".join(f"{_decl_type(w, False)} {f};" for f, w in sig.fields)
            typedefs.append(f"  typedef struct packed {{ {members} }} {sig.type_name};")
            composite_blocks += self.composite_block(sig)
            composites.append(sig)
        if self.on("enum", 0.6):
            self.use("enum")
            bits = rng.choice([2, 2, 3])
            values = rng.sample(range(1 << bits), rng.randint(3, min(6, 1 << bits)))
            tname = self.fresh("state") + "_e"
            sig = Sig(self.fresh("st"), bits)
            sig.enum = [(f"{tname[:-2].upper()}_{chr(65 + i)}", v) for i, v in enumerate(values)]
            sig.type_name = tname
            enum_type = (f"  typedef enum logic [{bits - 1}:0] {{"
                         + ", ".join(f"{n} = {bits}'d{v}" for n, v in sig.enum) + f"}} {tname};")
            if self.pkg_lines and rng.random() < 0.6:
                self.pkg_lines.insert(1, enum_type)     # the type (and its names) come from the package
            else:
                typedefs.append(enum_type)
            block = [self.block_head(), f"    {sig.name} = {sig.enum[0][0]};"]
            for _ in range(rng.randint(1, 3)):
                block += self.stmt([sig], rng.randint(1, 3), "    ")
            block.append("  end")
            composite_blocks += block
            composites.append(sig)
            self.readable.append(sig)
        n_out = rng.randint(1, 4)
        body = list(composite_blocks)
        produced = []
        for k in range(rng.randint(2, 6)):
            is_out = k >= 0 and len([p for p in produced if p[1]]) < n_out and (rng.random() < 0.5)
            w = rng.choice([1, 1, 2, 3, 4, 5, 6, 8])
            name = f"out{len([p for p in produced if p[1]])}" if is_out else f"w{k}"
            sig = Sig(name, w)
            src = self.pick(lambda s: s.plain and s.width >= w)
            if w >= 2 and src is not None and self.on("generate", 0.3):
                # one assign per bit through a generate loop, or one of two forms by a parameter
                self.use("generate")
                g = self.fresh("g")
                e, _ = self.expr(1)
                op = rng.choice(["&", "|", "^"])
                body += [f"  for (genvar {g} = 0; {g} < {w}; {g}++) begin : gen_{name}",
                         f"    assign {name}[{g}] = {src.name}[{g}] {op} ^({e});",
                         "  end"]
                if self.params and rng.random() < 0.5:
                    # a generate if over the parameter adds a term on top, in one of two forms
                    e2, _ = self.expr(1)
                    body[-2] = (f"    if ({self.params[0][0]} > {rng.randint(0, 9)}) begin : pick"
                                f"\n      assign {name}[{g}] = {src.name}[{g}] {op} ^({e});"
                                f"\n    end else begin : keep\n      assign {name}[{g}] = |({e2});\n    end")
            elif "ifdef" in self.f and rng.random() < 0.25:
                self.use("ifdef")
                e, _ = self.expr(rng.randint(1, 3))
                e2, _ = self.expr(rng.randint(1, 3))
                body += [f"`{rng.choice(['ifdef', 'ifndef'])} KERF_RAND_ALT",
                         f"  assign {name} = {e};", "`else", f"  assign {name} = {e2};", "`endif"]
            elif rng.random() < 0.4:
                e, _ = self.expr(rng.randint(1, 3))
                body.append(f"  assign {name} = {e};")
            else:
                targets = [sig]
                extra = None
                if rng.random() < 0.3:
                    extra = Sig(f"w{k}b", rng.choice([1, 2, 3, 4]))
                    targets.append(extra)
                body.append(self.block_head())
                for t in targets:
                    e, _ = self.expr(1)
                    body.append(f"    {t.name} = {e};")
                for _ in range(rng.randint(1, 3)):
                    body += self.stmt(targets, rng.randint(1, 3), "    ")
                body.append("  end")
                if extra:
                    produced.append((extra, False))
                    self.readable.append(extra)
            produced.append((sig, is_out))
            self.readable.append(sig)
        if not any(o for _, o in produced):
            sig = Sig("out0", rng.choice([1, 2, 4]))
            e, _ = self.expr(2)
            body.append(f"  assign out0 = {e};")
            produced.append((sig, True))
        if self.on("tristate", 0.4):
            # an output that drives z when its enable is low (kerf keeps such drivers as written)
            self.use("tristate")
            w = rng.choice([1, 2, 4])
            sig = Sig(f"out{len([p for p in produced if p[1]])}", w)
            e, _ = self.expr(2)
            body.append(f"  assign {sig.name} = {self.cond(1)} ? {e} : {w}'b{'z' * w};")
            produced.append((sig, True))
        ff = []
        for r in regs:
            e, _ = self.expr(2)
            ff += [f"  always_ff @(posedge {clock} or negedge {reset}) begin",
                   f"    if (!{reset}) {r.name} <= '0;",
                   f"    else {r.name} <= {e};",
                   "  end"]
        # every register is observable: one output shows it
        for j, r in enumerate(regs):
            ports_out.append(Sig(f"qo{j}", r.width))
            body.append(f"  assign qo{j} = {r.name};")
        outs = [s for s, o in produced if o] + ports_out
        internals = [s for s, o in produced if not o] + regs + composites
        # ---- text
        head = []
        if self.params:
            head.append(f"module {self.name} #(")
            head.append(",\n".join(f"  parameter int {n} = {d}" for n, d, _ in self.params))
            head.append(") (")
        else:
            head.append(f"module {self.name} (")
        plines = []
        if clock:
            plines += [f"  input  logic {clock}", f"  input  logic {reset}"]
        plines += [f"  input  {_decl_type(s.width, s.signed)} {s.name}" for s in ports_in]
        plines += [f"  output {_decl_type(s.width, False)} {s.name}" for s in outs]
        head.append(",\n".join(plines))
        head.append(");")
        decls = [f"  import {self.pkg}::*;"] if self.pkg_lines else []
        decls += [f"  localparam int {n} = {v};" for n, v in self.localparams]
        decls += typedefs
        decls += [f"  {self.decl_of(s)} {s.name};" for s in internals]
        pkg = self.pkg_lines + ["endpackage", ""] if self.pkg_lines else []
        code = self.lines + body + ff
        if "comment" in self.f:
            code = self.commented(code)
        macros = self.macros + [""] if self.macros else []
        undefs = [f"`undef {m.split()[1].split('(')[0]}" for m in self.macros]
        text = "\n".join(macros + pkg + head + decls + code + ["endmodule"] + undefs + [""])
        ports = []
        if clock:
            ports += [{"name": clock, "dir": "in", "width": 1, "signed": False},
                      {"name": reset, "dir": "in", "width": 1, "signed": False}]
        ports += [{"name": s.name, "dir": "in", "width": s.width, "signed": s.signed} for s in ports_in]
        ports += [{"name": s.name, "dir": "out", "width": s.width, "signed": False} for s in outs]
        desc = {
            "name": self.name,
            "ports": ports,
            "internals": [{"name": s.name, "width": s.width} for s in internals],
            "clock": clock,
            "reset": (reset, 0) if reset else None,
            "param_sets": [[]] + ([[f"{n}={o}" for n, _, o in self.params]] if self.params else []),
            "constructs": sorted(self.used),
            "package": self.pkg if self.pkg_lines else None,
        }
        return text, desc


def generate(seed, index, features):
    """(module text, description) of module `index` of campaign `seed`."""
    return ModuleGen(seed, index, features).generate()


def main():
    p = argparse.ArgumentParser(description="print one random module")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--index", type=int, default=0)
    p.add_argument("--features", default="default")
    a = p.parse_args()
    text, desc = generate(a.seed, a.index, parse_features(a.features))
    print(text)
    print("// " + repr(desc))


if __name__ == "__main__":
    main()
