// bit_names.cpp — bits of a vector the source selects only by named values.
//
// A one-hot controller written in the "reverse case" style (common trade practice) indexes its
// state and next-state vectors by an enum of bit positions: `state[IDLE]`, `next[LOAD] = 1'b1`.
// Issue 10 asks that the rewrite refer to enum constants by name as the source does, never by
// raw bit position (F291). The rule, per module signal declared as a one-dimensional vector:
//   - every select of its bits in the described expressions (reads and targets) is an element
//     select whose index is a constant of an enum type (slang types the index `IDLE` as the enum,
//     IEEE 1800-2017 6.19, so a literal `state[0]` is a constant of another type and never
//     mistaken for a name); a part select, a variable index or a literal index anywhere makes the
//     signal keep raw positions;
//   - all those indices are values of one enum type whose values the module can name (`ref`);
//   - then each bit that a value of that enum names (the value is its declared index) is written
//     `sig[VALUE]`; a bit no value names keeps its index.
// Whole uses of the signal (`next = '0`) do not count against it. Localparams used as indices are
// not named this way: the reader shares a constant leaf between `IDLE` and a literal `0` of the
// same type, so the description cannot tell which one a select used.
#include "kerf/frontend/module.h"

#include <algorithm>
#include <map>

namespace kerf::frontend {

void nameSelectedBits(ModuleDesc& m) {
    const Ir& ir = m.ir;
    // Per signal: the enum type its indices have (kNoId until the first), or poisoned.
    struct Use {
        TypeId enumType = kNoId;
        bool poisoned = false;
        std::uint32_t firstNamed = kNoId;   ///< byte offset of the earliest select by name
    };
    std::map<std::string, Use> uses;
    auto signalOfRef = [&](ExprId id) -> const Signal* {
        if (id >= ir.exprs.size() || ir.exprs[id].kind != ExprKind::Ref) return nullptr;
        const Signal* s = m.signalOf(ir.exprs[id].a);
        if (!s || s->type == kNoId || s->type >= ir.types.size()) return nullptr;
        const Type& t = ir.types[s->type];
        if (t.kind != TypeKind::Vector || t.width < 2 || t.width != s->width) return nullptr;
        return s;
    };
    for (const Expr& e : ir.exprs) {
        if (e.kind != ExprKind::Index && e.kind != ExprKind::Range && e.kind != ExprKind::Indexed) continue;
        const Signal* s = signalOfRef(e.a);
        if (!s) continue;
        Use& u = uses[s->name];
        if (u.poisoned) continue;
        bool named = false;
        if (e.kind == ExprKind::Index && e.b < ir.exprs.size()) {
            const Expr& ix = ir.exprs[e.b];
            if (ix.kind == ExprKind::Const && ix.type < ir.types.size() &&
                ir.types[ix.type].kind == TypeKind::Enum && (u.enumType == kNoId || u.enumType == ix.type))
                named = true, u.enumType = ix.type;
        }
        if (named && e.start != kNoId) u.firstNamed = std::min(u.firstNamed, e.start);
        if (!named) u.poisoned = true;
    }
    // The enum's values are declared before the first select that names them; the rewrite may
    // name them in any statement touching the signal, so the first of those (in source order)
    // must hold that select, and all must be in one file (a statement above the enum's
    // declaration cannot name its values: IEEE 1800-2017 6.18, declared before use).
    auto declaredInTime = [&](const std::string& name, std::uint32_t firstNamed) {
        const Member* first = nullptr;
        for (const Member& mem : m.members) {
            if (mem.kind == MemberKind::Kept) continue;
            auto has = [&](const std::vector<std::string>& v) { return std::find(v.begin(), v.end(), name) != v.end(); };
            if (!has(mem.reads) && !has(mem.writes)) continue;
            if (first && mem.src.file != first->src.file) return false;
            if (!first || mem.src.start < first->src.start) first = &mem;
        }
        return first && firstNamed != kNoId && first->src.start <= firstNamed && firstNamed < first->src.end;
    };
    for (const auto& [name, u] : uses) {
        if (u.poisoned || u.enumType == kNoId || !declaredInTime(name, u.firstNamed)) continue;
        Signal& s = m.signals.at(name);
        const Type& et = ir.types[u.enumType];
        std::vector<std::string> names(static_cast<std::size_t>(s.width));
        bool any = false, clash = false;
        for (const auto& v : et.values) {
            if (v.ref.empty() || v.bits.empty()) continue;
            long value = 0;
            bool ok = true;
            for (char c : v.bits) {
                if ((c != '0' && c != '1') || value > (1L << 30)) ok = false;
                value = value * 2 + (c == '1');
            }
            if (!ok) continue;
            int off = s.offsetOf(static_cast<int>(value));
            if (off < 0) continue;
            auto& slot = names[static_cast<std::size_t>(off)];
            if (!slot.empty()) clash = true;
            slot = v.ref;
            any = true;
        }
        if (any && !clash) s.bitNames = std::move(names);
    }
}

} // namespace kerf::frontend
