// references.cpp — naming bits of a signal as its declared type allows.
//
// A range of bits is resolved against the type from the outside in (IEEE
// 1800-2017 7.4.5: the leftmost packed dimension varies most slowly; 7.2.1:
// the first member of a packed struct is the most significant): a range
// inside one element or field descends into it, a range of whole elements
// is one part select, anything else is split into pieces.
#include "kerf/frontend/references.h"

#include <fmt/format.h>

#include <algorithm>

namespace kerf::frontend {

namespace {

// Types nest only as deep as their declarations do; this only guards against a
// malformed table.
constexpr int kMaxTypeDepth = 256;

/// One select of the resolution: text, the bits it covers, and how it may be assigned.
struct Piece {
    std::string text;
    int lo = 0, count = 1;
    bool enumBit = false;     ///< a one-bit enum: assigned through its named values or a cast
    TypeId type = kNoId;
};

int indexOf(int msb, int lsb, int offset) { return msb >= lsb ? lsb + offset : lsb - offset; }

std::string slice(int msb, int lsb, int lo, int count) {
    if (count == 1) return fmt::format("[{}]", indexOf(msb, lsb, lo));
    return fmt::format("[{}:{}]", indexOf(msb, lsb, lo + count - 1), indexOf(msb, lsb, lo));
}

class Resolver {
public:
    Resolver(const Ir& ir, bool target) : ir_(ir), target_(target) {}

    /// Pieces (least significant first) naming bits [lo, lo+count) of a value of type `t` written `text`.
    void resolve(TypeId t, const std::string& text, int lo, int count, int depth, std::vector<Piece>& out) const {
        if (t == kNoId || t >= ir_.types.size() || depth > kMaxTypeDepth) {
            out.push_back({text + (count == 1 ? fmt::format("[{}]", lo) : fmt::format("[{}:{}]", lo + count - 1, lo)),
                           lo, count, false, kNoId});
            return;
        }
        const Type& ty = ir_.types[t];
        bool whole = lo == 0 && count == ty.width;
        switch (ty.kind) {
        case TypeKind::Logic:
            out.push_back({text, lo, count, false, t});
            return;
        case TypeKind::Vector:
            out.push_back({whole ? text : text + slice(ty.msb, ty.lsb, lo, count), lo, count, false, t});
            return;
        case TypeKind::Enum: {
            const Type* base = ty.base < ir_.types.size() ? &ir_.types[ty.base] : nullptr;
            if (!base || base->kind != TypeKind::Vector) {
                out.push_back({text, lo, count, ty.width == 1, t});
                return;
            }
            // A part select of an enum is a plain vector: as a target it needs no cast.
            bool plain = whole && !target_;
            out.push_back({plain ? text : text + slice(base->msb, base->lsb, lo, count), lo, count, false, t});
            return;
        }
        case TypeKind::Array: {
            if (whole) {
                out.push_back({text, lo, count, false, t});
                return;
            }
            const Type& el = ir_.types[ty.element];
            int ew = std::max(el.width, 1);
            int k1 = lo / ew, k2 = (lo + count - 1) / ew;
            if (k1 == k2) {
                resolve(ty.element, text + fmt::format("[{}]", indexOf(ty.msb, ty.lsb, k1)), lo - k1 * ew, count,
                        depth + 1, out);
                return;
            }
            if (lo % ew == 0 && count % ew == 0) {
                out.push_back({text + slice(ty.msb, ty.lsb, k1, k2 - k1 + 1), lo, count, false, kNoId});
                return;
            }
            // A partial first element, whole elements, a partial last element.
            int pos = lo, end = lo + count;
            while (pos < end) {
                int k = pos / ew;
                int elemEnd = (k + 1) * ew;
                if (pos % ew == 0 && end >= elemEnd) {
                    int k2w = (end / ew) - 1;
                    out.push_back({text + slice(ty.msb, ty.lsb, k, k2w - k + 1), pos, (k2w - k + 1) * ew, false, kNoId});
                    pos = (k2w + 1) * ew;
                } else {
                    int n = std::min(end, elemEnd) - pos;
                    std::vector<Piece> sub;
                    resolve(ty.element, text + fmt::format("[{}]", indexOf(ty.msb, ty.lsb, k)), pos - k * ew, n,
                            depth + 1, sub);
                    for (auto& p : sub) {
                        p.lo += k * ew;
                        out.push_back(std::move(p));
                    }
                    pos += n;
                }
            }
            return;
        }
        case TypeKind::Struct:
        case TypeKind::Union: {
            if (whole || ty.fields.empty()) {
                out.push_back({text, lo, count, false, t});
                return;
            }
            if (ty.kind == TypeKind::Union) {
                const TypeField& f = ty.fields.front();
                resolve(f.type, text + "." + f.name, lo, count, depth + 1, out);
                return;
            }
            std::vector<const TypeField*> fields;
            for (const auto& f : ty.fields) fields.push_back(&f);
            std::sort(fields.begin(), fields.end(), [](auto* a, auto* b) { return a->offset < b->offset; });
            for (const TypeField* f : fields) {
                int fw = f->type < ir_.types.size() ? ir_.types[f->type].width : 0;
                int a = std::max(lo, f->offset), b = std::min(lo + count, f->offset + fw);
                if (a >= b) continue;
                const Type* ft = f->type < ir_.types.size() ? &ir_.types[f->type] : nullptr;
                if (ft && ft->kind == TypeKind::Enum && fw > 1 && (target_ || b - a != fw)) {
                    // Bits of an enum field are named through the struct, which is itself a
                    // vector [width-1:0] (7.2.1): `req[10]` rather than `req.st[1]`, which
                    // some simulators resolve to the wrong bits.
                    out.push_back({text + slice(ty.width - 1, 0, a, b - a), a, b - a, false, kNoId});
                    continue;
                }
                std::vector<Piece> sub;
                resolve(f->type, text + "." + f->name, a - f->offset, b - a, depth + 1, sub);
                for (auto& p : sub) {
                    p.lo += f->offset;
                    out.push_back(std::move(p));
                }
            }
            return;
        }
        case TypeKind::Other:
            out.push_back({text + (count == 1 ? fmt::format("[{}]", lo) : fmt::format("[{}:{}]", lo + count - 1, lo)),
                           lo, count, false, t});
            return;
        }
    }

private:
    const Ir& ir_;
    bool target_;
};

std::string concat(const std::vector<Piece>& pieces) {
    if (pieces.size() == 1) return pieces.front().text;
    std::string s = "{";
    for (std::size_t i = pieces.size(); i-- > 0;) {
        s += pieces[i].text;
        if (i) s += ", ";
    }
    return s + "}";
}

std::vector<Piece> piecesOf(const ModuleDesc& m, const std::string& signal, int lo, int count, bool target) {
    std::vector<Piece> out;
    auto it = m.signals.find(signal);
    std::string name = verilogName(signal);
    if (it == m.signals.end()) {
        out.push_back({name + (count == 1 ? fmt::format("[{}]", lo) : fmt::format("[{}:{}]", lo + count - 1, lo)),
                       lo, count, false, kNoId});
        return out;
    }
    const Signal& s = it->second;
    if (s.type == kNoId || s.type >= m.ir.types.size() || !s.packed) {
        // No declared type to go by: the flattened range of the signal.
        if (!s.vector && s.width == 1) out.push_back({name, lo, count, false, kNoId});
        else out.push_back({name + slice(s.msb, s.lsb, lo, count), lo, count, false, kNoId});
        return out;
    }
    if (!s.bitNames.empty() && !(lo == 0 && count == s.width)) {
        // Bits the source selects only by named values (bit_names.cpp): `state[IDLE]`, one
        // select per named bit; bits no value names by their indices, as a slice when adjacent.
        int pos = lo, end = lo + count;
        while (pos < end) {
            const std::string& bn = s.bitNames[static_cast<std::size_t>(pos)];
            if (!bn.empty()) {
                out.push_back({name + "[" + bn + "]", pos, 1, false, kNoId});
                ++pos;
                continue;
            }
            int run = pos;
            while (run < end && s.bitNames[static_cast<std::size_t>(run)].empty()) ++run;
            out.push_back({name + slice(s.msb, s.lsb, pos, run - pos), pos, run - pos, false, kNoId});
            pos = run;
        }
        return out;
    }
    Resolver(m.ir, target).resolve(s.type, name, lo, count, 0, out);
    std::sort(out.begin(), out.end(), [](const Piece& a, const Piece& b) { return a.lo < b.lo; });
    return out;
}

} // namespace

std::string referenceText(const ModuleDesc& m, const std::string& signal, int lo, int count) {
    return concat(piecesOf(m, signal, lo, count, false));
}

std::string referenceText(const ModuleDesc& m, const BitRef& bit) {
    return referenceText(m, bit.signal, bit.offset, 1);
}

std::vector<TargetPiece> targetPieces(const ModuleDesc& m, const std::string& signal, int lo, int count) {
    std::vector<Piece> raw = piecesOf(m, signal, lo, count, true);
    std::vector<TargetPiece> out;
    std::vector<Piece> run;   // consecutive plain pieces: one concatenation target
    auto flush = [&] {
        if (run.empty()) return;
        TargetPiece t;
        t.lo = run.front().lo;
        t.count = run.back().lo + run.back().count - t.lo;
        t.lhs = concat(run);
        out.push_back(std::move(t));
        run.clear();
    };
    for (auto& p : raw) {
        if (!p.enumBit) {
            run.push_back(std::move(p));
            continue;
        }
        flush();
        TargetPiece t;
        t.lo = p.lo;
        t.count = p.count;
        t.lhs = p.text;
        const Type& ty = m.ir.types[p.type];
        const EnumMember *zero = nullptr, *one = nullptr;
        for (const auto& v : ty.values) {
            if (v.bits == "0" && !v.ref.empty() && !zero) zero = &v;
            if (v.bits == "1" && !v.ref.empty() && !one) one = &v;
        }
        if (zero && one) {
            // `v ? ON : OFF` names the values: accepted where a cast is not (some simulators).
            t.valuePrefix = "(";
            t.valueSuffix = fmt::format(") ? {} : {}", one->ref, zero->ref);
        } else if (!ty.ref.empty()) {
            t.valuePrefix = ty.ref + "'(";
            t.valueSuffix = ")";
        }
        out.push_back(std::move(t));
    }
    flush();
    return out;
}

} // namespace kerf::frontend
