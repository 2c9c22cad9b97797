"""From slang's elaborated AST of one module to kerf's module description.

The output shape is specified in docs/reader-format.md (`kerf-module`,
version 3); keep the two in step. Entry point: `describe(compilation, top)`.

Members that use anything outside the subset kerf restructures become
`kept` members: conversion raises `Unsupported(reason)` (kerf_convert.py)
and the member's reads and writes are then collected from the whole AST,
writes as bit ranges where slang knows them statically. Any other exception
is a bug of the reader and is not caught here.
"""

import bisect
import operator
import os
import re
from collections import Counter

import pyslang
from pyslang import ast

from kerf_convert import LINKS_KEY, Conv, Tables, Unsupported, dim_offset
from kerf_types import Types, sv_bits
import kerf_variants

FORMAT = "kerf-module"
VERSION = 4

SK = ast.SymbolKind
EK = ast.ExpressionKind
STK = ast.StatementKind
TK = pyslang.parsing.TriviaKind
_DEC = pyslang.LiteralBase.Decimal

_DIRECTION = {
    ast.ArgumentDirection.In: "input",
    ast.ArgumentDirection.Out: "output",
    ast.ArgumentDirection.InOut: "inout",
    ast.ArgumentDirection.Ref: "inout",
}
_INCDEC = {
    ast.UnaryOperator.Preincrement, ast.UnaryOperator.Postincrement,
    ast.UnaryOperator.Predecrement, ast.UnaryOperator.Postdecrement,
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
_COMMENTS = (TK.LineComment, TK.BlockComment)
_SYMBOL = operator.attrgetter("symbol")


_WIRED_NETS = (ast.NetType.NetKind.WAnd, ast.NetType.NetKind.WOr, ast.NetType.NetKind.TriAnd,
               ast.NetType.NetKind.TriOr)


def _has_drive_strength(sym):
    """A continuous assignment written with a drive strength (`assign (strong0, weak1) z = ...`)."""
    try:
        return any(x is not None for x in sym.driveStrength)
    except TypeError:
        # pyslang 7 cannot convert a set DriveStrength value to Python (F119): there is one.
        return True
# Comments that synthesis, lint and coverage tools read as directives (common trade practice):
# `// synopsys translate_off`, `/* synthesis parallel_case */`, `// verilator lint_off WIDTH`,
# `// coverage off`. A statement holding one is kept as written: the code it brackets or marks
# may mean something else to those tools than to a simulator, which is all kerf models.
_DIRECTIVE_COMMENT = re.compile(
    rb"(?://|/\*)[ \t*]*(?:synopsys|synthesis|pragma|translate_off|translate_on|verilator|cadence|"
    rb"ambit|spyglass|xilinx|altera|lint_off|lint_on|rtl_synthesis|coverage[ \t]+o(?:n|ff))\b", re.I)


def _skip_unelaborated(n):
    """The visit action the module-level visitors share for a node none of their own cases
    took: skip a subroutine's body (its effects are followed through the calls that reach it)
    and a generate branch that is not instantiated (it reads and drives nothing)."""
    if isinstance(n, ast.SubroutineSymbol):
        return ast.VisitAction.Skip
    if isinstance(n, ast.GenerateBlockSymbol) and n.isUninstantiated:
        return ast.VisitAction.Skip
    return None


# ---------------------------------------------------------------------------
# sources


def _newline_starts(data):
    """Offsets where the lines of `data` start, counting `\\n` only."""
    starts = [0]
    find = data.find
    p = find(b"\n")
    while p >= 0:
        starts.append(p + 1)
        p = find(b"\n", p + 1)
    return starts


class Sources:
    def __init__(self, sm):
        self.sm = sm
        self._names = {}
        self._bytes = {}
        self._file = {}
        self._buffer_of = {}   # file name (as described) -> slang buffer
        self.lines = {}      # file name -> line start offsets (for the `files` table)
        self._starts = {}    # buffer id -> line start offsets, or None where slang must count

    def name(self, buf):
        key = buf.id
        n = self._names.get(key)
        if n is None:
            n = self.sm.getRawFileName(buf)
            # Report a file as the user named it (slang shortens paths relative
            # to the working directory); the writer and the proof key on it.
            n = GIVEN_FILES.get(os.path.realpath(n), n)
            self._names[key] = n
            self._buffer_of.setdefault(n, buf)
        return n

    def bytes_of(self, name):
        """The bytes of the file the description names `name` (one of its members' files)."""
        buf = self._buffer_of.get(name)
        return self.data(buf) if buf is not None else None

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

    def note_file(self, buf):
        """Record the line starts of a file whose offsets the description uses."""
        n = self.name(buf)
        if n not in self.lines:
            starts = self.line_starts(buf)    # the same list where slang counts lines alike
            if starts is None:
                starts = _newline_starts(self.data(buf))
            self.lines[n] = starts
        return n

    def line_starts(self, buf):
        """Line start offsets of a file's bytes, or None when slang's line count could differ
        from a count of `\\n` (a `\\r` alone ends a line for slang)."""
        key = buf.id
        if key in self._starts:
            return self._starts[key]
        data = self.data(buf)
        starts = _newline_starts(data) if data.count(b"\r") == data.count(b"\r\n") else None
        self._starts[key] = starts
        return starts

    def loc_src(self, start, end):
        # Line and column (1-based, bytes) from the file's line starts: the same figures as
        # slang's getLineNumber/getColumnNumber at a fraction of the cost of two calls into
        # slang per location (a generated design has hundreds of thousands of locations).
        buf = start.buffer
        off = start.offset
        starts = self.line_starts(buf)
        if starts is None:
            sm = self.sm
            return {"file": self.name(buf), "start": off, "end": end.offset,
                    "line": sm.getLineNumber(start), "col": sm.getColumnNumber(start)}
        line = bisect.bisect_right(starts, off)
        return {"file": self.name(buf), "start": off, "end": end.offset,
                "line": line, "col": off - starts[line - 1] + 1}

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


def _trivia_bytes(t):
    return len(t.getRawText().encode("utf-8", "surrogateescape"))


# ---------------------------------------------------------------------------
# the module

class Describer:
    def __init__(self, comp, top):
        self.comp = comp
        self.top = top
        self.body = top.body
        self.sm = comp.sourceManager
        self.src = Sources(self.sm)
        self.types = Types(self.body)
        self.tables = Tables(self.types)
        self.sig = {}            # signal symbol -> name
        self.sig_by_name = {}
        self.loop_candidates = set()   # module variables a comb block may use as a loop local
        self._sub_refs = {}
        self._decl_counts = {}
        self._next_token = {}    # start offset of a module member's syntax -> the token after it
        self._ctx = ast.EvalContext(self.body)
        self.constants = []      # named constants the logic compares against or names (below)
        self._const_ix = {}      # parameter symbol -> index in self.constants, or None
        self._compared = set()
        self._param_names = None # names of the module's and the packages' parameters
        self._is_param = {}      # symbol a NamedValue refers to -> whether it is a parameter

    # -- named constants -------------------------------------------------------------
    # A localparam or package constant the source compares a signal with (`cmd == CMD_RD`,
    # `addr[15:8] == BASE[15:8]`, a case item): the writer names it where it writes that
    # comparison, and lists the ones its rewrite no longer names (docs/reader-format.md).

    def constant_index(self, sym):
        """Index of a named constant the module can name (None for anything else)."""
        if sym.kind != SK.Parameter:
            return None
        if sym in self._const_ix:
            return self._const_ix[sym]
        idx = None
        t = sym.type
        local = sym.isLocalParam or "::" in sym.hierarchicalPath
        ref = self.types._qualified(sym.name, sym) if local else None
        v = sym.value
        sv = v.value if v is not None else None
        if ref is not None and t.isIntegral and isinstance(sv, pyslang.SVInt):
            w = t.bitWidth
            bits = sv_bits(sv, w)
            if "x" not in bits and "z" not in bits:
                ct = t.canonicalType
                msb, lsb, sliceable = w - 1, 0, False
                if ct.kind == SK.PackedArrayType and ct.elementType.canonicalType.kind == SK.ScalarType:
                    msb, lsb, sliceable = ct.range.left, ct.range.right, True
                elif ct.kind == SK.PredefinedIntegerType:
                    sliceable = True
                idx = len(self.constants)
                self.constants.append({"name": sym.name, "ref": ref, "bits": bits, "msb": msb, "lsb": lsb,
                                       "sliceable": sliceable, "elsewhere": False, "compared": []})
        elif ref is not None and isinstance(getattr(v, "value", None), list):
            # A constant table (kerf_convert.table_entry): named by its first entry, so that the
            # writer can read it where the rewrite no longer does (Verilator UNUSEDPARAM).
            ct = t.canonicalType
            first = v.value[0].value if v.value else None
            if ct.kind == SK.FixedSizeUnpackedArrayType and ct.elementType.isIntegral and \
                    isinstance(first, pyslang.SVInt):
                w = ct.elementType.bitWidth
                bits = sv_bits(first, w)
                if "x" not in bits and "z" not in bits:
                    idx = len(self.constants)
                    self.constants.append({"name": sym.name, "ref": "%s[%d]" % (ref, ct.range.left),
                                           "bits": bits, "msb": w - 1, "lsb": 0, "sliceable": False,
                                           "elsewhere": False, "compared": []})
        self._const_ix[sym] = idx
        return idx

    def note_compare(self, x, c):
        """`x` compared with `c` (both orders are tried): bits of a module signal against
        bits of a named constant, aligned at their least significant bits."""
        if READ_BACK is not None:
            return      # named constants are the writer's: a reading back describes none
        for a, b in ((x, c), (c, x)):
            s = self.static_bits(a)
            if s is None or s[1] is None:
                continue
            k = self.static_bits(b, self.constant_index)
            if k is None or k[1] is None:
                continue
            n = min(s[2] - s[1], k[2] - k[1]) + 1
            key = (s[0], s[1], s[1] + n - 1, k[0], k[1])
            if key not in self._compared:
                self._compared.add(key)
                self.constants[k[0]]["compared"].append([s[0], s[1], s[1] + n - 1, k[1]])

    def constants_named(self, sym):
        """Counter of the named-constant symbols `sym`'s text refers to."""
        out = Counter()
        is_param = self._is_param
        param = SK.Parameter
        # Only NamedValue expressions cross into Python (slang checks the kind natively),
        # into a list's append (no Python frame each); their symbols are counted in the order
        # they are met. Symbols are compared by identity (slang hands out one object per
        # symbol while it is alive; the tables keep it so): cheaper than the kind of each use.
        uses = []
        sym.visit(lookup_table={EK.NamedValue: uses.append})
        for s, n in Counter(map(_SYMBOL, uses)).items():
            p = is_param.get(s)
            if p is None:
                p = is_param[s] = s.kind is param
            if p:
                out[s] = n
        del uses
        # Names slang folds into a type (a cast's width `IW'(i)`) are no expressions: their tokens.
        syn = getattr(sym, "syntax", None)
        if self._param_names is None:
            names = {p.name for p in self.body if p.kind == SK.Parameter}
            for pkg in self.comp.getPackages():
                names.update(p.name for p in pkg if p.kind == SK.Parameter)
            self._param_names = names
        if syn is not None and self._param_names:
            def tok(n):
                if n.valueText in self._param_names:
                    f = self.body.lookupName(n.valueText)
                    if f is not None and f.kind == SK.Parameter and f not in out:
                        out[f] += 1
            syn.visit(lookup_table={pyslang.parsing.TokenKind.Identifier: tok})
        return out

    def finish_constants(self, members, named_by_src):
        """Each member's list of named constants; a constant named outside the members (a
        declaration, another constant) is marked `elsewhere`."""
        in_members = Counter()
        for key, c in named_by_src.items():
            in_members.update(c)
        def key(m):
            s = m.get("src")
            return (s["file"], s["start"], s["end"]) if s is not None else None
        for m in members:
            if m["kind"] == "kept":
                continue
            for sym in named_by_src.get(key(m), ()):
                self.constant_index(sym)
        # Uses of the module as a whole matter only for constants the members name: a
        # design without any (most generated logic) need not visit every expression again.
        total = self.constants_named(self.body) \
            if any(i is not None for i in self._const_ix.values()) else {}
        for sym, n in total.items():
            i = self._const_ix.get(sym)
            if i is not None and n > in_members[sym]:
                self.constants[i]["elsewhere"] = True
        for m in members:
            got = named_by_src.get(key(m), ())
            ix = sorted({self._const_ix[s] for s in got if self._const_ix.get(s) is not None})
            if ix:
                m["constants"] = ix

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
        data = self.src.data(syn.sourceRange.start.buffer)
        if _DIRECTIVE_COMMENT.search(data, syn.sourceRange.start.offset, syn.sourceRange.end.offset):
            # Confirmed on the comments slang lexed (not text inside a string).
            for a, b in self.comments(syn)["inside"]:
                if _DIRECTIVE_COMMENT.match(data, a, b):
                    text = data[a:b].decode("utf-8", "replace").strip()
                    return src, "it holds a comment tools read as a directive ('%s')" % (
                        text if len(text) <= 40 else text[:37] + "...")
        return src, None

    # -- comments ------------------------------------------------------------------

    def member_comments(self, syn):
        """A member's `comments`: only the writer carries them (into its new text), so a
        description of kerf's own rewrite for its proof (READ_BACK) has none."""
        if READ_BACK is not None:
            return _NO_COMMENTS
        return self.comments(syn)

    def comments(self, syn):
        """Byte ranges of the comments attached to a member: the comment lines directly
        above it, the comments inside it, a comment after it on its last line."""
        above, inside, trailing = [], [], []
        first = syn.getFirstToken()
        pos = first.location.offset - sum(_trivia_bytes(t) for t in first.trivia)
        # Split the first token's trivia into lines; line 0 ends the previous token's line.
        lines = [[]]
        for t in first.trivia:
            n = _trivia_bytes(t)
            lines[-1].append((t.kind, pos, pos + n))
            pos += n
            if t.kind == TK.EndOfLine:
                lines.append([])
        run = []
        for line in reversed(lines[1:-1]):
            items = [x for x in line if x[0] not in (TK.Whitespace, TK.EndOfLine)]
            if items and all(x[0] in _COMMENTS for x in items):
                run = items + run
            else:
                break
        above = [[s, e] for _, s, e in run]

        rng = syn.sourceRange
        # Every comment holds a '/': a member whose bytes have none has no comment inside
        # (walking the tokens of a large generated expression costs more than its parse).
        has_slash = b"/" in self.src.data(rng.start.buffer)[rng.start.offset:rng.end.offset]

        def visit(n):
            if isinstance(n, pyslang.parsing.Token):
                if n.trivia and n.location.offset != first.location.offset:
                    p = n.location.offset - sum(_trivia_bytes(t) for t in n.trivia)
                    for t in n.trivia:
                        k = _trivia_bytes(t)
                        if t.kind in _COMMENTS:
                            inside.append([p, p + k])
                        p += k
            return None
        if has_slash:
            syn.visit(visit)
        nxt = self._next_token.get(syn.sourceRange.start.offset)
        if nxt is not None:
            p = nxt.location.offset - sum(_trivia_bytes(t) for t in nxt.trivia)
            for t in nxt.trivia:
                k = _trivia_bytes(t)
                if t.kind == TK.EndOfLine:
                    break
                if t.kind in _COMMENTS:
                    trailing.append([p, p + k])
                p += k
        return {"above": above, "inside": inside, "trailing": trailing}

    def index_module_tokens(self):
        """The token that follows each module-level member (for trailing comments)."""
        msyn = self.top.definition.syntax
        if msyn is None:
            return
        members = list(getattr(msyn, "members", None) or [])
        for i, m in enumerate(members):
            nxt = members[i + 1].getFirstToken() if i + 1 < len(members) else msyn.endmodule
            self._next_token[m.sourceRange.start.offset] = nxt

    # -- constants -----------------------------------------------------------------

    def try_const(self, e):
        """slang's constant value of `e` as an SVInt, or None."""
        try:
            cv = e.eval(ast.EvalContext(self.body))
        except Exception:    # slang raises when `e` is not a constant expression
            return None
        v = cv.value
        return v if isinstance(v, pyslang.SVInt) else None

    def const_int(self, e):
        v = self.try_const(e)
        if v is None or v.hasUnknown:
            return None
        return int(v.toString(_DEC, False))

    def case_attributes(self, s):
        """Synthesis attributes written on a case statement (`(* full_case *)`, ...)."""
        syn = s.syntax
        names = []
        attrs = getattr(syn, "attributes", None) if syn is not None else None
        for a in attrs or []:
            for spec in getattr(a, "specs", None) or []:
                n = getattr(spec, "name", None)
                if n is not None:
                    names.append(n.valueText)
        return sorted(set(names))

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

    def attributes_of(self, sym):
        """Names of the attributes on a signal's declaration (`(* keep *)`); an attribute
        set to a constant 0 (`(* keep = 0 *)`) is left out."""
        names = set()
        for a in self.comp.getAttributes(sym):
            v = a.value.value
            if isinstance(v, pyslang.SVInt) and not v.hasUnknown and int(v.toString(_DEC, False)) == 0:
                continue
            names.add(a.name)
        return sorted(names)

    def shape(self, t):
        """(type index, width, signed, msb, lsb, vector, packed) of a declared type."""
        ti = self.types.of(t)
        e = self.types.entries[ti]
        w, s = e["width"], e["signed"]
        k = e["kind"]
        if k == "other":
            return ti, w, False, w - 1, 0, True, False
        if k == "vector":
            return ti, w, s, e["msb"], e["lsb"], True, True
        if k == "logic":
            return ti, 1, s, 0, 0, False, True
        if k == "enum" and self.types.entries[e["base"]]["kind"] == "logic":
            return ti, 1, s, 0, 0, False, True
        if k == "enum" and self.types.entries[e["base"]]["kind"] == "vector":
            b = self.types.entries[e["base"]]
            return ti, w, s, b["msb"], b["lsb"], True, True
        return ti, w, s, w - 1, 0, True, True

    def signal_entry(self, sym, is_port):
        ti, w, s, msb, lsb, vector, packed = self.shape(sym.type)
        e = {"name": sym.name, "id": self.tables.symbols[sym.name], "kind":
             "variable" if sym.kind == SK.Variable else "net", "type": ti,
             "width": w, "signed": s, "msb": msb, "lsb": lsb, "port": is_port, "vector": vector,
             "src": self.symbol_src(sym), "decl": self.decl_of(sym)}
        attrs = self.attributes_of(sym)
        if attrs:
            e["attributes"] = attrs
        if not packed:
            e["packed"] = False
        return e

    def port_entry(self, p):
        internal = p.internalSymbol
        if internal is not None and internal.kind in (SK.Net, SK.Variable):
            t = internal.type
        else:
            t = p.type
        ti, w, s, msb, lsb, vector, packed = self.shape(t)
        syn = p.syntax
        if syn is not None and syn.kind == pyslang.syntax.SyntaxKind.Declarator:
            src = self.src.range_src(syn.name.range)[0]
        elif syn is not None:
            src = self.node_src(syn)
        else:
            src = self.symbol_src(p)
        e = {"name": p.name, "direction": _DIRECTION.get(p.direction, "inout"), "type": ti,
             "width": w, "signed": s, "msb": msb, "lsb": lsb,
             "kind": "variable" if internal is not None and internal.kind == SK.Variable else "net",
             "src": src}
        if not packed:
            e["packed"] = False
        return e

    # -- reads and writes of kept code ------------------------------------------

    def static_bits(self, x, base=None):
        """(name, lo, hi) of the bits a select chain names, offsets from the signal's LSB;
        (name, None, None) when they are not known statically; None for no module signal.
        `base` names the chain's root instead (a symbol -> key or None), e.g. for constants."""
        k = x.kind
        if k in (EK.NamedValue, EK.HierarchicalValue):
            n = self.sig.get(x.symbol) if base is None else base(x.symbol)
            if n is None:
                return None
            t = x.type
            if not t.isIntegral:
                return n, None, None
            return n, 0, t.bitWidth - 1
        if k == EK.Conversion:
            return self.static_bits(x.operand, base)
        if k not in (EK.ElementSelect, EK.RangeSelect, EK.MemberAccess):
            return None
        inner = self.static_bits(x.value, base)
        if inner is None or inner[1] is None:
            return inner
        name, plo, phi = inner
        vt = x.value.type
        t = x.type
        if not vt.isIntegral or not t.isIntegral:
            return name, None, None
        w = t.bitWidth
        if k == EK.MemberAccess:
            lo = plo + x.member.bitOffset
        else:
            ct = vt.canonicalType
            if ct.kind == SK.PackedArrayType:
                msb, lsb = ct.range.left, ct.range.right
            else:
                msb, lsb = ct.bitWidth - 1, 0
            if k == EK.ElementSelect:
                i = self.const_int(x.selector)
                if i is None:
                    return name, None, None
                lo = plo + dim_offset(i, msb, lsb) * w
            else:
                sk = x.selectionKind
                if sk == ast.RangeSelectionKind.Simple:
                    left, right = self.const_int(x.left), self.const_int(x.right)
                else:
                    b, n = self.const_int(x.left), self.const_int(x.right)
                    if b is None or n is None:
                        return name, None, None
                    lo_i, hi_i = (b, b + n - 1) if sk == ast.RangeSelectionKind.IndexedUp else (b - n + 1, b)
                    left, right = (hi_i, lo_i) if msb >= lsb else (lo_i, hi_i)
                if left is None or right is None:
                    return name, None, None
                a, c = dim_offset(left, msb, lsb), dim_offset(right, msb, lsb)
                count = abs(a - c) + 1
                lo = plo + min(a, c) * (w // count if count else 1)
        hi = lo + w - 1
        if lo < plo or hi > phi:
            return name, None, None
        return name, lo, hi

    def collect(self, node, reads, writes):
        """Module signals `node` (symbol, statement or expression) reads and writes.
        `writes` maps a name to a list of (lo, hi) bit ranges, or None for the whole signal."""
        refs = Counter()
        pure = Counter()
        sig = self.sig

        def written(x, compound):
            k = x.kind
            if k in (EK.Concatenation, EK.SimpleAssignmentPattern):
                for o in x.operands if k == EK.Concatenation else x.elements:
                    written(o, compound)
                return
            if k == EK.Streaming:
                for st in x.streams:
                    written(st.operand, compound)
                return
            b = self.static_bits(x)
            if b is None:
                return
            name, lo, hi = b
            if lo is None:
                writes[name] = None
            elif name not in writes:
                writes[name] = [(lo, hi)]
            elif writes[name] is not None:
                writes[name].append((lo, hi))
            if not compound:
                pure[name] += 1

        def cb(n):
            if isinstance(n, ast.ValueExpressionBase):
                name = sig.get(n.symbol)
                if name is not None:
                    refs[name] += 1
            elif isinstance(n, ast.AssignmentExpression):
                written(n.left, n.isCompound)
            elif isinstance(n, ast.UnaryExpression):
                if n.op in _INCDEC:
                    written(n.operand, True)
            elif isinstance(n, ast.CallExpression):
                if not n.isSystemCall:
                    sub = n.subroutine
                    if isinstance(sub, ast.SubroutineSymbol):
                        r, w = self.subroutine_refs(sub)
                        reads.update(r)
                        for name in w:
                            writes[name] = None
            elif isinstance(n, ast.InstanceSymbol):
                self.instance_refs(n, reads, writes)
                return ast.VisitAction.Skip
            return _skip_unelaborated(n)

        node.visit(cb)
        for name, c in refs.items():
            if c > pure[name]:
                reads.add(name)

    def read_bits(self, nodes):
        """Per module signal the text of `nodes` reads: a list of (lo, hi) bit ranges named by
        static selects, or None when it reads the whole signal or bits not known statically
        (a variable select, a call, an instance connection). Targets of plain assignments
        through static selects are not reads. The writer uses it so that bits only a rewritten
        statement read are still listed as unused where a kept member reads other bits."""
        out = {}
        sig = self.sig

        def add(name, lo, hi):
            if lo is None:
                out[name] = None
            elif name not in out:
                out[name] = [(lo, hi)]
            elif out[name] is not None:
                out[name].append((lo, hi))

        def static_target(x):
            if x.kind == EK.Concatenation:
                return all(static_target(o) for o in x.operands)
            b = self.static_bits(x)
            return b is not None and b[1] is not None

        def cb(n):
            if isinstance(n, ast.AssignmentExpression):
                if not n.isCompound and static_target(n.left):
                    n.right.visit(cb)
                    return ast.VisitAction.Skip
                return None
            if isinstance(n, ast.Expression) and n.kind == EK.Conversion:
                # A narrowing conversion of a whole signal (`w1 = in3`, 1-bit `w1`) reads only
                # the low bits it keeps; of a select (`w1 = in3[2:0]`) the selected bits.
                # Verilator's unused-signal check counts both so.
                # `$unsigned(st3)`, `$signed(x)` and conversions that keep the width pass the
                # bits through: the narrowing still keeps only the low bits (F137).
                t, ot = n.type, n.operand.type
                inner = n.operand
                while True:
                    if inner.kind == EK.Call and inner.isSystemCall and len(inner.arguments) == 1 and \
                            inner.subroutineName in ("$unsigned", "$signed"):
                        inner = inner.arguments[0]
                    elif inner.kind == EK.Conversion and inner.type.isIntegral and \
                            inner.operand.type.isIntegral and inner.type.bitWidth == inner.operand.type.bitWidth:
                        inner = inner.operand
                    else:
                        break
                if t.isIntegral and ot.isIntegral and t.bitWidth < ot.bitWidth and \
                        inner.kind in (EK.NamedValue, EK.HierarchicalValue) and \
                        inner.type.isIntegral and inner.type.bitWidth == ot.bitWidth:
                    b = self.static_bits(inner)
                    if b is not None and b[1] is not None:
                        add(b[0], b[1], min(b[2], b[1] + t.bitWidth - 1))
                        return ast.VisitAction.Skip
                return None
            if isinstance(n, ast.Expression) and n.kind in (EK.ElementSelect, EK.RangeSelect, EK.MemberAccess):
                b = self.static_bits(n)
                if b is not None and b[1] is not None:
                    add(*b)
                    return ast.VisitAction.Skip
                return None
            if isinstance(n, ast.ValueExpressionBase):
                name = sig.get(n.symbol)
                if name is not None:
                    add(name, None, None)
            elif isinstance(n, ast.CallExpression):
                if not n.isSystemCall and isinstance(n.subroutine, ast.SubroutineSymbol):
                    for name in self.subroutine_refs(n.subroutine)[0]:
                        add(name, None, None)
            elif isinstance(n, ast.InstanceSymbol):
                r, w = set(), {}
                self.instance_refs(n, r, w)
                for name in r:
                    add(name, None, None)
                return ast.VisitAction.Skip
            return _skip_unelaborated(n)

        for node in nodes:
            if node is not None:
                node.visit(cb)
        return out

    def subroutine_refs(self, sub):
        got = self._sub_refs.get(sub)
        if got is not None:
            return got
        r, w = set(), {}
        self._sub_refs[sub] = (r, w)     # recursion guard
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
                r, w = set(), {}
                self.collect(e, r, w)
                for name in r | set(w):
                    reads.add(name)
                    writes[name] = None
            elif d == ast.ArgumentDirection.Out:
                x = e.left if e.kind == EK.Assignment else e
                r, w = set(), {}
                self.collect(x, r, w)
                reads.update(r - self.target_bases(x))
                b = self.static_bits(x)
                if b is not None:
                    name, lo, hi = b
                    if lo is None:
                        writes[name] = None
                    elif writes.get(name, []) is not None:
                        writes.setdefault(name, []).append((lo, hi))
                else:
                    for name in self.names_in(x):
                        writes[name] = None
            else:
                self.collect(e, reads, writes)

    def target_bases(self, x):
        """Names of the signals a target expression assigns (not those its indices read)."""
        k = x.kind
        if k in (EK.NamedValue, EK.HierarchicalValue):
            n = self.sig.get(x.symbol)
            return {n} if n is not None else set()
        if k in (EK.ElementSelect, EK.RangeSelect, EK.MemberAccess, EK.Conversion):
            return self.target_bases(x.operand if k == EK.Conversion else x.value)
        if k == EK.Concatenation:
            out = set()
            for o in x.operands:
                out |= self.target_bases(o)
            return out
        return set()

    def names_in(self, x):
        out = set()

        def cb(n):
            if isinstance(n, ast.ValueExpressionBase):
                name = self.sig.get(n.symbol)
                if name is not None:
                    out.add(name)
        x.visit(cb)
        return out

    def mentions(self, syn):
        """Module signal names written anywhere in a member's syntax, inactive generate
        branches included (a declaration they name must stay)."""
        out = set()
        names = self.sig_by_name

        def cb(n):
            if isinstance(n, pyslang.parsing.Token):
                if n.kind == pyslang.parsing.TokenKind.Identifier:
                    v = n.valueText
                    if v in names:
                        out.add(v)
            return None
        if syn is not None:
            syn.visit(cb)
        return out

    # -- x from kept code ---------------------------------------------------------

    def _dim_range(self, t):
        """(lower, upper) index bounds of the outermost dimension of slang type `t`, or None."""
        ct = t.canonicalType
        if ct.kind in (SK.PackedArrayType, SK.FixedSizeUnpackedArrayType):
            r = ct.range
            return min(r.left, r.right), max(r.left, r.right)
        if ct.isIntegral:
            return 0, ct.bitWidth - 1
        return None

    def _index_fits(self, sel, lo, hi, extra=0):
        """True when every value `sel` can take (and `extra` positions above it) lies in [lo, hi]."""
        c = self.try_const(sel)
        if c is not None:
            if c.hasUnknown:
                return False
            v = int(c.toString(_DEC, False))
            return lo <= v and v + extra <= hi
        w = sel.type.bitWidth
        if sel.type.isSigned or w >= 31:
            return False
        return lo <= 0 and (1 << w) - 1 + extra <= hi

    def x_writes(self, nodes):
        """Which signals kept code can make x by its own text: None when it cannot; otherwise
        the names written by assignments (and declarations' initial values) whose value can be
        x — an x source in the value, or a variable such an assignment wrote, local ones
        included — or True for every signal it writes when it holds a gate primitive or calls a
        task or a function with an output argument. An x source only in an `if`/`case`
        condition, a case item or an event control makes no value x (IEEE 1800 12.4, 12.5:
        the else branch or no item is taken)."""
        if not self.may_be_x(nodes):
            return None
        assigns = []     # (symbols the target names, module signals it names, value expressions)
        other = [False]

        def symbols(e):
            out = set()

            def f(n):
                if isinstance(n, ast.Expression) and n.kind == EK.NamedValue:
                    out.add(n.symbol)
                return None
            e.visit(f)
            return out

        def cb(n):
            if isinstance(n, ast.Expression):
                k = n.kind
                if k == EK.Assignment:
                    assigns.append((symbols(n.left), self._target_names(n.left),
                                    [n.right, n.left] if n.isCompound else [n.right]))
                    return ast.VisitAction.Skip
                if k == EK.UnaryOp and n.op in _INCDEC:
                    assigns.append((symbols(n.operand), self._target_names(n.operand), [n.operand]))
                    return ast.VisitAction.Skip
                if k == EK.Call and not n.isSystemCall:
                    sub = n.subroutine
                    if not isinstance(sub, ast.SubroutineSymbol) or \
                            sub.subroutineKind != ast.SubroutineKind.Function or \
                            any(a.direction != ast.ArgumentDirection.In for a in sub.arguments):
                        other[0] = True
            elif isinstance(n, ast.PrimitiveInstanceSymbol):
                other[0] = True
            elif isinstance(n, ast.InstanceSymbol):
                return ast.VisitAction.Skip
            elif isinstance(n, (ast.VariableSymbol, ast.NetSymbol)):
                init = getattr(n, "initializer", None)
                if init is not None:
                    name = self.sig.get(n)
                    assigns.append(({n}, {name} if name is not None else set(), [init]))
            return _skip_unelaborated(n)

        for node in nodes:
            if node is not None:
                node.visit(cb)
        if other[0]:
            return True
        xsyms = set()
        done = [False] * len(assigns)
        changed = True
        while changed:
            changed = False
            for i, (tsyms, _, values) in enumerate(assigns):
                if not done[i] and (self.may_be_x(values) or any(symbols(v) & xsyms for v in values)):
                    done[i] = True
                    xsyms |= tsyms
                    changed = True
        names = set()
        for i, (_, tnames, _) in enumerate(assigns):
            if done[i]:
                names |= tnames
        return names

    def _target_names(self, lhs):
        """Module signals a target expression names (every one, selects' own indices included)."""
        out = set()

        def f(n):
            if isinstance(n, ast.Expression) and n.kind == EK.NamedValue:
                name = self.sig.get(n.symbol)
                if name is not None:
                    out.add(name)
            return None
        lhs.visit(f)
        return out

    def may_be_x(self, nodes):
        """True when kept code can itself produce x or z by the language's rules: an x/z
        constant, a select that can fall out of range (IEEE 1800 11.5.1 reads x), a division
        or modulo by something that can be 0 (11.4.2), a gate primitive. Reading a signal that
        can be x is followed on the C++ side; ports and instance outputs are taken as 0/1, as
        in the proof; a register or memory before its first write is outside the model."""
        found = [False]
        seen_subs = set()

        def cb(n):
            if found[0]:
                return ast.VisitAction.Skip
            if isinstance(n, ast.Expression):
                k = n.kind
                if k in (EK.IntegerLiteral, EK.UnbasedUnsizedIntegerLiteral):
                    c = self.try_const(n)
                    if c is None or c.hasUnknown:
                        found[0] = True
                elif k == EK.ElementSelect:
                    r = self._dim_range(n.value.type)
                    if r is None or not self._index_fits(n.selector, r[0], r[1]):
                        found[0] = True
                elif k == EK.RangeSelect:
                    r = self._dim_range(n.value.type)
                    if r is None:
                        found[0] = True
                    elif n.selectionKind == ast.RangeSelectionKind.Simple:
                        a, b = self.const_int(n.left), self.const_int(n.right)
                        if a is None or b is None or not (r[0] <= min(a, b) and max(a, b) <= r[1]):
                            found[0] = True
                    else:
                        cnt = self.const_int(n.right)
                        up = n.selectionKind == ast.RangeSelectionKind.IndexedUp
                        if cnt is None or not up or not self._index_fits(n.left, r[0], r[1], cnt - 1):
                            found[0] = True
                elif k == EK.BinaryOp and n.op in (ast.BinaryOperator.Divide, ast.BinaryOperator.Mod,
                                                   ast.BinaryOperator.Power):
                    c = self.try_const(n.right)
                    if c is None or c.hasUnknown or int(c.toString(_DEC, False)) == 0 \
                            or n.op == ast.BinaryOperator.Power:
                        found[0] = True
                elif k == EK.Call and not n.isSystemCall:
                    sub = n.subroutine
                    if isinstance(sub, ast.SubroutineSymbol) and sub not in seen_subs:
                        seen_subs.add(sub)
                        body = getattr(sub, "body", None)
                        if body is not None:
                            body.visit(cb)
            elif isinstance(n, ast.InstanceSymbol):
                return ast.VisitAction.Skip     # instance outputs: 0/1, like ports
            elif isinstance(n, ast.PrimitiveInstanceSymbol):
                found[0] = True                 # bufif0, nmos, ...: can drive z
            return _skip_unelaborated(n)

        for node in nodes:
            if node is not None and not found[0]:
                node.visit(cb)
        return found[0]

    def kept_member(self, what, reason, src, collect_from, extra_writes=(), syn=None):
        reads, writes = set(), {}
        for node in collect_from:
            if node is not None:
                self.collect(node, reads, writes)
        for n in extra_writes:
            writes[n] = None
        return self.kept_entry(what, reason, src, reads, writes, syn, self.x_writes(collect_from),
                               read_from=collect_from)

    def kept_entry(self, what, reason, src, reads, writes, syn, may_x=False, read_from=None):
        """`may_x`: False/None (its text makes no x), True (it can make every signal it writes
        x) or the set of names it can make x. `read_from`: the nodes whose reads are told by
        bit (read_bits); without it every read counts as the whole signal."""
        m = {"kind": "kept", "src": src, "what": what, "reason": reason,
             "reads": sorted(reads), "writes": sorted(writes)}
        if may_x is not None and may_x is not False and writes:
            if may_x is True:
                m["may_be_x"] = True
            else:
                xw = sorted(set(writes) & set(may_x))
                if xw:
                    m["may_be_x"] = True
                    if xw != sorted(writes):
                        m["x_writes"] = xw
        ranges = {}
        for name, rs in writes.items():
            if rs is None:
                continue
            w = self.sig_by_name[name].type.bitWidth if self.sig_by_name[name].type.isIntegral else 0
            merged = _merge_ranges(rs)
            if merged != [[0, w - 1]]:
                ranges[name] = merged
        if ranges:
            m["write_ranges"] = ranges
        if read_from is not None and reads:
            bits = self.read_bits(read_from)
            rr = {}
            for name in sorted(reads):
                rs = bits.get(name)
                if not rs or not self.sig_by_name[name].type.isIntegral:
                    continue
                merged = _merge_ranges(rs)
                if merged != [[0, self.sig_by_name[name].type.bitWidth - 1]]:
                    rr[name] = merged
            if rr:
                m["read_ranges"] = rr
        m["mentions"] = sorted(self.mentions(syn) | reads | set(writes))
        return m

    # -- functions -----------------------------------------------------------------

    def function_index(self, sub):
        """Index of the description of function `sub` (described on first use), or
        Unsupported with the reason it cannot be."""
        t = self.tables
        got = t.fn_index.get(sub)
        if isinstance(got, str):
            raise Unsupported(got)
        if got is not None:
            return got
        if sub in t.fn_busy:
            raise Unsupported("calls the function '%s' recursively" % sub.name)
        t.fn_busy.add(sub)
        try:
            entry = self.describe_function(sub)
        except Unsupported as u:
            reason = "calls the function '%s', which %s" % (sub.name, str(u))
            t.fn_index[sub] = reason
            raise Unsupported(reason)
        finally:
            t.fn_busy.discard(sub)
        idx = len(t.functions)
        t.functions.append(entry)
        t.fn_index[sub] = idx
        t.watermark = (len(t.exprs), len(t.stmts), t.next_symbol)
        return idx

    def describe_function(self, sub):
        if sub.subroutineKind != ast.SubroutineKind.Function:
            raise Unsupported("is a task")
        if sub.isVirtual or sub.thisVar is not None:
            raise Unsupported("is a class method")
        res = sub.returnValVar
        if res is None or not res.type.isIntegral:
            raise Unsupported("returns no packed value")
        syn = sub.syntax
        if syn is None:
            raise Unsupported("has no source text")
        c = Conv(self)
        rng = syn.sourceRange
        c.buf = rng.start.buffer
        self.src.note_file(c.buf)
        c.macros = b"`" in self.src.data(c.buf)[rng.start.offset:rng.end.offset]
        try:
            args = []
            for a in sub.arguments:
                if a.direction != ast.ArgumentDirection.In:
                    raise Unsupported("has an argument that is not an input")
                args.append(c.add_local(a)[1])
            _, ridx = c.add_local(res)
            c.function = (self.types.of(res.type), ridx)
            c.tail = True
            pre = []
            if _early_return(sub.body, True):
                # A return before the end: a flag, clear at the start, guards what follows.
                c.flags["return"] = c.new_flag("return", syn)
                pre = [c.set_flag(c.flags["return"], 0, syn)]
                if _ends_in_return(sub.body):
                    # Every path assigns the result (an early return or the last one), so a
                    # start value is never seen; without it the result would look x until then.
                    rti = self.types.of(res.type)
                    w = self.types.width_signed(rti)[0]
                    pre.append(c.add_stmt(["assign"] + c.sspan(syn) + [c.leaf(("r", rti, ridx), ["ref", rti, -1, -1, ridx]),
                                                                     c.const_of_type("0" * w, rti, syn)]))
            b = c.stmt_or_empty(sub.body)
            if pre:
                b = c.add_stmt(["block"] + c.sspan(sub.body) + [pre + [b]])
            if c.st[b][0] != "block":
                b = c.add_stmt(["block"] + c.sspan(sub.body) + [[b]])
            if c.writes:
                raise Unsupported("assigns '%s' of the module" % sorted(c.writes)[0])
            if c.localized:
                raise Unsupported("uses a module variable as a loop variable")
        except Unsupported:
            c.drop()
            raise
        return {"name": sub.name, "automatic": sub.defaultLifetime == ast.VariableLifetime.Automatic,
                "result": ridx, "args": args, "locals": c.local_list, "body": b, "reads": sorted(c.reads),
                "src": self.src.range_src(rng)[0]}

    # -- members -------------------------------------------------------------------

    def start_conv(self, syn):
        c = Conv(self)
        rng = syn.sourceRange
        buf = rng.start.buffer
        c.buf = buf
        self.src.note_file(buf)
        # Without a backquote in its text the member uses no macro: every node's
        # text is in the member's own file (the per-node check is then skipped).
        c.macros = b"`" in self.src.data(buf)[rng.start.offset:rng.end.offset]
        return c

    def wired_net_reason(self, names):
        """Why an assignment to one of `names` is kept: a wired net (`wor`, `wand`, `trior`,
        `triand`) resolves all its drivers together (IEEE 1800-2017 6.6.3), so each driver is
        only part of its value."""
        for n in names:
            sym = self.sig_by_name.get(n) if n is not None else None
            if sym is not None and sym.kind == SK.Net and sym.netType.netKind in _WIRED_NETS:
                return "it drives '%s', a %s net whose drivers resolve together" % (n, sym.netType.name)
        return None

    @staticmethod
    def check_hidden_reads(c, what):
        """Refuse a member whose simulation does not wait on a signal a called function reads
        by name. `@*` (IEEE 1364-2005 9.7.5) and a continuous assignment (re-evaluated when an
        operand changes, IEEE 1800-2017 10.3.2) wait on a call's arguments, not on what the
        function reads inside (`always_comb` does, IEEE 1800-2017 9.2.2.2.1): a simulator holds
        the old value when only such a signal changes, which gates in its place would not."""
        hidden = sorted(set(c.fn_reads) - c.direct_reads)
        if hidden:
            raise Unsupported("is %s calling '%s', which reads '%s' by name: a simulator does "
                              "not re-evaluate it when that changes"
                              % (what, c.fn_reads[hidden[0]], hidden[0]))

    def assign_member(self, sym):
        syn = self.member_syntax(sym)
        src, why = self.member_src(syn)
        if why is None:
            if sym.delay is not None:
                why = "it has a delay"
            elif _has_drive_strength(sym):
                why = "it has a drive strength"
            else:
                why = self.wired_net_reason(self.target_bases(sym.assignment.left))
        a = sym.assignment
        if why is None:
            c = self.start_conv(syn)
            try:
                lhs = c.target(a.left)
                rhs = c.expr(a.right)
                self.check_hidden_reads(c, "a continuous assignment")
                return {"kind": "assign", "src": src, "lhs": lhs, "rhs": rhs,
                        "reads": sorted(c.reads), "writes": sorted(c.writes),
                        "comments": self.member_comments(syn)}
            except Unsupported as u:
                c.drop()
                why = "it " + str(u)
        return self.kept_member("assign", why, src, [sym], syn=syn)

    def net_decl_member(self, net):
        syn = net.syntax
        init = net.initializer
        src, clean = self.src.range_src(pyslang.SourceRange(syn.name.range.end, syn.sourceRange.end))
        why = None
        stmt = syn.parent
        if not clean:
            why = "it is written through a macro"
        elif net.delay is not None:
            why = "it has a delay"
        elif self.wired_net_reason([self.sig.get(net)]):
            why = self.wired_net_reason([self.sig.get(net)])
        else:
            attrs = getattr(stmt, "attributes", None) if stmt is not None else None
            if attrs is not None and len(attrs) > 0:
                why = "it carries an attribute (* ... *)"
        name = self.sig.get(net)
        if why is None:
            c = self.start_conv(syn)
            try:
                ti = self.types.of(net.type)
                if self.types.entries[ti]["kind"] == "other":
                    raise Unsupported("initializes '%s', which is not a packed vector" % net.name)
                c.writes.add(name)
                idx = self.tables.symbols[name]
                lhs = c.leaf(("r", ti, idx), ["ref", ti] + list(c.span(syn.name)) + [idx])
                rhs = c.expr(init)
                self.check_hidden_reads(c, "a net declaration assignment")
                return {"kind": "assign", "src": src, "net_decl": True, "lhs": lhs, "rhs": rhs,
                        "reads": sorted(c.reads), "writes": sorted(c.writes), "comments": self.member_comments(stmt)}
            except Unsupported as u:
                c.drop()
                why = "it " + str(u)
        m = self.kept_member("assign", why, src, [init], extra_writes=[name], syn=syn)
        m["net_decl"] = True
        return m

    @staticmethod
    def events_of(timing):
        """The events of an event control (`@(a or posedge b)`: two), or None when it is not a
        list of events (a delay, `@*`)."""
        TK = ast.TimingControlKind
        if timing.kind == TK.SignalEvent:
            return [timing]
        if timing.kind == TK.EventList:
            return list(timing.events)
        return None

    @staticmethod
    def level_events(timing):
        """The signal names of an event control that lists whole signals without edges
        (`@(a or b)`, `@(a, b)`); None for anything else (an edge, `iff`, a select)."""
        TK = ast.TimingControlKind
        events = Describer.events_of(timing)
        if events is None:
            return None
        names = set()
        for ev in events:
            if (ev.kind != TK.SignalEvent or ev.edge != ast.EdgeKind.None_ or ev.iffCondition is not None
                    or ev.expr.kind != EK.NamedValue):
                return None
            names.add(ev.expr.symbol.name)
        return names

    @staticmethod
    def edge_events(timing):
        """True when an event control waits for an edge (`@(posedge clk)`, `@(negedge rst_n or
        posedge clk)`): what the block writes changes only at that edge."""
        events = Describer.events_of(timing) or []
        return any(ev.kind == ast.TimingControlKind.SignalEvent and ev.edge != ast.EdgeKind.None_
                   for ev in events)

    @staticmethod
    def named_block_variable(stmt):
        """(block, variable) of the first variable declared in a named block of a procedural
        body (`begin : p_class logic [3:0] grp; ...`), or None."""
        found = []

        def visit(n):
            if found:
                return False
            if isinstance(n, ast.Statement) and n.kind == STK.Block and n.blockSymbol is not None \
                    and n.blockSymbol.name:
                for x in n.blockSymbol:
                    if x.kind == ast.SymbolKind.Variable:
                        found.append((n.blockSymbol.name, x.name))
                        return False
            return True
        stmt.visit(visit)
        return found[0] if found else None

    def procedural_member(self, sym):
        syn = self.member_syntax(sym)
        src, why = self.member_src(syn)
        k = sym.procedureKind
        PK = ast.ProceduralBlockKind
        body = sym.body
        style = None
        listed = None     # the names of an explicit level-sensitive event list
        never_runs = False
        if k == PK.AlwaysComb:
            style, what, stmt = "always_comb", "always_comb", body
        elif k == PK.Always:
            what = "always"
            if body.kind == STK.Timed and body.timing.kind == ast.TimingControlKind.ImplicitEvent:
                style, stmt = "always_star", body.stmt
            elif body.kind == STK.Timed and (listed := self.level_events(body.timing)) is not None:
                # `always @(a or b)`: combinational when the list names every signal the block
                # reads (checked below); a rewrite is written with `@(*)`, which is then the same.
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
            named = self.named_block_variable(stmt)
            if named is not None:
                # A variable of a named block is reachable by name from a testbench or a
                # waveform (`dut.p_class.grp`, IEEE 1800-2017 23.6); a rewrite would delete its
                # declaration, which kerf never does (F324).
                why = ("it declares '%s' in its named block '%s', where testbenches and waveforms "
                       "reach it by name" % (named[1], named[0]))
        if style is not None and why is None:
            c = self.start_conv(syn)
            try:
                b = c.stmt_or_empty(stmt)
                if c.st[b][0] != "block":
                    b = c.add_stmt(["block"] + c.sspan(stmt) + [[b]])
                bad = set(c.localized) & c.outside
                if bad:
                    raise Unsupported("uses '%s' both as a for loop variable and outside the loop"
                                      % sorted(bad)[0])
                if listed is None and style == "always_star" and c.reads <= c.writes:
                    # IEEE 1364-2005 9.7.5: `@*` waits on the signals the block reads; with none
                    # but its own targets it never wakes, so a simulator never runs it and what
                    # it writes stays x (synthesis reads it as constants: a mismatch of the
                    # source's own). Kept as written; its targets may be x.
                    never_runs = True
                    raise Unsupported("is an `always @*` block that reads no signal it does not "
                                      "write itself: a simulator never runs it (IEEE 1364-2005 "
                                      "9.7.5), so what it writes stays x")
                if style == "always_star" and listed is None:
                    self.check_hidden_reads(c, "an `always @*` block")
                if listed is not None and not c.reads <= listed:
                    # IEEE 1364-2005 9.7.5: the block runs only when a listed signal changes, so
                    # with a signal left out simulation holds old values (not combinational).
                    raise Unsupported("has an event list that leaves out '%s', which it reads: a "
                                      "simulator does not re-run it when that changes"
                                      % sorted(c.reads - listed)[0])
                m = {"kind": "comb", "src": src, "style": style, "locals": c.local_list, "body": b,
                     "reads": sorted(c.reads), "writes": sorted(c.writes), "comments": self.member_comments(syn)}
                # The block's label (`begin : p_decode`), which a rewrite keeps: scopes in
                # waveforms, coverage exclusions and `disable` name it.
                if stmt.kind == STK.Block and stmt.blockSymbol is not None and stmt.blockSymbol.name:
                    m["label"] = stmt.blockSymbol.name
                    if getattr(stmt.syntax, "endBlockName", None) is not None:
                        m["end_label"] = True
                if c.localized:
                    m["_localized"] = set(c.localized)
                    m["_symbol"] = sym
                    m["_what"] = what
                    m["_syntax"] = syn
                return m
            except Unsupported as u:
                c.drop()
                why = "it " + str(u)
        m = self.kept_member(what, why, src, [sym], syn=syn)
        if never_runs and m["writes"]:
            m["may_be_x"] = True
            m.pop("x_writes", None)
        if k == PK.AlwaysFF or (k == PK.Always and body.kind == STK.Timed and self.edge_events(body.timing)):
            m["clocked"] = True
        return m

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
        reads, writes = set(), {}
        if k == SK.Instance:
            self.instance_refs(sym, reads, writes)
        elif k == SK.GenerateBlock and sym.isUninstantiated:
            pass    # an inactive generate branch reads and drives nothing
        else:
            self.collect(sym, reads, writes)
        read_from = [sym] if k in (SK.GenerateBlock, SK.GenerateBlockArray) and not sym.isUninstantiated else None
        if k == SK.NetAlias:
            both = reads | set(writes)
            reads = set(both)
            writes = {n: None for n in both}
        may_x = True if k == SK.PrimitiveInstance else None if k == SK.Instance else self.x_writes([sym])
        return self.kept_entry(what, why, src, reads, writes, syn, may_x, read_from=read_from)

    # -- the whole module -------------------------------------------------------

    def run(self):
        body = self.body
        self.index_module_tokens()
        port_internal = set()
        port_syms = []
        for p in body.portList:
            if p.kind in (SK.Port, SK.MultiPort):
                port_syms.append(p)
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
                self.tables.symbols[sym.name] = self.tables.new_symbol()
                if k == SK.Variable and sym not in port_internal and self.shape(sym.type)[6]:
                    self.loop_candidates.add(sym.name)
            members_syms.append(sym)
        ports = [self.port_entry(p) for p in port_syms]
        signals = [self.signal_entry(s, s in port_internal) for s in signal_syms]

        members = []
        named_by_src = {}        # member's (file, start, end) -> named constants its text refers to
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
                if m["src"] is not None and READ_BACK is None:   # named constants: for the writer
                    key = (m["src"]["file"], m["src"]["start"], m["src"]["end"])
                    named = self.constants_named(sym.initializer if k == SK.Net else sym)
                    if named:
                        named_by_src.setdefault(key, Counter()).update(named)

        # Parameters an instance may override and the preprocessor (kerf_variants.py).
        members = kerf_variants.restrict(self, members)
        self.finish_loop_locals(members)
        members = self.merge_statements(members)
        for i, m in enumerate(members):
            m["id"] = i
        self.finish_constants(members, named_by_src)

        msyn = self.top.definition.syntax
        msrc = self.node_src(msyn) if msyn is not None else self.symbol_src(self.top)
        files = [{"path": n, "line_starts": ls} for n, ls in sorted(self.src.lines.items())]
        # Key order matters to no reader, but the big tables come last so that a
        # streaming reader has the small ones in hand first.
        desc = {"format": FORMAT, "version": VERSION,
                "module": {"name": self.top.name, "src": msrc},
                "files": files,
                "types": self.types.entries,
                "ports": ports, "signals": signals, "members": members}
        kerf_variants.finish(self, members, desc)    # match keys, the parameters list
        if self.constants:
            desc["constants"] = self.constants
        desc["functions"] = self.tables.functions
        desc["exprs"] = self.tables.exprs
        desc[LINKS_KEY] = self.tables.links     # kerf_read.write_json writes these nodes as links
        desc["stmts"] = self.tables.stmts
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
            syn = m.pop("_syntax", None)
            if not loc:
                continue
            shared = sorted(n for n in loc if users[n] > 0)
            if shared:
                members[i] = self.kept_member(
                    what, "it uses '%s' as a for loop variable, and other code in the module uses it too"
                    % shared[0], m["src"], [sym], syn=syn)

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
                reads, writes, mentions = set(), set(), set()
                ranges = {}
                whole = set()
                read_ranges, read_whole = {}, set()
                for g in group:
                    for n in g["reads"]:
                        if n in g.get("read_ranges", {}):
                            read_ranges.setdefault(n, []).extend(g["read_ranges"][n])
                        else:
                            read_whole.add(n)
                    reads.update(g["reads"])
                    writes.update(g["writes"])
                    mentions.update(g.get("mentions", []))
                    for n in g["writes"]:
                        if n in g.get("write_ranges", {}):
                            ranges.setdefault(n, []).extend(g["write_ranges"][n])
                        else:
                            whole.add(n)
                m = dict(m, reads=sorted(reads), writes=sorted(writes), mentions=sorted(mentions))
                m.pop("x_writes", None)
                if any(g.get("may_be_x") for g in group):
                    m["may_be_x"] = True
                    if all("x_writes" in g for g in group if g.get("may_be_x")):
                        xw = sorted(set().union(*(g["x_writes"] for g in group if g.get("may_be_x"))))
                        if xw != sorted(writes):
                            m["x_writes"] = xw
                wr = {n: _merge_ranges(r) for n, r in ranges.items() if n not in whole}
                if wr:
                    m["write_ranges"] = wr
                else:
                    m.pop("write_ranges", None)
                rr = {n: _merge_ranges(r) for n, r in read_ranges.items() if n not in read_whole}
                if rr:
                    m["read_ranges"] = rr
                else:
                    m.pop("read_ranges", None)
                out.append(m)
                continue
            kept = [g for g in group if g["kind"] == "kept"]
            if kept and m["kind"] != "kept":
                m = {"kind": "kept", "src": m["src"], "what": "assign",
                     "reason": "it shares its statement with an assignment that is kept (%s)"
                     % kept[0]["reason"], "reads": m["reads"], "writes": m["writes"],
                     "mentions": sorted(set(m["reads"]) | set(m["writes"])), "may_be_x": True}
            out.append(m)
        return out


def _early_return(s, tail):
    """A `return` that is not the last statement on its path (as Conv.block counts the tail)."""
    if s is None:
        return False
    k = s.kind
    if k == STK.Return:
        return not tail
    if k == STK.Block:
        return _early_return(s.body, tail)
    if k == STK.List:
        lst = list(s.list)
        return any(_early_return(x, tail and i == len(lst) - 1) for i, x in enumerate(lst))
    if k == STK.Conditional:
        return _early_return(s.ifTrue, tail) or _early_return(s.ifFalse, tail)
    if k == STK.Case:
        return any(_early_return(g.stmt, tail) for g in s.items) or _early_return(s.defaultCase, tail)
    if k in (STK.ForLoop, STK.ForeachLoop):
        return _early_return(s.body, False)
    return False


def _ends_in_return(s):
    """The last statement of a function body is `return e;`."""
    while s is not None and s.kind in (STK.Block, STK.List):
        if s.kind == STK.Block:
            s = s.body
        else:
            lst = list(s.list)
            s = lst[-1] if lst else None
    return s is not None and s.kind == STK.Return and s.expr is not None


def _merge_ranges(rs):
    out = []
    for lo, hi in sorted(rs):
        if out and lo <= out[-1][1] + 1:
            out[-1][1] = max(out[-1][1], hi)
        else:
            out.append([lo, hi])
    return out


# realpath -> the path as given on the command line (set by kerf_read.py)
GIVEN_FILES = {}

# Set (kerf_read.py --read-back) when the file is kerf's own rewrite, read back to be measured
# and proved: a set of (byte length, CRC-32) of the texts of the members of the description the
# rewrite was made from. Only what the lowering and the proof use is described: no comments, no
# named constants, and a full match key only for a member whose text is in the set (a kept
# statement comes back byte for byte; any other member can pair with nothing, docs/proof.md).
READ_BACK = None
_NO_COMMENTS = {"above": [], "inside": [], "trailing": []}


def describe(comp, top):
    return Describer(comp, top).run()
