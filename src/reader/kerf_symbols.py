"""What a piece of a module refers to, with slang's tokens and name lookup.

Three services for the analyses that decide what kerf may restructure
(kerf_params.py, kerf_preproc.py) and for matching kept statements between
two designs (`kerf equiv`):

- `Tokens`: the preprocessor directives slang saw (trivia), and on demand
  every token slang lexed indexed by the byte offset where it stands in a
  file (a token that comes out of a macro expansion stands at the macro's
  use). Nothing here reads Verilog text: it is slang's own token stream.
- `Refs`: the module-scope and package symbols a syntax node names,
  resolved with slang's `lookupName`, and the syntax that declares each
  symbol (type, dimensions, initializer; a function's whole text). A
  dependency closure over those declarations answers questions such as
  "does this statement depend, through localparams, typedefs, widths or
  functions, on parameter W?".
- `match_key`: a digest of a member's tokens (whitespace and comments
  ignored) together with what its names mean (the types of the signals it
  touches, the values of the parameters, the text of the functions and of
  the modules it instantiates). Two kept statements with equal keys behave
  alike when their inputs are equal.

Resolution by name is conservative on purpose: a local variable that
shares a module parameter's name is taken to mean the parameter, so an
analysis can only keep more code as written, never less.
"""

import bisect
import hashlib
import itertools
import operator
import re

import pyslang
from pyslang import ast, parsing, syntax

SK = ast.SymbolKind
TK = parsing.TokenKind
TRK = parsing.TriviaKind
SXK = syntax.SyntaxKind

_SKIP_TOKENS = {TK.Placeholder, TK.EndOfFile}
# Every other token kind: the keys of a visit's lookup table that reaches each token.
_TOKEN_KINDS = [k for k in TK.__members__.values() if k not in _SKIP_TOKENS]
_RAW_TEXT = operator.attrgetter("rawText")
_IS_MISSING = operator.attrgetter("isMissing")
_KIND = operator.attrgetter("kind")
# First characters no identifier, `$unit` or `::` token starts with (IEEE 1800 5.6: a simple
# identifier starts with a letter or `_`, an escaped one with `\`).
_NEVER_NAME_FIRST = frozenset("0123456789'\"`#@[](){}&|~^!+-*/%<>=?;,.")
# A visit that hands every token to a list's append: no Python frame per token (slang
# looks the kind up natively). The list is emptied after each visit; nothing else runs
# during one, so the one list serves every call.
_VISITED = []
_APPEND_ALL = dict.fromkeys(_TOKEN_KINDS, _VISITED.append)


# A native visit compiles its lookup table anew each time (about 60 us for the table of every
# token kind, the cost of some 40 tokens handed over one by one): nodes of fewer bytes of text
# than this hand every node to the list instead, and their tokens are picked out (a rewrite of
# generated logic has thousands of one-line wires, each keyed on its own).
SMALL_NODE_BYTES = 256
_TOKEN = parsing.Token


def _visit_tokens(node):
    """The tokens of syntax node `node` in order, missing ones included."""
    _VISITED.clear()
    try:
        r = node.sourceRange
        start, end = r.start, r.end
        if start.buffer == end.buffer and 0 <= end.offset - start.offset < SMALL_NODE_BYTES:
            node.visit(_VISITED.append)
            tok, skip = _TOKEN, _SKIP_TOKENS
            return [t for t in _VISITED if type(t) is tok and t.kind not in skip]
        node.visit(lookup_table=_APPEND_ALL)
        return _VISITED[:]
    finally:
        _VISITED.clear()


def node_tokens(node):
    """The tokens of a syntax node, in order (empty placeholders left out)."""
    out = []

    def cb(n):
        if isinstance(n, parsing.Token) and n.kind not in _SKIP_TOKENS and not n.isMissing:
            out.append(n)
        return True

    if node is None:
        return out
    if isinstance(node, parsing.Token):
        cb(node)
    elif isinstance(node, syntax.SyntaxNode):
        out = list(itertools.filterfalse(_IS_MISSING, _visit_tokens(node)))
    else:                      # a token list, e.g. a macro body
        for n in node:
            if isinstance(n, parsing.Token):
                cb(n)
            elif n is not None:
                n.visit(cb)
    return out


def directive_name(tok):
    """`NAME` of a directive token such as "`NAME" (macro usages included)."""
    t = tok.valueText or tok.rawText
    return t[1:] if t.startswith("`") else t


class Tokens:
    """slang's preprocessor directives per buffer and, on demand, its tokens
    indexed by file offset.

    Directives (`ifdef`, `define`, macro usages, ...) are listed as
    (offset, end, syntax) per buffer, in order. Token entries are
    (offset, seq, kind, text, token); the offset is the token's place in its
    file: for text produced by a macro, the place of the macro use. The
    token index is built only when an analysis asks for a range.
    """

    def __init__(self, comp):
        self.sm = comp.sourceManager
        self.trees = list(comp.getSyntaxTrees())
        self.directives = {}     # buffer id -> [(start, end, syntax)]
        self.buffers = {}        # buffer id -> a SourceBuffer (a location's .buffer)
        self.macro_usages = 0
        self.by_buffer = None
        self._offsets = {}
        self._directive_starts = {}
        d = parsing.TriviaKind.Directive
        tok_type = parsing.Token
        found = []

        def cb(n):
            if type(n) is tok_type:
                for tv in n.trivia:
                    if tv.kind == d:
                        s = tv.syntax()
                        if s is not None:
                            found.append(s)
            return True

        # Every directive (`define, `ifdef, `include, a macro use, ...) starts with a
        # backtick: sources without one have none, and visiting every token of a big
        # generated file for its trivia is a good part of the reader's time.
        self.any_directives = self._may_hold_directives()
        if self.any_directives:
            for tree in self.trees:
                tree.root.visit(cb)
        for s in found:
            r = s.sourceRange
            start = self._file_loc(r.start)
            bid = start.buffer.id
            self.buffers.setdefault(bid, start.buffer)
            self.directives.setdefault(bid, []).append((start.offset, self._file_loc(r.end).offset, s))
            if s.kind == SXK.MacroUsage:
                self.macro_usages += 1
        for lst in self.directives.values():
            lst.sort(key=lambda e: e[0])

    def _may_hold_directives(self):
        """Whether any source buffer slang loaded has a backtick in its text."""
        sm = self.sm
        return any("`" in sm.getSourceText(b) for b in sm.getAllBuffers())

    def _file_loc(self, loc):
        sm = self.sm
        if sm.isFileLoc(loc):
            return loc
        return sm.getFullyExpandedLoc(loc)

    def _index(self):
        sm = self.sm
        self.by_buffer = {}
        seq = [0]
        tok_type = parsing.Token

        def cb(n):
            if type(n) is not tok_type or n.kind in _SKIP_TOKENS or n.isMissing:
                return True
            loc = self._file_loc(n.location)
            bid = loc.buffer.id
            self.buffers.setdefault(bid, loc.buffer)
            seq[0] += 1
            self.by_buffer.setdefault(bid, []).append((loc.offset, seq[0], n.kind, n.rawText, n))
            return True

        for tree in self.trees:
            tree.root.visit(cb)
        for bid, entries in self.by_buffer.items():
            entries.sort(key=lambda e: (e[0], e[1]))
            self._offsets[bid] = [e[0] for e in entries]

    def in_range(self, bid, start, end):
        """Token entries of buffer `bid` standing in [start, end)."""
        if self.by_buffer is None:
            self._index()
        offs = self._offsets.get(bid)
        if not offs:
            return []
        entries = self.by_buffer[bid]
        return entries[bisect.bisect_left(offs, start):bisect.bisect_left(offs, end)]

    def directives_in(self, bid, start, end):
        return [d for d in self.directives.get(bid, ()) if start <= d[0] < end]

    def has_directive_in(self, bid, start, end):
        """Whether a directive (macro use, `include, ...) starts in [start, end) of buffer `bid`."""
        starts = self._directive_starts.get(bid)
        if starts is None:
            starts = self._directive_starts[bid] = [d[0] for d in self.directives.get(bid, ())]
        i = bisect.bisect_left(starts, start)
        return i < len(starts) and starts[i] < end

    def covers_exactly(self, node, bid, start, end):
        """Whether `node_in_range(node, bid, start, end)` would be all of the node's own
        tokens (the node spans exactly [start, end) of the buffer, without directives)."""
        r = node.sourceRange
        if not (self.sm.isFileLoc(r.start) and self.sm.isFileLoc(r.end)):
            return False
        if r.start.buffer.id != bid or r.end.buffer.id != bid:
            return False
        lo, hi = r.start.offset, r.end.offset
        return lo == start and hi == end and not self.has_directive_in(bid, lo, hi)

    def node_in_range(self, node, bid, start, end):
        """The same entries' tokens as `in_range(bid, start, end)`, from one syntax node
        covering that range, without indexing every token of every file; None when that
        cannot be shown cheaply (the node's text holds a directive: a macro's expansion
        or an included file may bring tokens standing elsewhere)."""
        r = node.sourceRange
        if not (self.sm.isFileLoc(r.start) and self.sm.isFileLoc(r.end)):
            return None
        if r.start.buffer.id != bid or r.end.buffer.id != bid:
            return None
        lo, hi = r.start.offset, r.end.offset
        if lo > start or hi < end or self.has_directive_in(bid, lo, hi):
            return None
        toks = node_tokens(node)
        if lo == start and hi == end:
            return toks
        # Without directives every token stands where it is written, in order.
        return [t for t in toks if start <= t.location.offset < end]


class Refs:
    """Names in syntax, resolved to symbols; declarations and their closure."""

    def __init__(self, body):
        self.body = body
        self._lookup = {}        # (scope id, name) -> symbol or None
        self._decl = {}          # symbol -> [syntax nodes]
        self._deps = {}          # symbol -> [symbols]

    # -- names ------------------------------------------------------------------

    @staticmethod
    def token_names(tokens):
        """Names written in a token sequence: `a`, and `pkg::a` for scoped names."""
        names = []
        kinds = list(map(_KIND, tokens))    # each token's kind fetched once, natively
        ident, unit_name, colons = TK.Identifier, TK.UnitSystemName, TK.DoubleColon
        n = len(tokens)
        i = 0
        while i < n:
            k = kinds[i]
            if (k is ident or k is unit_name) and i + 2 < n and kinds[i + 1] is colons \
                    and kinds[i + 2] is ident:
                names.append(tokens[i].valueText + "::" + tokens[i + 2].valueText)
                i += 3
                continue
            if k is ident:
                names.append(tokens[i].valueText)
            i += 1
        return names

    def resolve(self, name, scope=None):
        scope = scope if scope is not None else self.body
        key = (id(scope), name)
        if key in self._lookup:
            return self._lookup[key]
        try:
            sym = scope.lookupName(name)
        except Exception:       # a name slang cannot look up from here: not ours to judge
            sym = None
        self._lookup[key] = sym
        return sym

    def symbols_in(self, node, scope=None):
        """Symbols named in a syntax node, in order of first mention."""
        return self.symbols_of_tokens(node_tokens(node), scope)

    def symbols_of_tokens(self, tokens, scope=None):
        return self.symbols_of_names(self.token_names(tokens), scope)

    def symbols_of_names(self, names, scope=None):
        out = []
        seen = set()
        for name in names:
            sym = self.resolve(name, scope)
            if sym is not None and sym not in seen:
                seen.add(sym)
                out.append(sym)
        return out

    # -- declarations -------------------------------------------------------------

    def decl_nodes(self, sym):
        """The syntax that gives `sym` its meaning (for signals: the type and
        dimensions, not the initializer, which is a statement of its own)."""
        got = self._decl.get(sym)
        if got is not None:
            return got
        nodes = []
        k = sym.kind
        syn = sym.syntax
        if k in (SK.Net, SK.Variable, SK.Parameter, SK.Port):
            target = sym
            if k == SK.Port and sym.internalSymbol is not None:
                target = sym.internalSymbol
            dt = getattr(target, "declaredType", None)
            if dt is not None and dt.typeSyntax is not None:
                nodes.append(dt.typeSyntax)
            tsyn = target.syntax
            if tsyn is not None and tsyn.kind == SXK.Declarator:
                if k == SK.Parameter:
                    nodes.append(tsyn)
                else:
                    nodes.extend(x for x in tsyn.dimensions)
            elif tsyn is not None and k == SK.Parameter:
                nodes.append(tsyn)
            if k == SK.Port and syn is not None:
                nodes.append(syn)
        elif k == SK.EnumValue:
            n = syn
            while n is not None and n.kind != SXK.EnumType:
                n = n.parent
            if n is not None:
                nodes.append(n)
        elif syn is not None:
            # typedefs, type parameters, functions and tasks, and anything else
            # declared by one piece of syntax: all of it
            nodes.append(syn)
        self._decl[sym] = nodes
        return nodes

    def deps(self, sym):
        """Symbols named by `sym`'s declaration."""
        got = self._deps.get(sym)
        if got is not None:
            return got
        self._deps[sym] = []          # cycle guard
        scope = sym if isinstance(sym, ast.Scope) else self._scope_of(sym)
        out = []
        seen = set()
        for node in self.decl_nodes(sym):
            for d in self.symbols_in(node, scope):
                if d is not sym and d not in seen:
                    seen.add(d)
                    out.append(d)
        self._deps[sym] = out
        return out

    def _scope_of(self, sym):
        p = sym.parentScope
        return p if p is not None else self.body

    def closure(self, roots, seed):
        """{symbol: reasons} for symbols reachable from `roots` through declarations,
        where `seed(symbol)` gives the reasons a symbol contributes itself (a set).
        Returns the union of reasons over the closure."""
        reasons = set()
        stack = list(roots)
        seen = set()
        while stack:
            s = stack.pop()
            if s in seen:
                continue
            seen.add(s)
            r = seed(s)
            if r:
                reasons |= r
            stack.extend(self.deps(s))
        return reasons


# ---------------------------------------------------------------------------
# match keys

def _type_text(t):
    """A type as slang prints its canonical form (enum encodings and struct layouts
    included), without the numbers slang gives anonymous types (`s$1`)."""
    return re.sub(r"\$\d+", "", str(t.canonicalType))


class Keys:
    """Digests of members for matching kept statements between two designs."""

    def __init__(self, comp, tokens, refs):
        self.comp = comp
        self.tokens = tokens
        self.refs = refs
        self._sym_text = {}
        self._def_text = {}

    def token_text(self, tokens):
        """Token texts, with the directives standing between them (whitespace and comments left out)."""
        if not self.tokens.any_directives:
            return list(map(_RAW_TEXT, tokens))     # no directive anywhere: only the texts
        out = []
        for i, tok in enumerate(tokens):
            if i == 0:
                out.append(tok.rawText)
                continue         # directives before the first token stand outside the member
            for tv in tok.trivia:
                if tv.kind == TRK.Directive and tv.syntax() is not None:
                    out.append("#" + " ".join(t.rawText for t in node_tokens(tv.syntax())))
            out.append(tok.rawText)
        return out

    def symbol_text(self, sym):
        """What a name means, as text: type of a signal, value of a parameter,
        the whole declaration of a function or type (and what it names)."""
        got = self._sym_text.get(sym)
        if got is not None:
            return got
        self._sym_text[sym] = "%s %s (recursive)" % (sym.kind.name, sym.name)
        k = sym.kind
        if k in (SK.Net, SK.Variable):
            t = "%s %s : %s" % (k.name, sym.name, _type_text(sym.type))
        elif k == SK.Parameter:
            t = "parameter %s : %s = %s" % (sym.name, _type_text(sym.type), sym.value)
        elif k == SK.EnumValue:
            t = "enum value %s = %s" % (sym.name, sym.value)
        elif k == SK.TypeParameter or k == SK.TypeAlias:
            t = "type %s = %s" % (sym.name, getattr(sym, "targetType", None) and sym.targetType.type)
        else:
            parts = ["%s %s" % (k.name, sym.name)]
            for node in self.refs.decl_nodes(sym):
                parts.extend(t.rawText for t in node_tokens(node))
            for d in self.refs.deps(sym):
                parts.append("{" + self.symbol_text(d) + "}")
            t = " ".join(parts)
        self._sym_text[sym] = t
        return t

    def definition_text(self, name):
        """The text of a module (interface, program) definition and of every
        definition its text instantiates, found by name as slang's
        compilation knows them."""
        got = self._def_text.get(name)
        if got is not None:
            return got
        self._def_text[name] = "definition %s (recursive)" % name
        found = self.comp.tryGetDefinition(name, self.comp.getRoot())
        defn = found.definition if found is not None else None
        syn = defn.syntax if defn is not None else None
        if syn is None:
            t = "definition %s: unknown" % name
        else:
            parts = ["definition %s:" % name] + [x.rawText for x in node_tokens(syn)]
            inner = []

            def cb(n):
                if isinstance(n, syntax.SyntaxNode) and n.kind == SXK.HierarchyInstantiation:
                    inner.append(n.type.valueText)
                return True

            syn.visit(cb)
            for n in sorted(set(inner)):
                parts.append("{" + self.definition_text(n) + "}")
            t = " ".join(parts)
        self._def_text[name] = t
        return t

    def key(self, what, tokens, instances=()):
        """Digest of a member given its tokens; `instances` are the names of the
        definitions it instantiates."""
        parts = [what, " ".join(self.token_text(tokens))]
        for s in self.refs.symbols_of_tokens(tokens):
            parts.append(self.symbol_text(s))
        for n in instances:
            parts.append(self.definition_text(n))
        return hashlib.sha256("\n".join(parts).encode("utf-8", "surrogateescape")).hexdigest()[:32]

    def node_key(self, what, node, instances=()):
        """`key(what, node_tokens(node), instances)` without holding the tokens: their
        texts go into the digest while the node is visited (a generated member has
        millions of tokens), and only the names are kept for the symbols. None when the
        node has no tokens."""
        h = hashlib.sha256()
        enc = "utf-8"
        h.update(what.encode(enc, "surrogateescape") + b"\n")
        ident, unit_name, colons = TK.Identifier, TK.UnitSystemName, TK.DoubleColon
        directive = TRK.Directive
        trivia = self.tokens.any_directives
        if not trivia and isinstance(node, syntax.SyntaxNode):
            got = self._plain_node_key(h, node, instances)
            if got is not False:
                return got
        named = []           # (position, kind, value text) of the tokens names are made of
        chunk = []
        count = 0

        def tok(n):
            nonlocal count
            if n.isMissing:
                return
            text = n.rawText
            if count:
                if trivia:
                    for tv in n.trivia:
                        if tv.kind == directive and tv.syntax() is not None:
                            chunk.append("#" + " ".join(t.rawText for t in node_tokens(tv.syntax())))
                chunk.append(text)
                if len(chunk) > 4096:
                    h.update((" " + " ".join(chunk)).encode(enc, "surrogateescape"))
                    chunk.clear()
            else:
                h.update(text.encode(enc, "surrogateescape"))
            count += 1

        def name_tok(n):
            if n.isMissing:
                return
            named.append((count, n.kind, n.valueText))
            tok(n)

        # Only tokens cross into Python: slang looks their kind up in the table natively.
        table = {k: tok for k in _TOKEN_KINDS}
        for k in (ident, unit_name, colons):
            table[k] = name_tok

        if isinstance(node, syntax.SyntaxNode):
            node.visit(lookup_table=table)
        else:
            for t in node_tokens(node):
                table[t.kind](t)
        if not count:
            return None
        if chunk:
            h.update((" " + " ".join(chunk)).encode(enc, "surrogateescape"))
        return self._finish_key(h, self._names_of(named), instances)

    # Members longer than this (bytes of text) are keyed token by token (`node_key`) rather
    # than with all their tokens in hand at once (about 80 bytes a token).
    PLAIN_KEY_MAX_TEXT = 1 << 20

    def _plain_node_key(self, h, node, instances):
        """`node_key` for sources without directives, where a token's text is all it gives:
        the tokens come from one visit that runs no Python per token (`_visit_tokens`),
        only the name tokens are looked at one by one. The digest is the same bytes.
        False when the member is too long for that or has a missing token."""
        r = node.sourceRange
        if r.end.offset - r.start.offset > self.PLAIN_KEY_MAX_TEXT or r.end.buffer != r.start.buffer:
            return False
        toks = _visit_tokens(node)
        if not toks:
            return None
        texts = list(map(_RAW_TEXT, toks))
        if "" in texts:
            return False         # a missing token (slang would have reported an error)
        enc = "utf-8"
        for i in range(0, len(texts), 4096):
            part = " ".join(texts[i:i + 4096])
            h.update(((" " + part) if i else part).encode(enc, "surrogateescape"))
        ident, unit_name, colons = TK.Identifier, TK.UnitSystemName, TK.DoubleColon
        # Only a token whose text can start a name is asked its kind (most of a generated
        # member's tokens are operators, brackets and numbers).
        not_first = _NEVER_NAME_FIRST
        if "::" not in texts:
            # No `pkg::name`: the names are the identifiers, and the symbols come in order of
            # first mention, so each distinct text is asked once. Without directives a
            # token's kind and value follow from its text. The dict keeps each text at its
            # first place and the index of one token that has it.
            one = dict(zip(texts, range(len(texts))))
            names = [toks[i].valueText for t, i in one.items()
                     if t[0] not in not_first and toks[i].kind is ident]
            return self._finish_key(h, names, instances)
        named = [(i, k, toks[i].valueText) for i, t in enumerate(texts) if t[0] not in not_first
                 and ((k := toks[i].kind) is ident or k is unit_name or k is colons)]
        return self._finish_key(h, self._names_of(named), instances)

    @staticmethod
    def _names_of(named):
        """The names as Refs.token_names finds them, from (position, kind, value text) of a
        member's name tokens: `a`, and `pkg::a` from three adjacent tokens."""
        ident, colons = TK.Identifier, TK.DoubleColon
        names = []
        j = 0
        while j < len(named):
            i, k, text = named[j]
            if k is not colons and j + 2 < len(named) and named[j + 1][0] == i + 1 and named[j + 1][1] is colons \
                    and named[j + 2][0] == i + 2 and named[j + 2][1] is ident:
                names.append(text + "::" + named[j + 2][2])
                j += 3
                continue
            if k is ident:
                names.append(text)
            j += 1
        return names

    def _finish_key(self, h, names, instances):
        enc = "utf-8"
        for s in self.refs.symbols_of_names(names):
            h.update(b"\n" + self.symbol_text(s).encode(enc, "surrogateescape"))
        for n in instances:
            h.update(b"\n" + self.definition_text(n).encode(enc, "surrogateescape"))
        return h.hexdigest()[:32]
