"""From slang's elaborated AST of one module to kerf's module description.

The output shape is specified in docs/reader-format.md (`kerf-module`,
version 1); keep the two in step. Entry point: `describe(compilation, top)`.

Members that use anything outside the subset kerf restructures become
`kept` members: conversion raises `Unsupported(reason)` and the member's
reads/writes are then collected conservatively from the whole AST.
"""

import os
from collections import Counter

import pyslang
from pyslang import ast

import kerf_variants

FORMAT = "kerf-module"
VERSION = 1

SK = ast.SymbolKind
EK = ast.ExpressionKind
STK = ast.StatementKind
_BIN = pyslang.LiteralBase.Binary
_DEC = pyslang.LiteralBase.Decimal

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
_CHECK = {
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
_DIRECTION = {
    ast.ArgumentDirection.In: "input",
    ast.ArgumentDirection.Out: "output",
    ast.ArgumentDirection.InOut: "inout",
    ast.ArgumentDirection.Ref: "inout",
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
# Module members that carry no behaviour: never reported as members.
_DECLARATIVE = {
    SK.Port, SK.MultiPort, SK.InterfacePort, SK.Net, SK.Variable, SK.Parameter,
    SK.TypeParameter, SK.TypeAlias, SK.ForwardingTypedef, SK.Subroutine, SK.MethodPrototype,
    SK.Genvar, SK.ExplicitImport, SK.WildcardImport, SK.TransparentMember, SK.EmptyMember,
    SK.StatementBlock, SK.Modport, SK.NetType, SK.Sequence, SK.Property, SK.LetDecl,
    SK.Checker, SK.Attribute, SK.Specparam, SK.DefParam, SK.EnumValue, SK.PackedStructType,
    SK.PackedUnionType, SK.EnumType, SK.ClassType, SK.GenericClassDef, SK.CovergroupType,
    SK.Primitive, SK.UninstantiatedDef, SK.ConfigBlock, SK.PulseStyle, SK.TimingPath,
}
_MODULE_SYNTAX = {
    pyslang.syntax.SyntaxKind.ModuleDeclaration,
    pyslang.syntax.SyntaxKind.InterfaceDeclaration,
    pyslang.syntax.SyntaxKind.ProgramDeclaration,
    pyslang.syntax.SyntaxKind.GenerateRegion,
    pyslang.syntax.SyntaxKind.CompilationUnit,
}
_DECL_SYNTAX = {
    pyslang.syntax.SyntaxKind.NetDeclaration,
    pyslang.syntax.SyntaxKind.DataDeclaration,
    pyslang.syntax.SyntaxKind.PortDeclaration,
    pyslang.syntax.SyntaxKind.UserDefinedNetDeclaration,
}
class Unsupported(Exception):
    """The construct is outside what kerf restructures; the member is kept."""


# ---------------------------------------------------------------------------
# constants

def sv_bits(sv, width):
    """Bits of an SVInt as a string of 0 1 x z, MSB first, resized to `width`."""
    s = sv.toString(_BIN, False)
    n = sv.bitWidth
    if s.startswith("-"):
        s = format((-int(s[1:], 2)) & ((1 << n) - 1), "b")
    if len(s) < n:
        s = "0" * (n - len(s)) + s
    if width < n:
        return s[n - width:]
    if width > n:
        fill = s[0] if (sv.isSigned and s) else "0"
        return fill * (width - n) + s
    return s


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


def const_node(bits, signed):
    return {"op": "const", "width": len(bits), "signed": signed, "bits": bits}


def type_shape(t):
    """(width, signed, msb, lsb, vector, packed) of a declared type, flattened."""
    ct = t.canonicalType
    if ct.isIntegral:
        w = ct.bitWidth
        msb, lsb = w - 1, 0
        if ct.kind == SK.PackedArrayType:
            el = ct.elementType.canonicalType
            if el.isScalar:
                r = ct.range
                msb, lsb = r.left, r.right
        return w, ct.isSigned, msb, lsb, not ct.isScalar, True
    w = ct.bitstreamWidth if ct.isFixedSize else 0
    return w, False, w - 1, 0, True, False


def dim_range(t):
    """Declared range of the outermost packed dimension of an integral type."""
    ct = t.canonicalType
    if ct.kind == SK.PackedArrayType:
        r = ct.range
        return r.left, r.right
    return ct.bitWidth - 1, 0


def dim_offset(index, msb, lsb):
    return index - lsb if msb >= lsb else lsb - index


# ---------------------------------------------------------------------------
# sources

class Sources:
    def __init__(self, sm):
        self.sm = sm
        self._names = {}
        self._bytes = {}
        self._file = {}

    def name(self, buf):
        key = buf.id
        n = self._names.get(key)
        if n is None:
            n = self.sm.getRawFileName(buf)
            # Report a file as the user named it (slang shortens paths relative
            # to the working directory); the writer and the proof key on it.
            n = GIVEN_FILES.get(os.path.realpath(n), n)
            self._names[key] = n
        return n

    def data(self, buf):
        key = buf.id
        b = self._bytes.get(key)
        if b is None:
            try:
                with open(self.sm.getFullPath(buf), "rb") as f:
                    b = f.read()
            except OSError:
                b = self.sm.getSourceText(buf).encode("utf-8", "surrogateescape")
            self._bytes[key] = b
        return b

    def loc_src(self, start, end):
        sm = self.sm
        return {"file": self.name(start.buffer), "start": start.offset, "end": end.offset,
                "line": sm.getLineNumber(start), "col": sm.getColumnNumber(start)}

    def is_file(self, buf, loc):
        key = buf.id
        f = self._file.get(key)
        if f is None:
            f = self.sm.isFileLoc(loc)
            self._file[key] = f
        return f

    def range_src(self, rng):
        """(SRC, clean): clean is False when the range comes out of a macro expansion."""
        start, end = rng.start, rng.end
        sm = self.sm
        sb, eb = start.buffer, end.buffer
        if sb == eb and self.is_file(sb, start):
            return self.loc_src(start, end), True
        # Locate macro-expanded text at the macro's use in the file.
        s, e = start, end
        for _ in range(64):
            if sm.isFileLoc(s):
                break
            s = sm.getExpansionRange(s).start
        for _ in range(64):
            if sm.isFileLoc(e):
                break
            e = sm.getExpansionRange(e).end
        if s.buffer != e.buffer or e.offset < s.offset:
            e = s
        return self.loc_src(s, e), False


# ---------------------------------------------------------------------------
# conversion of one member

class Conv:
    """Converts the expressions and statements of one assign or comb member."""

    def __init__(self, d):
        self.d = d
        self.reads = set()
        self.writes = set()
        self.locals = {}          # local symbol -> name
        self.local_list = []      # SIGNAL entries
        self.local_names = set()
        self.loop_syms = {}       # module variable used as the active loop variable -> depth
        self.localized = set()    # names of module variables treated as loop locals
        self.outside = set()      # names of module variables used outside such loops
        self.lvref = None         # target of the compound assignment being converted

    # -- helpers -----------------------------------------------------------------

    @staticmethod
    def ws(e):
        t = e.type
        if not t.isIntegral:
            raise Unsupported("uses a value of type '%s'" % t)
        return t.bitWidth, t.isSigned

    def fold(self, e):
        return self.d.try_const(e)

    def add_local(self, sym):
        w, s, msb, lsb, vector, packed = type_shape(sym.type)
        if not packed:
            raise Unsupported("declares the local variable '%s' of type '%s'" % (sym.name, sym.type))
        base = sym.name
        name = base
        n = 1
        while name in self.local_names or name in self.d.sig_by_name:
            name = "%s@%d" % (base, n)
            n += 1
        self.local_names.add(name)
        self.locals[sym] = name
        self.local_list.append({"name": name, "kind": "variable", "width": w, "signed": s,
                                "msb": msb, "lsb": lsb, "port": False, "vector": vector,
                                "src": self.d.symbol_src(sym), "decl": None})
        return name

    def signal_ref(self, e, sym, name, write):
        w, s = self.ws(e)
        if sym in self.loop_syms:
            return {"op": "ref", "width": w, "signed": s, "name": name}
        if name in self.d.loop_candidates:
            self.outside.add(name)
        (self.writes if write else self.reads).add(name)
        return {"op": "ref", "width": w, "signed": s, "name": name}

    # -- expressions ---------------------------------------------------------------

    def expr(self, e):
        h = _EXPR.get(e.kind)
        if h is None:
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported(_expr_reason(e))
        return h(self, e)

    def x_int_literal(self, e):
        w, s = self.ws(e)
        return const_node(sv_bits(e.value, w), s)

    def x_folded(self, e):
        c = self.fold(e)
        if c is None:
            raise Unsupported(_expr_reason(e))
        return c

    def x_string(self, e):
        w, s = self.ws(e)
        v = e.intValue.value
        if not isinstance(v, pyslang.SVInt):
            raise Unsupported("uses a string")
        return const_node(sv_bits(v, w), s)

    def x_named(self, e):
        sym = e.symbol
        name = self.d.sig.get(sym)
        if name is not None:
            return self.signal_ref(e, sym, name, False)
        lname = self.locals.get(sym)
        if lname is not None:
            w, s = self.ws(e)
            return {"op": "ref", "width": w, "signed": s, "name": lname}
        c = self.fold(e)
        if c is not None:
            return c
        raise Unsupported("refers to '%s', which is not a signal of this module" % sym.name)

    def x_hier(self, e):
        raise Unsupported("uses the hierarchical reference '%s'" % _text(e))

    def x_lvref(self, e):
        if self.lvref is None:
            raise Unsupported("uses an unsupported expression")
        return self.expr(self.lvref)

    def x_unary(self, e):
        op = _UNARY.get(e.op)
        if op is None:
            raise Unsupported("uses an increment or decrement inside an expression")
        w, s = self.ws(e)
        a = self.expr(e.operand)
        if a["op"] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        return {"op": "unary", "width": w, "signed": s, "operator": op, "operand": a}

    def x_binary(self, e):
        w, s = self.ws(e)
        l = self.expr(e.left)
        r = self.expr(e.right)
        if l["op"] == "const" and r["op"] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        return {"op": "binary", "width": w, "signed": s, "operator": _BINARY[e.op], "lhs": l, "rhs": r}

    def x_cond(self, e):
        conds = e.conditions
        if len(conds) != 1 or conds[0].pattern is not None:
            raise Unsupported("uses a conditional operator with pattern matching")
        w, s = self.ws(e)
        c = self.expr(conds[0].expr)
        t = self.expr(e.left)
        f = self.expr(e.right)
        if c["op"] == "const" and t["op"] == "const" and f["op"] == "const":
            k = self.fold(e)
            if k is not None:
                return k
        return {"op": "cond", "width": w, "signed": s, "cond": c, "then": t, "else": f}

    def x_inside(self, e):
        w, s = self.ws(e)
        terms = []
        for it in e.rangeList:
            if it.kind == EK.ValueRange:
                if it.syntax is not None and ("+/-" in str(it.syntax) or "+%-" in str(it.syntax)):
                    raise Unsupported("uses an inside range with a tolerance")
                ge = {"op": "binary", "width": 1, "signed": False, "operator": ">=",
                      "lhs": self.expr(e.left), "rhs": self.expr(it.left)}
                le = {"op": "binary", "width": 1, "signed": False, "operator": "<=",
                      "lhs": self.expr(e.left), "rhs": self.expr(it.right)}
                terms.append({"op": "binary", "width": 1, "signed": False, "operator": "&&",
                              "lhs": ge, "rhs": le})
            else:
                if not it.type.isIntegral:
                    raise Unsupported("uses inside with a value of type '%s'" % it.type)
                terms.append({"op": "binary", "width": 1, "signed": False, "operator": "==?",
                              "lhs": self.expr(e.left), "rhs": self.expr(it)})
        if all(_all_const(t) for t in terms):
            c = self.fold(e)
            if c is not None:
                return c
        acc = terms[0]
        for t in terms[1:]:
            acc = {"op": "binary", "width": 1, "signed": False, "operator": "||", "lhs": acc, "rhs": t}
        if w != 1 or s:
            acc = {"op": "convert", "width": w, "signed": s, "operand": acc}
        return acc

    def x_concat(self, e):
        w, s = self.ws(e)
        parts = []
        for o in e.operands:
            if o.type.bitWidth == 0:
                continue
            parts.append(self.expr(o))
        if not parts:
            raise Unsupported("uses an empty concatenation")
        if all(p["op"] == "const" for p in parts):
            c = self.fold(e)
            if c is not None:
                return c
        return {"op": "concat", "width": w, "signed": s, "parts": parts}

    def x_replicate(self, e):
        w, s = self.ws(e)
        n = self.d.const_int(e.count)
        if n is None or n <= 0:
            raise Unsupported("uses a replication with a count that is not a positive constant")
        p = self.expr(e.concat)
        if p["op"] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        return {"op": "replicate", "width": w, "signed": s, "count": n, "part": p}

    def unpacked_select(self, e, lvalue):
        """A select from something that is not a packed vector: a constant if slang can fold it."""
        if not lvalue:
            c = self.fold(e)
            if c is not None:
                return c
        raise Unsupported("selects from '%s', which is not a packed vector" % _text(e.value))

    def x_element(self, e, lvalue=False):
        v = e.value
        vt = v.type
        if not vt.isIntegral:
            return self.unpacked_select(e, lvalue)
        w, s = self.ws(e)
        val = self.lvalue(v) if lvalue else self.expr(v)
        idx = self.expr(e.selector)
        if not lvalue and val["op"] == "const" and idx["op"] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        msb, lsb = dim_range(vt)
        return {"op": "index", "width": w, "signed": s, "value": val, "index": idx, "msb": msb, "lsb": lsb}

    def x_range(self, e, lvalue=False):
        v = e.value
        vt = v.type
        if not vt.isIntegral:
            return self.unpacked_select(e, lvalue)
        w, s = self.ws(e)
        msb, lsb = dim_range(vt)
        val = self.lvalue(v) if lvalue else self.expr(v)
        kind = e.selectionKind
        if kind == ast.RangeSelectionKind.Simple:
            left = self.d.const_int(e.left)
            right = self.d.const_int(e.right)
            if left is None or right is None:
                raise Unsupported("uses a part select with non-constant bounds")
            node = {"op": "range", "width": w, "signed": s, "value": val, "left": left, "right": right,
                    "msb": msb, "lsb": lsb}
        else:
            n = self.d.const_int(e.right)
            if n is None or n <= 0:
                raise Unsupported("uses an indexed part select with a non-constant width")
            base = self.expr(e.left)
            b = bits_int(base["bits"], base["signed"]) if base["op"] == "const" else None
            up = kind == ast.RangeSelectionKind.IndexedUp
            if b is not None:
                if up:
                    lo_i, hi_i = b, b + n - 1
                else:
                    lo_i, hi_i = b - n + 1, b
                if msb >= lsb:
                    left, right = hi_i, lo_i
                else:
                    left, right = lo_i, hi_i
                node = {"op": "range", "width": w, "signed": s, "value": val, "left": left, "right": right,
                        "msb": msb, "lsb": lsb}
            else:
                node = {"op": "indexed", "width": w, "signed": s, "value": val, "base": base,
                        "dir": "+" if up else "-", "msb": msb, "lsb": lsb}
        if not lvalue and val["op"] == "const" and node["op"] == "range":
            c = self.fold(e)
            if c is not None:
                return c
        return node

    def x_member(self, e, lvalue=False):
        v = e.value
        vt = v.type.canonicalType
        if vt.kind not in (SK.PackedStructType, SK.PackedUnionType):
            if not lvalue:
                c = self.fold(e)
                if c is not None:
                    return c
            raise Unsupported("accesses a member of '%s', which is not a packed struct or union" % _text(v))
        w, s = self.ws(e)
        val = self.lvalue(v) if lvalue else self.expr(v)
        off = e.member.bitOffset
        if not lvalue and val["op"] == "const":
            c = self.fold(e)
            if c is not None:
                return c
        return {"op": "range", "width": w, "signed": s, "value": val, "left": off + w - 1, "right": off,
                "msb": vt.bitWidth - 1, "lsb": 0}

    def x_convert(self, e):
        t = e.type
        op = e.operand
        if not t.isIntegral or not op.type.isIntegral:
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported("converts between '%s' and '%s'" % (op.type, t))
        a = self.expr(op)
        w, s = t.bitWidth, t.isSigned
        # IEEE 1800-2017 11.8.2: an operand reached by type propagation is extended
        # according to the propagated type, so a signed operand of an unsigned
        # expression is zero-extended. slang marks those conversions Propagated.
        ext_signed = s if e.conversionKind == ast.ConversionKind.Propagated else a["signed"]
        if a["op"] == "const":
            return const_node(convert_bits(a["bits"], ext_signed, w, t.isFourState), s)
        if a["width"] == w and a["signed"] == s:
            return a
        if ext_signed != a["signed"] and w > a["width"]:
            a = {"op": "convert", "width": a["width"], "signed": ext_signed, "operand": a}
        return {"op": "convert", "width": w, "signed": s, "operand": a}

    def x_call(self, e):
        if e.isSystemCall:
            name = e.subroutineName
            if name in ("$signed", "$unsigned"):
                args = e.arguments
                w, s = self.ws(e)
                a = self.expr(args[0])
                if a["op"] == "const":
                    return const_node(convert_bits(a["bits"], a["signed"], w, True), s)
                if a["width"] == w and a["signed"] == s:
                    return a
                return {"op": "convert", "width": w, "signed": s, "operand": a}
            c = self.fold(e)
            if c is not None:
                return c
            raise Unsupported("calls the system function %s" % name)
        c = self.fold(e)
        if c is not None:
            return c
        raise Unsupported("calls the function '%s'" % e.subroutineName)

    # -- lvalues -------------------------------------------------------------------

    def lvalue(self, e):
        k = e.kind
        if k == EK.NamedValue:
            sym = e.symbol
            name = self.d.sig.get(sym)
            if name is not None:
                return self.signal_ref(e, sym, name, True)
            lname = self.locals.get(sym)
            if lname is not None:
                w, s = self.ws(e)
                return {"op": "ref", "width": w, "signed": s, "name": lname}
            raise Unsupported("assigns '%s', which is not a signal of this module" % sym.name)
        if k == EK.ElementSelect:
            return self.x_element(e, True)
        if k == EK.RangeSelect:
            return self.x_range(e, True)
        if k == EK.MemberAccess:
            return self.x_member(e, True)
        if k == EK.Concatenation:
            w, s = self.ws(e)
            parts = [self.lvalue(o) for o in e.operands if o.type.bitWidth != 0]
            return {"op": "concat", "width": w, "signed": s, "parts": parts}
        if k == EK.HierarchicalValue:
            raise Unsupported("assigns the hierarchical reference '%s'" % _text(e))
        raise Unsupported("assigns a target of kind %s" % k.name)

    def target(self, e):
        return flatten_lvalue(self.lvalue(e))

    # -- statements ----------------------------------------------------------------

    def stmt(self, s):
        k = s.kind
        if k == STK.Block:
            if s.blockKind != ast.StatementBlockKind.Sequential:
                raise Unsupported("contains a fork-join block")
            return self.block(s.body)
        if k == STK.List:
            return self.block(s)
        if k == STK.Empty:
            return {"stmt": "empty"}
        if k == STK.ExpressionStatement:
            return self.expr_stmt(s.expr, s)
        if k == STK.VariableDeclaration:
            sym = s.symbol
            syn = sym.syntax
            if syn is not None and syn.parent is not None \
                    and syn.parent.kind == pyslang.syntax.SyntaxKind.ForVariableDeclaration:
                return None    # declared by the for loop that follows; it initializes it
            name = self.add_local(sym)
            init = sym.initializer
            if init is None:
                return None
            if sym.lifetime != ast.VariableLifetime.Automatic:
                raise Unsupported("initializes the static variable '%s' (it would be set only once)" % sym.name)
            w, sg = self.ws(init)
            lhs = {"op": "ref", "width": sym.type.bitWidth, "signed": sym.type.isSigned, "name": name}
            return {"stmt": "assign", "lhs": lhs, "rhs": self.expr(init), "src": self.d.node_src(s)}
        if k == STK.Conditional:
            conds = s.conditions
            if len(conds) != 1 or conds[0].pattern is not None:
                raise Unsupported("contains an if with pattern matching")
            cond = self.expr(conds[0].expr)
            then = self.stmt_or_empty(s.ifTrue)
            els = self.stmt_or_empty(s.ifFalse) if s.ifFalse is not None else None
            return {"stmt": "if", "cond": cond, "then": then, "else": els, "check": _CHECK[s.check],
                    "src": self.d.node_src(s)}
        if k == STK.Case:
            sel = self.expr(s.expr)
            items = []
            for g in s.items:
                exprs = []
                for x in g.expressions:
                    if x.kind == EK.ValueRange:
                        raise Unsupported("contains a case inside with a value range")
                    exprs.append(self.expr(x))
                items.append({"exprs": exprs, "body": self.stmt_or_empty(g.stmt)})
            dflt = self.stmt_or_empty(s.defaultCase) if s.defaultCase is not None else None
            return {"stmt": "case", "kind": _CASE_KIND[s.condition], "check": _CHECK[s.check],
                    "expr": sel, "items": items, "default": dflt, "src": self.d.node_src(s)}
        if k == STK.ForLoop:
            return self.for_loop(s)
        if k == STK.Invalid:
            raise Unsupported("contains a statement slang could not bind")
        raise Unsupported("contains %s" % _STMT_REASON.get(k, "a %s statement" % k.name))

    def stmt_or_empty(self, s):
        r = self.stmt(s)
        return r if r is not None else {"stmt": "empty"}

    def block(self, s):
        items = []
        lst = s.list if s.kind == STK.List else [s]
        for x in lst:
            r = self.stmt(x)
            if r is not None:
                items.append(r)
        return {"stmt": "block", "items": items}

    def expr_stmt(self, x, s):
        k = x.kind
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
            return {"stmt": "assign", "lhs": lhs, "rhs": rhs, "src": self.d.node_src(s or x)}
        if k == EK.UnaryOp and x.op in _INCDEC:
            lhs = self.target(x.operand)
            cur = self.expr(x.operand)
            w, sg = cur["width"], cur["signed"]
            one = const_node("0" * (w - 1) + "1", sg)
            rhs = {"op": "binary", "width": w, "signed": sg, "operator": _INCDEC[x.op], "lhs": cur, "rhs": one}
            return {"stmt": "assign", "lhs": lhs, "rhs": rhs, "src": self.d.node_src(s or x)}
        if k == EK.Call:
            raise Unsupported("calls %s" % (x.subroutineName if x.isSystemCall else "'%s'" % x.subroutineName))
        raise Unsupported("contains an expression statement")

    def for_loop(self, s):
        pushed = []
        init = []
        try:
            for v in s.loopVars:
                name = self.add_local(v)
                if v.initializer is None:
                    raise Unsupported("has a for loop variable without an initial value")
                init.append({"name": name, "value": self.expr(v.initializer)})
            for x in s.initializers:
                if x.kind != EK.Assignment or x.left.kind != EK.NamedValue or x.isCompound:
                    raise Unsupported("has a for loop whose initialization is not 'variable = value'")
                sym = x.left.symbol
                name = self.locals.get(sym)
                if name is None:
                    name = self.d.sig.get(sym)
                    if name is None or name not in self.d.loop_candidates:
                        raise Unsupported("has a for loop over '%s', which cannot be made local to the block"
                                          % x.left.symbol.name)
                    value = self.expr(x.right)
                    if sym not in self.loop_syms:
                        self.loop_syms[sym] = 0
                        pushed.append(sym)
                    if name not in self.localized:
                        self.localized.add(name)
                        w, sg, msb, lsb, vector, _ = type_shape(sym.type)
                        self.local_list.append({"name": name, "kind": "variable", "width": w, "signed": sg,
                                                "msb": msb, "lsb": lsb, "port": False, "vector": vector,
                                                "src": self.d.symbol_src(sym), "decl": None})
                else:
                    value = self.expr(x.right)
                init.append({"name": name, "value": value})
            if s.stopExpr is None:
                raise Unsupported("has a for loop without a condition")
            cond = self.expr(s.stopExpr)
            step = [self.expr_stmt(x, None) for x in s.steps]
            body = self.stmt_or_empty(s.body)
        finally:
            for sym in pushed:
                del self.loop_syms[sym]
        return {"stmt": "for", "init": init, "cond": cond, "step": step, "body": body,
                "src": self.d.node_src(s)}


def flatten_lvalue(n):
    """Nested constant selects on a target become one bit range of the signal."""
    op = n["op"]
    if op == "concat":
        n["parts"] = [flatten_lvalue(p) for p in n["parts"]]
        return n
    if op not in ("index", "range") or n["value"]["op"] == "ref":
        return n
    span = _const_span(n)
    if span is None:
        return n
    ref, lo, hi = span
    return {"op": "range", "width": n["width"], "signed": n["signed"], "value": ref,
            "left": hi, "right": lo, "msb": ref["width"] - 1, "lsb": 0}


def _const_span(n):
    op = n["op"]
    if op == "ref":
        return n, 0, n["width"] - 1
    if op not in ("index", "range"):
        return None
    inner = _const_span(n["value"])
    if inner is None:
        return None
    ref, plo, phi = inner
    w = n["width"]
    msb, lsb = n["msb"], n["lsb"]
    if op == "index":
        if n["index"]["op"] != "const":
            return None
        k = bits_int(n["index"]["bits"], n["index"]["signed"])
        if k is None:
            return None
        off = dim_offset(k, msb, lsb)
        lo = plo + off * w
    else:
        a, b = dim_offset(n["left"], msb, lsb), dim_offset(n["right"], msb, lsb)
        count = abs(a - b) + 1
        ew = w // count if count else 1
        lo = plo + min(a, b) * ew
    hi = lo + w - 1
    if lo < plo or hi > phi:
        return None
    return ref, lo, hi


def _all_const(n):
    if n.get("op") == "const":
        return True
    for k in ("lhs", "rhs"):
        if k in n and not _all_const(n[k]):
            return False
    return "lhs" in n


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
        EK.SimpleAssignmentPattern: "uses an assignment pattern that is not constant",
        EK.StructuredAssignmentPattern: "uses an assignment pattern that is not constant",
        EK.ReplicatedAssignmentPattern: "uses an assignment pattern that is not constant",
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
    EK.ElementSelect: Conv.x_element,
    EK.RangeSelect: Conv.x_range,
    EK.MemberAccess: Conv.x_member,
    EK.Conversion: Conv.x_convert,
    EK.Call: Conv.x_call,
}


# ---------------------------------------------------------------------------
# the module

class Describer:
    def __init__(self, comp, top):
        self.comp = comp
        self.top = top
        self.body = top.body
        self.sm = comp.sourceManager
        self.src = Sources(self.sm)
        self.sig = {}            # signal symbol -> name
        self.sig_by_name = {}
        self.loop_candidates = set()   # module variables a comb block may use as a loop local
        self._sub_refs = {}
        self._decl_counts = {}

    # -- sources -------------------------------------------------------------------

    def node_src(self, node):
        if node is None:
            return None
        return self.src.range_src(node.sourceRange)[0]

    def symbol_src(self, sym):
        syn = sym.syntax
        if syn is not None and syn.kind == pyslang.syntax.SyntaxKind.Declarator:
            return self.src.range_src(syn.name.range)[0]
        loc = sym.location
        if not self.sm.isFileLoc(loc):
            return self.src.range_src(pyslang.SourceRange(loc, loc))[0]
        return self.src.loc_src(loc, pyslang.SourceLocation(loc.buffer, loc.offset + len(sym.name)))

    def member_syntax(self, sym):
        n = sym.syntax
        if n is None:
            return None
        while n.parent is not None and n.parent.kind not in _MODULE_SYNTAX:
            n = n.parent
        return n

    def member_src(self, syn):
        """(SRC, why-not-rewritable or None) of a member's statement."""
        src, clean = self.src.range_src(syn.sourceRange)
        if not clean:
            return src, "it is written through a macro"
        attrs = getattr(syn, "attributes", None)
        if attrs is not None and len(attrs) > 0:
            return src, "it carries an attribute (* ... *)"
        # Directives inside a member are found from slang's trivia (kerf_preproc.py).
        return src, None

    # -- constants -----------------------------------------------------------------

    def try_const(self, e):
        t = e.type
        if not t.isIntegral:
            return None
        try:
            cv = e.eval(ast.EvalContext(self.body))
        except Exception:
            return None
        v = cv.value
        if isinstance(v, pyslang.SVInt):
            return const_node(sv_bits(v, t.bitWidth), t.isSigned)
        return None

    def const_int(self, e):
        try:
            cv = e.eval(ast.EvalContext(self.body))
        except Exception:
            return None
        v = cv.value
        if isinstance(v, pyslang.SVInt):
            if v.hasUnknown:
                return None
            return int(v.toString(_DEC, False))
        return None

    # -- signals -------------------------------------------------------------------

    def decl_of(self, sym):
        syn = sym.syntax
        if syn is None or syn.kind != pyslang.syntax.SyntaxKind.Declarator:
            return None
        stmt = syn.parent
        if stmt is None or stmt.kind not in _DECL_SYNTAX:
            return None
        dsrc, clean = self.src.range_src(syn.sourceRange)
        ssrc, sclean = self.src.range_src(stmt.sourceRange)
        if not clean or not sclean or dsrc["file"] != ssrc["file"]:
            return None
        key = (ssrc["file"], ssrc["start"])
        count = self._decl_counts.get(key)
        if count is None:
            # a separated list: declarators with commas between them
            count = (len(stmt.declarators) + 1) // 2
            self._decl_counts[key] = count
        return {"file": dsrc["file"], "start": dsrc["start"], "end": dsrc["end"],
                "stmt_start": ssrc["start"], "stmt_end": ssrc["end"], "count": count}

    def signal_entry(self, sym, is_port):
        w, s, msb, lsb, vector, packed = type_shape(sym.type)
        e = {"name": sym.name, "kind": "variable" if sym.kind == SK.Variable else "net",
             "width": w, "signed": s, "msb": msb, "lsb": lsb, "port": is_port, "vector": vector,
             "src": self.symbol_src(sym), "decl": self.decl_of(sym)}
        if not packed:
            e["packed"] = False
        return e

    def port_entry(self, p):
        internal = p.internalSymbol
        if internal is not None and internal.kind in (SK.Net, SK.Variable):
            t = internal.type
        else:
            t = p.type
        w, s, msb, lsb, vector, packed = type_shape(t)
        syn = p.syntax
        if syn is not None and syn.kind == pyslang.syntax.SyntaxKind.Declarator:
            src = self.src.range_src(syn.name.range)[0]
        elif syn is not None:
            src = self.node_src(syn)
        else:
            src = self.symbol_src(p)
        e = {"name": p.name, "direction": _DIRECTION.get(p.direction, "inout"), "width": w, "signed": s,
             "msb": msb, "lsb": lsb,
             "kind": "variable" if internal is not None and internal.kind == SK.Variable else "net",
             "src": src}
        if not packed:
            e["packed"] = False
        return e

    # -- reads and writes of kept code ------------------------------------------

    def collect(self, node, reads, writes):
        """Module signals `node` (symbol, statement or expression) reads and writes."""
        refs = Counter()
        pure = Counter()
        sig = self.sig

        def bases(x, out):
            k = x.kind
            if k in (EK.NamedValue, EK.HierarchicalValue):
                n = sig.get(x.symbol)
                if n is not None:
                    out.append(n)
            elif k in (EK.ElementSelect, EK.RangeSelect, EK.MemberAccess):
                bases(x.value, out)
            elif k in (EK.Concatenation, EK.SimpleAssignmentPattern):
                for o in x.operands if k == EK.Concatenation else x.elements:
                    bases(o, out)
            elif k == EK.Streaming:
                for st in x.streams:
                    bases(st.operand, out)
            elif k == EK.Conversion:
                bases(x.operand, out)

        def cb(n):
            if isinstance(n, ast.ValueExpressionBase):
                name = sig.get(n.symbol)
                if name is not None:
                    refs[name] += 1
            elif isinstance(n, ast.AssignmentExpression):
                out = []
                bases(n.left, out)
                for b in out:
                    writes.add(b)
                    if not n.isCompound:
                        pure[b] += 1
            elif isinstance(n, ast.UnaryExpression):
                if n.op in _INCDEC:
                    out = []
                    bases(n.operand, out)
                    writes.update(out)
            elif isinstance(n, ast.CallExpression):
                if not n.isSystemCall:
                    sub = n.subroutine
                    if isinstance(sub, ast.SubroutineSymbol):
                        r, w = self.subroutine_refs(sub)
                        reads.update(r)
                        writes.update(w)
            elif isinstance(n, ast.InstanceSymbol):
                self.instance_refs(n, reads, writes)
                return ast.VisitAction.Skip
            elif isinstance(n, (ast.SubroutineSymbol,)):
                return ast.VisitAction.Skip
            return None

        node.visit(cb)
        for name, c in refs.items():
            if c > pure[name]:
                reads.add(name)

    def subroutine_refs(self, sub):
        key = sub
        got = self._sub_refs.get(key)
        if got is not None:
            return got
        r, w = set(), set()
        self._sub_refs[key] = (r, w)     # recursion guard
        body = getattr(sub, "body", None)
        if body is not None:
            self.collect(body, r, w)
        return r, w

    def instance_refs(self, inst, reads, writes):
        for pc in inst.portConnections:
            port = pc.port
            e = pc.expression
            if e is None or not isinstance(port, (ast.PortSymbol, ast.MultiPortSymbol)):
                continue
            d = port.direction
            if d in (ast.ArgumentDirection.InOut, ast.ArgumentDirection.Ref):
                r, w = set(), set()
                self.collect(e, r, w)
                reads.update(r | w)
                writes.update(r | w)
            else:
                self.collect(e, reads, writes)

    def kept_member(self, what, reason, src, collect_from, extra_writes=()):
        reads, writes = set(), set()
        for node in collect_from:
            if node is not None:
                self.collect(node, reads, writes)
        writes.update(extra_writes)
        return {"kind": "kept", "src": src, "what": what, "reason": reason,
                "reads": sorted(reads), "writes": sorted(writes)}

    # -- members -------------------------------------------------------------------

    def assign_member(self, sym):
        syn = self.member_syntax(sym)
        src, why = self.member_src(syn)
        if why is None:
            if sym.delay is not None:
                why = "it has a delay"
            elif any(x is not None for x in sym.driveStrength):
                why = "it has a drive strength"
        a = sym.assignment
        if why is None:
            try:
                c = Conv(self)
                lhs = c.target(a.left)
                rhs = c.expr(a.right)
                return {"kind": "assign", "src": src, "lhs": lhs, "rhs": rhs,
                        "reads": sorted(c.reads), "writes": sorted(c.writes)}
            except Unsupported as u:
                why = "it " + str(u)
            except Exception as x:   # a construct this reader does not know: keep it
                why = "it uses a construct the reader does not handle (%s: %s)" % (type(x).__name__, x)
        return self.kept_member("assign", why, src, [sym])

    def net_decl_member(self, net):
        syn = net.syntax
        init = net.initializer
        src, clean = self.src.range_src(pyslang.SourceRange(syn.name.range.end, syn.sourceRange.end))
        why = None
        if not clean:
            why = "it is written through a macro"
        elif net.delay is not None:
            why = "it has a delay"
        else:
            stmt = syn.parent
            attrs = getattr(stmt, "attributes", None) if stmt is not None else None
            if attrs is not None and len(attrs) > 0:
                why = "it carries an attribute (* ... *)"
        name = self.sig.get(net)
        if why is None:
            try:
                c = Conv(self)
                w, s, _, _, _, packed = type_shape(net.type)
                if not packed:
                    raise Unsupported("initializes '%s', which is not a packed vector" % net.name)
                c.writes.add(name)
                lhs = {"op": "ref", "width": w, "signed": s, "name": name}
                rhs = c.expr(init)
                m = {"kind": "assign", "src": src, "net_decl": True, "lhs": lhs, "rhs": rhs,
                     "reads": sorted(c.reads), "writes": sorted(c.writes)}
                return m
            except Unsupported as u:
                why = "it " + str(u)
            except Exception as x:   # a construct this reader does not know: keep it
                why = "it uses a construct the reader does not handle (%s: %s)" % (type(x).__name__, x)
        m = self.kept_member("assign", why, src, [init], extra_writes=[name])
        m["net_decl"] = True
        return m

    def procedural_member(self, sym):
        syn = self.member_syntax(sym)
        src, why = self.member_src(syn)
        k = sym.procedureKind
        PK = ast.ProceduralBlockKind
        body = sym.body
        style = None
        if k == PK.AlwaysComb:
            style, what, stmt = "always_comb", "always_comb", body
        elif k == PK.Always:
            what = "always"
            if body.kind == STK.Timed and body.timing.kind == ast.TimingControlKind.ImplicitEvent:
                style, stmt = "always_star", body.stmt
            elif body.kind == STK.ConcurrentAssertion:
                what = "assertion"
                why = "it is an assertion"
            else:
                why = "it is an always block with an event or timing control (sequential logic)"
        elif k == PK.AlwaysFF:
            what, why = "always_ff", "it is sequential logic (always_ff)"
        elif k == PK.AlwaysLatch:
            what, why = "always_latch", "it is a latch (always_latch)"
        elif k == PK.Initial:
            what, why = "initial", "it is an initial block"
        else:
            what, why = "final", "it is a final block"
        if style is not None and why is None:
            try:
                c = Conv(self)
                b = c.stmt_or_empty(stmt)
                if b.get("stmt") != "block":
                    b = {"stmt": "block", "items": [b]}
                bad = c.localized & c.outside
                if bad:
                    raise Unsupported("uses '%s' both as a for loop variable and outside the loop"
                                      % sorted(bad)[0])
                m = {"kind": "comb", "src": src, "style": style, "locals": c.local_list, "body": b,
                     "reads": sorted(c.reads), "writes": sorted(c.writes)}
                if c.localized:
                    m["_localized"] = c.localized
                    m["_symbol"] = sym
                    m["_what"] = what
                return m
            except Unsupported as u:
                why = "it " + str(u)
            except Exception as x:   # a construct this reader does not know: keep it
                why = "it uses a construct the reader does not handle (%s: %s)" % (type(x).__name__, x)
        return self.kept_member(what, why, src, [sym])

    def other_member(self, sym):
        k = sym.kind
        syn = self.member_syntax(sym)
        if syn is not None:
            src, _ = self.member_src(syn)
        else:
            src = self.symbol_src(sym)
        if k in (SK.Instance, SK.InstanceArray, SK.CheckerInstance):
            what, why = "instance", "it is an instance"
        elif k == SK.PrimitiveInstance:
            what, why = "primitive", "it is a gate primitive instance"
        elif k in (SK.GenerateBlock, SK.GenerateBlockArray):
            what, why = "generate", "it is a generate construct"
        elif k == SK.NetAlias:
            what, why = "alias", "it is a net alias"
        elif k == SK.SpecifyBlock:
            what, why = "specify", "it is a specify block"
        elif k == SK.ElabSystemTask:
            what, why = "elaboration_task", "it is an elaboration system task"
        else:
            what, why = k.name.lower(), "it is a %s" % k.name
        reads, writes = set(), set()
        if k == SK.Instance:
            self.instance_refs(sym, reads, writes)
        else:
            self.collect(sym, reads, writes)
        if k == SK.NetAlias:
            reads |= writes | reads
            writes |= reads
        return {"kind": "kept", "src": src, "what": what, "reason": why,
                "reads": sorted(reads), "writes": sorted(writes)}

    # -- the whole module -------------------------------------------------------

    def run(self):
        body = self.body
        port_internal = set()
        ports = []
        for p in body.portList:
            if p.kind in (SK.Port, SK.MultiPort):
                ports.append(self.port_entry(p))
                if p.kind == SK.Port and p.internalSymbol is not None:
                    port_internal.add(p.internalSymbol)
        signal_syms = []
        members_syms = []
        for sym in body:
            k = sym.kind
            if k in (SK.Net, SK.Variable):
                if k == SK.Variable and (int(sym.flags) & int(ast.VariableFlags.CompilerGenerated)):
                    continue
                signal_syms.append(sym)
                self.sig[sym] = sym.name
                self.sig_by_name[sym.name] = sym
                if k == SK.Variable and sym not in port_internal and type_shape(sym.type)[5]:
                    self.loop_candidates.add(sym.name)
            members_syms.append(sym)
        signals = [self.signal_entry(s, s in port_internal) for s in signal_syms]

        members = []
        for sym in members_syms:
            first = len(members)    # kerf_variants needs each member's symbol
            k = sym.kind
            if k == SK.ContinuousAssign:
                members.append(self.assign_member(sym))
            elif k == SK.Net:
                if sym.initializer is not None and sym.syntax is not None \
                        and sym.syntax.kind == pyslang.syntax.SyntaxKind.Declarator:
                    members.append(self.net_decl_member(sym))
            elif k == SK.ProceduralBlock:
                members.append(self.procedural_member(sym))
            elif k in _DECLARATIVE:
                continue
            else:
                members.append(self.other_member(sym))
            for m in members[first:]:
                m["_sym"] = sym

        # Parameters an instance may override and the preprocessor (kerf_variants.py).
        members = kerf_variants.restrict(self, members)
        self.finish_loop_locals(members)
        members = self.merge_statements(members)
        for i, m in enumerate(members):
            m["id"] = i

        msyn = self.top.definition.syntax
        msrc = self.node_src(msyn) if msyn is not None else self.symbol_src(self.top)
        desc = {"format": FORMAT, "version": VERSION,
                "module": {"name": self.top.name, "src": msrc},
                "ports": ports, "signals": signals, "members": members}
        kerf_variants.finish(self, members, desc)    # match keys, the parameters list
        return desc

    def finish_loop_locals(self, members):
        """A module variable used as a comb block's loop variable stays local to that
        block only if no other member touches it."""
        users = Counter()
        for m in members:
            for n in set(m["reads"]) | set(m["writes"]):
                users[n] += 1
        for i, m in enumerate(members):
            loc = m.pop("_localized", None)
            sym = m.pop("_symbol", None)
            what = m.pop("_what", None)
            if not loc:
                continue
            shared = sorted(n for n in loc if users[n] > 0)
            if shared:
                members[i] = self.kept_member(
                    what, "it uses '%s' as a for loop variable, and other code in the module uses it too"
                    % shared[0], m["src"], [sym])

    @staticmethod
    def merge_statements(members):
        """One statement with several assignments: all kept when one is kept. Generate
        branches of one construct become one kept member."""
        by_src = {}
        for m in members:
            s = m["src"]
            key = (s["file"], s["start"], s["end"])
            by_src.setdefault(key, []).append(m)
        out = []
        seen = set()
        for m in members:
            s = m["src"]
            key = (s["file"], s["start"], s["end"])
            group = by_src[key]
            if len(group) == 1:
                out.append(m)
                continue
            if m.get("what") == "generate":
                if key in seen:
                    continue
                seen.add(key)
                reads, writes = set(), set()
                for g in group:
                    reads.update(g["reads"])
                    writes.update(g["writes"])
                m = dict(m, reads=sorted(reads), writes=sorted(writes))
                out.append(m)
                continue
            kept = [g for g in group if g["kind"] == "kept"]
            if kept and m["kind"] != "kept":
                m = {"kind": "kept", "src": m["src"], "what": "assign",
                     "reason": "it shares its statement with an assignment that is kept (%s)"
                     % kept[0]["reason"], "reads": m["reads"], "writes": m["writes"]}
            out.append(m)
        return out


# realpath -> the path as given on the command line (set by kerf_read.py)
GIVEN_FILES = {}


def describe(comp, top):
    return Describer(comp, top).run()
