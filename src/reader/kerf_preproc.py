"""Conditional compilation and macros: what may differ between builds of one file.

slang reads the files for one set of defines. A rewrite must hold for every
define combination the file's directives allow, so this module finds, from
slang's own preprocessor information (directive trivia, the tokens of
excluded text, macro expansion locations), everything whose meaning could
change with the defines:

- conditional regions: the text between `ifdef/`ifndef/`elsif/`else and
  the matching `endif. A region that encloses the whole module does not
  count (the module is not compiled at all in the other builds), nor does
  an include guard (`ifndef G `define G ... `endif, common trade practice).
- unstable macros: a macro defined more than once, inside a conditional
  region, `undef'd, not defined in the files at all (so it comes from the
  command line or the tool), given with -D, or whose body uses an unstable
  macro.
- excluded text inside the module (the branches not taken): it becomes a
  kept member of its own, reading every module signal it names, so those
  signals keep their names and functions for the builds that take it.

A member is kept as written, with the reason, when it lies in a conditional
region, contains a directive, uses an unstable macro, or names a symbol
declared in a conditional region or through an unstable macro (directly or
through localparams, types and functions; see kerf_symbols.Refs.closure).
"""

import pyslang
from pyslang import parsing, syntax

from kerf_symbols import TK, directive_name, node_tokens

SXK = syntax.SyntaxKind
_OPEN = {SXK.IfDefDirective, SXK.IfNDefDirective}
_BRANCH = {SXK.ElsIfDirective, SXK.ElseDirective}
_CONDITIONAL = _OPEN | _BRANCH | {SXK.EndIfDirective}


def _cond_name(s):
    """The macro name (or expression text) an `ifdef/`ifndef/`elsif tests."""
    e = getattr(s, "expr", None)
    if e is None:
        return ""
    return " ".join(t.valueText for t in node_tokens(e))


class Region:
    """One branch of a conditional group: active text in [start, end) of a buffer."""

    def __init__(self, bid, start, end, opener, line):
        self.bid = bid
        self.start = start
        self.end = end
        self.opener = opener      # e.g. "`ifdef FAST"
        self.line = line


class Preproc:
    def __init__(self, tokens, describer, cmdline_defines):
        self.tokens = tokens
        self.d = describer
        self.sm = tokens.sm
        self.cmdline = set(cmdline_defines)
        self.regions = []                 # relevant conditional regions
        self.excluded = []                # (bid, start, end, opener, line, disabled tokens)
        self.defs = {}                    # macro name -> [(bid, offset, syntax or None, in region)]
        self.undefs = set()
        self.undefine_all = False
        self._macro_reason = {}
        self._symbol_reason = {}
        msyn = describer.top.definition.syntax
        if msyn is not None:
            r = msyn.sourceRange
            self.mod = (r.start.buffer.id, r.start.offset, r.end.offset)
        else:
            self.mod = None
        for bid, dirs in tokens.directives.items():
            self._scan(bid, dirs)
        self._collect_macros()

    # -- regions ----------------------------------------------------------------

    def _line(self, bid, offset):
        buf = self.tokens.buffers.get(bid)
        if buf is None:
            return 0
        return self.sm.getLineNumber(pyslang.SourceLocation(buf, offset))

    def _encloses_module(self, bid, start, end):
        m = self.mod
        return m is not None and m[0] == bid and start <= m[1] and m[2] <= end

    def _scan(self, bid, dirs):
        stack = []     # [opener text, opener line, branch start, [branches], guard candidate]
        cond = [d for d in dirs if d[2].kind in _CONDITIONAL]
        for i, (start, end, s) in enumerate(cond):
            k = s.kind
            if k in _OPEN:
                text = "`%s %s" % ("ifdef" if k == SXK.IfDefDirective else "ifndef", _cond_name(s))
                guard = None
                if k == SXK.IfNDefDirective:
                    guard = _cond_name(s)
                stack.append([text, self._line(bid, start), end, [], guard, start])
            elif k in _BRANCH:
                if not stack:
                    continue
                g = stack[-1]
                g[3].append((g[2], start))
                g[2] = end
                g[4] = None           # an include guard has no `else
            elif k == SXK.EndIfDirective:
                if not stack:
                    continue
                g = stack.pop()
                g[3].append((g[2], start))
                if g[4] is not None and self._is_guard(bid, g[5], g[4]):
                    continue
                whole = (g[5], end)
                if self._encloses_module(bid, whole[0], whole[1]):
                    continue
                for (a, b) in g[3]:
                    self.regions.append(Region(bid, a, b, g[0], g[1]))
        # excluded text: directives carrying the tokens of a branch not taken
        for start, end, s in dirs:
            dt = getattr(s, "disabledTokens", None)
            if dt is None or len(dt) == 0:
                continue
            toks = [t for t in dt if t.kind != TK.Placeholder]
            if not toks:
                continue
            self.excluded.append((bid, start, end, self._opener_text(s), self._line(bid, start), toks))

    @staticmethod
    def _opener_text(s):
        k = s.kind
        name = {SXK.IfDefDirective: "`ifdef", SXK.IfNDefDirective: "`ifndef", SXK.ElsIfDirective: "`elsif",
                SXK.ElseDirective: "`else"}.get(k, "`" + k.name)
        c = _cond_name(s)
        return name + (" " + c if c else "")

    def _is_guard(self, bid, open_start, name):
        """`ifndef NAME directly followed by `define NAME (an include guard)."""
        dirs = self.tokens.directives.get(bid, ())
        after = [d for d in dirs if d[0] > open_start]
        if not after:
            return False
        s = after[0][2]
        return s.kind == SXK.DefineDirective and s.name.valueText == name and name not in self.cmdline

    def conditionals(self):
        """The conditional directives that matter to the module: [{file, line, text}]."""
        seen = set()
        out = []
        m = self.mod
        for r in self.regions:
            if m is None or r.bid != m[0] or not (m[1] <= r.start < m[2]):
                continue
            key = (r.bid, r.line, r.opener)
            if key in seen:
                continue
            seen.add(key)
            buf = self.tokens.buffers.get(r.bid)
            out.append({"file": self.d.src.name(buf) if buf is not None else "?", "line": r.line,
                        "text": r.opener})
        return out

    def region_at(self, bid, offset):
        for r in self.regions:
            if r.bid == bid and r.start <= offset < r.end:
                return r
        return None

    def region_overlapping(self, bid, start, end):
        for r in self.regions:
            if r.bid == bid and r.start < end and start < r.end:
                return r
        return None

    # -- macros -----------------------------------------------------------------

    def _collect_macros(self):
        for bid, dirs in self.tokens.directives.items():
            for start, end, s in dirs:
                k = s.kind
                if k == SXK.DefineDirective:
                    name = s.name.valueText
                    self.defs.setdefault(name, []).append((bid, start, s, self.region_at(bid, start)))
                elif k == SXK.UndefDirective:
                    self.undefs.add(s.name.valueText)
                elif k == SXK.UndefineAllDirective:
                    self.undefine_all = True
        for bid, start, end, opener, line, toks in self.excluded:
            for i, t in enumerate(toks):
                if t.kind != TK.Directive:
                    continue
                dn = directive_name(t)
                nxt = toks[i + 1] if i + 1 < len(toks) else None
                if dn == "define" and nxt is not None:
                    self.defs.setdefault(nxt.valueText, []).append((bid, start, None, True))
                elif dn == "undef" and nxt is not None:
                    self.undefs.add(nxt.valueText)
                elif dn == "undefineall":
                    self.undefine_all = True

    def macro_reason(self, name):
        """Why macro `name` may mean different things in different builds, or None."""
        if name in self._macro_reason:
            return self._macro_reason[name]
        self._macro_reason[name] = None      # cycle guard: a recursive macro is an error anyway
        why = None
        defs = self.defs.get(name, [])
        if name in self.cmdline:
            why = "the macro `%s may be set on the command line (-D)" % name
        elif not defs:
            why = "the macro `%s is not defined in the files, so it comes from the command line or the tool" % name
        elif len(defs) > 1:
            why = "the macro `%s is defined %d times" % (name, len(defs))
        elif defs[0][3] is True:
            why = "the macro `%s is defined in text the current defines leave out" % name
        elif defs[0][3] is not None:
            r = defs[0][3]
            why = "the macro `%s is defined inside a conditional region (%s at line %d)" % (name, r.opener, r.line)
        elif name in self.undefs:
            why = "the macro `%s is undefined with `undef" % name
        elif self.undefine_all:
            why = "the files use `undefineall"
        else:
            s = defs[0][2]
            for t in node_tokens(s.body) if s is not None and s.body is not None else ():
                if t.kind == TK.Directive:
                    inner = self.macro_reason(directive_name(t))
                    if inner is not None:
                        why = "the macro `%s uses `%s: %s" % (name, directive_name(t), inner)
                        break
        self._macro_reason[name] = why
        return why

    def macros_used(self, tokens):
        """Names of the macros whose expansions produced these tokens."""
        sm = self.sm
        names = []
        seen = set()

        def add(n):
            if n and n not in seen:
                seen.add(n)
                names.append(n)

        for tok in tokens:
            loc = tok.location
            for _ in range(64):
                if not sm.isMacroLoc(loc):
                    break
                add(sm.getMacroName(loc))
                loc = sm.getExpansionLoc(loc)
            for tv in tok.trivia:
                if tv.kind != parsing.TriviaKind.Directive:
                    continue
                s = tv.syntax()
                if s is None or s.kind != SXK.MacroUsage:
                    continue
                add(directive_name(s.directive))
                if s.args is not None:
                    for t in node_tokens(s.args):
                        if t.kind == TK.Directive:
                            add(directive_name(t))
        return names

    def unstable_macro(self, tokens):
        for n in self.macros_used(tokens):
            why = self.macro_reason(n)
            if why is not None:
                return n, why
        return None

    # -- members and symbols -------------------------------------------------------

    def member_reason(self, bid, start, end, tokens):
        """Why a member at [start, end) of buffer `bid`, made of `tokens`, must stay as written, or None."""
        for ds, de, s in self.tokens.directives_in(bid, start, end):
            if s.kind != SXK.MacroUsage:
                return "it contains the preprocessor directive %s (line %d)" % (
                    self._directive_text(s), self._line(bid, ds))
        r = self.region_overlapping(bid, start, end)
        if r is not None:
            return "it lies in a conditional region (%s at line %d), so other builds compile other text" % (
                r.opener, r.line)
        u = self.unstable_macro(tokens)
        if u is not None:
            return "it uses the macro `%s, and %s" % (u[0], u[1])
        return None

    @staticmethod
    def _directive_text(s):
        toks = node_tokens(s)
        return toks[0].rawText if toks else "`" + s.kind.name

    def symbol_reason(self, sym, refs):
        """Why the declaration of `sym` may differ between builds, or None."""
        if sym in self._symbol_reason:
            return self._symbol_reason[sym]
        why = None
        loc = sym.location
        sm = self.sm
        if loc is not None and loc.buffer is not None and not sm.isFileLoc(loc):
            loc = sm.getFullyExpandedLoc(loc)
        if loc is not None and sm.isFileLoc(loc):
            r = self.region_at(loc.buffer.id, loc.offset)
            if r is not None:
                why = "'%s' is declared in a conditional region (%s at line %d)" % (sym.name, r.opener, r.line)
        if why is None:
            for node in refs.decl_nodes(sym):
                u = self.unstable_macro(node_tokens(node))
                if u is not None:
                    why = "'%s' is declared with the macro `%s, and %s" % (sym.name, u[0], u[1])
                    break
        self._symbol_reason[sym] = why
        return why

    def excluded_members(self, signal_names):
        """Kept members standing for the excluded text inside the module."""
        out = []
        m = self.mod
        if m is None:
            return out
        for bid, start, end, opener, line, toks in self.excluded:
            if bid != m[0] or not (m[1] <= start < m[2]):
                continue
            reads = sorted({t.valueText for t in toks if t.kind == TK.Identifier and t.valueText in signal_names})
            buf = self.tokens.buffers[bid]
            a = pyslang.SourceLocation(buf, start)
            b = pyslang.SourceLocation(buf, end)
            src = self.d.src.loc_src(a, b)
            key_text = opener + " " + " ".join(t.rawText for t in toks)
            out.append({"kind": "kept", "src": src, "what": "excluded_text",
                        "reason": "it is text the current defines leave out (%s at line %d); the signals it "
                                  "names stay available for the builds that compile it" % (opener, line),
                        "reads": reads, "writes": [], "_key_text": key_text})
        return out
