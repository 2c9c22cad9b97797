"""Keep what other builds of the same source could see differently.

Entry points called by kerf_describe.Describer.run (two small hooks):

- `restrict(describer, members)`: members whose function depends on an
  overridable parameter that is not pinned (kerf_params.py), or on the
  preprocessor (kerf_preproc.py), become kept members with the reason;
  the text the current defines leave out becomes kept members of its own.
  (Generate branches another parameter value would take already count
  as reads: the describer's collection visits uninstantiated blocks.)
- `finish(describer, members, description)`: a `match_key` on every
  member (kerf_symbols.Keys; `kerf equiv` and the proof pair kept statements
  by it), the description's `parameters` list and its `conditionals`.

Settings come from kerf_read.py through module globals (`PINNED`,
`DEFINES`, `AS_BUILT`), like kerf_describe.GIVEN_FILES.
"""

import hashlib
import zlib

from pyslang import ast, syntax

import kerf_params
from kerf_preproc import Preproc
from kerf_symbols import Keys, Refs, Tokens, TK, directive_name, node_tokens

SK = ast.SymbolKind
SXK = syntax.SyntaxKind

PINNED = {}          # name -> value text, from --param
DEFINES = []         # names given with -D
AS_BUILT = False     # describe this build only (kerf equiv): lower what depends on parameters or defines


class _State:
    def __init__(self, d):
        self.tokens = Tokens(d.comp)
        self.refs = Refs(d.body)
        self.pre = Preproc(self.tokens, d, DEFINES)
        self.params = kerf_params.overridable(d.body)
        self.param_set = set(self.params)
        # A name that refers to a type parameter resolves to its type alias (slang): the
        # alias stands for the parameter (F122).
        self.param_of_alias = {p.typeAlias: p for p in self.params if p.kind == SK.TypeParameter}
        self.type_params = {p.name for p in self.params if p.kind == SK.TypeParameter}
        self.keys = Keys(d.comp, self.tokens, self.refs)
        self.used_by = {}
        self.syntax_by_src = {}      # (file, start, end) -> the member's syntax node
        self.node_by_src = {}        # (file, start, end) -> the syntax node holding every member's text
        self.instances = None

    def seed(self, sym):
        r = set()
        sym = self.param_of_alias.get(sym, sym)
        if sym in self.param_set:
            r.add(("param", sym.name))
        why = self.pre.symbol_reason(sym, self.refs)
        if why is not None:
            r.add(("define", why))
        return r

    def anything_varies(self):
        """False when no member can depend on parameters or defines: no overridable
        parameter, no conditional region, no directive inside the module and no
        unstable macro used anywhere. Then the per-member analysis is skipped."""
        if self.params or self.pre.regions:
            return True
        m = self.pre.mod
        for bid, dirs in self.tokens.directives.items():
            for start, end, s in dirs:
                if s.kind != SXK.MacroUsage:
                    if m is not None and bid == m[0] and m[1] <= start < m[2]:
                        return True
                    continue
                names = [directive_name(s.directive)]
                if s.args is not None:
                    names += [directive_name(t) for t in node_tokens(s.args) if t.kind == TK.Directive]
                if any(self.pre.macro_reason(n) is not None for n in names):
                    return True
        return False


def _state(d):
    st = getattr(d, "_kerf_variants", None)
    if st is None:
        st = _State(d)
        d._kerf_variants = st
    return st


def _member_node(d, m, sym):
    if sym is None:
        return None
    if m.get("net_decl"):
        syn = sym.syntax
        return syn.parent if syn is not None and syn.parent is not None else syn
    return d.member_syntax(sym)


def _kept_what(m):
    if m["kind"] == "assign":
        return "assign"
    return {"always_comb": "always_comb", "always_star": "always"}.get(m.get("style"), "always")


def _src_key(src):
    return (src["file"], src["start"], src["end"])


def restrict(d, members):
    st = _state(d)
    analyse = not AS_BUILT and st.anything_varies()
    out = []
    for m in members:
        sym = m.pop("_sym", None)
        node = None
        if sym is not None:
            node = _member_node(d, m, sym)
            if node is not None:
                st.node_by_src.setdefault(_src_key(m["src"]), node)
                if m["kind"] == "kept" or analyse:
                    st.syntax_by_src.setdefault(_src_key(m["src"]), node)
                else:
                    node = None
        if m["kind"] in ("assign", "comb") and analyse and node is not None:
            # `assign a = x, b = y;` has one member per assignment: look at this one only.
            own = sym.syntax if sym.kind == SK.ContinuousAssign and sym.syntax is not None else node
            toks = node_tokens(own)
            loc = st.tokens._file_loc(node.sourceRange.start)
            s = m["src"]
            why = st.pre.member_reason(loc.buffer.id, s["start"], s["end"], toks)
            named = st.refs.symbols_of_tokens(toks)
            if m.get("net_decl") and sym is not None:
                named.append(sym)            # the net's own declared type
            reasons = st.refs.closure(named, st.seed)
            params = sorted({r[1] for r in reasons if r[0] == "param"})
            defines = sorted(r[1] for r in reasons if r[0] == "define")
            if why is None and defines:
                why = "it depends on a declaration other builds may see differently: " + defines[0]
            free = [p for p in params if p not in PINNED]
            if why is None and free:
                values = [p for p in free if p not in st.type_params]
                why = ("its function depends on the parameter%s %s, which an instance can override "
                       % ("s" if len(free) > 1 else "", ", ".join(free)))
                why += ("(restructure it for one value with --param %s=VALUE)" % values[0] if values else
                        "(a type parameter, which --param cannot pin)")
            if why is not None:
                for p in free:
                    st.used_by[p] = st.used_by.get(p, 0) + 1
                if m.get("net_decl"):
                    km = d.kept_member("assign", why, m["src"], [sym.initializer],
                                       extra_writes=[d.sig.get(sym)])
                    km["net_decl"] = True
                else:
                    km = d.kept_member(_kept_what(m), why, m["src"], [sym])
                for k in ("_localized", "_symbol", "_what"):
                    m.pop(k, None)
                m = km
            m["parameters"] = params
        elif m["kind"] == "kept" and analyse and node is not None and sym is not None:
            # Kept anyway; say which overridable parameters it depends on (for the summary).
            reasons = st.refs.closure(st.refs.symbols_of_tokens(node_tokens(node)), st.seed)
            m["parameters"] = sorted({r[1] for r in reasons if r[0] == "param"})
        out.append(m)
    # Even for one build (AS_BUILT), the text it leaves out is kept and compared by its tokens:
    # `kerf equiv` must not call two files equal that differ there.
    out.extend(st.pre.excluded_members(set(d.sig_by_name)))
    return out


def _instances_in(d, st, file, start, end):
    """Names of the definitions instantiated by code in [start, end) of `file`, elaborated or not."""
    if st.instances is None:
        idx = []
        sm = st.tokens.sm

        def cb(n):
            if isinstance(n, (ast.InstanceSymbol, ast.UninstantiatedDefSymbol)):
                loc = n.location
                if not sm.isFileLoc(loc):
                    loc = sm.getFullyExpandedLoc(loc)
                name = n.definition.name if isinstance(n, ast.InstanceSymbol) else n.definitionName
                idx.append((d.src.name(loc.buffer), loc.offset, name))
                return ast.VisitAction.Skip
            if isinstance(n, (ast.ProceduralBlockSymbol, ast.ContinuousAssignSymbol)):
                # Instances are members of scopes, never inside processes or assignments:
                # their statements and expressions (most of a big design) need no visit.
                return ast.VisitAction.Skip
            return ast.VisitAction.Advance

        d.body.visit(cb)
        st.instances = idx
    return sorted({n for (f, o, n) in st.instances if f == file and start <= o < end})


def _text_listed(d, src, listed):
    """Whether the member text at `src` has its (byte length, CRC-32) in `listed`."""
    n = src["end"] - src["start"]
    if (n, None) not in listed:
        return False
    data = d.src.bytes_of(src["file"])
    if data is None:
        return True     # cannot tell: key it as usual
    return (n, zlib.crc32(data[src["start"]:src["end"]])) in listed


def finish(d, members, description):
    import kerf_describe
    st = _state(d)
    for m in members:
        key_text = m.pop("_key_text", None)
        # Every member gets a key: the lowering may still decline an assignment or a block,
        # and then it is paired by this key like any kept member.
        what = "kept:" + (m.get("what", "") if m["kind"] == "kept" else _kept_what(m))
        if key_text is not None:
            m["match_key"] = hashlib.sha256((what + "\n" + key_text).encode("utf-8", "surrogateescape")) \
                .hexdigest()[:32]
            continue
        src = m["src"]
        if kerf_describe.READ_BACK is not None and not _text_listed(d, src, kerf_describe.READ_BACK):
            # kerf's own rewrite: this text is no member's of the design it came from, so no
            # member there can pair with it (a kept statement comes back byte for byte).
            m["match_key"] = "unmatched:%s:%d:%d" % (src["file"], src["start"], src["end"])
            continue
        node = st.syntax_by_src.get(_src_key(src))
        whole = None         # a syntax node whose tokens are exactly the member's
        toks = None
        if isinstance(node, syntax.SyntaxNode):
            whole = node
        elif node is not None:
            toks = node_tokens(node)
        else:
            holder = st.node_by_src.get(_src_key(src))
            if holder is not None:
                # The member's own syntax gives the tokens of its range directly (the common
                # case); indexing every token of every file costs time and memory in
                # proportion to the whole design, for each run.
                r = holder.sourceRange
                if st.tokens.sm.isFileLoc(r.start) and d.src.name(r.start.buffer) == src["file"]:
                    if st.tokens.covers_exactly(holder, r.start.buffer.id, src["start"], src["end"]):
                        whole = holder
                    else:
                        toks = st.tokens.node_in_range(holder, r.start.buffer.id, src["start"], src["end"])
        if whole is not None:
            key = st.keys.node_key(what, whole, _instances_in(d, st, src["file"], src["start"], src["end"]))
            m["match_key"] = key if key is not None else \
                "unmatched:%s:%d:%d" % (src["file"], src["start"], src["end"])
            continue
        if toks is None:
            bid = next((b for b, buf in st.tokens.buffers.items() if d.src.name(buf) == src["file"]), None)
            if bid is None:
                st.tokens.in_range(-1, 0, 0)          # builds the index, which knows every buffer
                bid = next((b for b, buf in st.tokens.buffers.items() if d.src.name(buf) == src["file"]),
                           None)
            toks = [e[4] for e in st.tokens.in_range(bid, src["start"], src["end"])] if bid is not None else []
        if not toks:
            # Nothing to compare it by: a key no other member can have.
            m["match_key"] = "unmatched:%s:%d:%d" % (src["file"], src["start"], src["end"])
            continue
        m["match_key"] = st.keys.key(what, toks, _instances_in(d, st, src["file"], src["start"], src["end"]))
    from kerf_describe import sv_bits
    description["parameters"] = kerf_params.describe(d.body, set(PINNED), st.used_by, sv_bits, d.symbol_src)
    description["conditionals"] = st.pre.conditionals()
    description["port_members"] = port_members(d.body)


def port_members(body):
    """Members of packed struct and union ports, for counterexamples shown by member:
    {port: [{"name": "inner.a", "offset": bit offset from the LSB, "width": W}...]},
    leaves only, most significant first (declaration order of a struct)."""
    out = {}

    def leaves(t, prefix, base, acc):
        ct = t.canonicalType
        if ct.kind not in (SK.PackedStructType, SK.PackedUnionType):
            acc.append({"name": prefix, "offset": base, "width": int(ct.bitWidth)})
            return
        for f in ct:
            if f.kind == SK.Field:
                leaves(f.type, (prefix + "." if prefix else "") + f.name, base + int(f.bitOffset), acc)

    for p in body.portList:
        t = getattr(p, "type", None)
        if t is None or t.canonicalType.kind not in (SK.PackedStructType, SK.PackedUnionType):
            continue
        acc = []
        leaves(t, "", 0, acc)
        if acc:
            out[p.name] = acc
    return out
