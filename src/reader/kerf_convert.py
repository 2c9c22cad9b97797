"""Expressions and statements of one member into the description's node tables.

`Tables` holds the module-wide `exprs` and `stmts` tables of the description
(docs/reader-format.md): every node is a JSON array whose operands name
earlier nodes by index, so the C++ side builds its arena in one pass and a
deep expression never needs a deep recursion there. `Conv` converts the
slang AST of one continuous assignment or combinational block; anything
outside the subset kerf restructures raises `Unsupported(reason)` and the
member's nodes are dropped again (the member is then `kept`). Only
`Unsupported` does that: any other exception is a reader bug and stops the
reader (kerf reports an internal error).

Widths and signedness are slang's (IEEE 1800-2017 11.6, 11.8): implicit
conversions appear as `convert` nodes. Leaves (constants, signal references,
constant selects of them) are shared within one member.
"""

import bisect
import re

import pyslang
from pyslang import ast

from kerf_types import sv_bits

_DEC = pyslang.LiteralBase.Decimal

SK = ast.SymbolKind
# A constant table read with an index of more bits is kept as written (2**bits entries each
# become a choice in the logic).
TABLE_INDEX_BITS_MAX = 8
EK = ast.ExpressionKind
STK = ast.StatementKind

# Deeper nesting than this is kept as written (the C++ side is iterative; this
# bounds the reader's own recursion).
MAX_DEPTH = 200000

_UNARY = {
    ast.UnaryOperator.Plus: "+",
    ast.UnaryOperator.Minus: "-",
    ast.UnaryOperator.BitwiseNot: "~",
    ast.UnaryOperator.BitwiseAnd: "&",
    ast.UnaryOperator.BitwiseOr: "|",
    ast.UnaryOperator.BitwiseXor: "^",
    ast.UnaryOperator.BitwiseNand: "~&",
    ast.UnaryOperator.BitwiseNor: "~|",
    ast.UnaryOperator.BitwiseXnor: "~^",
    ast.UnaryOperator.LogicalNot: "!",
}
_EQUALITY = ("==", "!=", "===", "!==", "==?", "!=?")
_INCDEC = {
    ast.UnaryOperator.Preincrement: "+",
    ast.UnaryOperator.Postincrement: "+",
    ast.UnaryOperator.Predecrement: "-",
    ast.UnaryOperator.Postdecrement: "-",
}
_BINARY = {
    ast.BinaryOperator.Add: "+",
    ast.BinaryOperator.Subtract: "-",
    ast.BinaryOperator.Multiply: "*",
    ast.BinaryOperator.Divide: "/",
    ast.BinaryOperator.Mod: "%",
    ast.BinaryOperator.BinaryAnd: "&",
    ast.BinaryOperator.BinaryOr: "|",
    ast.BinaryOperator.BinaryXor: "^",
    ast.BinaryOperator.BinaryXnor: "~^",
    ast.BinaryOperator.Equality: "==",
    ast.BinaryOperator.Inequality: "!=",
    ast.BinaryOperator.CaseEquality: "===",
    ast.BinaryOperator.CaseInequality: "!==",
    ast.BinaryOperator.GreaterThanEqual: ">=",
    ast.BinaryOperator.GreaterThan: ">",
    ast.BinaryOperator.LessThanEqual: "<=",
    ast.BinaryOperator.LessThan: "<",
    ast.BinaryOperator.WildcardEquality: "==?",
    ast.BinaryOperator.WildcardInequality: "!=?",
    ast.BinaryOperator.LogicalAnd: "&&",
    ast.BinaryOperator.LogicalOr: "||",
    ast.BinaryOperator.LogicalImplication: "->",
    ast.BinaryOperator.LogicalEquivalence: "<->",
    ast.BinaryOperator.LogicalShiftLeft: "<<",
    ast.BinaryOperator.LogicalShiftRight: ">>",
    ast.BinaryOperator.ArithmeticShiftLeft: "<<<",
    ast.BinaryOperator.ArithmeticShiftRight: ">>>",
    ast.BinaryOperator.Power: "**",
}
# The operator tables keyed by the identity of slang's enum members (singletons): a
# Python enum hashes by name in Python code, which is on the reader's hottest path.
_UNARY_BY_ID = {id(k): v for k, v in _UNARY.items()}
_BINARY_BY_ID = {id(k): v for k, v in _BINARY.items()}
_TOKEN = pyslang.parsing.Token
CHECK = {
    ast.UniquePriorityCheck.None_: "none",
    ast.UniquePriorityCheck.Unique: "unique",
    ast.UniquePriorityCheck.Unique0: "unique0",
    ast.UniquePriorityCheck.Priority: "priority",
}
_CASE_KIND = {
    ast.CaseStatementCondition.Normal: "case",
    ast.CaseStatementCondition.WildcardJustZ: "casez",
    ast.CaseStatementCondition.WildcardXOrZ: "casex",
    ast.CaseStatementCondition.Inside: "inside",
}
_STMT_REASON = {
    STK.Timed: "a timing or event control",
    STK.Return: "a return statement",
    STK.Break: "a break statement",
    STK.Continue: "a continue statement",
    STK.Disable: "a disable statement",
    STK.PatternCase: "a case with pattern matching",
    STK.RepeatLoop: "a repeat loop",
    STK.ForeachLoop: "a foreach loop",
    STK.WhileLoop: "a while loop",
    STK.DoWhileLoop: "a do-while loop",
    STK.ForeverLoop: "a forever loop",
    STK.ImmediateAssertion: "an assertion",
    STK.ConcurrentAssertion: "an assertion",
    STK.DisableFork: "a disable fork",
    STK.Wait: "a wait statement",
    STK.WaitFork: "a wait fork",
    STK.WaitOrder: "a wait order",
    STK.EventTrigger: "an event trigger",
    STK.ProceduralAssign: "a procedural assign",
    STK.ProceduralDeassign: "a procedural deassign",
    STK.RandCase: "a randcase",
    STK.RandSequence: "a randsequence",
    STK.ProceduralChecker: "a checker",
}


# The key under which the describer hands kerf_read.write_json the nodes to write as links
# (`Tables.links`); not part of the description.
LINKS_KEY = "_links"


class Unsupported(Exception):
    """The construct is outside what kerf restructures; the member is kept."""


def bits_int(bits, signed):
    """Integer value of a constant's bits, or None when it has x/z bits."""
    if not bits or "x" in bits or "z" in bits:
        return None
    v = int(bits, 2)
    if signed and bits[0] == "1":
        v -= 1 << len(bits)
    return v


def convert_bits(bits, from_signed, width, four_state):
    n = len(bits)
    if width < n:
        bits = bits[n - width:]
    elif width > n:
        fill = bits[0] if (from_signed and bits) else "0"
        bits = fill * (width - n) + bits
    if not four_state and ("x" in bits or "z" in bits):
        bits = bits.replace("x", "0").replace("z", "0")
    return bits


def dim_range(t):
    """Declared range of the outermost packed dimension of an integral type."""
    ct = t.canonicalType
    if ct.kind == SK.PackedArrayType:
        r = ct.range
        return r.left, r.right
    return ct.bitWidth - 1, 0


def dim_offset(index, msb, lsb):
    return index - lsb if msb >= lsb else lsb - index


class Tables:
    """The module-wide node tables and the symbol numbering they refer to."""

    def __init__(self, types):
        self.types = types
        self.exprs = []     # node arrays (docs/reader-format.md, "Expressions")
        self.stmts = []     # statement arrays ("Statements")
        self.symbols = {}   # name of a module signal -> symbol index
        self.next_symbol = 0
        self.functions = []     # FUNCTION entries, by index
        self.fn_index = {}      # subroutine symbol -> index, or the reason it is not described
        self.fn_busy = set()    # functions being described (a call back into one is recursion)
        self.lit_types = {}     # slang type -> (width, four-state, integral), for case tables
        # Indices of binary nodes that continue a left-nested chain of their left operand's
        # operator, type and start (`t1 | t2 | t3`): written as links `[l, r, end]` (version 4;
        # `compact_links`).
        self.links = []
        # Everything up to here belongs to described functions: a member dropped later
        # must not take it along.
        self.watermark = (0, 0, 0)

    def new_symbol(self):
        i = self.next_symbol
        self.next_symbol += 1
        return i


class Conv:
    """Converts the expressions and statements of one assign or comb member."""

    def __init__(self, d):
        self.d = d
        self.t = d.tables
        self.types = d.tables.types
        self.ex = d.tables.exprs
        self.st = d.tables.stmts
        self.mark = (len(self.ex), len(self.st), d.tables.next_symbol)
        self._tinfo = d.tables.types._info   # slang type -> Types.info tuple (hot path)
        self.buf = None           # slang buffer of the member's file (node ranges are offsets in it)
        self.macros = True        # the member may use macros (set False when its text has none)
        self.reads = set()
        self.writes = set()
        self.direct_reads = set() # reads named in the member's own text (not inside a function)
        self.fn_reads = {}        # signal a called function reads directly -> the function's name
        self.locals = {}          # local symbol -> (name, symbol index)
        self.local_list = []      # LOCAL entries
        self.local_names = set()
        self.loop_syms = {}       # module variable used as the active loop variable -> depth
        self.loop_ranges = {}     # loop variable of an enclosing counting loop -> (first, last)
        self.localized = {}       # name of a module variable treated as a loop local -> symbol index
        self.outside = set()      # names of module variables used outside such loops
        self.lvref = None         # target of the compound assignment being converted
        self.shared = {}          # leaf key -> node index (leaves shared within the member)
        self.shared_ids = set()
        self.depth = 0
        self.function = None      # the function's return variable (symbol index) in function mode
        self.tail = False         # the statement being converted is the last one on its path
        # Early exits written as flags (1-bit locals): the innermost loop's `break` and
        # `continue`, and a function's `return` before its end (symbol indices, or None).
        self.flags = {"break": None, "continue": None, "return": None}

    def drop(self):
        """Forget every node this member added (it is kept after all). Nodes of functions
        described meanwhile stay (the member's nodes before them are left unused)."""
        w = self.t.watermark
        links = self.t.links
        while links and links[-1] >= max(self.mark[0], w[0]):
            links.pop()
        del self.ex[max(self.mark[0], w[0]):]
        del self.st[max(self.mark[1], w[1]):]
        self.t.next_symbol = max(self.mark[2], w[2])
        self.shared.clear()
        self.shared_ids.clear()

    # -- node helpers --------------------------------------------------------------

    def span(self, x):
        """(start, end) byte offsets of slang node `x` in the member's file, or (-1, -1)."""
        if self.buf is None:
            return -1, -1
        r = x.range if isinstance(x, _TOKEN) else x.sourceRange
        s = r.start
        # A member without macro uses has all its text in its own file; otherwise
        # ask slang where each node comes from.
        if self.macros and s.buffer != self.buf:
            return -1, -1
        return s.offset, r.end.offset

    def add(self, node):
        self.ex.append(node)
        return len(self.ex) - 1

    def leaf(self, key, node):
        i = self.shared.get(key)
        if i is None:
            i = self.add(node)
            self.shared[key] = i
            self.shared_ids.add(i)
        return i

    def const(self, bits, signed, x=None):
        ti = self.types.vector(len(bits), signed)
        s, e = self.span(x) if x is not None else (-1, -1)
        return self.leaf(("c", ti, bits), ["const", ti, s, e, bits])

    def const_of_type(self, bits, ti, x):
        key = ("c", ti, bits)
        got = self.shared.get(key)
        if got is None:
            s, e = self.span(x)
            got = self.leaf(key, ["const", ti, s, e, bits])
        return got

    def kind(self, i):
        return self.ex[i][0]

    def is_const(self, i):
        return self.ex[i][0] == "const"

    def bits(self, i):
        return self.ex[i][4]

    def wsig(self, i):
        return self.types.width_signed(self.ex[i][1])

    def type_of(self, e):
        """Type index of slang expression `e`; a value that is not integral is unsupported."""
        t = e.type
        info = self._tinfo.get(t) or self.types.info(t)
        if not info[3]:
            raise Unsupported("uses a value of type '%s'" % t)
        return info[0]

    def fold(self, e):
        """A constant node for `e` when slang can evaluate it, else None."""
        t = e.type
        if not t.isIntegral:
            return None
        v = self.d.try_const(e)
        if v is None:
            return None
        return self.const_of_type(sv_bits(v, t.bitWidth), self.types.of(t), e)

    # -- locals ----------------------------------------------------------------------

    def local_entry(self, name, t, src, sym_index):
        ti = self.types.of(t)
        ent = self.types.entries[ti]
        w, s = ent["width"], ent["signed"]
        msb, lsb = dim_range(t) if ent["kind"] not in ("logic",) else (0, 0)
        return {"name": name, "id": sym_index, "kind": "variable", "type": ti, "width": w, "signed": s,
                "msb": msb, "lsb": lsb, "port": False, "vector": ent["kind"] != "logic",
                "src": src, "decl": None}

    def add_local(self, sym):
        ti = self.types.of(sym.type)
        if self.types.entries[ti]["kind"] == "other":
            raise Unsupported("declares the local variable '%s' of type '%s'" % (sym.name, sym.type))
        base = sym.name
        name = base
        n = 1
        while name in self.local_names or name in self.d.sig_by_name:
            name = "%s@%d" % (base, n)
            n += 1
        self.local_names.add(name)
        idx = self.t.new_symbol()
        self.locals[sym] = (name, idx)
        self.local_list.append(self.local_entry(name, sym.type, self.d.symbol_src(sym), idx))
        return name, idx

    def ref(self, e, ti, idx):
        key = ("r", ti, idx)
        got = self.shared.get(key)
        if got is None:
            got = self.leaf(key, ["ref", ti] + list(self.span(e)) + [idx])
        return got

    def signal_ref(self, e, sym, name, write):
        ti = self.type_of(e)
        if sym in self.loop_syms:
            return self.ref(e, ti, self.localized[name])
        if name in self.d.loop_candidates:
            self.outside.add(name)
        (self.writes if write else self.reads).add(name)
        if not write:
            self.direct_reads.add(name)
        return self.ref(e, ti, self.t.symbols[name])

    # -- expressions ---------------------------------------------------------------

    def expr(self, e):
        h = _EXPR_BY_CLASS.get(type(e))
        if h is None:
            h = _handler(e)
        if h is None:
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported(_expr_reason(e))
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise Unsupported("nests expressions more than %d deep" % MAX_DEPTH)
        try:
            return h(self, e)
        finally:
            self.depth -= 1

    def x_int_literal(self, e):
        ti = self.type_of(e)
        w, s = self.types.width_signed(ti)
        return self.const_of_type(sv_bits(e.value, w), ti, e)

    def x_folded(self, e):
        c = self.fold(e)
        if c is None:
            raise Unsupported(_expr_reason(e))
        return c

    def x_string(self, e):
        ti = self.type_of(e)
        w, s = self.types.width_signed(ti)
        v = e.intValue.value
        if not isinstance(v, pyslang.SVInt):
            raise Unsupported("uses a string")
        return self.const_of_type(sv_bits(v, w), ti, e)

    def x_named(self, e):
        sym = e.symbol
        name = self.d.sig.get(sym)
        if name is not None:
            if sym in self.loop_syms:
                return self.signal_ref(e, sym, name, False)
            # Read again outside a loop over it: the same ref (the first read noted the name
            # among the reads); nothing more is asked of slang.
            key = ("n", sym)
            got = self.shared.get(key)
            if got is None:
                got = self.shared[key] = self.signal_ref(e, sym, name, False)
            return got
        loc = self.locals.get(sym)
        if loc is not None:
            return self.ref(e, self.type_of(e), loc[1])
        c = self.fold(e)
        if c is not None:
            return c
        raise Unsupported("refers to '%s', which is not a signal of this module" % sym.name)

    def x_hier(self, e):
        raise Unsupported("%s '%s'" % (_hier_what(e, "uses", self.d.body), _text(e)))

    def x_lvref(self, e):
        if self.lvref is None:
            raise Unsupported("uses an unsupported expression")
        return self.expr(self.lvref)

    def x_unary(self, e):
        op = _UNARY_BY_ID.get(id(e.op))
        if op is None:
            raise Unsupported("uses an increment or decrement inside an expression")
        t = e.type          # type_of(e), inline
        info = self._tinfo.get(t) or self.types.info(t)
        if not info[3]:
            raise Unsupported("uses a value of type '%s'" % t)
        ti = info[0]
        # expr(e.operand) without its frame when the operand's class is known (`~x[3]`)
        o = e.operand
        h = _EXPR_BY_CLASS.get(type(o))
        if h is None:
            a = self.expr(o)
        else:
            depth = self.depth + 1
            if depth > MAX_DEPTH:
                raise Unsupported("nests expressions more than %d deep" % MAX_DEPTH)
            self.depth = depth
            try:
                a = h(self, o)
            finally:
                self.depth = depth - 1
        if self.ex[a][0] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        if a in self.shared_ids:
            key = ("u", ti, op, a)
            got = self.shared.get(key)
            if got is None:
                s, t = self.span(e)
                got = self.leaf(key, ["unary", ti, s, t, op, a])
            return got
        s, t = self.span(e)
        return self.add(["unary", ti, s, t, op, a])

    def x_binary(self, e):
        """A binary operator, and the binary operators down its left operands with it: a
        chain `t1 | t2 | ... | tN` nests to the left, and its N nodes are converted in one
        loop (no Python frames per node) in the order, and at the depths, of the
        recursion through `expr`."""
        spine = []
        depth = self.depth
        tinfo = self._tinfo
        while True:
            t = e.type          # type_of(e), inline
            info = tinfo.get(t) or self.types.info(t)
            if not info[3]:
                raise Unsupported("uses a value of type '%s'" % t)
            ti = info[0]
            op = _BINARY_BY_ID.get(id(e.op))
            if op is None:
                op = _BINARY[e.op]     # a KeyError (a reader bug) as before
            left = e.left
            if op in _EQUALITY:
                self.d.note_compare(left, e.right)
            spine.append((e, ti, op, depth))
            if type(left) is not _BINARY_EXPR:
                break
            depth += 1
            if depth > MAX_DEPTH:
                raise Unsupported("nests expressions more than %d deep" % MAX_DEPTH)
            e = left
        saved = self.depth
        try:
            self.depth = depth
            l = self.expr(left)
            ex = self.ex
            own_text = self.buf is not None and not self.macros    # span(e) needs no check
            by_class = _EXPR_BY_CLASS
            shared = self.shared
            loop_syms = self.loop_syms
            links = self.t.links
            prev = -1       # the node this loop appended last (its type, operator and range: ti, op, s, t)
            pti = pop = ps = pt = None
            for e, ti, op, depth in reversed(spine):
                # expr(e.right) without its frame when the operand's class is known
                right = e.right
                cls = type(right)
                r = None
                if cls is _NAMED_VALUE and depth + 1 <= MAX_DEPTH:
                    # A signal read again (a generated sum of products reads each term's
                    # signal many times): x_named's own first lookup, without its call.
                    sym = right.symbol
                    if sym not in loop_syms:
                        r = shared.get(("n", sym))
                if r is not None:
                    pass
                elif (h := by_class.get(cls)) is None:
                    self.depth = depth
                    r = self.expr(right)
                else:
                    if depth + 1 > MAX_DEPTH:
                        raise Unsupported("nests expressions more than %d deep" % MAX_DEPTH)
                    self.depth = depth + 1
                    r = h(self, right)
                if ex[l][0] == "const" and ex[r][0] == "const":
                    c = self.fold(e)
                    if c is not None:
                        l = c
                        continue
                if own_text:
                    rng = e.sourceRange
                    s, t = rng.start.offset, rng.end.offset
                else:
                    s, t = self.span(e)
                ex.append(["binary", ti, s, t, op, l, r])
                i = len(ex) - 1
                if prev == l and ps == s and pti == ti and pop == op and s >= 0 and pt >= s and t >= s:
                    links.append(i)     # a link (version 4): its left operand gives op, type, start
                prev, pti, pop, ps, pt = i, ti, op, s, t
                l = i
            return l
        finally:
            self.depth = saved

    def x_cond(self, e):
        conds = e.conditions
        if len(conds) != 1 or conds[0].pattern is not None:
            raise Unsupported("uses a conditional operator with pattern matching")
        ti = self.type_of(e)
        c = self.expr(conds[0].expr)
        t = self.expr(e.left)
        f = self.expr(e.right)
        if self.is_const(c) and self.is_const(t) and self.is_const(f):
            k = self.fold(e)
            if k is not None:
                return k
        return self.add(["cond", ti] + list(self.span(e)) + [c, t, f])

    def x_inside(self, e):
        ti = self.type_of(e)
        w, s = self.types.width_signed(ti)
        bit = self.types.vector(1, False)
        sp = list(self.span(e))
        left = self.expr(e.left)
        terms = []
        consts = self.is_const(left)
        for it in e.rangeList:
            if it.kind == EK.ValueRange:
                if it.syntax is not None and ("+/-" in str(it.syntax) or "+%-" in str(it.syntax)):
                    raise Unsupported("uses an inside range with a tolerance")
                lo = self.expr(it.left)
                hi = self.expr(it.right)
                consts = consts and self.is_const(lo) and self.is_const(hi)
                ge = self.add(["binary", bit] + sp + [">=", left, lo])
                le = self.add(["binary", bit] + sp + ["<=", left, hi])
                terms.append(self.add(["binary", bit] + sp + ["&&", ge, le]))
            else:
                if not it.type.isIntegral:
                    raise Unsupported("uses inside with a value of type '%s'" % it.type)
                self.d.note_compare(e.left, it)
                v = self.expr(it)
                consts = consts and self.is_const(v)
                terms.append(self.add(["binary", bit] + sp + ["==?", left, v]))
        if consts:
            c = self.fold(e)
            if c is not None:
                return c
        acc = terms[0]
        for t in terms[1:]:
            acc = self.add(["binary", bit] + sp + ["||", acc, t])
        if w != 1 or s:
            acc = self.add(["convert", ti] + sp + [acc])
        return acc

    def x_concat(self, e):
        ti = self.type_of(e)
        parts = []
        for o in e.operands:
            if o.type.bitWidth == 0:
                continue
            parts.append(self.expr(o))
        if not parts:
            raise Unsupported("uses an empty concatenation")
        if all(self.is_const(p) for p in parts):
            c = self.fold(e)
            if c is not None:
                return c
        return self.add(["concat", ti] + list(self.span(e)) + [parts])

    def x_pattern(self, e):
        """An assignment pattern of a packed type (`'{valid: 1'b1, write: we, kind: 2'd1}`,
        `'{default: '0, ...}`, `'{a, b}`, `'{2{x}}`) is the concatenation of its elements,
        first element most significant (IEEE 1800 10.9, 7.2.2, 7.4.1). slang has already
        resolved member names, type keys and defaults into one element per member, each
        converted to the member's type."""
        if not e.type.isIntegral:
            raise Unsupported(_expr_reason(e))
        ti = self.type_of(e)
        n = 1
        if e.kind == EK.ReplicatedAssignmentPattern:
            n = self.d.const_int(e.count)
            if n is None or n <= 0:
                raise Unsupported("uses a replicated assignment pattern with a count that is not a positive constant")
        elems = list(e.elements)
        if not elems or sum(x.type.bitWidth for x in elems) * n != e.type.bitWidth:
            raise Unsupported(_expr_reason(e))
        parts = [self.expr(x) for x in elems] * n
        if all(self.is_const(p) for p in parts):
            c = self.fold(e)
            if c is not None:
                return c
        if len(parts) == 1:
            return self.add(["convert", ti] + list(self.span(e)) + [parts[0]])
        return self.add(["concat", ti] + list(self.span(e)) + [parts])

    def x_replicate(self, e):
        ti = self.type_of(e)
        n = self.d.const_int(e.count)
        if n is None or n <= 0:
            raise Unsupported("uses a replication with a count that is not a positive constant")
        p = self.expr(e.concat)
        if self.is_const(p):
            c = self.fold(e)
            if c is not None:
                return c
        return self.add(["replicate", ti] + list(self.span(e)) + [n, p])

    def unpacked_select(self, e, lvalue):
        """A select from something that is not a packed vector: a constant if slang can fold it,
        or an entry of a constant table (`TBL[idx]`)."""
        if not lvalue:
            c = self.fold(e)
            if c is not None:
                return c
            if e.kind == EK.ElementSelect:
                t = self.table_entry(e)
                if t is not None:
                    return t
        raise Unsupported("selects from '%s', which is not a packed vector" % _text(e.value))

    def table_entry(self, e):
        """`TBL[idx]` where TBL is a constant unpacked array of packed values (a lookup table
        in a localparam, as table-driven generators write them): a choice among its entries
        (`idx == 0 ? TBL[0] : idx == 1 ? ...`). Only when every value of the index names an
        entry: a read out of range gives the element type's default (x for 4-state types,
        IEEE 1800-2017 7.4.6), which stays with code kept as written. None otherwise."""
        v, sel = e.value, e.selector
        ct = v.type.canonicalType
        if ct.kind != SK.FixedSizeUnpackedArrayType or not ct.elementType.isIntegral:
            return None
        if sel.kind == EK.NamedValue and sel.symbol in self.loop_ranges:
            return self.loop_table_entry(e, *self.loop_ranges[sel.symbol])
        st = sel.type
        if not st.isIntegral or st.isSigned:
            return None
        if st.bitWidth > TABLE_INDEX_BITS_MAX:
            raise Unsupported("reads the table '%s' with an index of more than %d bits" %
                              (_text(v), TABLE_INDEX_BITS_MAX))
        got = self.table_values(e)
        if got is None:
            return None
        values, left, right = got
        lo, hi = min(left, right), max(left, right)
        w = st.bitWidth
        if lo != 0 or hi < (1 << w) - 1:
            raise Unsupported("reads the table '%s' with an index that can fall outside it (an x by "
                              "the language's rules)" % _text(v))
        ti = self.type_of(e)
        width = e.type.bitWidth
        idx = self.expr(sel)
        bit = self.types.vector(1, False)
        sp = list(self.span(e))
        at = (lambda k: k) if left <= right else (lambda k: left - k)   # index -> list position
        out = self.const_of_type(sv_bits(values[at((1 << w) - 1)], width), ti, e)
        for k in range((1 << w) - 2, -1, -1):
            entry = self.const_of_type(sv_bits(values[at(k)], width), ti, e)
            eq = self.add(["binary", bit] + sp + ["==", idx, self.const(format(k, "0%db" % w), False)])
            out = self.add(["cond", ti] + sp + [eq, entry, out])
        return out

    def table_values(self, e):
        """(values, left, right) of the constant unpacked array `e.value` reads, or None."""
        v = e.value
        ct = v.type.canonicalType
        try:
            cv = v.eval(ast.EvalContext(self.d.body)).value
        except Exception:    # slang raises when the array is not a constant
            return None
        if not isinstance(cv, list) or not cv:
            return None
        values = [x.value for x in cv]
        if not all(isinstance(x, pyslang.SVInt) for x in values):
            return None
        left, right = ct.range.left, ct.range.right
        if len(values) != abs(left - right) + 1:
            return None
        return values, left, right

    def loop_table_entry(self, e, first, last):
        """`TBL[i]` where i is the variable of an enclosing counting loop that runs from
        `first` to `last`, both inside the table (`for (int i = 0; i < N; i++) ...
        (addr & MASK[i]) == BASE[i]`, an address map in a localparam array): a choice among
        the entries the loop reaches, `i == first ? TBL[first] : ... : TBL[last]`, which the
        unrolled loop folds to one entry per pass. No read can fall outside the table, so no x
        by the language's rules is lost. None when the table is not a constant."""
        got = self.table_values(e)
        if got is None:
            return None
        values, left, right = got
        lo, hi = min(left, right), max(left, right)
        if first < lo or last > hi or first > last:
            return None
        ti = self.type_of(e)
        width = e.type.bitWidth
        sel = e.selector
        w, sg = self.types.width_signed(self.types.of(sel.type))
        idx = self.expr(sel)
        bit = self.types.vector(1, False)
        sp = list(self.span(e))
        at = (lambda k: k - left) if left <= right else (lambda k: left - k)   # index -> list position
        out = self.const_of_type(sv_bits(values[at(last)], width), ti, e)
        for k in range(last - 1, first - 1, -1):
            entry = self.const_of_type(sv_bits(values[at(k)], width), ti, e)
            eq = self.add(["binary", bit] + sp + ["==", idx, self.const(format(k & ((1 << w) - 1), "0%db" % w), sg)])
            out = self.add(["cond", ti] + sp + [eq, entry, out])
        return out

    def counting_range(self, s):
        """(variable, first, last) of `for (int i = A; i < B; i++)` (or `<=`, `++i`, `i += 1`)
        with constant A and B whose body does not write i; None for any other loop."""
        if len(s.loopVars) != 1 or s.initializers or len(s.steps) != 1 or s.stopExpr is None:
            return None
        v = s.loopVars[0]
        if v.initializer is None:
            return None
        first = self.d.const_int(v.initializer)
        stop = s.stopExpr
        if stop.kind != EK.BinaryOp or stop.op not in (ast.BinaryOperator.LessThan, ast.BinaryOperator.LessThanEqual):
            return None
        left = stop.left
        while left.kind == EK.Conversion:      # `i < N` with an unsigned N converts i
            left = left.operand
        if left.kind != EK.NamedValue or left.symbol is not v:
            return None
        bound = self.d.const_int(stop.right)
        if first is None or bound is None:
            return None
        last = bound - 1 if stop.op == ast.BinaryOperator.LessThan else bound
        step = s.steps[0]
        if step.kind == EK.UnaryOp:
            if step.op not in (ast.UnaryOperator.Postincrement, ast.UnaryOperator.Preincrement):
                return None
            target = step.operand
        elif step.kind == EK.Assignment and step.isCompound and step.op == ast.BinaryOperator.Add:
            target = step.left
            if self.d.const_int(step.right.operand if step.right.kind == EK.BinaryOp else step.right) != 1:
                return None
        else:
            return None
        if target.kind != EK.NamedValue or target.symbol is not v:
            return None
        written = []

        def cb(n):
            if isinstance(n, ast.AssignmentExpression) and n.left.kind == EK.NamedValue and n.left.symbol is v:
                written.append(n)
            elif isinstance(n, ast.UnaryExpression) and n.op in (
                    ast.UnaryOperator.Postincrement, ast.UnaryOperator.Preincrement,
                    ast.UnaryOperator.Postdecrement, ast.UnaryOperator.Predecrement) and \
                    n.operand.kind == EK.NamedValue and n.operand.symbol is v:
                written.append(n)
        s.body.visit(cb)
        return None if written else (v, first, last)

    def x_element(self, e, lvalue=False):
        v = e.value
        sel = e.selector
        key = None
        if not lvalue and type(v) is _NAMED_VALUE and type(sel) is _INT_LITERAL \
                and (sym := v.symbol) not in self.loop_syms:
            # `a[3]`: shared within the member, found before anything else is asked of slang
            # (the same signal and index give the same type: the select's type is the
            # element type of the signal's)
            key = ("e", sym, sel.value.toString(_DEC, False))
            got = self.shared.get(key)
            if got is not None:
                return got
        vt = v.type
        vinfo = self._tinfo.get(vt) or self.types.info(vt)
        if not vinfo[3]:
            return self.unpacked_select(e, lvalue)
        ti = self.type_of(e)
        if key is not None:
            val = self.expr(v)
            if self.is_const(val):
                c = self.fold(e)
                if c is not None:
                    return c
            idx = self.expr(sel)
            s, t = self.span(e)
            return self.leaf(key, ["index", ti, s, t, val, idx, vinfo[4], vinfo[5]])
        val = self.lvalue(v) if lvalue else self.expr(v)
        idx = self.expr(sel)
        if not lvalue and self.is_const(val) and self.is_const(idx):
            c = self.fold(e)
            if c is not None:
                return c
        node = ["index", ti] + list(self.span(e)) + [val, idx, vinfo[4], vinfo[5]]
        if not lvalue and self.is_const(idx) and self.ex[val][0] == "ref":
            return self.leaf(("i", ti, val, idx, vinfo[4], vinfo[5]), node)
        return self.add(node)

    def x_range(self, e, lvalue=False):
        v = e.value
        vt = v.type
        vinfo = self._tinfo.get(vt) or self.types.info(vt)
        if not vinfo[3]:
            return self.unpacked_select(e, lvalue)
        ti = self.type_of(e)
        msb, lsb = vinfo[4], vinfo[5]
        val = self.lvalue(v) if lvalue else self.expr(v)
        sp = list(self.span(e))
        kind = e.selectionKind
        if kind == ast.RangeSelectionKind.Simple:
            left = self.d.const_int(e.left)
            right = self.d.const_int(e.right)
            if left is None or right is None:
                raise Unsupported("uses a part select with non-constant bounds")
            node = ["range", ti] + sp + [val, left, right, msb, lsb]
        else:
            n = self.d.const_int(e.right)
            if n is None or n <= 0:
                raise Unsupported("uses an indexed part select with a non-constant width")
            base = self.expr(e.left)
            b = bits_int(self.bits(base), self.wsig(base)[1]) if self.is_const(base) else None
            up = kind == ast.RangeSelectionKind.IndexedUp
            if b is not None:
                lo_i, hi_i = (b, b + n - 1) if up else (b - n + 1, b)
                left, right = (hi_i, lo_i) if msb >= lsb else (lo_i, hi_i)
                node = ["range", ti] + sp + [val, left, right, msb, lsb]
            else:
                node = ["indexed", ti] + sp + [val, base, "+" if up else "-", msb, lsb]
        if not lvalue and self.is_const(val) and node[0] == "range":
            c = self.fold(e)
            if c is not None:
                return c
        if not lvalue and node[0] == "range" and self.ex[val][0] == "ref":
            return self.leaf(("g",) + tuple(node[1:2] + node[4:]), node)
        return self.add(node)

    def x_member(self, e, lvalue=False):
        v = e.value
        vt = v.type.canonicalType
        if vt.kind not in (SK.PackedStructType, SK.PackedUnionType):
            if not lvalue:
                c = self.fold(e)
                if c is not None:
                    return c
            raise Unsupported("accesses a member of '%s', which is not a packed struct or union" % _text(v))
        ti = self.type_of(e)
        w, s = self.types.width_signed(ti)
        val = self.lvalue(v) if lvalue else self.expr(v)
        off = e.member.bitOffset
        if not lvalue and self.is_const(val):
            c = self.fold(e)
            if c is not None:
                return c
        node = ["range", ti] + list(self.span(e)) + [val, off + w - 1, off, vt.bitWidth - 1, 0]
        if not lvalue and self.ex[val][0] == "ref":
            return self.leaf(("g",) + tuple(node[1:2] + node[4:]), node)
        return self.add(node)

    def x_convert(self, e):
        t = e.type
        op = e.operand
        if op.kind == EK.Streaming and t.isIntegral:
            return self.x_stream(e, op)
        if not t.isIntegral or not op.type.isIntegral:
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported("converts between '%s' and '%s'" % (op.type, t))
        a = self.expr(op)
        ti = self.types.of(t)
        w, s = t.bitWidth, bool(t.isSigned)
        aw, asg = self.wsig(a)
        # IEEE 1800-2017 11.8.2: an operand reached by type propagation is extended
        # according to the propagated type, so a signed operand of an unsigned
        # expression is zero-extended. slang marks those conversions Propagated.
        ext_signed = s if e.conversionKind == ast.ConversionKind.Propagated else asg
        if self.is_const(a):
            return self.const_of_type(convert_bits(self.bits(a), ext_signed, w, t.isFourState), ti, e)
        if aw == w and asg == s:
            return a
        sp = list(self.span(e))
        if ext_signed != asg and w > aw:
            a = self.add(["convert", self.types.vector(aw, ext_signed)] + sp + [a])
        return self.add(["convert", ti] + sp + [a])

    def x_stream(self, e, op):
        """A streaming concatenation assigned or cast to an integral type (IEEE 1800 11.4.14):
        the operands' bits in order; for `<<` cut into slices of `sliceSize` bits from the right
        and put in reverse order (`>>` keeps the stream); left-justified in a wider target and
        zero-filled on the right (as slang evaluates it). A concatenation of part selects."""
        c = self.fold(e)
        if c is not None:
            return c
        ti = self.types.of(e.type)
        w = e.type.bitWidth
        sp = list(self.span(e))
        parts = []
        for st in op.streams:
            o = st.operand
            if st.withExpr is not None or o.kind == EK.Streaming or not o.type.isIntegral:
                raise Unsupported("uses a streaming concatenation with a nested stream, a `with` range "
                                  "or a value that is not a packed vector")
            if o.type.bitWidth > 0:
                parts.append(self.expr(o))
        sw = sum(self.wsig(x)[0] for x in parts)
        if not parts or sw > w:
            raise Unsupported("uses a streaming concatenation wider than its target")
        flat = self.types.vector(sw, False)
        stream = parts[0] if len(parts) == 1 else self.add(["concat", flat] + sp + [parts])
        n = op.sliceSize
        if 0 < n < sw:
            # `<<`: slices of n bits from the least significant end (a shorter one left over at
            # the most significant end), the least significant slice first.
            slices = []
            for lo in range(0, sw, n):
                hi = min(lo + n, sw) - 1
                slices.append(self.add(["range", self.types.vector(hi - lo + 1, False)] + sp +
                                       [stream, hi, lo, sw - 1, 0]))
            stream = self.add(["concat", flat] + sp + [slices])
        if w > sw:
            stream = self.add(["concat", self.types.vector(w, False)] + sp +
                              [[stream, self.const("0" * (w - sw), False, e)]])
        return self.add(["convert", ti] + sp + [stream])

    def ones(self, e, arg):
        """Per bit of `arg`, least significant first, a 1-bit node that is 1 where the bit is 1:
        `arg[i] === 1'b1`, so an x or z bit counts as not 1, as the system functions on bit
        counts say (IEEE 1800 20.9); the nodes are never x."""
        v = self.expr(arg)
        w = self.wsig(v)[0]
        sp = list(self.span(e))
        bit = self.types.vector(1, False)
        one = self.const("1", False, e)
        return [self.add(["binary", bit] + sp + ["===", self.add(["range", bit] + sp + [v, i, i, w - 1, 0]), one])
                for i in range(w)], sp, bit

    def count_ones(self, e, arg):
        """`$countones(v)`: the sum of v's ones in just enough bits, zero-extended to int."""
        ts, sp, bit = self.ones(e, arg)
        m = len(ts).bit_length()
        it = self.types.vector(m, False)
        terms = [self.add(["convert", it] + sp + [t]) for t in ts]
        while len(terms) > 1:
            nxt = [self.add(["binary", it] + sp + ["+", terms[i], terms[i + 1]])
                   for i in range(0, len(terms) - 1, 2)]
            if len(terms) % 2:
                nxt.append(terms[-1])
            terms = nxt
        return self.add(["convert", self.types.vector(32, True)] + sp + [terms[0]])

    def one_hot(self, e, arg, zero_ok):
        """`$onehot(v)` (exactly one bit is 1) or `$onehot0(v)` (at most one), as gates: a bit
        that is 1 while a lower one was already 1 is a conflict."""
        ts, sp, bit = self.ones(e, arg)
        seen, conflict = ts[0], None
        for t in ts[1:]:
            c = self.add(["binary", bit] + sp + ["&", t, seen])
            conflict = c if conflict is None else self.add(["binary", bit] + sp + ["|", conflict, c])
            seen = self.add(["binary", bit] + sp + ["|", seen, t])
        if conflict is None:
            return self.const("1", False, e) if zero_ok else seen
        ok = self.add(["unary", bit] + sp + ["~", conflict])
        return ok if zero_ok else self.add(["binary", bit] + sp + ["&", seen, ok])

    def x_call(self, e):
        if e.isSystemCall:
            name = e.subroutineName
            if name in ("$countones", "$onehot", "$onehot0") and len(e.arguments) == 1 \
                    and e.arguments[0].type.isIntegral and e.arguments[0].type.bitWidth > 0:
                c = self.fold(e)
                if c is not None:
                    return c
                ti = self.type_of(e)
                w, s = self.types.width_signed(ti)
                sp = list(self.span(e))
                if name == "$countones":
                    n = self.count_ones(e, e.arguments[0])
                    if (w, s) == (32, True):
                        return n
                else:
                    n = self.one_hot(e, e.arguments[0], name == "$onehot0")
                    if (w, s) == (1, False):
                        return n
                return self.add(["convert", ti] + sp + [n])
            if name in ("$signed", "$unsigned"):
                args = e.arguments
                ti = self.type_of(e)
                w, s = self.types.width_signed(ti)
                a = self.expr(args[0])
                aw, asg = self.wsig(a)
                if self.is_const(a):
                    return self.const_of_type(convert_bits(self.bits(a), asg, w, True), ti, e)
                if aw == w and asg == s:
                    return a
                return self.add(["convert", ti] + list(self.span(e)) + [a])
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported("calls the system function %s" % name)
        c = self.fold(e)
        if c is not None:
            return c
        sub = e.subroutine
        if not isinstance(sub, ast.SubroutineSymbol):
            raise Unsupported("calls the function '%s'" % e.subroutineName)
        fi = self.d.function_index(sub)
        formals = list(sub.arguments)
        actuals = list(e.arguments)
        if len(formals) != len(actuals):
            raise Unsupported("calls the function '%s' with arguments kerf cannot match" % sub.name)
        args = [self.expr(a) for a in actuals]
        self.reads.update(self.t.functions[fi]["reads"])
        for n in self.t.functions[fi]["reads"]:
            self.fn_reads.setdefault(n, sub.name)
        ti = self.type_of(e)
        return self.add(["call", ti] + list(self.span(e)) + [fi, args])

    # -- lvalues -------------------------------------------------------------------

    def lvalue(self, e):
        k = e.kind
        if k == EK.NamedValue:
            sym = e.symbol
            name = self.d.sig.get(sym)
            if name is not None:
                return self.signal_ref(e, sym, name, True)
            loc = self.locals.get(sym)
            if loc is not None:
                return self.ref(e, self.type_of(e), loc[1])
            raise Unsupported("assigns '%s', which is not a signal of this module" % sym.name)
        if k == EK.ElementSelect:
            return self.x_element(e, True)
        if k == EK.RangeSelect:
            return self.x_range(e, True)
        if k == EK.MemberAccess:
            return self.x_member(e, True)
        if k == EK.Concatenation:
            ti = self.type_of(e)
            parts = [self.lvalue(o) for o in e.operands if o.type.bitWidth != 0]
            return self.add(["concat", ti] + list(self.span(e)) + [parts])
        if k == EK.HierarchicalValue:
            raise Unsupported("%s '%s'" % (_hier_what(e, "assigns", self.d.body), _text(e)))
        raise Unsupported("assigns a target of kind %s" % k.name)

    def target(self, e):
        return self.flatten_lvalue(self.lvalue(e))

    def flatten_lvalue(self, n):
        """Nested constant selects on a target become one bit range of the signal."""
        node = self.ex[n]
        op = node[0]
        if op == "concat":
            # Flattened parts are new nodes: a concatenation naming them must follow them.
            parts = [self.flatten_lvalue(p) for p in node[4]]
            if parts == node[4]:
                return n
            return self.add(node[:4] + [parts])
        if op not in ("index", "range") or self.ex[node[4]][0] == "ref":
            return n
        span = self._const_span(n)
        if span is None:
            return n
        ref, lo, hi = span
        rw, _ = self.wsig(ref)
        return self.add(["range", node[1], node[2], node[3], ref, hi, lo, rw - 1, 0])

    def _const_span(self, n):
        node = self.ex[n]
        op = node[0]
        w, _ = self.wsig(n)
        if op == "ref":
            return n, 0, w - 1
        if op not in ("index", "range"):
            return None
        inner = self._const_span(node[4])
        if inner is None:
            return None
        ref, plo, phi = inner
        if op == "index":
            msb, lsb = node[6], node[7]
            if not self.is_const(node[5]):
                return None
            k = bits_int(self.bits(node[5]), self.wsig(node[5])[1])
            if k is None:
                return None
            lo = plo + dim_offset(k, msb, lsb) * w
        else:
            msb, lsb = node[7], node[8]
            a, b = dim_offset(node[5], msb, lsb), dim_offset(node[6], msb, lsb)
            count = abs(a - b) + 1
            ew = w // count if count else 1
            lo = plo + min(a, b) * ew
        hi = lo + w - 1
        if lo < plo or hi > phi:
            return None
        return ref, lo, hi

    # -- statements ----------------------------------------------------------------

    def sspan(self, s):
        return list(self.span(s)) if s is not None else [-1, -1]

    def add_stmt(self, node):
        self.st.append(node)
        return len(self.st) - 1

    def stmt(self, s):
        k = s.kind
        if k == STK.Return and self.function is not None:
            # `return e;` as the last statement on its path: the result is e. Before the end,
            # the return flag is set too, and what follows runs only while it is clear.
            if not self.tail and self.flags["return"] is None:
                raise Unsupported("returns from the middle of the function")
            if s.expr is None:
                raise Unsupported("returns without a value")
            ti, idx = self.function
            lhs = self.leaf(("r", ti, idx), ["ref", ti, -1, -1, idx])
            a = self.add_stmt(["assign"] + self.sspan(s) + [lhs, self.expr(s.expr)])
            if self.flags["return"] is None:
                return a
            return self.add_stmt(["block"] + self.sspan(s) + [[a, self.set_flag(self.flags["return"], 1, s)]])
        if k in (STK.Break, STK.Continue):
            f = self.flags["break" if k == STK.Break else "continue"]
            if f is None:
                raise Unsupported("contains %s" % _STMT_REASON[k])
            return self.set_flag(f, 1, s)
        if k == STK.Block:
            if s.blockKind != ast.StatementBlockKind.Sequential:
                raise Unsupported("contains a fork-join block")
            return self.block(s.body, s)
        if k == STK.List:
            return self.block(s, s)
        if k == STK.Empty:
            return self.add_stmt(["empty"] + self.sspan(s))
        if k == STK.ExpressionStatement:
            return self.expr_stmt(s.expr, s)
        if k == STK.VariableDeclaration:
            sym = s.symbol
            syn = sym.syntax
            if syn is not None and syn.parent is not None \
                    and syn.parent.kind == pyslang.syntax.SyntaxKind.ForVariableDeclaration:
                return None    # declared by the for loop that follows; it initializes it
            name, idx = self.add_local(sym)
            init = sym.initializer
            if init is None:
                return None
            if sym.lifetime != ast.VariableLifetime.Automatic:
                raise Unsupported("initializes the static variable '%s' (it would be set only once)" % sym.name)
            ti = self.types.of(sym.type)
            lhs = self.leaf(("r", ti, idx), ["ref", ti, -1, -1, idx])
            return self.add_stmt(["assign"] + self.sspan(s) + [lhs, self.expr(init)])
        if k == STK.Conditional:
            conds = s.conditions
            if len(conds) != 1 or conds[0].pattern is not None:
                raise Unsupported("contains an if with pattern matching")
            cond = self.expr(conds[0].expr)
            then = self.stmt_or_empty(s.ifTrue)
            els = self.stmt_or_empty(s.ifFalse) if s.ifFalse is not None else -1
            return self.add_stmt(["if"] + self.sspan(s) + [cond, then, els, CHECK[s.check]])
        if k == STK.Case:
            sel = self.expr(s.expr)
            table = self.case_table(s, sel)
            if table is not None:
                return table
            items = []
            bit = self.types.vector(1, False)
            for g in s.items:
                exprs = []
                conds = []
                for x in g.expressions:
                    if x.kind == EK.ValueRange:
                        # `[lo:hi]` of a case inside: a condition, lo <= selector <= hi (12.5.4, 11.4.13)
                        if x.syntax is not None and ("+/-" in str(x.syntax) or "+%-" in str(x.syntax)):
                            raise Unsupported("contains a case inside range with a tolerance")
                        sp = list(self.span(x))
                        ge = self.add(["binary", bit] + sp + [">=", sel, self.expr(x.left)])
                        le = self.add(["binary", bit] + sp + ["<=", sel, self.expr(x.right)])
                        exprs.append(self.add(["binary", bit] + sp + ["&&", ge, le]))
                        conds.append(1)
                    else:
                        self.d.note_compare(s.expr, x)
                        exprs.append(self.expr(x))
                        conds.append(0)
                body = self.stmt_or_empty(g.stmt)
                items.append([exprs, body, conds] if any(conds) else [exprs, body])
            dflt = self.stmt_or_empty(s.defaultCase) if s.defaultCase is not None else -1
            return self.add_stmt(["case"] + self.sspan(s) + [_CASE_KIND[s.condition], CHECK[s.check],
                                                            sel, items, dflt, self.d.case_attributes(s)])
        if k == STK.ForLoop:
            return self.for_loop(s)
        if k == STK.ForeachLoop:
            return self.foreach_loop(s)
        if k == STK.Invalid:
            raise Unsupported("contains a statement slang could not bind")
        raise Unsupported("contains %s" % _STMT_REASON.get(k, "a %s statement" % k.name))

    def literal_bits(self, x):
        """(bits, slang type) of `x` when it is an integer literal, or a conversion of one that
        keeps its width (slang's conversion of a case label or an assigned value to its
        context's type); None for anything else."""
        k = x.kind
        if k is EK.IntegerLiteral:
            t = x.type
            return sv_bits(x.value, self.lit_type(t)[0]), t
        if k is not EK.Conversion:
            return None
        o = x.operand
        if o.kind is not EK.IntegerLiteral:
            return None
        t = x.type
        w, four, integral = self.lit_type(t)
        v = o.value
        if v.bitWidth != w or not integral:
            return None
        bits = sv_bits(v, w)
        if not four and ("x" in bits or "z" in bits):
            bits = bits.replace("x", "0").replace("z", "0")
        return bits, t

    def lit_type(self, t):
        """(width, four-state, integral) of slang type `t`, cached per type object."""
        got = self.t.lit_types.get(t)
        if got is None:
            got = self.t.lit_types[t] = (t.bitWidth, bool(t.isFourState), bool(t.isIntegral))
        return got

    def case_table(self, s, sel):
        """A case whose items are constants and whose item bodies only assign constants to
        fixed bits (the shape of generated decoders and ROM tables) as one `case_table`
        statement: the labels as one string, the values as one string per target
        (docs/reader-format.md, "Case tables"). None when the case has another shape; the
        caller then describes it item by item (nodes made here are left unused)."""
        items = list(s.items)
        if not items:
            return None
        types = self.types
        info = types.info
        labels = []
        counts = []
        lw = None
        rows = []                 # per item: {target key: bits}
        targets = {}              # target key -> (position, node, width)
        by_symbol = {}            # slang symbol of a whole-signal target -> target key
        for g in items:
            exprs = g.expressions
            for x in exprs:
                got = self.literal_bits(x)
                if got is not None:
                    bits, xt = got
                    xi = info(xt)
                    wsig = (xi[1], xi[2])
                else:
                    if x.kind == EK.ValueRange:
                        return None
                    self.d.note_compare(s.expr, x)
                    n = self.expr(x)
                    if not self.is_const(n):
                        return None
                    bits = self.bits(n)
                    wsig = self.wsig(n)
                if lw is None:
                    lw = wsig
                elif wsig != lw:
                    return None
                labels.append(bits)
            counts.append(len(exprs))
            row = {}
            work = [g.stmt]
            while work:
                st = work.pop()
                sk = st.kind
                if sk == STK.Block:
                    if st.blockKind != ast.StatementBlockKind.Sequential:
                        return None
                    work.append(st.body)
                elif sk == STK.List:
                    work.extend(reversed(list(st.list)))
                elif sk == STK.Empty:
                    pass
                elif sk == STK.ExpressionStatement:
                    a = st.expr
                    if a.kind != EK.Assignment or a.isNonBlocking or a.isCompound or a.timingControl is not None:
                        return None
                    left = a.left
                    key = None
                    if left.kind == EK.NamedValue:
                        key = by_symbol.get(left.symbol)
                    if key is None:
                        node = self.target(left)
                        sp = self._const_span(node)
                        if sp is None:
                            return None
                        ref, lo, hi = sp
                        key = (self.ex[ref][4], lo, hi)
                        if key not in targets:
                            targets[key] = (len(targets), node, hi - lo + 1)
                        if left.kind == EK.NamedValue:
                            by_symbol[left.symbol] = key
                    tw = targets[key][2]
                    r = a.right
                    got = self.literal_bits(r)
                    if got is not None and self.lit_type(got[1])[0] == tw:
                        bits = got[0]
                    else:
                        rt = r.type
                        if not rt.isIntegral:
                            return None
                        c = self.fold(r)
                        if c is None:
                            return None
                        bits = convert_bits(self.bits(c), info(rt)[2], tw, True)
                    row[key] = bits
                else:
                    return None
            rows.append(row)
        # Targets that share bits (`ctl` in one item, `ctl[7:4]` in another) are fine unless one
        # item assigns two of them: then the order of its assignments would matter.
        if _overlap(targets):
            for r in rows:
                if len(r) > 1 and _overlap(r):
                    return None
        order = sorted(targets.items(), key=lambda kv: kv[1][0])
        columns = []
        for key, (_, _, tw) in order:
            unset = "-" * tw
            columns.append("".join([r.get(key, unset) for r in rows]))
        table = {"width": lw[0], "signed": lw[1], "labels": "".join(labels),
                 "targets": [t[1] for _, t in order], "values": columns}
        if any(c != 1 for c in counts):
            table["counts"] = counts
        dflt = self.stmt_or_empty(s.defaultCase) if s.defaultCase is not None else -1
        return self.add_stmt(["case_table"] + self.sspan(s) + [_CASE_KIND[s.condition], CHECK[s.check], sel,
                                                              table, dflt, self.d.case_attributes(s)])

    def stmt_or_empty(self, s):
        r = self.stmt(s)
        return r if r is not None else self.add_stmt(["empty"] + self.sspan(s))

    def block(self, s, where):
        lst = list(s.list) if s.kind == STK.List else [s]
        return self.block_items(lst, where)

    def block_items(self, lst, where):
        items = []
        tail = self.tail
        for i, x in enumerate(lst):
            self.tail = tail and i == len(lst) - 1
            r = self.stmt(x)
            if r is not None:
                items.append(r)
            if i + 1 < len(lst) and self.may_exit(x):
                # What follows an early exit runs only while no exit flag is set.
                self.tail = tail
                rest = self.block_items(lst[i + 1:], where)
                items.append(self.add_stmt(["if"] + self.sspan(where) + [self.no_exit(where), rest, -1, "none"]))
                break
        self.tail = tail
        return self.add_stmt(["block"] + self.sspan(where) + [items])

    # -- early exits ---------------------------------------------------------------------

    def new_flag(self, name, where):
        """A 1-bit local of the member (or function) holding an early exit."""
        idx = self.t.new_symbol()
        base, n = "%s@exit" % name, 1
        fname = base
        while fname in self.local_names:
            fname = "%s%d" % (base, n)
            n += 1
        self.local_names.add(fname)
        src = self.d.src.range_src(where.sourceRange)[0]
        self.local_list.append({"name": fname, "id": idx, "kind": "variable", "type": self.types.vector(1, False),
                                "width": 1, "signed": False, "msb": 0, "lsb": 0, "port": False,
                                "vector": False, "src": src, "decl": None})
        return idx

    def flag_ref(self, idx):
        bit = self.types.vector(1, False)
        return self.leaf(("r", bit, idx), ["ref", bit, -1, -1, idx])

    def set_flag(self, idx, v, where):
        return self.add_stmt(["assign"] + self.sspan(where) + [self.flag_ref(idx), self.const(str(v), False)])

    def no_exit(self, where):
        """1 while none of the active exit flags is set."""
        bit = self.types.vector(1, False)
        sp = list(self.sspan(where))
        refs = [self.flag_ref(f) for f in self.flags.values() if f is not None]
        acc = refs[0]
        for r in refs[1:]:
            acc = self.add(["binary", bit] + sp + ["|", acc, r])
        return self.add(["unary", bit] + sp + ["~", acc])

    def may_exit(self, s):
        """Statement s contains a `break`/`continue` of the loop being converted (one not inside a
        nested loop) or a `return`, while the flag for it is active."""
        want_loop = self.flags["break"] is not None or self.flags["continue"] is not None
        want_ret = self.flags["return"] is not None
        if not want_loop and not want_ret:
            return False
        return _contains_exit(s, want_loop, want_ret)

    def loop_body(self, s, body_stmt):
        """Convert a loop body with flags for its own `break`/`continue` when it has them: returns
        (statements to put before the loop, the body). The body runs only while no exit flag is
        set; `continue` is cleared at the start of every iteration."""
        saved = dict(self.flags)
        has_b = _contains_exit(body_stmt, True, False, kinds=(STK.Break,))
        has_c = _contains_exit(body_stmt, True, False, kinds=(STK.Continue,))
        self.flags["break"] = self.new_flag("break", s) if has_b else None
        self.flags["continue"] = self.new_flag("continue", s) if has_c else None
        try:
            before = [self.set_flag(self.flags["break"], 0, s)] if has_b else []
            body = self.stmt_or_empty(body_stmt)
            items = [self.set_flag(self.flags["continue"], 0, s)] if has_c else []
            if has_b or self.flags["return"] is not None:
                self.flags["continue"] = None    # cleared here; only break/return guard the body
                body = self.add_stmt(["if"] + self.sspan(s) + [self.no_exit(s), body, -1, "none"])
            if items:
                body = self.add_stmt(["block"] + self.sspan(s) + [items + [body]])
            return before, body
        finally:
            self.flags = saved

    def expr_stmt(self, x, s):
        k = x.kind
        where = s if s is not None else x
        if k == EK.Assignment:
            if x.isNonBlocking:
                raise Unsupported("contains a nonblocking assignment")
            if x.timingControl is not None:
                raise Unsupported("contains an intra-assignment timing control")
            lhs = self.target(x.left)
            if x.isCompound:
                self.lvref = x.left
            try:
                rhs = self.expr(x.right)
            finally:
                self.lvref = None
            return self.add_stmt(["assign"] + self.sspan(where) + [lhs, rhs])
        if k == EK.UnaryOp and x.op in _INCDEC:
            lhs = self.target(x.operand)
            cur = self.expr(x.operand)
            ti = self.ex[cur][1]
            w, sg = self.wsig(cur)
            one = self.const("0" * (w - 1) + "1", sg)
            rhs = self.add(["binary", ti] + list(self.span(x)) + [_INCDEC[x.op], cur, one])
            return self.add_stmt(["assign"] + self.sspan(where) + [lhs, rhs])
        if k == EK.Call:
            raise Unsupported("calls %s" % (x.subroutineName if x.isSystemCall else "'%s'" % x.subroutineName))
        raise Unsupported("contains an expression statement")

    def for_loop(self, s):
        pushed = []
        init = []
        counting = self.counting_range(s)
        if counting is not None:
            self.loop_ranges[counting[0]] = counting[1:]
        try:
            for v in s.loopVars:
                name, idx = self.add_local(v)
                if v.initializer is None:
                    raise Unsupported("has a for loop variable without an initial value")
                init.append([idx, self.expr(v.initializer)])
            for x in s.initializers:
                if x.kind != EK.Assignment or x.left.kind != EK.NamedValue or x.isCompound:
                    raise Unsupported("has a for loop whose initialization is not 'variable = value'")
                sym = x.left.symbol
                loc = self.locals.get(sym)
                if loc is None:
                    name = self.d.sig.get(sym)
                    if name is None or name not in self.d.loop_candidates:
                        raise Unsupported("has a for loop over '%s', which cannot be made local to the block"
                                          % x.left.symbol.name)
                    value = self.expr(x.right)
                    if sym not in self.loop_syms:
                        self.loop_syms[sym] = 0
                        pushed.append(sym)
                    if name not in self.localized:
                        idx = self.t.new_symbol()
                        self.localized[name] = idx
                        self.local_list.append(self.local_entry(name, sym.type, self.d.symbol_src(sym), idx))
                    init.append([self.localized[name], value])
                else:
                    init.append([loc[1], self.expr(x.right)])
            if s.stopExpr is None:
                raise Unsupported("has a for loop without a condition")
            cond = self.expr(s.stopExpr)
            step = [self.expr_stmt(x, None) for x in s.steps]
            tail, self.tail = self.tail, False
            before, body = self.loop_body(s, s.body)
            self.tail = tail
        finally:
            for sym in pushed:
                del self.loop_syms[sym]
            if counting is not None:
                del self.loop_ranges[counting[0]]
        loop = self.add_stmt(["for"] + self.sspan(s) + [init, cond, step, body])
        return self.add_stmt(["block"] + self.sspan(s) + [before + [loop]]) if before else loop


    def foreach_loop(self, s):
        """`foreach (a[i, j])` over fixed-size dimensions: nested for loops, each running its
        variable from the dimension's left bound to its right bound (IEEE 1800 12.7.3)."""
        dims = []
        for d in s.loopDims:
            if d.loopVar is None:
                continue
            if d.range is None:
                raise Unsupported("has a foreach loop over a dimension that is not of fixed size")
            dims.append((d.loopVar, d.range.left, d.range.right))
        if not dims:
            raise Unsupported("has a foreach loop without a loop variable")
        loops = [(self.add_local(v)[1], v, l, r) for v, l, r in dims]
        tail, self.tail = self.tail, False
        before, body = self.loop_body(s, s.body)
        self.tail = tail
        sp = self.sspan(s)
        bit = self.types.vector(1, False)
        for idx, v, l, r in reversed(loops):
            ti = self.types.of(v.type)
            w, sg = self.types.width_signed(ti)
            if w < 32 or not sg:
                raise Unsupported("has a foreach loop variable of type '%s'" % v.type)
            def k(n):
                return self.const(format(n & ((1 << w) - 1), "0%db" % w), True)
            ref = self.ref(s, ti, idx)
            cond = self.add(["binary", bit] + sp + ["<=" if l <= r else ">=", ref, k(r)])
            nxt = self.add(["binary", ti] + sp + ["+" if l <= r else "-", ref, k(1)])
            step = self.add_stmt(["assign"] + sp + [ref, nxt])
            body = self.add_stmt(["for"] + sp + [[[idx, k(l)]], cond, [step], body])
        return self.add_stmt(["block"] + sp + [before + [body]]) if before else body


def _overlap(spans):
    """Two of the (symbol, lo, hi) bit spans share a bit (sorted, a later span that overlaps
    an earlier one overlaps the one right after it)."""
    s = sorted(spans)
    return any(a[0] == b[0] and b[1] <= a[2] for a, b in zip(s, s[1:]))


def _contains_exit(s, loop, ret, kinds=(STK.Break, STK.Continue)):
    """Statement s contains (`loop`) a break/continue of one of `kinds` outside any loop nested
    in s, or (`ret`) a return anywhere."""
    work = [(s, True)]
    while work:
        x, outer = work.pop()
        if x is None:
            continue
        k = x.kind
        if k == STK.Return and ret:
            return True
        if k in kinds and loop and outer:
            return True
        if k == STK.Block:
            work.append((x.body, outer))
        elif k == STK.List:
            work.extend((y, outer) for y in x.list)
        elif k == STK.Conditional:
            work.append((x.ifTrue, outer))
            work.append((x.ifFalse, outer))
        elif k == STK.Case:
            work.extend((g.stmt, outer) for g in x.items)
            work.append((x.defaultCase, outer))
        elif k in (STK.ForLoop, STK.ForeachLoop):
            work.append((x.body, False))
        elif k == STK.Timed:
            work.append((x.stmt, outer))
    return False


def _hier_what(e, verb, body=None):
    """How a message names a hierarchical reference: a member of an interface port (reached
    through its modport, F29, or through a port of the interface type without one) is the
    module's own boundary, kept as written like a port."""
    sym = getattr(e, "symbol", None)
    if sym is not None and sym.kind == SK.ModportPort:
        return "%s a member of an interface port" % verb
    if body is not None:
        # Without a modport the member is the interface instance's own variable: the path
        # starts at the module's interface port (`bus.paddr`, `bus[1].paddr`).
        head = re.split(r"[.\[\s]", _text(e), 1)[0]
        try:
            first = body.lookupName(head) if head else None
        except Exception:   # a name slang cannot look up from the body is not a port
            first = None
        if first is not None and first.kind == SK.InterfacePort:
            return "%s a member of an interface port" % verb
    return "%s the hierarchical reference" % verb


def _text(e):
    syn = e.syntax
    if syn is not None:
        return str(syn).strip()
    if isinstance(e, ast.ValueExpressionBase):
        return e.symbol.name
    return e.kind.name


def _expr_reason(e):
    k = e.kind
    reasons = {
        EK.Streaming: "uses a streaming concatenation",
        EK.Assignment: "uses an assignment inside an expression",
        EK.SimpleAssignmentPattern: "uses an assignment pattern of a type that is not packed",
        EK.StructuredAssignmentPattern: "uses an assignment pattern of a type that is not packed",
        EK.ReplicatedAssignmentPattern: "uses an assignment pattern of a type that is not packed",
        EK.RealLiteral: "uses a real number",
        EK.Dist: "uses a distribution",
        EK.MinTypMax: "uses a min:typ:max expression",
        EK.TaggedUnion: "uses a tagged union",
        EK.Invalid: "uses an expression slang could not bind",
    }
    return reasons.get(k, "uses an expression of kind %s" % k.name)


_EXPR = {
    EK.IntegerLiteral: Conv.x_int_literal,
    EK.UnbasedUnsizedIntegerLiteral: Conv.x_folded,
    EK.StringLiteral: Conv.x_string,
    EK.NamedValue: Conv.x_named,
    EK.HierarchicalValue: Conv.x_hier,
    EK.LValueReference: Conv.x_lvref,
    EK.UnaryOp: Conv.x_unary,
    EK.BinaryOp: Conv.x_binary,
    EK.ConditionalOp: Conv.x_cond,
    EK.Inside: Conv.x_inside,
    EK.Concatenation: Conv.x_concat,
    EK.Replication: Conv.x_replicate,
    EK.SimpleAssignmentPattern: Conv.x_pattern,
    EK.StructuredAssignmentPattern: Conv.x_pattern,
    EK.ReplicatedAssignmentPattern: Conv.x_pattern,
    EK.ElementSelect: Conv.x_element,
    EK.RangeSelect: Conv.x_range,
    EK.MemberAccess: Conv.x_member,
    EK.Conversion: Conv.x_convert,
    EK.Call: Conv.x_call,
}
# Enum members are singletons: dispatching on their identity avoids hashing them.
_EXPR_BY_ID = {id(k): h for k, h in _EXPR.items()}
# The same by the Python class pyslang gives an expression: each of slang's expression
# classes stands for one kind, and the class needs no call into slang (the kind does).
# Filled as classes are met; the base class (a kind pyslang has no class for) is not.
_EXPR_BY_CLASS = {}
_BINARY_EXPR = ast.BinaryExpression
_NAMED_VALUE = ast.NamedValueExpression
_INT_LITERAL = ast.IntegerLiteral


def _handler(e):
    """The converter of `e` by its kind (None when there is none), remembered for its class."""
    h = _EXPR_BY_ID.get(id(e.kind))
    if h is not None and type(e) is not ast.Expression:
        _EXPR_BY_CLASS[type(e)] = h
    return h




def linked(exprs, links, lo, hi):
    """Nodes lo..hi-1 of `exprs` as written (version 4): each binary node listed in `links`
    (ascending) as a link `(l, r, end)`; the C++ side restores `["binary", type(l), start(l),
    end, op(l), l, r]`. `x_binary` lists a node only when its left operand `l` is the binary node
    it appended just before, of the same operator, type and start, both with a known range (a
    member dropped takes its listed nodes along; no node is changed once made). A long chain
    (`t1 | t2 | ... | tN`, the OR of a generated decoder's rewrite) then costs three numbers a
    term in the text and in the C++ read. `exprs` itself is not changed."""
    part = exprs[lo:hi]
    a = bisect.bisect_left(links, lo)
    for i in links[a:bisect.bisect_left(links, hi, a)]:
        x = exprs[i]
        part[i - lo] = (x[5], x[6], x[3])
    return part
