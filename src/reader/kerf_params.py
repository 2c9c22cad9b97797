"""Parameters an instance can override, and what depends on them.

slang elaborates the module with one value per parameter (its default, or
the value given with kerf's `--param NAME=VALUE`, which reaches slang as a
top-level override). A rewrite of logic whose function depends on a
parameter is only right for that value, yet every instance of the module
may set another one. So, by default, a member whose function depends on an
overridable parameter -- directly, or through localparams, typedefs,
signal widths or functions whose declarations name it (kerf_symbols.Refs)
-- is kept as written. A parameter pinned with `--param` no longer counts:
logic depending on it is restructured for that value, and the writer puts
an elaboration-time guard in the file (src/emit/guard.cpp) so that a build
setting another value stops instead of using the specialised logic.

Overridable, per IEEE 1800-2017 6.20.1 and 23.10: a parameter of the
module's parameter port list, or a body `parameter` when the module has no
parameter port list. slang reports exactly these as not `isLocalParam`.
Type parameters count too; they cannot be pinned.
"""

import pyslang
from pyslang import ast, syntax

SK = ast.SymbolKind
SXK = syntax.SyntaxKind


def overridable(body):
    """The module's parameters an instance can set, in declaration order."""
    out = []
    for sym in body:
        if sym.kind in (SK.Parameter, SK.TypeParameter) and not sym.isLocalParam:
            out.append(sym)
    return out


def implicit_type(sym):
    """True when the parameter is declared without a type or range (`parameter W = 4`):
    its type then follows the value an instance gives (IEEE 1800-2017 6.20.2)."""
    if sym.kind != SK.Parameter:
        return False
    ts = sym.declaredType.typeSyntax
    if ts is None:
        return True
    if ts.kind != SXK.ImplicitType:
        return False
    return str(ts).strip() == ""


def value_literal(sym, sv_bits):
    """A sized Verilog literal of the parameter's value, or None when it is not integral."""
    t = sym.type
    v = sym.value
    if not t.isIntegral or not isinstance(v.value if hasattr(v, "value") else None, pyslang.SVInt):
        return None
    w = t.bitWidth
    bits = sv_bits(v.value, w)
    s = "s" if t.isSigned else ""
    if "x" in bits or "z" in bits:
        return "%d'%sb%s" % (w, s, bits)
    return "%d'%sh%x" % (w, s, int(bits, 2))


def check_pinned(body, pinned):
    """Error message for a --param name that is not an overridable value parameter, or None."""
    params = {p.name: p for p in overridable(body)}
    for name in pinned:
        p = params.get(name)
        if p is not None:
            if p.kind == SK.TypeParameter:
                return "--param %s: '%s' is a type parameter; only value parameters can be pinned" % (name, name)
            if not p.type.isIntegral:
                return ("--param %s: '%s' has the type '%s'; only integral parameters can be pinned"
                        % (name, name, p.type))
            continue
        other = body.find(name)
        if other is not None and other.kind == SK.Parameter:
            return ("--param %s: '%s' is a localparam of module '%s' (or a body parameter of a module with a "
                    "parameter port list), which no instance can set" % (name, name, body.name))
        names = ", ".join(sorted(params)) or "none"
        return "--param %s: module '%s' has no parameter '%s' (parameters an instance can set: %s)" % (
            name, body.name, name, names)
    return None


def describe(body, pinned, used_by, sv_bits, src_of):
    """The description's `parameters` list."""
    out = []
    for p in overridable(body):
        e = {"name": p.name, "kind": "type" if p.kind == SK.TypeParameter else "value",
             "pinned": p.name in pinned, "members": used_by.get(p.name, 0), "src": src_of(p)}
        if p.kind == SK.Parameter:
            e["value"] = str(p.value)
            lit = value_literal(p, sv_bits)
            if lit is not None:
                e["literal"] = lit
            e["implicit_type"] = implicit_type(p)
        else:
            e["value"] = str(p.targetType.type)
        out.append(e)
    return out
