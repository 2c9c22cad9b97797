"""Declared types for kerf's module description: the `types` table.

Every signal, local and expression node of the description names an entry of
this table by index. An entry says how the bits of a value are organised as
the source declares them (docs/reader-format.md, "Types"): a single bit, a
vector with its declared range, a packed array of non-bit elements (each
dimension one level), a packed struct or union with its fields and their bit
offsets, an enum with its base type and named values. The writer uses this to
name bits the way the source does (`mem[1][3]`, `req.hdr.valid`, a plain name
for a one-bit value); the lowering uses width and signedness.

Entries are deduplicated by content, so two slang types with the same shape
share one entry.
"""

import json

import pyslang
from pyslang import ast

SK = ast.SymbolKind
_BIN = pyslang.LiteralBase.Binary


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


class Types:
    """The `types` table: slang types (and plain widths) to entry indices."""

    def __init__(self, scope):
        self.scope = scope          # the module body: names are made valid from here
        self.entries = []           # TYPE dicts, in index order
        self._by_key = {}           # canonical JSON of an entry -> index
        self._by_type = {}          # slang type object (kept alive) -> index
        self._by_shape = {}         # (width, signed) -> index of a plain vector type
        self._info = {}             # slang type object (kept alive) -> Info

    # -- plain vectors (results of operators kerf describes itself) -------------

    def vector(self, width, signed):
        key = (width, signed)
        got = self._by_shape.get(key)
        if got is None:
            if width == 1 and not signed:
                e = {"kind": "logic", "width": 1, "signed": False, "four_state": True}
            else:
                e = {"kind": "vector", "width": width, "signed": signed, "four_state": True,
                     "msb": width - 1, "lsb": 0}
            got = self._add(e)
            self._by_shape[key] = got
        return got

    # -- slang types ---------------------------------------------------------------

    def of(self, t):
        """Index of the entry for slang type `t`."""
        got = self._by_type.get(t)
        if got is None:
            got = self._add(self._describe(t))
            self._by_type[t] = got
        return got

    def info(self, t):
        """(index, width, signed, integral, msb, lsb) of slang type `t`; msb/lsb are the
        declared range of its outermost packed dimension ([width-1:0] when it has none).
        Cached per type object: this is on the reader's hottest path."""
        got = self._info.get(t)
        if got is None:
            ti = self.of(t)
            ct = t.canonicalType
            integral = bool(ct.isIntegral)
            w, s = self.entries[ti]["width"], self.entries[ti]["signed"]
            if ct.kind == SK.PackedArrayType:
                r = ct.range
                msb, lsb = r.left, r.right
            else:
                msb, lsb = w - 1, 0
            got = (ti, w, s, integral, msb, lsb)
            self._info[t] = got
        return got

    def width_signed(self, index):
        e = self.entries[index]
        return e["width"], e["signed"]

    def _add(self, e):
        key = json.dumps(e, sort_keys=True, separators=(",", ":"))
        got = self._by_key.get(key)
        if got is None:
            got = len(self.entries)
            self.entries.append(e)
            self._by_key[key] = got
        return got

    def _describe(self, t):
        ct = t.canonicalType
        name, ref = self._type_name(t)
        if not ct.isIntegral:
            w = ct.bitstreamWidth if ct.isFixedSize else 0
            e = {"kind": "other", "width": w, "signed": False, "four_state": bool(ct.isFourState),
                 "text": str(t)}
            return self._named(e, name, ref)
        w = ct.bitWidth
        signed = bool(ct.isSigned)
        four = bool(ct.isFourState)
        k = ct.kind
        if k == SK.ScalarType:
            e = {"kind": "logic", "width": 1, "signed": signed, "four_state": four}
        elif k == SK.PredefinedIntegerType:
            e = {"kind": "vector", "width": w, "signed": signed, "four_state": four,
                 "msb": w - 1, "lsb": 0}
        elif k == SK.PackedArrayType:
            r = ct.range
            el = ct.elementType
            elc = el.canonicalType
            if elc.kind == SK.ScalarType and not el.isAlias:
                e = {"kind": "vector", "width": w, "signed": signed, "four_state": four,
                     "msb": r.left, "lsb": r.right}
            else:
                e = {"kind": "array", "width": w, "signed": signed, "four_state": four,
                     "msb": r.left, "lsb": r.right, "element": self.of(el)}
        elif k in (SK.PackedStructType, SK.PackedUnionType):
            fields = []
            for f in ct:
                if f.kind == SK.Field:
                    fields.append({"name": f.name, "offset": f.bitOffset, "type": self.of(f.type)})
            e = {"kind": "struct" if k == SK.PackedStructType else "union", "width": w,
                 "signed": signed, "four_state": four, "fields": fields}
        elif k == SK.EnumType:
            values = []
            for v in ct:
                if v.kind != SK.EnumValue:
                    continue
                cv = v.value.value
                bits = sv_bits(cv, w) if isinstance(cv, pyslang.SVInt) else None
                values.append({"name": v.name, "bits": bits, "ref": self._value_ref(v)})
            e = {"kind": "enum", "width": w, "signed": signed, "four_state": four,
                 "base": self.of(ct.baseType), "values": values}
        else:
            e = {"kind": "vector", "width": w, "signed": signed, "four_state": four,
                 "msb": w - 1, "lsb": 0}
        return self._named(e, name, ref)

    @staticmethod
    def _named(e, name, ref):
        if name:
            e["name"] = name
            e["ref"] = ref
        return e

    # -- names valid in the module -----------------------------------------------

    def _visible(self, name, sym):
        """True when `name` looked up from the module body finds `sym`."""
        found = self.scope.lookupName(name)
        return found is not None and found == sym

    def _qualified(self, name, sym):
        """`name` when the module sees `sym` by it, `pkg::name` for a package member, else None."""
        if self._visible(name, sym):
            return name
        path = sym.hierarchicalPath          # 'pkg::type', 'pkg::type.VALUE' for package members
        if "::" in path:
            return "%s::%s" % (path.split("::", 1)[0], name)
        return None

    def _type_name(self, t):
        """(name as declared, text naming the type from the module or None) of a typedef."""
        if not t.isAlias:
            return None, None
        return t.name, self._qualified(t.name, t)

    def _value_ref(self, v):
        return self._qualified(v.name, v)
