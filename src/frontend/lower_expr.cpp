// lower_expr.cpp — expressions of the typed IR into four-valued network literals.
//
// Evaluation is iterative: an explicit stack of frames walks the expression
// (a `^` chain of tens of thousands of terms is as deep as it is long), and
// each frame combines its operands' bits once they are on the value stack.
// Selects with a constant position read only the bits they select.
// Arithmetic with two variable operands stays a word-level operation unless
// the proof asks for gates. Every operator follows IEEE 1800-2017 clause 11
// on unknown bits: bitwise operators bit by bit (11.4.8: 0 & x is 0), the
// conditional operator merges its branches on an unknown select (11.4.11),
// equality is x unless some known bits differ (11.4.5), case equality
// compares x literally (kept as written when both sides can be unknown, as x
// and z are not told apart here), arithmetic and relational results are x
// when any operand bit is (11.4.3, 11.4.4), a select with an unknown or
// out-of-range position reads x (11.5.1).
#include "lower_internal.h"

#include "kerf/frontend/references.h"

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <numeric>
#include <stdexcept>

namespace kerf::frontend::detail {

using algebra::literalVar;

// ---- Builder ----------------------------------------------------------------

Literal Builder::andN(Lits in) {
    std::sort(in.begin(), in.end());
    in.erase(std::unique(in.begin(), in.end()), in.end());
    Lits lits;
    for (Literal l : in) {
        if (l == kFalse) return kFalse;
        if (l == kTrue) continue;
        if (!lits.empty() && lits.back() == negateLiteral(l)) return kFalse;
        lits.push_back(l);
    }
    if (lits.empty()) return kTrue;
    if (lits.size() == 1) return lits[0];
    algebra::Cube c;
    c.lits = std::move(lits);
    algebra::Cover cv;
    cv.cubes.push_back(std::move(c));
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

Literal Builder::orN(Lits in) {
    std::sort(in.begin(), in.end());
    in.erase(std::unique(in.begin(), in.end()), in.end());
    Lits lits;
    for (Literal l : in) {
        if (l == kTrue) return kTrue;
        if (l == kFalse) continue;
        if (!lits.empty() && lits.back() == negateLiteral(l)) return kTrue;
        lits.push_back(l);
    }
    if (lits.empty()) return kFalse;
    if (lits.size() == 1) return lits[0];
    algebra::Cover cv;
    for (Literal l : lits) {
        algebra::Cube c;
        c.lits = {l};
        cv.cubes.push_back(std::move(c));
    }
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

Literal Builder::xor2(Literal a, Literal b) {
    if (a == kFalse) return b;
    if (b == kFalse) return a;
    if (a == kTrue) return negateLiteral(b);
    if (b == kTrue) return negateLiteral(a);
    if (a == b) return kFalse;
    if (a == negateLiteral(b)) return kTrue;
    return sop({{a, negateLiteral(b)}, {negateLiteral(a), b}});
}

Literal Builder::mux(Literal s, Literal t, Literal e) {
    if (s == kTrue || t == e) return t;
    if (s == kFalse) return e;
    if (t == kTrue && e == kFalse) return s;
    if (t == kFalse && e == kTrue) return negateLiteral(s);
    if (t == kFalse) return and2(negateLiteral(s), e);
    if (t == kTrue) return or2(s, e);
    if (e == kFalse) return and2(s, t);
    if (e == kTrue) return or2(negateLiteral(s), t);
    return sop({{s, t}, {negateLiteral(s), e}});
}

Literal Builder::sop(std::vector<Lits> cubes) {
    algebra::Cover cv;
    for (auto& cb : cubes) {
        algebra::Cube c;
        std::sort(cb.begin(), cb.end());
        c.lits = std::move(cb);
        cv.cubes.push_back(std::move(c));
    }
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

std::optional<std::uint64_t> constValue(const Bits& b) {
    std::uint64_t v = 0;
    for (std::size_t i = 0; i < b.size(); ++i) {
        if (b[i].x != kFalse || !isConst(b[i].v)) return std::nullopt;
        if (b[i].v == kTrue) {
            if (i >= 64) return std::nullopt;
            v |= std::uint64_t{1} << i;
        }
    }
    return v;
}

std::optional<std::int64_t> constantPosition(const Bits& idx, bool isSigned) {
    if (idx.empty() || idx.size() > 62) return std::nullopt;
    auto k = constValue(idx);
    if (!k) return std::nullopt;
    auto p = static_cast<std::int64_t>(*k);
    if (isSigned && ((*k >> (idx.size() - 1)) & 1)) p -= std::int64_t{1} << idx.size();
    return p;
}

namespace {

/// The w-bit constant `v` (w <= 64) as known bits.
Bits constantBits(std::uint64_t v, int w) {
    Bits r(static_cast<std::size_t>(w));
    for (int i = 0; i < w; ++i) r[i] = known(((v >> i) & 1) ? kTrue : kFalse);
    return r;
}

/// a op b on two known w-bit values (w <= 64, b != 0 for / and %): the value arithmetic of
/// IEEE 1800 11.4.2 — modulo 2^w; signed division truncates toward zero and the remainder
/// takes the sign of the first operand. Folding here keeps constant arithmetic (loop indices,
/// widths) from building gates that only fold away afterwards.
std::uint64_t foldArithmetic(BinaryOp o, std::uint64_t a, std::uint64_t b, int w, bool sign) {
    const std::uint64_t mask = w >= 64 ? ~std::uint64_t{0} : (std::uint64_t{1} << w) - 1;
    auto asSigned = [&](std::uint64_t v) {
        if (w < 64 && ((v >> (w - 1)) & 1)) v |= ~mask;
        return static_cast<std::int64_t>(v);
    };
    switch (o) {
    case BinaryOp::Add: return (a + b) & mask;
    case BinaryOp::Sub: return (a - b) & mask;
    case BinaryOp::Mul: return (a * b) & mask;
    case BinaryOp::Div:
    case BinaryOp::Mod: {
        if (!sign) return (o == BinaryOp::Div ? a / b : a % b) & mask;
        std::int64_t sa = asSigned(a), sb = asSigned(b);
        if (sb == -1) return (o == BinaryOp::Div ? std::uint64_t{0} - a : 0) & mask;   // no INT64_MIN / -1
        return static_cast<std::uint64_t>(o == BinaryOp::Div ? sa / sb : sa % sb) & mask;
    }
    default: break;
    }
    throw std::logic_error("foldArithmetic: not an arithmetic operator");
}

} // namespace

Bits extend(Bits b, int width, bool sign) {
    Bit fill = sign && !b.empty() ? b.back() : known(kFalse);
    b.resize(static_cast<std::size_t>(width), fill);
    return b;
}

Lits values(const Bits& b) {
    Lits r(b.size());
    for (std::size_t i = 0; i < b.size(); ++i) r[i] = b[i].v;
    return r;
}

namespace {

bool allKnown(const Bits& b) {
    return std::all_of(b.begin(), b.end(), [](const Bit& x) { return x.x == kFalse; });
}

} // namespace

// ---- four-valued operations ---------------------------------------------------

Literal Lowerer::anyX(const Bits& a) {
    Lits xs;
    for (const Bit& b : a)
        if (b.x != kFalse) xs.push_back(b.x);
    return xs.empty() ? kFalse : b_.orN(std::move(xs));
}

Literal Lowerer::anyS(const Bits& a) {
    Lits ss;
    for (const Bit& b : a)
        if (b.s != kFalse) ss.push_back(b.s);
    return ss.empty() ? kFalse : b_.orN(std::move(ss));
}

Bit Lowerer::bAnd(const Bits& in) {
    Lits vs;
    for (const Bit& b : in) vs.push_back(b.v);
    Literal v = b_.andN(vs);
    if (allKnown(in)) return known(v);
    // 0 when some bit is a known 0; otherwise unknown when some bit is.
    Lits zeros, xs;
    for (const Bit& b : in) {
        zeros.push_back(b_.and2(negateLiteral(b.x), negateLiteral(b.v)));
        if (b.x != kFalse) xs.push_back(b.x);
    }
    Literal x = b_.and2(b_.orN(xs), negateLiteral(b_.orN(zeros)));
    return {v, x, ruleOf(x, anyS(in))};
}

Bit Lowerer::bOr(const Bits& in) {
    Lits vs;
    for (const Bit& b : in) vs.push_back(b.v);
    Literal v = b_.orN(vs);
    if (allKnown(in)) return known(v);
    Lits ones, xs;
    for (const Bit& b : in) {
        ones.push_back(b_.and2(negateLiteral(b.x), b.v));
        if (b.x != kFalse) xs.push_back(b.x);
    }
    Literal x = b_.and2(b_.orN(xs), negateLiteral(b_.orN(ones)));
    return {v, x, ruleOf(x, anyS(in))};
}

Bit Lowerer::bCond(Bit s, Bit t, Bit e) {
    if (s.x == kFalse) return bMux(s.v, t, e);
    Literal differ = b_.orN({t.x, e.x, b_.xor2(t.v, e.v)});
    Literal x = b_.mux(s.x, differ, b_.mux(s.v, t.x, e.x));
    return {b_.mux(s.v, t.v, e.v), x, ruleOf(x, b_.orN({s.s, t.s, e.s}))};
}

Bit Lowerer::truth(const Bits& a) {
    if (allKnown(a)) return known(b_.orN(values(a)));
    Lits ones;
    for (const Bit& b : a) ones.push_back(b_.and2(negateLiteral(b.x), b.v));
    Literal one = b_.orN(ones);
    Literal x = b_.and2(negateLiteral(one), anyX(a));
    return {one, x, ruleOf(x, anyS(a))};
}

void Lowerer::xDecides(Literal x, Literal s, const char* where, const char* clause) {
    if (x == kFalse || b_.and2(x, negateLiteral(s)) == kFalse) return;
    // `x & ~s` is not always constant false in structure where only the language's rules
    // make x (an out-of-range select): those statements stay exact as long as the module
    // assigns no x. Members lowered before the first assigned x are checked at the end.
    if (!assignedXMade_) {
        if (current_) xDecidedEarly_.push_back(current_->id);
        return;
    }
    keep(fmt::format("an x the source assigns can reach {}, where Verilog decides on it (IEEE 1800 {}); "
                     "kerf does not read that x as a don't-care",
                     where, clause));
}

Bit Lowerer::equality(const Bits& a, const Bits& b, bool wild) {
    std::size_t n = std::min(a.size(), b.size());
    bool maskConst = std::all_of(b.begin(), b.end(), [](const Bit& x) { return isConst(x.x); });
    if (allKnown(a) && (allKnown(b) || (wild && maskConst))) {
        Lits x, y;
        for (std::size_t i = 0; i < n; ++i) {
            if (wild && b[i].x == kTrue) continue;   // a wildcard bit of the pattern
            x.push_back(a[i].v);
            y.push_back(b[i].v);
        }
        if (!wild && !allKnown(b)) return known(kFalse);
        return known(equal(x, y));
    }
    Lits mis, unk;
    for (std::size_t i = 0; i < n; ++i) {
        Literal care = wild ? negateLiteral(b[i].x) : kTrue;
        Literal bothKnown = b_.and2(negateLiteral(a[i].x), negateLiteral(b[i].x));
        mis.push_back(b_.andN({care, bothKnown, b_.xor2(a[i].v, b[i].v)}));
        unk.push_back(wild ? b_.and2(care, a[i].x) : b_.or2(a[i].x, b[i].x));
    }
    Literal anyMis = b_.orN(mis), anyUnk = b_.orN(unk);
    Literal x = b_.and2(negateLiteral(anyMis), anyUnk);
    return {b_.and2(negateLiteral(anyMis), negateLiteral(anyUnk)), x, ruleOf(x, b_.or2(anyS(a), anyS(b)))};
}

// ---- arithmetic and comparison on values ----------------------------------------

Literal Lowerer::equal(const Lits& a0, const Lits& b0) {
    std::size_t n = std::max(a0.size(), b0.size());
    Lits a = a0, b = b0;
    a.resize(n, kFalse);
    b.resize(n, kFalse);
    Lits terms;
    for (std::size_t i = 0; i < n; ++i) terms.push_back(negateLiteral(b_.xor2(a[i], b[i])));
    return b_.andN(terms);
}

Literal Lowerer::lessThan(Lits a, Lits b, bool sign) {
    std::size_t n = std::max(a.size(), b.size());
    Literal fa = sign && !a.empty() ? a.back() : kFalse, fb = sign && !b.empty() ? b.back() : kFalse;
    a.resize(n, fa);
    b.resize(n, fb);
    if (sign && n) {
        a[n - 1] = negateLiteral(a[n - 1]);
        b[n - 1] = negateLiteral(b[n - 1]);
    }
    Literal lt = kFalse;
    for (std::size_t i = 0; i < n; ++i) {
        Literal bitLess = b_.and2(negateLiteral(a[i]), b[i]);
        Literal same = negateLiteral(b_.xor2(a[i], b[i]));
        lt = b_.or2(bitLess, b_.and2(same, lt));
    }
    return lt;
}

Lits Lowerer::add(const Lits& a, const Lits& b, Literal cin) {
    Lits s(a.size());
    Literal c = cin;
    for (std::size_t i = 0; i < a.size(); ++i) {
        Literal x = b_.xor2(a[i], b[i]);
        s[i] = b_.xor2(x, c);
        c = b_.or2(b_.and2(a[i], b[i]), b_.and2(c, x));
    }
    return s;
}

Lits Lowerer::mul(const Lits& a, const Lits& b, int w) {
    Lits acc(static_cast<std::size_t>(w), kFalse);
    for (int i = 0; i < w; ++i) {
        Lits partial(static_cast<std::size_t>(w), kFalse);
        for (int j = 0; j + i < w; ++j) partial[i + j] = b_.and2(a[j], b[i]);
        acc = add(acc, partial, kFalse);
    }
    return acc;
}

Lits Lowerer::shift(const Lits& a, const Lits& amount, bool left, Literal fill, int w) {
    Lits cur = a;
    Literal overflow = kFalse;
    for (std::size_t k = 0; k < amount.size(); ++k) {
        if (k >= 31 || (std::size_t{1} << k) >= static_cast<std::size_t>(w)) {
            overflow = b_.or2(overflow, amount[k]);
            continue;
        }
        int sh = 1 << k;
        Lits next(cur.size());
        for (int i = 0; i < w; ++i) {
            int src = left ? i - sh : i + sh;
            Literal moved = src >= 0 && src < w ? cur[src] : fill;
            next[i] = b_.mux(amount[k], moved, cur[i]);
        }
        cur = next;
    }
    for (int i = 0; i < w; ++i) cur[i] = b_.mux(overflow, fill, cur[i]);
    return cur;
}

Lits Lowerer::divide(const Lits& a0, const Lits& b0, bool isSigned, bool remainder) {
    std::size_t w = a0.size();
    auto negate = [&](const Lits& x) {
        Lits inv(x.size());
        for (std::size_t i = 0; i < x.size(); ++i) inv[i] = negateLiteral(x[i]);
        return add(inv, Lits(x.size(), kFalse), kTrue);
    };
    auto select = [&](Literal c, const Lits& t, const Lits& e) {
        Lits r(t.size());
        for (std::size_t i = 0; i < t.size(); ++i) r[i] = b_.mux(c, t[i], e[i]);
        return r;
    };
    Literal sa = isSigned ? a0.back() : kFalse, sb = isSigned ? b0.back() : kFalse;
    Lits a = isSigned ? select(sa, negate(a0), a0) : a0;   // magnitudes
    Lits b = isSigned ? select(sb, negate(b0), b0) : b0;
    // Restoring division, most significant bit first.
    Lits rem(w, kFalse), q(w, kFalse);
    Lits nb(w);
    for (std::size_t i = 0; i < w; ++i) nb[i] = negateLiteral(b[i]);
    for (std::size_t k = w; k-- > 0;) {
        // rem = rem * 2 + a[k], kept one bit wider so the comparison sees the carry out.
        Lits wide(w + 1);
        wide[0] = a[k];
        for (std::size_t i = 0; i < w; ++i) wide[i + 1] = rem[i];
        Lits bw = b;
        bw.push_back(kFalse);
        Literal ge = negateLiteral(lessThan(wide, bw, false));
        Lits nbw = nb;
        nbw.push_back(kTrue);
        Lits diff = add(wide, nbw, kTrue);
        for (std::size_t i = 0; i < w; ++i) rem[i] = b_.mux(ge, diff[i], wide[i]);
        q[k] = ge;
    }
    if (!isSigned) return remainder ? rem : q;
    // The quotient is negative when the signs differ; the remainder takes the dividend's sign.
    if (remainder) return select(sa, negate(rem), rem);
    return select(b_.xor2(sa, sb), negate(q), q);
}

Literal Lowerer::indexIs(const Lits& idx, bool isSigned, std::int64_t p) {
    std::size_t n = idx.size();
    if (n == 0) return p == 0 ? kTrue : kFalse;
    if (n < 63) {
        std::int64_t lo = isSigned ? -(std::int64_t{1} << (n - 1)) : 0;
        std::int64_t hi = isSigned ? (std::int64_t{1} << (n - 1)) - 1 : (std::int64_t{1} << n) - 1;
        if (p < lo || p > hi) return kFalse;   // a position the index cannot name
    } else if (!isSigned && p < 0) {
        return kFalse;
    }
    Lits cv(n);
    for (std::size_t i = 0; i < n; ++i) {
        bool bit = i < 63 ? ((static_cast<std::uint64_t>(p) >> i) & 1) : p < 0;
        cv[i] = bit ? kTrue : kFalse;
    }
    return equal(idx, cv);
}

namespace {
/// Every value an index of this width and signedness can take lies in [lo, hi]: then some
/// position is always named, and the select reads x only through an unknown index.
bool indexAlwaysNames(std::size_t n, bool isSigned, std::int64_t lo, std::int64_t hi) {
    if (n == 0 || n >= 62) return n == 0 && lo <= 0 && 0 <= hi;
    std::int64_t ilo = isSigned ? -(std::int64_t{1} << (n - 1)) : 0;
    std::int64_t ihi = isSigned ? (std::int64_t{1} << (n - 1)) - 1 : (std::int64_t{1} << n) - 1;
    return lo <= ilo && ihi <= hi;
}
} // namespace

Bits Lowerer::selectElement(const Bits& v, const Bits& idx, bool idxSigned, int msb, int lsb, int ew) {
    int count = static_cast<int>(v.size()) / std::max(ew, 1);
    if (auto k = constValue(idx)) {
        std::int64_t pos = static_cast<std::int64_t>(*k);
        if (idxSigned && idx.size() < 64 && idx.size() > 0 && ((*k >> (idx.size() - 1)) & 1))
            pos -= std::int64_t{1} << idx.size();
        std::int64_t off = msb >= lsb ? pos - lsb : lsb - pos;
        Bits r(static_cast<std::size_t>(ew), kRuleX);   // out of range reads x (11.5.1)
        if (off >= 0 && off < count)
            for (int i = 0; i < ew; ++i) r[i] = v[static_cast<std::size_t>(off) * ew + i];
        return r;
    }
    // Variable select: a parallel sum over the positions the index can name
    // (the conditions are exclusive); no position, or an unknown index, reads x.
    Lits iv = values(idx);
    std::vector<Lits> vt(static_cast<std::size_t>(ew)), xt(static_cast<std::size_t>(ew)), st(static_cast<std::size_t>(ew));
    Lits hits;
    int lo = std::min(msb, lsb), hi = std::max(msb, lsb);
    for (int index = lo; index <= hi; ++index) {
        int off = dimOffset(index, msb, lsb);
        if (off < 0 || off >= count) continue;
        Literal sel = indexIs(iv, idxSigned, index);
        if (sel == kFalse) continue;
        hits.push_back(sel);
        for (int i = 0; i < ew; ++i) {
            const Bit& b = v[static_cast<std::size_t>(off) * ew + i];
            vt[i].push_back(b_.and2(sel, b.v));
            if (b.x != kFalse) xt[i].push_back(b_.and2(sel, b.x));
            if (b.s != kFalse) st[i].push_back(b_.and2(sel, b.s));
        }
    }
    // Out of range, or an unknown index: x by the rules (an index unknown because the
    // source assigned x counts as a rule too: the select's x is not the author's value).
    Literal miss = indexAlwaysNames(iv.size(), idxSigned, lo, hi) ? anyX(idx)
                 : b_.or2(negateLiteral(b_.orN(hits)), anyX(idx));
    Bits r(static_cast<std::size_t>(ew));
    for (int i = 0; i < ew; ++i) {
        xt[i].push_back(miss);
        st[i].push_back(miss);
        r[i] = {b_.orN(vt[i]), b_.orN(xt[i]), b_.orN(st[i])};
    }
    return r;
}

// ---- references ---------------------------------------------------------------

Bits Lowerer::readBits(SymbolId s, const std::vector<int>& offs) {
    int sw = ir_.symbols[s].width;
    if (isLocal(s) && env_) {
        auto it = env_->vars.find(s);
        sw = it == env_->vars.end() ? 0 : static_cast<int>(it->second.size());
    }
    Bits r;
    r.reserve(offs.size());
    for (int o : offs) r.push_back(o >= 0 && o < sw ? signalBit(s, o) : kRuleX);
    return r;
}

bool Lowerer::constantSelect(ExprId id, SymbolId& sym, std::vector<int>& offs) const {
    // Reading only the bits the chain names matters in a block that assigns some bits of a
    // signal before it reads others (F81: `st.f[0] = st.f[1] ^ a;` after `st.f[1] = b;`).
    std::vector<ExprId> chain;
    for (ExprId at = id;;) {
        const Expr& e = ir_.exprs[at];
        if (e.kind == ExprKind::Ref) {
            sym = e.a;
            break;
        }
        if (e.kind == ExprKind::Index) {
            const Expr& ix = ir_.exprs[e.b];
            if (ix.kind != ExprKind::Const || ix.width == 0 || ix.width > 62) return false;
        } else if (e.kind != ExprKind::Range) {
            return false;
        }
        chain.push_back(at);
        at = e.a;
    }
    offs.resize(static_cast<std::size_t>(std::max(ir_.symbols[sym].width, 0)));
    std::iota(offs.begin(), offs.end(), 0);
    auto through = [&](const std::vector<int>& positions) {
        std::vector<int> next;
        next.reserve(positions.size());
        for (int p : positions) next.push_back(p >= 0 && p < static_cast<int>(offs.size()) ? offs[p] : -1);
        offs = std::move(next);
    };
    for (std::size_t k = chain.size(); k-- > 0;) {
        const Expr& e = ir_.exprs[chain[k]];
        const int w = static_cast<int>(e.width);
        std::vector<int> positions;
        if (e.kind == ExprKind::Range) {
            int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
            if (lo > hi) std::swap(lo, hi);
            int elems = hi - lo + 1;
            int ew = std::max(1, w / std::max(elems, 1));
            for (int i = lo * ew; i < (hi + 1) * ew; ++i) positions.push_back(i);
        } else {
            const Expr& ix = ir_.exprs[e.b];
            std::int64_t pos = 0;
            for (std::uint32_t i = ix.width; i-- > 0;) {
                char c = ir_.constBit(ix, i);
                if (c != '0' && c != '1') return false;
                pos = pos * 2 + (c == '1');
            }
            if (ix.isSigned && ((pos >> (ix.width - 1)) & 1)) pos -= std::int64_t{1} << ix.width;
            std::int64_t off = e.msb >= e.lsb ? pos - e.lsb : e.lsb - pos;
            std::int64_t count = std::abs(static_cast<std::int64_t>(e.msb) - e.lsb) + 1;
            for (int i = 0; i < w; ++i)
                positions.push_back(off >= 0 && off < count ? static_cast<int>(off * w + i) : -1);
        }
        through(positions);
    }
    return true;
}

Bits Lowerer::evalRef(SymbolId s, int width) {
    const Symbol& y = ir_.symbols[s];
    int sw = y.width;
    if (y.local && env_) {
        auto it = env_->vars.find(s);
        sw = it == env_->vars.end() ? 0 : static_cast<int>(it->second.size());
    }
    Bits r;
    for (int i = 0; i < sw && i < width; ++i) r.push_back(signalBit(s, i));
    return extend(r, width, !y.local && y.isSigned);
}

Bits Lowerer::callFunction(std::uint32_t f, const std::vector<Bits>& args, int width) {
    const Function& fn = ir_.functions[f];
    if (callDepth_ >= 64) keep(fmt::format("its calls of '{}' nest more than 64 deep", fn.name));
    Env fenv;
    fenv.parent = env_;
    // Automatic variables start as their type's default at each call: x for four-state
    // types, 0 for two-state ones (IEEE 1800-2017 6.8, 13.4.2).
    for (SymbolId l : fn.locals) {
        const Symbol& y = ir_.symbols[l];
        bool four = y.type < ir_.types.size() && ir_.types[y.type].fourState;
        Bit init = !fn.automatic ? known(kUnassigned) : four ? kRuleX : known(kFalse);
        fenv.vars[l].assign(static_cast<std::size_t>(y.width), init);
    }
    for (std::size_t i = 0; i < fn.args.size() && i < args.size(); ++i) {
        const Symbol& y = ir_.symbols[fn.args[i]];
        fenv.vars[fn.args[i]] = extend(args[i], y.width, false);
    }
    Env* savedEnv = env_;
    const Function* savedFn = function_;
    env_ = &fenv;
    function_ = &fn;
    ++callDepth_;
    exec(fn.body);
    --callDepth_;
    function_ = savedFn;
    env_ = savedEnv;
    Bits r = fenv.vars[fn.result];
    for (const Bit& b : r)
        if (isSentinel(b)) keep(fmt::format("the function '{}' does not assign its result on every path", fn.name));
    return extend(std::move(r), width, false);
}

bool Lowerer::operandUndriven(ExprId id) const {
    const Expr& o = ir_.exprs[id];
    if (o.kind != ExprKind::Ref || isLocal(o.a)) return false;
    const Symbol& y = ir_.symbols[o.a];
    if (y.width != static_cast<int>(o.width)) return false;
    if (cut_[o.a]) return true;   // a cut point is read by its name
    const auto& d = drivers_[o.a];
    return std::all_of(d.begin(), d.end(), [&](int mem) { return mem < 0 || !restructured_[mem]; });
}

// ---- names of word results --------------------------------------------------------
//
// A word operation's result is written as a wire of its own (`assign a_plus_b = a + b;`), so its
// name is read in review (issue 10). It says what the operation computes when both operands
// are plain: a signal (`a`), a member of a packed struct (`claim.lvl` reads `lvl`), a select of
// either (`b[2:0]` reads `b`), a conversion or zero-extension of one (`$unsigned(x)`,
// `{1'b0, a}`) or a small constant: `a_plus_b`, `lvl_gt_thresh`, `cnt_plus_1`, `neg_a`. Two
// reads of one signal add their selects (`a_7_4_plus_a_3_0`). Otherwise (also for a constant
// first, `1 << addr`), or when longer than kMaxWordName, it is named from the first signal its
// statement writes and its place among that statement's word operations (`y_w0`, `y_w1`). Either way the name depends only on the
// statement's own logic, not on operations elsewhere in the module; a collision with any name of
// the module (signals, parameters, named constants, enum values, functions, names given
// earlier) adds `_2`, `_3`... The operands kerf generates take the result's name and `_a`/`_b`,
// so kMaxWordName keeps those within the writer's cap of 26 characters (docs/guide.md).

namespace {
constexpr std::size_t kMaxWordName = 24;

bool plainIdentifier(std::string_view n) {
    if (n.empty() || !(std::isalpha(static_cast<unsigned char>(n[0])) || n[0] == '_')) return false;
    return std::all_of(n.begin(), n.end(), [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; });
}

std::string_view wordOfOperator(std::string_view op, bool unary) {
    if (unary) return op == "-" ? "neg" : "";
    static const std::pair<std::string_view, std::string_view> words[] = {
        {"+", "plus"}, {"-", "minus"}, {"*", "times"}, {"/", "div"}, {"%", "mod"}, {"**", "pow"},
        {"==", "eq"}, {"!=", "ne"}, {"===", "eq"}, {"!==", "ne"}, {"<", "lt"}, {"<=", "le"},
        {">", "gt"}, {">=", "ge"}, {"<<", "shl"}, {"<<<", "shl"}, {">>", "shr"}, {">>>", "ashr"}};
    for (const auto& [o, w] : words)
        if (o == op) return w;
    return "";
}
} // namespace

bool Lowerer::nameTaken(const std::string& n) const {
    return m_.signals.count(n) || usedNames_.count(n) || otherNames_.count(n);
}

std::pair<std::string, std::string> Lowerer::operandStem(ExprId id) const {
    const Expr* o = &ir_.exprs[id];
    // Conversions ($signed, $unsigned, widths) and zero-extensions read as what they convert.
    for (int guard = 0; guard < 16; ++guard) {
        if (o->kind == ExprKind::Convert) {
            o = &ir_.exprs[o->a];
            continue;
        }
        if (o->kind == ExprKind::Concat && o->b >= 2) {
            const std::uint32_t* parts = ir_.list(o->a);
            bool zeros = true;
            for (std::uint32_t i = 0; i + 1 < o->b && zeros; ++i) {
                const Expr& p = ir_.exprs[parts[i]];
                zeros = p.kind == ExprKind::Const;
                for (std::uint32_t j = 0; zeros && j < p.width; ++j) zeros = ir_.constBit(p, j) == '0';
            }
            if (!zeros) return {};
            o = &ir_.exprs[parts[o->b - 1]];
            continue;
        }
        break;
    }
    if (o->kind == ExprKind::Const) {
        if (o->width > 32) return {};
        std::uint64_t v = 0;
        for (std::uint32_t j = 0; j < o->width; ++j) {
            char c = ir_.constBit(*o, j);
            if (c != '0' && c != '1') return {};
            if (c == '1') v |= std::uint64_t{1} << j;
        }
        return {std::to_string(v), ""};
    }
    if (o->kind == ExprKind::Ref) {
        const std::string& n = ir_.symbols[o->a].name;
        return plainIdentifier(n) ? std::pair<std::string, std::string>{n, ""} : std::pair<std::string, std::string>{};
    }
    if ((o->kind != ExprKind::Range && o->kind != ExprKind::Index) || ir_.exprs[o->a].kind != ExprKind::Ref) return {};
    const Symbol& y = ir_.symbols[ir_.exprs[o->a].a];
    if (!plainIdentifier(y.name)) return {};
    std::string detail;
    if (o->kind == ExprKind::Index) {
        auto [stem, value] = operandStem(o->b);
        if (stem.empty() || !value.empty() || !std::isdigit(static_cast<unsigned char>(stem[0]))) return {};
        detail = stem;
    } else {
        detail = fmt::format("{}_{}", o->left(), o->right());
        // A member of a packed struct reads as the member (`claim.lvl` -> `lvl`).
        if (!y.local && m_.signals.count(y.name)) {
            const int lo = std::abs(o->right() - o->lsb), count = std::abs(o->left() - o->right()) + 1;
            std::string text = referenceText(m_, y.name, lo, count);
            if (auto dot = text.rfind('.'); dot != std::string::npos) {
                std::string member = text.substr(dot + 1);
                if (auto br = member.find('['); br != std::string::npos) member.resize(br);
                if (plainIdentifier(member)) return {member, ""};
            }
        }
    }
    return {y.name, detail};
}

std::string Lowerer::wordResultName(ExprId id, std::string_view op, bool unary) {
    if (otherNames_.empty()) {
        otherNames_.insert("");   // filled once
        for (const auto& p : m_.parameters) otherNames_.insert(p.name);
        for (const auto& c : m_.constants) otherNames_.insert(c.name);
        for (const auto& f : ir_.functions) otherNames_.insert(f.name);
        for (const auto& t : ir_.types)
            for (const auto& v : t.values) otherNames_.insert(v.name);
    }
    const Expr& e = ir_.exprs[id];
    std::string name;
    if (std::string_view word = wordOfOperator(op, unary); !word.empty()) {
        auto a = operandStem(e.a);
        if (unary && !a.first.empty()) {
            name = fmt::format("{}_{}", word, a.first);
        } else if (!unary && !a.first.empty()) {
            auto b = operandStem(e.b);
            if (!b.first.empty()) {
                if (a.first == b.first) {   // two reads of one signal: their selects tell them apart
                    if (!a.second.empty()) a.first += "_" + a.second;
                    if (!b.second.empty()) b.first += "_" + b.second;
                }
                name = fmt::format("{}_{}_{}", a.first, word, b.first);
            }
        }
    }
    // A constant first operand would start the name with a digit (`1 << addr`): not an identifier.
    if (name.size() > kMaxWordName || !plainIdentifier(name)) name.clear();
    if (name.empty() && current_) {
        // The first signal the statement writes, and the operation's place in the statement.
        std::string stem;
        for (const auto& w : current_->writes)
            if (plainIdentifier(w)) {
                stem = w;
                break;
            }
        if (!stem.empty()) {
            std::string tail = fmt::format("_w{}", wordsOfMember_[current_->id]++);
            if (stem.size() + tail.size() > kMaxWordName) stem.resize(kMaxWordName - tail.size());
            while (stem.size() > 1 && stem.back() == '_') stem.pop_back();
            name = stem + tail;
        }
    }
    if (name.empty()) return fmt::format("{}w{}", opts_.prefix, wordCount_);
    name = opts_.namePrefix + name;
    std::string n = name;
    for (int k = 2; nameTaken(n) || nameTaken(n + "_a") || nameTaken(n + "_b"); ++k) n = fmt::format("{}_{}", name, k);
    return n;
}

Bits Lowerer::wordOp(ExprId id, int w, std::string_view op, bool unary, const Bits* a, const Bits* b, Literal x,
                     Literal sx) {
    const Expr& e = ir_.exprs[id];
    WordOp wop;
    wop.op = std::string(op);
    wop.unary = unary;
    std::string base = wordResultName(id, op, unary);
    ++wordCount_;
    for (int n = 1; nameTaken(base); ++n) base = fmt::format("{}w{}_{}", opts_.prefix, wordCount_ - 1, n);
    usedNames_.insert(base);
    wop.result = base;
    wop.resultWidth = w;
    std::vector<ExprId> operands{e.a};
    std::vector<const Bits*> vals{a};
    if (!unary) {
        operands.push_back(e.b);
        vals.push_back(b);
    }
    const Expr& first = ir_.exprs[operands[0]];
    wop.isSigned = first.isSigned && (unary || ir_.exprs[operands[1]].isSigned);
    if (op == ">>>" || op == "<<<") wop.isSigned = first.isSigned;
    const char* suffix[] = {"_a", "_b"};
    int member = current_ ? current_->id : -1;
    for (std::size_t i = 0; i < operands.size(); ++i) {
        const Expr& o = ir_.exprs[operands[i]];
        WordOp::Operand opd;
        opd.width = static_cast<int>(o.width);
        if (operandUndriven(operands[i])) {
            opd.name = ir_.symbols[o.a].name;
            opd.generated = false;
            wop.operands.push_back(opd);
            continue;
        }
        opd.name = base + suffix[i];
        usedNames_.insert(opd.name);
        const Bits& bits = *vals[i];
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            out_.net.addOutput(fmt::format("{}[{}]", opd.name, bit), bits[bit].v);
            out_.outputBits.push_back(BitRef{opd.name, static_cast<int>(bit)});
            out_.outputSources.push_back(OutputSource{OutputKind::WordOperand, member});
            outputUnknown_.push_back(bits[bit].x);
            outputRuleX_.push_back(bits[bit].s);
        }
        wop.operands.push_back(opd);
    }
    Bits r;
    for (int bit = 0; bit < w; ++bit) {
        r.push_back({algebra::makeLiteral(out_.net.addInput(fmt::format("{}[{}]", base, bit)), false), x, sx});
        out_.inputBits.push_back(BitRef{base, bit});
    }
    out_.wordOps.push_back(std::move(wop));
    return r;
}

// ---- the evaluator ----------------------------------------------------------------

namespace {

Bits pick(const Bits& v, const std::vector<int>& offs) {
    Bits r;
    r.reserve(offs.size());
    for (int o : offs) r.push_back(o >= 0 && o < static_cast<int>(v.size()) ? v[o] : kRuleX);
    return r;
}

} // namespace

Bits Lowerer::eval(ExprId root) {
    struct Frame {
        ExprId id;
        std::uint8_t stage;
        std::size_t vals;    // value-stack height when the frame started
        std::uint32_t aux;   // And/Or: offset of its operands in `chain`; Cond: the branch taken
    };
    std::vector<Frame> stack;
    std::vector<Bits> vals;
    std::vector<ExprId> chain;   // operands of flattened And/Or chains, per frame
    // A frame's value-stack height is taken when it starts running (several
    // operand frames are pushed at once and run one after the other).
    constexpr std::size_t kNotStarted = ~std::size_t{0};
    stack.push_back({root, 0, kNotStarted, 0});
    auto push = [&](ExprId id) { stack.push_back({id, 0, kNotStarted, 0}); };
    // Finish the top frame with `r` as its value.
    auto done = [&](Bits r) {
        std::size_t base = stack.back().vals;
        vals.resize(base);
        vals.push_back(std::move(r));
        stack.pop_back();
    };
    while (!stack.empty()) {
        Frame& f = stack.back();
        if (f.vals == kNotStarted) f.vals = vals.size();
        const ExprId id = f.id;
        const Expr& e = ir_.exprs[id];
        const int w = static_cast<int>(e.width);
        const std::size_t base = f.vals;
        switch (e.kind) {
        case ExprKind::Const: {
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) {
                char c = ir_.constBit(e, static_cast<std::uint32_t>(i));
                // An x the source assigns as a value is the author's don't-care; an x or z
                // anywhere else (compared with, computed with) is unknown by the rules.
                r[i] = c == '1' ? known(kTrue) : c == '0' ? known(kFalse) : assignedX_.count(id) ? kAssignedX : kRuleX;
                if (r[i] == kAssignedX) assignedXMade_ = true;
            }
            done(std::move(r));
            break;
        }
        case ExprKind::Ref:
            done(evalRef(e.a, w));
            break;
        case ExprKind::Convert: {
            if (f.stage++ == 0) { push(e.a); break; }
            Bits r = extend(std::move(vals[base]), w, ir_.exprs[e.a].isSigned);
            if (!ir_.types[e.type].fourState)   // into a two-state type: x and z become 0 (6.11.2)
                for (Bit& b : r)
                    if (b.x != kFalse) b = known(b_.and2(b.v, negateLiteral(b.x)));
            done(std::move(r));
            break;
        }
        case ExprKind::Unary: {
            if (f.stage++ == 0) { push(e.a); break; }
            const Expr& opnd = ir_.exprs[e.a];
            bool sign = opnd.isSigned;
            Bits a = std::move(vals[base]);
            UnaryOp o = e.unaryOp();
            if (o == UnaryOp::BitNot) {
                a = extend(std::move(a), w, sign);
                for (Bit& b : a) b = bNot(b);
                done(std::move(a));
                break;
            }
            if (o == UnaryOp::Plus) { done(extend(std::move(a), w, sign)); break; }
            if (o == UnaryOp::Minus) {
                a = extend(std::move(a), w, sign);
                Literal x = anyX(a), sx = anyS(a);
                if (constValue(a) || opts_.bitBlastArithmetic) {
                    Lits inv = values(a);
                    for (Literal& l : inv) l = negateLiteral(l);
                    Lits s = add(inv, Lits(a.size(), kFalse), kTrue);
                    Bits r(s.size());
                    for (std::size_t i = 0; i < s.size(); ++i) r[i] = {s[i], x, sx};
                    done(std::move(r));
                } else {
                    done(wordOp(id, w, "-", true, &a, nullptr, x, sx));
                }
                break;
            }
            Bit r;
            switch (o) {
            case UnaryOp::LogicNot: r = bNot(truth(a)); break;
            case UnaryOp::RedAnd: r = bAnd(a); break;
            case UnaryOp::RedNand: r = bNot(bAnd(a)); break;
            case UnaryOp::RedOr: r = bOr(a); break;
            case UnaryOp::RedNor: r = bNot(bOr(a)); break;
            case UnaryOp::RedXor:
            case UnaryOp::RedXnor: {
                Literal v = kFalse;
                for (const Bit& b : a) v = b_.xor2(v, b.v);
                r = {o == UnaryOp::RedXnor ? negateLiteral(v) : v, anyX(a), anyS(a)};
                break;
            }
            default: break;
            }
            done(extend({r}, w, false));
            break;
        }
        case ExprKind::Binary: {
            BinaryOp o = e.binaryOp();
            if (o == BinaryOp::And || o == BinaryOp::Or) {
                // A chain `a | b | c ...` becomes one wide node per bit, not a ladder of
                // two-input nodes: the depth as read is that of a balanced tree.
                if (f.stage == 0) {
                    f.stage = 1;
                    f.aux = static_cast<std::uint32_t>(chain.size());
                    std::size_t first = chain.size();
                    std::vector<ExprId> work{e.b, e.a};
                    while (!work.empty()) {
                        ExprId x = work.back();
                        work.pop_back();
                        const Expr& xe = ir_.exprs[x];
                        if (xe.kind == ExprKind::Binary && xe.binaryOp() == o && xe.width == e.width) {
                            work.push_back(xe.b);
                            work.push_back(xe.a);
                        } else {
                            chain.push_back(x);
                        }
                    }
                    // push in reverse: the first operand is evaluated first
                    for (std::size_t k = chain.size(); k-- > first;) push(chain[k]);
                    break;
                }
                std::size_t n = vals.size() - base;
                std::vector<Bits> ext(n);
                for (std::size_t k = 0; k < n; ++k)
                    ext[k] = extend(std::move(vals[base + k]), w, ir_.exprs[chain[f.aux + k]].isSigned);
                Bits r(static_cast<std::size_t>(w));
                for (int i = 0; i < w; ++i) {
                    Bits in(n);
                    for (std::size_t k = 0; k < n; ++k) in[k] = ext[k][i];
                    r[i] = o == BinaryOp::And ? bAnd(in) : bOr(in);
                }
                done(std::move(r));
                break;
            }
            if (f.stage++ == 0) {
                push(e.b);
                push(e.a);
                break;
            }
            const Expr& lj = ir_.exprs[e.a];
            const Expr& rj = ir_.exprs[e.b];
            bool ls = lj.isSigned, rs = rj.isSigned;
            Bits a = std::move(vals[base]), b = std::move(vals[base + 1]);
            switch (o) {
            case BinaryOp::Xor:
            case BinaryOp::Xnor: {
                a = extend(std::move(a), w, ls);
                b = extend(std::move(b), w, rs);
                Bits r(static_cast<std::size_t>(w));
                for (int i = 0; i < w; ++i) {
                    Bit x = bXor(a[i], b[i]);
                    r[i] = o == BinaryOp::Xor ? x : bNot(x);
                }
                done(std::move(r));
                break;
            }
            case BinaryOp::LogicAnd:
            case BinaryOp::LogicOr:
            case BinaryOp::Implies:
            case BinaryOp::Equiv: {
                Bit x = truth(a), y = truth(b);
                Bit r = o == BinaryOp::LogicAnd ? bAnd({x, y})
                      : o == BinaryOp::LogicOr ? bOr({x, y})
                      : o == BinaryOp::Implies ? bOr({bNot(x), y})
                                               : bNot(bXor(x, y));
                done(extend({r}, w, false));
                break;
            }
            case BinaryOp::Eq: case BinaryOp::Ne: case BinaryOp::CaseEq:
            case BinaryOp::CaseNe: case BinaryOp::WildEq: case BinaryOp::WildNe: {
                bool both = ls && rs;
                std::size_t n = std::max(a.size(), b.size());
                a = extend(std::move(a), static_cast<int>(n), both);
                b = extend(std::move(b), static_cast<int>(n), both);
                bool wild = o == BinaryOp::WildEq || o == BinaryOp::WildNe;
                bool positive = o == BinaryOp::Eq || o == BinaryOp::CaseEq || o == BinaryOp::WildEq;
                if (!opts_.bitBlastArithmetic && !constValue(a) && !constValue(b) && allKnown(a) && allKnown(b) &&
                    !(wild && rj.kind == ExprKind::Const)) {
                    done(wordOp(id, w, positive ? "==" : "!=", false, &a, &b, kFalse, kFalse));
                    break;
                }
                Bit r;
                if (o == BinaryOp::CaseEq || o == BinaryOp::CaseNe) {
                    // 11.4.5: x and z compare literally. With one side known this is exact;
                    // both sides unknown would need x told apart from z.
                    Literal xa = anyX(a), xb = anyX(b);
                    if (xa != kFalse && xb != kFalse)
                        keep(fmt::format("'{}' compares two values that can both be x or z", opText(o)));
                    xDecides(b_.or2(xa, xb), b_.or2(anyS(a), anyS(b)), "a case equality", "11.4.5");
                    r = known(b_.andN({negateLiteral(xa), negateLiteral(xb), equal(values(a), values(b))}));
                } else {
                    r = equality(a, b, wild);
                }
                done(extend({positive ? r : bNot(r)}, w, false));
                break;
            }
            case BinaryOp::Lt: case BinaryOp::Le: case BinaryOp::Gt: case BinaryOp::Ge: {
                Literal x = b_.or2(anyX(a), anyX(b)), sx = b_.or2(anyS(a), anyS(b));
                if (!constValue(a) && !constValue(b) && !opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, opText(o), false, &a, &b, x, sx));
                    break;
                }
                bool sign = ls && rs;
                Lits av = values(a), bv = values(b);
                Literal r = o == BinaryOp::Lt ? lessThan(av, bv, sign)
                          : o == BinaryOp::Gt ? lessThan(bv, av, sign)
                          : o == BinaryOp::Le ? negateLiteral(lessThan(bv, av, sign))
                                              : negateLiteral(lessThan(av, bv, sign));
                done(extend({Bit{r, x, sx}}, w, false));
                break;
            }
            case BinaryOp::Add: case BinaryOp::Sub: case BinaryOp::Mul: {
                a = extend(std::move(a), w, ls);
                b = extend(std::move(b), w, rs);
                Literal x = b_.or2(anyX(a), anyX(b)), sx = b_.or2(anyS(a), anyS(b));
                bool consts = constValue(a) && constValue(b);
                if (consts && w <= 64) {
                    done(constantBits(foldArithmetic(o, *constValue(a), *constValue(b), w, false), w));
                    break;
                }
                if (!consts) {
                    // A constant 0 operand: the product is 0, a sum (or a difference by 0) is the
                    // other operand; no word operation is left for the writer to keep. An unknown
                    // bit anywhere still makes the whole result unknown (IEEE 1800-2017 11.4.3).
                    auto ka = constValue(a), kb = constValue(b);
                    bool za = ka && *ka == 0, zb = kb && *kb == 0;
                    if ((o == BinaryOp::Mul && (za || zb)) || (o == BinaryOp::Add && (za || zb)) ||
                        (o == BinaryOp::Sub && zb)) {
                        Bits r = o == BinaryOp::Mul ? Bits(static_cast<std::size_t>(w), known(kFalse)) : zb ? a : b;
                        if (x != kFalse)
                            for (Bit& bit : r) bit = {bit.v, x, sx};
                        done(std::move(r));
                        break;
                    }
                }
                if (o == BinaryOp::Mul && !consts) {
                    // By a constant power of two: a shift, wires only.
                    auto ka = constValue(a), kb = constValue(b);
                    auto k = kb ? kb : ka;
                    const Bits& v = kb ? a : b;
                    if (k && *k != 0 && (*k & (*k - 1)) == 0) {
                        int sh = 0;
                        while ((std::uint64_t{1} << sh) != *k) ++sh;
                        Bits r(static_cast<std::size_t>(w), known(kFalse));
                        for (int i = sh; i < w; ++i) r[i] = v[i - sh];
                        // an unknown bit anywhere makes the whole product unknown (11.4.3)
                        if (x != kFalse)
                            for (Bit& bit : r) bit = {bit.v, x, sx};
                        done(std::move(r));
                        break;
                    }
                }
                if (!consts && !opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, opText(o), false, &a, &b, x, sx));
                    break;
                }
                Lits av = values(a), bv = values(b), s;
                if (o == BinaryOp::Add) s = add(av, bv, kFalse);
                else if (o == BinaryOp::Sub) {
                    for (Literal& l : bv) l = negateLiteral(l);
                    s = add(av, bv, kTrue);
                } else {
                    s = mul(av, bv, w);
                }
                Bits r(s.size());
                for (std::size_t i = 0; i < s.size(); ++i) r[i] = {s[i], x, sx};
                done(std::move(r));
                break;
            }
            case BinaryOp::Shl: case BinaryOp::Shr: case BinaryOp::AShl: case BinaryOp::AShr: {
                a = extend(std::move(a), w, ls);
                bool left = o == BinaryOp::Shl || o == BinaryOp::AShl;
                bool arith = o == BinaryOp::AShr && ls;
                Bit fill = arith ? a.back() : known(kFalse);
                if (auto k = constValue(b)) {
                    Bits r(static_cast<std::size_t>(w));
                    for (int i = 0; i < w; ++i) {
                        std::int64_t src = left ? static_cast<std::int64_t>(i) - static_cast<std::int64_t>(*k)
                                                : static_cast<std::int64_t>(i) + static_cast<std::int64_t>(*k);
                        r[i] = src >= 0 && src < w ? a[src] : fill;
                    }
                    done(std::move(r));
                    break;
                }
                // 11.4.10: an unknown shift amount gives x; unknown bits move with the value.
                Literal amountX = anyX(b), amountS = anyS(b);
                Lits bv = values(b);
                Bits r(static_cast<std::size_t>(w));
                Lits xs(static_cast<std::size_t>(w), kFalse), ss(static_cast<std::size_t>(w), kFalse);
                if (!allKnown(a) || fill.x != kFalse) {
                    Lits ax(a.size()), as(a.size());
                    for (std::size_t i = 0; i < a.size(); ++i) ax[i] = a[i].x, as[i] = a[i].s;
                    xs = shift(ax, bv, left, fill.x, w);
                    ss = shift(as, bv, left, fill.s, w);
                }
                if (!opts_.bitBlastArithmetic) {
                    Bits rw = wordOp(id, w, opText(o), false, &a, &b, kFalse, kFalse);
                    for (int i = 0; i < w; ++i) {
                        rw[i].x = b_.or2(xs[i], amountX);
                        rw[i].s = b_.or2(ss[i], amountS);
                    }
                    done(std::move(rw));
                    break;
                }
                Lits vs = shift(values(a), bv, left, fill.v, w);
                for (int i = 0; i < w; ++i) r[i] = {vs[i], b_.or2(xs[i], amountX), b_.or2(ss[i], amountS)};
                done(std::move(r));
                break;
            }
            case BinaryOp::Div: case BinaryOp::Mod: {
                bool sign = ls && rs;
                a = extend(std::move(a), w, ls);
                b = extend(std::move(b), w, rs);
                Literal x = b_.or2(anyX(a), anyX(b)), sx = b_.or2(anyS(a), anyS(b));
                auto kb = constValue(b);
                if (!kb && !allKnown(b)) keep("it divides by a value that can be x");
                if (kb && *kb == 0 && w <= 64) {   // 11.4.2: division by zero gives x
                    done(Bits(static_cast<std::size_t>(w), kRuleX));
                    break;
                }
                if (!kb) keep(fmt::format("operator '{}' with a right operand that is not constant here", opText(o)));
                if (auto ka = constValue(a); ka && w <= 64) {
                    done(constantBits(foldArithmetic(o, *ka, *kb, w, sign), w));
                    break;
                }
                if (!sign && (*kb & (*kb - 1)) == 0) {
                    // Unsigned by a power of two: a shift or the low bits, wires only.
                    int sh = 0;
                    while ((std::uint64_t{1} << sh) != *kb) ++sh;
                    Bits r(static_cast<std::size_t>(w), known(kFalse));
                    for (int i = 0; i < w; ++i) {
                        if (o == BinaryOp::Div) r[i] = i + sh < w ? a[i + sh] : known(kFalse);
                        else r[i] = i < sh ? a[i] : known(kFalse);
                    }
                    if (x != kFalse)
                        for (Bit& bit : r) bit = {bit.v, x, sx};
                    done(std::move(r));
                    break;
                }
                // By another constant: gates (a word operation would print the divisor as a
                // generated wire, i.e. a division by a variable). Wide ones stay as written.
                if (w > 16 && !constValue(a))
                    keep(fmt::format("operator '{}' by a constant on {} bits (wider than 16) is left as written",
                                     opText(o), w));
                Lits q = divide(values(a), values(b), sign, o == BinaryOp::Mod);
                Bits r(q.size());
                for (std::size_t i = 0; i < q.size(); ++i) r[i] = {q[i], x, sx};
                done(std::move(r));
                break;
            }
            case BinaryOp::Pow: {
                // a ** k for a constant k >= 0: k - 1 multiplications (11.4.3); 0 ** negative is x.
                a = extend(std::move(a), w, ls);
                Literal x = b_.or2(anyX(a), anyX(b)), sx = b_.or2(anyS(a), anyS(b));
                auto kb = constValue(b);
                if (!kb) keep("operator '**' with an exponent that is not constant here");
                std::int64_t k = static_cast<std::int64_t>(*kb);
                if (rs && !b.empty() && b.size() < 64 && ((*kb >> (b.size() - 1)) & 1)) k -= std::int64_t{1} << b.size();
                if (k < 0 || k > 64) keep("operator '**' with a negative or large exponent");
                Lits acc(static_cast<std::size_t>(w), kFalse);
                acc[0] = kTrue;
                Lits av = values(a);
                if (k > 0 && !opts_.bitBlastArithmetic && !constValue(a)) {
                    // Kept as written at the word level; the proof multiplies it out.
                    done(wordOp(id, w, "**", false, &a, &b, x, sx));
                    break;
                }
                for (std::int64_t i = 0; i < k; ++i) acc = mul(acc, av, w);
                Bits r(acc.size());
                for (std::size_t i = 0; i < acc.size(); ++i) r[i] = {acc[i], x, sx};
                done(std::move(r));
                break;
            }
            default:
                fail(fmt::format("operator '{}' is not supported here", opText(o)), here(e.start));
            }
            break;
        }
        case ExprKind::Cond: {
            if (f.stage == 0) {
                f.stage = 1;
                push(e.a);
                break;
            }
            if (f.stage == 1) {
                Bit c = truth(vals[base]);
                vals.resize(base);
                if (c.x == kFalse && (c.v == kTrue || c.v == kFalse)) {
                    f.stage = 3;
                    f.aux = c.v == kTrue ? e.b : e.c;
                    push(f.aux);
                } else {
                    f.stage = 2;
                    vals.push_back({c});
                    push(e.c);
                    push(e.b);
                }
                break;
            }
            if (f.stage == 3) {   // the condition was constant: the branch taken is the value
                bool sign = ir_.exprs[f.aux].isSigned;
                done(extend(std::move(vals[base]), w, sign));
                break;
            }
            Bit c = vals[base][0];
            Bits t = extend(std::move(vals[base + 1]), w, ir_.exprs[e.b].isSigned);
            Bits el = extend(std::move(vals[base + 2]), w, ir_.exprs[e.c].isSigned);
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) r[i] = bCond(c, t[i], el[i]);
            done(std::move(r));
            break;
        }
        case ExprKind::Call: {
            const std::uint32_t* args = ir_.list(e.b);
            if (f.stage++ == 0) {
                for (std::uint32_t k = e.c; k-- > 0;) push(args[k]);   // the first argument first
                break;
            }
            std::vector<Bits> vs(vals.begin() + static_cast<std::ptrdiff_t>(base), vals.end());
            done(callFunction(e.a, vs, w));
            break;
        }
        case ExprKind::Concat: {
            const std::uint32_t* parts = ir_.list(e.a);
            if (f.stage++ == 0) {
                // Least significant part first, as the parts fill the value from bit 0 up.
                for (std::uint32_t k = 0; k < e.b; ++k) push(parts[k]);
                break;
            }
            Bits r;
            r.reserve(static_cast<std::size_t>(w));
            for (std::size_t k = base; k < vals.size(); ++k) r.insert(r.end(), vals[k].begin(), vals[k].end());
            done(extend(std::move(r), w, false));
            break;
        }
        case ExprKind::Replicate: {
            if (f.stage++ == 0) { push(e.a); break; }
            Bits p = std::move(vals[base]);
            Bits r;
            r.reserve(static_cast<std::size_t>(w));
            for (std::uint32_t k = 0; k < e.b; ++k) r.insert(r.end(), p.begin(), p.end());
            done(extend(std::move(r), w, false));
            break;
        }
        case ExprKind::Index: {
            const Expr& value = ir_.exprs[e.a];
            bool idxSigned = ir_.exprs[e.b].isSigned;
            if (f.stage == 0 && value.kind != ExprKind::Ref) {
                SymbolId sym;
                std::vector<int> offs;
                if (constantSelect(id, sym, offs)) {
                    done(extend(readBits(sym, offs), w, false));
                    break;
                }
            }
            if (f.stage == 0) {
                f.stage = 1;
                push(e.b);
                break;
            }
            if (f.stage == 1) {
                const Bits& idx = vals[base];
                auto k = constValue(idx);
                if (k && value.kind == ExprKind::Ref) {
                    // Read only the selected element: earlier bits of a vector may be
                    // assigned before later ones are (prefix chains in a loop).
                    std::int64_t pos = static_cast<std::int64_t>(*k);
                    if (idxSigned && idx.size() < 64 && !idx.empty() && ((*k >> (idx.size() - 1)) & 1))
                        pos -= std::int64_t{1} << idx.size();
                    std::int64_t off = e.msb >= e.lsb ? pos - e.lsb : e.lsb - pos;
                    std::int64_t count = std::abs(static_cast<std::int64_t>(e.msb) - e.lsb) + 1;
                    std::vector<int> offs;
                    for (int i = 0; i < w; ++i)
                        offs.push_back(off >= 0 && off < count ? static_cast<int>(off * w + i) : -1);
                    done(readBits(value.a, offs));
                    break;
                }
                f.stage = 2;
                push(e.a);
                break;
            }
            done(selectElement(vals[base + 1], vals[base], idxSigned, e.msb, e.lsb, w));
            break;
        }
        case ExprKind::Range: {
            const Expr& value = ir_.exprs[e.a];
            int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
            if (lo > hi) std::swap(lo, hi);
            int elems = hi - lo + 1;
            int ew = std::max(1, w / std::max(elems, 1));
            std::vector<int> offs;
            for (int i = lo * ew; i < (hi + 1) * ew; ++i) offs.push_back(i);
            if (value.kind == ExprKind::Ref) {
                done(extend(readBits(value.a, offs), w, false));
                break;
            }
            if (f.stage == 0) {
                SymbolId sym;
                std::vector<int> chained;
                if (constantSelect(id, sym, chained)) {
                    done(extend(readBits(sym, chained), w, false));
                    break;
                }
            }
            if (f.stage++ == 0) { push(e.a); break; }
            done(extend(pick(vals[base], offs), w, false));
            break;
        }
        case ExprKind::Indexed: {
            const Expr& value = ir_.exprs[e.a];
            bool baseSigned = ir_.exprs[e.b].isSigned;
            int lo = std::min(e.msb, e.lsb), hi = std::max(e.msb, e.lsb);
            int n = hi - lo + 1;
            int ew = std::max(1, static_cast<int>(value.width) / n);   // element width of the selected dimension
            int count = std::max(1, w / ew);                           // elements selected
            // Offsets of each selected bit for a base position; a bit outside the
            // dimension reads x (11.5.1), the others read their bits.
            auto offsetsFrom = [&](std::int64_t start) {
                std::int64_t first = e.up ? start : start - count + 1;   // lowest index selected
                std::vector<int> offs(static_cast<std::size_t>(w), -1);
                for (int el = 0; el < count; ++el) {
                    std::int64_t index = first + el;
                    if (index < lo || index > hi) continue;
                    int off = dimOffset(static_cast<int>(index), e.msb, e.lsb);
                    // element `el` counts from the low index; in offsets it is the low end
                    // when the range descends, the high end when it ascends.
                    int slot = e.msb >= e.lsb ? el : count - 1 - el;
                    for (int i = 0; i < ew; ++i) offs[static_cast<std::size_t>(slot * ew + i)] = off * ew + i;
                }
                return offs;
            };
            auto toPos = [&](std::uint64_t k, std::size_t width) {
                std::int64_t p = static_cast<std::int64_t>(k);
                if (baseSigned && width < 64 && width > 0 && ((k >> (width - 1)) & 1)) p -= std::int64_t{1} << width;
                return p;
            };
            if (f.stage == 0) {
                f.stage = 1;
                push(e.b);
                break;
            }
            if (f.stage == 1) {
                const Bits& baseBits = vals[base];
                if (auto k = constValue(baseBits); k && value.kind == ExprKind::Ref) {
                    done(readBits(value.a, offsetsFrom(toPos(*k, baseBits.size()))));
                    break;
                }
                f.stage = 2;
                push(e.a);
                break;
            }
            const Bits& baseBits = vals[base];
            const Bits& v = vals[base + 1];
            if (auto k = constValue(baseBits)) {
                done(pick(v, offsetsFrom(toPos(*k, baseBits.size()))));
                break;
            }
            // Every base the select can start at with some bit in range; any other base,
            // or an unknown one, reads x.
            Lits bv = values(baseBits);
            std::vector<Lits> vt(static_cast<std::size_t>(w)), xt(static_cast<std::size_t>(w)),
                st(static_cast<std::size_t>(w));
            Lits hits;
            for (std::int64_t start = lo - count + 1; start <= hi + count - 1; ++start) {
                Literal sel = indexIs(bv, baseSigned, start);
                if (sel == kFalse) continue;
                auto offs = offsetsFrom(start);
                hits.push_back(sel);
                for (int i = 0; i < w; ++i) {
                    int o = offs[static_cast<std::size_t>(i)];
                    Bit b = o >= 0 && o < static_cast<int>(v.size()) ? v[o] : kRuleX;
                    vt[i].push_back(b_.and2(sel, b.v));
                    if (b.x != kFalse) xt[i].push_back(b_.and2(sel, b.x));
                    if (b.s != kFalse) st[i].push_back(b_.and2(sel, b.s));
                }
            }
            Literal miss = indexAlwaysNames(bv.size(), baseSigned, lo - count + 1, hi + count - 1)
                         ? anyX(baseBits) : b_.or2(negateLiteral(b_.orN(hits)), anyX(baseBits));
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) {
                xt[i].push_back(miss);
                st[i].push_back(miss);
                r[i] = {b_.orN(vt[i]), b_.orN(xt[i]), b_.orN(st[i])};
            }
            done(std::move(r));
            break;
        }
        }
    }
    return std::move(vals.back());
}

} // namespace kerf::frontend::detail
