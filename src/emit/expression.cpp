// expression.cpp — factored forms as readable Verilog expressions.
//
// Polarity: for every sub-expression both ways of writing it are counted —
// as it stands, or as the complement of its De Morgan dual under one `~` —
// and the one with fewer inversions is printed (ties keep the form without
// the outer `~`). This is the usual inverter-minimising choice of phase
// assignment (common trade practice); the function never changes.
// Operators follow IEEE 1800-2017 clause 11.3.2 precedence; the writer adds
// parentheses around comparisons, exclusive-ors and choices inside `&`/`|`
// for the reader's sake even where the standard does not need them.
#include "expression.h"
#include "kerf/frontend/module.h"
#include "kerf/frontend/references.h"

#include <fmt/format.h>

#include <algorithm>
#include <functional>
#include <map>
#include <numeric>

namespace kerf::emit {

using algebra::Factored;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::negateLiteral;
using K = Factored::Kind;

namespace {

/// A reduction's text: `|v`, `&v[3:0]`, `^v`, `~|v`, `~&v`, `~^v`.
bool isReductionText(const std::string& t) {
    auto op = [](char c) { return c == '|' || c == '&' || c == '^'; };
    return !t.empty() && (op(t[0]) || (t[0] == '~' && t.size() > 1 && op(t[1])));
}

/// Is f the sum x & ~y | ~x & y (or x & y | ~x & ~y) of two variables?
bool xorShape(const Factored& f, Literal& x, Literal& y, bool& inverted) {
    if (f.kind != K::Or || f.kids.size() != 2) return false;
    auto pairOf = [](const Factored& g, Literal& a, Literal& b) {
        if (g.kind != K::And || g.kids.size() != 2) return false;
        if (g.kids[0].kind != K::Lit || g.kids[1].kind != K::Lit) return false;
        a = g.kids[0].lit;
        b = g.kids[1].lit;
        if (literalVar(a) > literalVar(b)) std::swap(a, b);
        return literalVar(a) != literalVar(b) && literalVar(a) != 0;
    };
    Literal a1, b1, a2, b2;
    if (!pairOf(f.kids[0], a1, b1) || !pairOf(f.kids[1], a2, b2)) return false;
    if (a2 != negateLiteral(a1) || b2 != negateLiteral(b1)) return false;
    x = a1 & ~1u;
    y = b1 & ~1u;
    inverted = literalNegated(a1) == literalNegated(b1);
    return true;
}

} // namespace

bool xorForm(const Factored& f, Literal& x, Literal& y, bool& inverted) { return xorShape(f, x, y, inverted); }

namespace {

/// Two products of a sum that form an exclusive or, with what they share:
/// `P & x & ~y | P & ~x & y` (or its complement) is `P & (x ^ y)`, P empty for two literals.
struct XorPair {
    std::size_t i = 0, j = 0;        ///< the products' places in the sum, i < j
    std::vector<Literal> common;      ///< P, in kid i's order
    Literal x = 0, y = 0;             ///< kid i's two literals where j has their complements
};

/// Most products of one variable set compared pair by pair; a larger set (a decoder's products
/// over one opcode) is left alone, so the search stays linear in the sum's size.
constexpr std::size_t kXorGroupLimit = 64;

/// In a sum, the pairs of products that differ in the polarity of exactly two variables and
/// agree on the rest, so that `t | (a ^ b)` is not printed as three products and
/// `P & x & ~y | P & ~x & y` reads `P & (x ^ y)`. Products are ANDs of literals only.
std::vector<XorPair> xorPairs(const Factored& f) {
    std::vector<XorPair> pairs;
    if (f.kind != K::Or || f.kids.size() < 2) return pairs;
    // Products keyed by their variables (each product's literals sorted by variable).
    std::map<std::vector<Literal>, std::vector<std::size_t>> byVars;
    std::vector<std::vector<Literal>> sorted(f.kids.size());
    for (std::size_t i = 0; i < f.kids.size(); ++i) {
        const Factored& g = f.kids[i];
        if (g.kind != K::And || g.kids.size() < 2) continue;
        std::vector<Literal> lits;
        bool ok = true;
        for (const auto& k : g.kids) {
            if (k.kind != K::Lit || literalVar(k.lit) == 0) { ok = false; break; }
            lits.push_back(k.lit);
        }
        if (!ok) continue;
        std::sort(lits.begin(), lits.end());
        std::vector<Literal> vars;
        for (Literal l : lits) vars.push_back(l & ~1u);
        if (std::adjacent_find(vars.begin(), vars.end()) != vars.end()) continue;
        sorted[i] = std::move(lits);
        byVars[std::move(vars)].push_back(i);
    }
    std::vector<std::uint8_t> used(f.kids.size(), 0);
    for (const auto& [vars, idx] : byVars) {
        if (vars.size() > 2 && idx.size() > kXorGroupLimit) continue;
        for (std::size_t p = 0; p < idx.size(); ++p)
            for (std::size_t q = p + 1; q < idx.size(); ++q) {
                std::size_t i = idx[p], j = idx[q];
                if (used[i] || used[j]) continue;
                const auto &a = sorted[i], &b = sorted[j];
                std::vector<std::size_t> diff;
                for (std::size_t k = 0; k < a.size() && diff.size() <= 2; ++k)
                    if (a[k] != b[k]) diff.push_back(k);
                if (diff.size() != 2) continue;
                used[i] = used[j] = 1;
                XorPair pair;
                pair.i = std::min(i, j);
                pair.j = std::max(i, j);
                pair.x = sorted[pair.i][diff[0]];
                pair.y = sorted[pair.i][diff[1]];
                // P in the written order of the first product.
                for (const auto& k : f.kids[pair.i].kids)
                    if (k.lit != pair.x && k.lit != pair.y) pair.common.push_back(k.lit);
                pairs.push_back(std::move(pair));
            }
    }
    std::sort(pairs.begin(), pairs.end(), [](const XorPair& a, const XorPair& b) { return a.i < b.i; });
    return pairs;
}

/// Is f the choice s & A | ~s & B (s a literal directly under both ANDs)?
bool muxShape(const Factored& f, Literal& sel, std::size_t& thenKid, std::size_t& selInThen, std::size_t& selInElse) {
    if (f.kind != K::Or || f.kids.size() != 2) return false;
    const Factored& p = f.kids[0];
    const Factored& q = f.kids[1];
    if (p.kind != K::And || q.kind != K::And || p.kids.size() < 2 || q.kids.size() < 2) return false;
    for (std::size_t i = 0; i < p.kids.size(); ++i) {
        if (p.kids[i].kind != K::Lit || literalVar(p.kids[i].lit) == 0) continue;
        for (std::size_t j = 0; j < q.kids.size(); ++j) {
            if (q.kids[j].kind != K::Lit) continue;
            if (q.kids[j].lit != negateLiteral(p.kids[i].lit)) continue;
            bool pPositive = !literalNegated(p.kids[i].lit);
            sel = pPositive ? p.kids[i].lit : q.kids[j].lit;
            thenKid = pPositive ? 0 : 1;
            selInThen = pPositive ? i : j;
            selInElse = pPositive ? j : i;
            return true;
        }
    }
    return false;
}

Factored without(const Factored& andForm, std::size_t drop) {
    Factored r;
    r.kind = K::And;
    for (std::size_t i = 0; i < andForm.kids.size(); ++i)
        if (i != drop) r.kids.push_back(andForm.kids[i]);
    if (r.kids.size() == 1) return r.kids[0];
    return r;
}

int precedence(const PExpr& e) {
    if (e.neg && !e.atomic()) return 10;   // ~( ... )
    switch (e.kind) {
    case PExpr::Kind::Mux: return 1;
    case PExpr::Kind::Or: return e.kids.size() > 1 ? 2 : 10;
    case PExpr::Kind::Xor: return 3;
    case PExpr::Kind::And: return e.kids.size() > 1 ? 4 : 10;
    case PExpr::Kind::Compare: return 5;
    default: return 10;
    }
}

const char* opText(PExpr::Kind k) {
    switch (k) {
    case PExpr::Kind::And: return "&";
    case PExpr::Kind::Or: return "|";
    case PExpr::Kind::Xor: return "^";
    default: return "?";
    }
}

/// Does kid need parentheses as an operand of parent kind `pk`?
bool needsParens(PExpr::Kind pk, const PExpr& kid) {
    int p = precedence(kid);
    if (p == 10) return false;
    if (pk == PExpr::Kind::Mux) return p <= 1;
    // A reduction is a unary operator, which binds tighter than every binary one (IEEE
    // 1800-2017 11.3.2, Table 11-2): `|v[3:2] & a`, `^v ^ ...` need none to parse. They are
    // left out under a different operator (`~|live[5:4] & a`), and kept where the reduction's
    // symbol is the operator's own (`(^v) ^ a`, `(~|v) | a`), which would read as the operator
    // written twice (docs/guide.md).
    if (kid.kind == PExpr::Kind::Compare && isReductionText(kid.text)) {
        const char sym = kid.text[0] == '~' ? kid.text[1] : kid.text[0];
        return opText(pk)[0] == sym;
    }
    // Readability: anything composite under a different operator gets parentheses.
    return true;
}

std::string constText(int width, const std::vector<int>& bitsMsbFirst) {
    if (width % 4 == 0) {
        std::string hex;
        for (int i = 0; i < width; i += 4) {
            int v = 0;
            for (int j = 0; j < 4; ++j) v = v * 2 + bitsMsbFirst[static_cast<std::size_t>(i + j)];
            hex += "0123456789abcdef"[v];
        }
        return fmt::format("{}'h{}", width, hex);
    }
    std::string bin;
    for (int b : bitsMsbFirst) bin += b ? '1' : '0';
    return fmt::format("{}'b{}", width, bin);
}

int indexOf(const VarRef& r, int offset) { return r.msb >= r.lsb ? r.lsb + offset : r.lsb - offset; }

std::string sliceText(const VarRef& r, int loOff, int hiOff) {
    if (r.module) return frontend::referenceText(*r.module, r.signal, loOff, hiOff - loOff + 1);
    std::string base = r.text.substr(0, r.text.rfind('['));
    if (loOff == 0 && hiOff == r.width - 1) return base;
    if (loOff == hiOff) return fmt::format("{}[{}]", base, indexOf(r, loOff));
    return fmt::format("{}[{}:{}]", base, indexOf(r, hiOff), indexOf(r, loOff));
}

/// The name of the value bits `lo..hi` of `r` are compared with, as the source names it:
/// a whole enum-typed signal by the value's name (`state_q == ST_IDLE`, IEEE 1800-2017 6.19);
/// bits the source compared with a localparam or package constant by that constant
/// (`cmd == CMD_RD`, `addr[15:12] == BASE[15:12]` where the source compared `BASE[15:8]`).
/// `constant` is set to the latter's index.
std::optional<std::string> constantName(const VarRef& r, int loOff, int hiOff, const std::vector<int>& bitsMsbFirst,
                                        int& constant) {
    constant = -1;
    if (!r.module) return std::nullopt;
    const frontend::ModuleDesc& m = *r.module;
    auto it = m.signals.find(r.signal);
    if (it == m.signals.end()) return std::nullopt;
    const auto& types = m.ir.types;
    frontend::TypeId t = it->second.type;
    if (loOff == 0 && hiOff == r.width - 1 && t != frontend::kNoId && t < types.size() &&
        types[t].kind == frontend::TypeKind::Enum) {
        std::string bits;
        for (int b : bitsMsbFirst) bits += b ? '1' : '0';
        for (const auto& v : types[t].values)
            if (v.bits == bits && !v.ref.empty()) return v.ref;
        return std::nullopt;
    }
    int len = hiOff - loOff + 1;
    std::optional<std::string> sliced;
    int slicedIndex = -1;
    for (std::size_t ci = 0; ci < m.constants.size(); ++ci) {
        const auto& c = m.constants[ci];
        for (const auto& k : c.compared) {
            if (k.signal != r.signal || loOff < k.lo || hiOff > k.hi) continue;
            int clo = k.constLo + (loOff - k.lo);
            bool same = true;
            for (int j = 0; j < len && same; ++j)
                same = (bitsMsbFirst[static_cast<std::size_t>(len - 1 - j)] != 0) == c.bit(clo + j);
            if (!same) continue;
            if (clo == 0 && len == c.width()) {
                constant = static_cast<int>(ci);
                return c.ref;
            }
            // A part of the constant only where the source compared a part of it
            // (`addr[15:8] == BASE[15:8]`): `st[1:0] == IDLE[1:0]` would misread a whole-value test.
            bool partial = k.constLo != 0 || k.hi - k.lo + 1 != c.width();
            // Also a leading part of a wide constant the source compared whole: a prefix that
            // several addresses share (`csr_addr[11:4] == CSR_MSTATUS[11:4]`, F285) — at least 4
            // bits from its most significant bit down, of a constant of at least 6 bits. A short
            // code keeps its number (`st[1:0] == 2'b01`, not `IDLE[1:0]`).
            bool prefix = !partial && c.width() >= 6 && hiOff == k.hi && len >= 4;
            if (!sliced && (partial || prefix) && c.sliceable && c.msb >= c.lsb) {
                int ilo = c.lsb + clo, ihi = c.lsb + clo + len - 1;
                sliced = len == 1 ? fmt::format("{}[{}]", c.ref, ilo) : fmt::format("{}[{}:{}]", c.ref, ihi, ilo);
                slicedIndex = static_cast<int>(ci);
            }
        }
    }
    constant = slicedIndex;
    return sliced;
}

/// An AND/OR/XOR of more than kMaxChain operands is written as parenthesised groups of
/// kMaxChain, nested as needed: slang's elaboration time grows with the square of a flat
/// chain's length (measured: 10,000 wires joined by `|` take 1.2 s, the same grouped 0.02 s),
/// and the proof reads the written file back. No one reads a chain this long term by term.
void groupLongChain(PExpr& e) {
    constexpr std::size_t kMaxChain = 64;
    if (e.kind != PExpr::Kind::And && e.kind != PExpr::Kind::Or && e.kind != PExpr::Kind::Xor) return;
    while (e.kids.size() > kMaxChain) {
        std::vector<PExpr> groups;
        for (std::size_t i = 0; i < e.kids.size(); i += kMaxChain) {
            PExpr g;
            g.kind = e.kind;
            std::size_t end = std::min(e.kids.size(), i + kMaxChain);
            for (std::size_t j = i; j < end; ++j) g.kids.push_back(std::move(e.kids[j]));
            if (g.kids.size() == 1) groups.push_back(std::move(g.kids[0]));
            else groups.push_back(std::move(g));
        }
        e.kids = std::move(groups);
    }
}

} // namespace

// ---------------------------------------------------------------- costs

std::vector<std::uint8_t> ExprBuilder::sliceKids(const Factored& f) const {
    // Kids that are bits of one vector at consecutive offsets become one comparison
    // (see groupSlices): they cost no inversion whichever way the operator is written.
    std::vector<std::uint8_t> out(f.kids.size(), 0);
    std::map<std::string, std::vector<std::pair<int, std::size_t>>> bySignal;
    for (std::size_t i = 0; i < f.kids.size(); ++i) {
        const Factored& k = f.kids[i];
        if (k.kind != K::Lit) continue;
        std::uint32_t v = literalVar(k.lit);
        if (v == 0 || v >= refs_.size() || !refs_[v] || refs_[v]->signal.empty() || refs_[v]->width < 2 ||
            refs_[v]->byName)
            continue;
        bySignal[refs_[v]->signal].push_back({refs_[v]->offset, i});
    }
    for (auto& [sig, bits] : bySignal) {
        std::sort(bits.begin(), bits.end());
        for (std::size_t a = 0; a < bits.size(); ++a) {
            bool prev = a > 0 && bits[a - 1].first + 1 == bits[a].first;
            bool next = a + 1 < bits.size() && bits[a].first + 1 == bits[a + 1].first;
            if (prev || next) out[bits[a].second] = 1;
        }
    }
    return out;
}

bool ExprBuilder::comparisons(const Factored& f) const {
    // An OR (AND) whose every operand is a whole-vector comparison `v == K` (`v != K`): written as
    // those comparisons, never regrouped into ?: or ^ over the vector's bits.
    // Also an OR (AND) of slice comparisons of one and the same vector, as an address decoder
    // writes them: `(addr[2:1] == 2'b01) | (addr[2:0] == 3'b100)`, not `addr[1] ? ~addr[2] : ...`.
    if ((f.kind != K::And && f.kind != K::Or) || f.kids.size() < 2) return false;
    bool whole = true, sameBits = true, oneVector = true;
    const std::string* vector = nullptr;
    std::vector<std::uint32_t> firstVars;
    for (const auto& k : f.kids) {
        if (k.kind == f.kind || (k.kind != K::And && k.kind != K::Or) || k.kids.size() < 2) return false;
        for (const auto& x : k.kids)
            if (x.kind != K::Lit) return false;
        std::uint32_t v0 = literalVar(k.kids[0].lit);
        if (v0 == 0 || v0 >= refs_.size() || !refs_[v0] || refs_[v0]->signal.empty()) return false;
        std::vector<std::uint8_t> in = sliceKids(k);
        for (auto b : in)
            if (!b) return false;
        for (const auto& x : k.kids) {
            std::uint32_t v = literalVar(x.lit);
            if (v == 0 || v >= refs_.size() || !refs_[v] || refs_[v]->signal != refs_[v0]->signal) return false;
        }
        // A whole comparison: every bit of one vector.
        if (refs_[v0]->width != static_cast<int>(k.kids.size())) whole = false;
        std::vector<std::uint32_t> vars;
        for (const auto& x : k.kids) vars.push_back(literalVar(x.lit));
        std::sort(vars.begin(), vars.end());
        if (firstVars.empty()) firstVars = vars;
        else if (vars != firstVars) sameBits = false;
        if (!vector) vector = &refs_[v0]->signal;
        else if (*vector != refs_[v0]->signal) oneVector = false;
    }
    // Products over the very same bits stay free to read as `^` or `?:` (`g[4] ^ g[5]`).
    return whole || (oneVector && !sameBits);
}

int ExprBuilder::costLit(Literal l) {
    std::uint32_t v = literalVar(l);
    if (v == 0) return 0;
    if (v < refs_.size() && refs_[v]) return (literalNegated(l) != refs_[v]->inverted) ? 1 : 0;
    return cost(forms_[v], literalNegated(l));
}

const Factored* ExprBuilder::xorGrouped(const Factored& f) {
    if (f.kind != K::Or || f.kids.size() < 2 || comparisons(f)) return nullptr;
    if (auto it = regroupedOf_.find(&f); it != regroupedOf_.end()) return it->second;
    const Factored* out = nullptr;
    auto pairs = xorPairs(f);
    // A sum of two products that already is an exclusive or is written by build itself.
    bool shared = std::any_of(pairs.begin(), pairs.end(), [](const XorPair& x) { return !x.common.empty(); });
    if (!pairs.empty() && (f.kids.size() > 2 || shared)) {
        Factored g;
        g.kind = K::Or;
        std::vector<std::uint8_t> inPair(f.kids.size(), 0);
        for (const auto& x : pairs) {
            Factored two;
            two.kind = K::Or;
            if (x.common.empty()) {
                two.kids = {f.kids[x.i], f.kids[x.j]};
                g.kids.push_back(std::move(two));
            } else {
                auto product = [](Literal a, Literal b) {
                    Factored p;
                    p.kind = K::And;
                    p.kids.resize(2);
                    p.kids[0].kind = p.kids[1].kind = K::Lit;
                    p.kids[0].lit = a;
                    p.kids[1].lit = b;
                    return p;
                };
                two.kids = {product(x.x, x.y), product(negateLiteral(x.x), negateLiteral(x.y))};
                Factored both;
                both.kind = K::And;
                for (Literal l : x.common) {
                    Factored lit;
                    lit.kind = K::Lit;
                    lit.lit = l;
                    both.kids.push_back(std::move(lit));
                }
                both.kids.push_back(std::move(two));
                g.kids.push_back(std::move(both));
            }
            inPair[x.i] = inPair[x.j] = 1;
        }
        for (std::size_t i = 0; i < f.kids.size(); ++i)
            if (!inPair[i]) g.kids.push_back(f.kids[i]);
        regrouped_.push_back(std::move(g));
        out = &regrouped_.back();
    }
    regroupedOf_[&f] = out;
    return out;
}

const Factored& ExprBuilder::choiceArm(const Factored& f, std::size_t kid, std::size_t drop) {
    // f's AND `kid` without the select; at most one per (f, kid), so the address stays the form's.
    auto& arms = armOf_[kid];
    if (auto it = arms.find(&f); it != arms.end()) return *it->second;
    regrouped_.push_back(without(f.kids[kid], drop));
    arms[&f] = &regrouped_.back();
    return regrouped_.back();
}

int ExprBuilder::cost(const Factored& f, bool neg) {
    if (const Factored* g = xorGrouped(f)) return cost(*g, neg);
    auto& memo = memo_[neg ? 1 : 0];
    if (auto it = memo.find(&f); it != memo.end()) return it->second;
    int c = 0;
    Literal x, y;
    bool inv;
    switch (f.kind) {
    case K::Zero:
    case K::One: c = 0; break;
    case K::Lit: c = costLit(neg ? negateLiteral(f.lit) : f.lit); break;
    case K::And:
    case K::Or: {
        if (!comparisons(f) && xorShape(f, x, y, inv)) {
            c = costLit(x) + costLit(y) + ((inv != neg) ? 1 : 0);
            break;
        }
        // A choice is written `s ? a : b` with the select in whichever polarity has fewer
        // inversions (build swaps the arms for free), so only the arms' own inversions count.
        Literal sel;
        std::size_t thenKid, sThen, sElse;
        if (!comparisons(f) && muxShape(f, sel, thenKid, sThen, sElse)) {
            c = std::min(costLit(sel), costLit(negateLiteral(sel))) + cost(choiceArm(f, thenKid, sThen), neg) +
                cost(choiceArm(f, 1 - thenKid, sElse), neg);
            break;
        }
        int same = 0, flipped = 1;
        std::vector<std::uint8_t> slice = sliceKids(f);
        for (std::size_t i = 0; i < f.kids.size(); ++i) {
            if (slice[i]) continue;
            same += cost(f.kids[i], neg);
            flipped += cost(f.kids[i], !neg);
        }
        // `neg` of an AND is an OR of complemented kids (same), or ~(AND) (flipped).
        c = std::min(same, flipped);
        break;
    }
    }
    memo[&f] = c;
    return c;
}

int ExprBuilder::inversions(std::uint32_t v, bool negate) { return cost(forms_[v], negate); }

// ---------------------------------------------------------------- building

PExpr ExprBuilder::buildLit(Literal l) {
    std::uint32_t v = literalVar(l);
    PExpr e;
    if (v == 0) {
        e.kind = literalNegated(l) ? PExpr::Kind::One : PExpr::Kind::Zero;
        return e;
    }
    if (v < refs_.size() && refs_[v]) {
        e.kind = PExpr::Kind::Ref;
        e.ref = &*refs_[v];
        e.text = refs_[v]->text;
        e.rank = refs_[v]->rank;
        e.neg = literalNegated(l) != refs_[v]->inverted;
        return e;
    }
    return build(forms_[v], literalNegated(l));
}

PExpr ExprBuilder::literal(Literal l) { return buildLit(l); }

PExpr ExprBuilder::definition(std::uint32_t v, bool negate) { return build(forms_[v], negate); }

PExpr ExprBuilder::build(const Factored& f, bool neg) {
    PExpr e;
    switch (f.kind) {
    case K::Zero: e.kind = neg ? PExpr::Kind::One : PExpr::Kind::Zero; return e;
    case K::One: e.kind = neg ? PExpr::Kind::Zero : PExpr::Kind::One; return e;
    case K::Lit: return buildLit(neg ? negateLiteral(f.lit) : f.lit);
    case K::And:
    case K::Or: break;
    }
    if (f.kids.empty()) {
        bool one = (f.kind == K::And) != neg;
        e.kind = one ? PExpr::Kind::One : PExpr::Kind::Zero;
        return e;
    }
    if (f.kids.size() == 1) return build(f.kids[0], neg);
    if (const Factored* g = xorGrouped(f)) return build(*g, neg);
    Literal x, y;
    bool inv;
    const bool compares = comparisons(f);
    if (!compares && xorShape(f, x, y, inv)) {
        e.kind = PExpr::Kind::Xor;
        bool parity = inv != neg;
        // An operand with no name of its own is an exclusive or read only by this one (the
        // writer names every other node another node reads): written inside it, in the tree's
        // own shape so that the file reads back with the same depth — a subtree on the left
        // continues the chain (`a ^ b ^ c` is `(a ^ b) ^ c`, IEEE 1800-2017 11.3.2), one on
        // the right is parenthesised. Inversions anywhere in the tree move to the front.
        auto inner = [&](Literal l, Literal& a, Literal& b, bool& i2) {
            std::uint32_t v = literalVar(l);
            return v != 0 && v < refs_.size() && !refs_[v] && v < forms_.size() && xorShape(forms_[v], a, b, i2);
        };
        std::function<void(PExpr&, Literal, Literal)> chain = [&](PExpr& into, Literal l, Literal r) {
            Literal a, b;
            bool i2 = false;
            if (!inner(l, a, b, i2) && inner(r, a, b, i2)) std::swap(l, r);
            for (Literal side : {l, r}) {
                if (inner(side, a, b, i2)) {
                    parity = parity != (literalNegated(side) != i2);
                    if (side == l) {
                        chain(into, a, b);
                    } else {
                        PExpr sub;
                        sub.kind = PExpr::Kind::Xor;
                        chain(sub, a, b);
                        groupXorSlices(sub);
                        into.kids.push_back(std::move(sub));
                    }
                    continue;
                }
                PExpr k = buildLit(side);
                // `~a ^ b` reads worse than `~(a ^ b)`: move operand inversions outside.
                if (k.neg && (k.atomic() || (k.kind == PExpr::Kind::Compare && isReductionText(k.text)))) {
                    k.neg = false;
                    parity = !parity;
                }
                into.kids.push_back(std::move(k));
            }
        };
        chain(e, x, y);
        e.neg = parity;
        groupXorSlices(e);
        if (e.kind == PExpr::Kind::Xor) groupLongChain(e);
        return e;
    }
    Literal sel;
    std::size_t thenKid, sThen, sElse;
    if (!compares && muxShape(f, sel, thenKid, sThen, sElse)) {
        e.kind = PExpr::Kind::Mux;
        PExpr s = buildLit(sel);
        PExpr a = build(choiceArm(f, thenKid, sThen), neg);
        PExpr b = build(choiceArm(f, 1 - thenKid, sElse), neg);
        if (s.neg) {
            // Select on the name (or the expression) without its `~` and swap the branches:
            // `~(a & b) ? x : y` reads better as `(a & b) ? y : x`.
            s.neg = false;
            std::swap(a, b);
        }
        e.kids.push_back(std::move(s));
        e.kids.push_back(std::move(a));
        e.kids.push_back(std::move(b));
        return e;
    }
    int same = 0, flipped = 1;
    std::vector<std::uint8_t> slice = sliceKids(f);
    for (std::size_t i = 0; i < f.kids.size(); ++i) {
        if (slice[i]) continue;
        same += cost(f.kids[i], neg);
        flipped += cost(f.kids[i], !neg);
    }
    bool isAnd = f.kind == K::And;
    if (same <= flipped) {
        // neg of AND = OR of complemented kids.
        e.kind = (isAnd != neg) ? PExpr::Kind::And : PExpr::Kind::Or;
        for (const auto& k : f.kids) e.kids.push_back(build(k, neg));
    } else {
        // ~(G) with G the complement of the wanted value: for an AND, G is the
        // OR of complemented kids (neg false) or the AND itself (neg true).
        e.neg = true;
        for (const auto& k : f.kids) e.kids.push_back(build(k, !neg));
        e.kind = isAnd ? (neg ? PExpr::Kind::And : PExpr::Kind::Or) : (neg ? PExpr::Kind::Or : PExpr::Kind::And);
    }
    // Flatten nested operators of the same kind (associative).
    std::vector<PExpr> flat;
    for (auto& k : e.kids) {
        if (k.kind == e.kind && !k.neg && k.kids.size() > 1) {
            for (auto& kk : k.kids) flat.push_back(std::move(kk));
        } else {
            flat.push_back(std::move(k));
        }
    }
    e.kids = std::move(flat);
    groupSlices(e);
    // Named operands first, in rank order (bits of one vector MSB first); composite ones after.
    // Composite operands in the order of their text, so that the same logic always prints the same.
    std::vector<std::pair<std::string, std::size_t>> keys;
    for (std::size_t i = 0; i < e.kids.size(); ++i) keys.push_back({flatText(e.kids[i]), i});
    std::vector<std::size_t> perm(e.kids.size());
    std::iota(perm.begin(), perm.end(), 0);
    std::stable_sort(perm.begin(), perm.end(), [&](std::size_t x, std::size_t y) {
        const PExpr& a = e.kids[x];
        const PExpr& b = e.kids[y];
        bool sa = a.kind == PExpr::Kind::Ref || a.kind == PExpr::Kind::Compare;
        bool sb = b.kind == PExpr::Kind::Ref || b.kind == PExpr::Kind::Compare;
        if (sa != sb) return sa;
        if (!sa) return keys[x].first < keys[y].first;
        return a.rank < b.rank;
    });
    std::vector<PExpr> sorted;
    for (std::size_t i : perm) sorted.push_back(std::move(e.kids[i]));
    e.kids = std::move(sorted);
    groupLongChain(e);
    return e;
}

/// Within an AND (or OR) of bits of one vector, consecutive bits become one
/// comparison with a constant: `v[5:2] == 4'h0` (or `v[5:2] != 4'hf` in an OR).
std::string complementedCompare(const std::string& text) {
    if (text.size() > 1 && text[0] == '~' && (text[1] == '|' || text[1] == '&' || text[1] == '^')) return text.substr(1);
    if (!text.empty() && (text[0] == '|' || text[0] == '&' || text[0] == '^')) return "~" + text;
    std::string t = text;
    std::size_t at = t.find(" != ");
    if (at == std::string::npos) {
        at = t.find(" == ");
        if (at != std::string::npos) t.replace(at, 4, " != ");
    } else {
        t.replace(at, 4, " == ");
    }
    return t;
}

void ExprBuilder::groupSlices(PExpr& e) {
    if (e.kind != PExpr::Kind::And && e.kind != PExpr::Kind::Or) return;
    std::map<std::string, std::vector<std::size_t>> bySignal;
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        const PExpr& k = e.kids[i];
        if (k.kind == PExpr::Kind::Ref && k.ref && !k.ref->signal.empty() && k.ref->width > 1 && !k.ref->byName)
            bySignal[k.ref->signal].push_back(i);
    }
    std::vector<std::uint8_t> drop(e.kids.size(), 0);
    std::vector<PExpr> added;
    std::vector<std::size_t> addedAt;
    for (auto& [sig, idx] : bySignal) {
        if (idx.size() < 2) continue;
        std::sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
            return e.kids[a].ref->offset < e.kids[b].ref->offset;
        });
        const VarRef& r0 = *e.kids[idx[0]].ref;
        std::size_t s = 0;
        while (s < idx.size()) {
            std::size_t t = s;
            while (t + 1 < idx.size() && e.kids[idx[t + 1]].ref->offset == e.kids[idx[t]].ref->offset + 1) ++t;
            std::size_t len = t - s + 1;
            int lo = e.kids[idx[s]].ref->offset, hi = e.kids[idx[t]].ref->offset;
            // Bits that the declared type splits (two struct fields, two array elements) would be
            // a concatenation compared with a constant: `a.valid & a.tag[3]` reads better.
            if (len >= 2 && sliceText(r0, lo, hi).front() != '{') {
                // AND: bit value 1 for a positive literal; OR of literals = NOT(all literals false).
                bool isAnd = e.kind == PExpr::Kind::And;
                std::vector<int> bits;
                for (std::size_t q = t + 1; q-- > s;) {
                    bool n = e.kids[idx[q]].neg;
                    bits.push_back(isAnd ? (n ? 0 : 1) : (n ? 1 : 0));
                }
                PExpr c;
                c.kind = PExpr::Kind::Compare;
                const bool allOne = std::all_of(bits.begin(), bits.end(), [](int b) { return b == 1; });
                const bool allZero = std::all_of(bits.begin(), bits.end(), [](int b) { return b == 0; });
                if (reduced_ && reduced_->count(r0.signal) && (allOne || allZero)) {
                    // A signal the source reduces: `|v[7:4]`, `~|v`, `&v`, `~&v` (reductions.cpp).
                    // AND, all 1: &s; AND, all 0: ~|s; OR, all 0 (any 1): |s; OR, all 1 (any 0): ~&s.
                    const char* op = isAnd ? (allOne ? "&" : "~|") : (allZero ? "|" : "~&");
                    c.text = std::string(op) + sliceText(r0, lo, hi);
                } else {
                    c.text = fmt::format("{} {} {}", sliceText(r0, lo, hi), isAnd ? "==" : "!=",
                                         constantName(r0, lo, hi, bits, c.constant)
                                             .value_or(constText(static_cast<int>(len), bits)));
                }
                c.rank = e.kids[idx[s]].rank;
                c.sliceSignal = r0.signal;
                c.sliceLo = lo;
                c.sliceHi = hi;
                std::size_t first = idx[s];
                for (std::size_t q = s; q <= t; ++q) {
                    drop[idx[q]] = 1;
                    first = std::min(first, idx[q]);
                    c.rank = std::min(c.rank, e.kids[idx[q]].rank);
                }
                added.push_back(std::move(c));
                addedAt.push_back(first);
            }
            s = t + 1;
        }
    }
    if (added.empty()) return;
    std::vector<PExpr> kids;
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        for (std::size_t a = 0; a < added.size(); ++a)
            if (addedAt[a] == i) kids.push_back(added[a]);
        if (!drop[i]) kids.push_back(std::move(e.kids[i]));
    }
    e.kids = std::move(kids);
    if (e.kids.size() == 1) {
        PExpr only = std::move(e.kids[0]);
        if (e.neg) only.text = complementedCompare(only.text);   // ~(v != K) reads as v == K
        e = std::move(only);
    }
}

std::string comparisonText(const VarRef& r, int loOff, int hiOff, const std::vector<int>& bitsMsbFirst,
                           int& constant) {
    return fmt::format("{} == {}", sliceText(r, loOff, hiOff),
                       constantName(r, loOff, hiOff, bitsMsbFirst, constant)
                           .value_or(constText(hiOff - loOff + 1, bitsMsbFirst)));
}

void ExprBuilder::groupXorSlices(PExpr& e) {
    // In an exclusive or, consecutive bits of a vector the source reduces are one reduction
    // `^v[7:4]` (reductions.cpp): the parity of those bits, as the source writes it.
    if (e.kind != PExpr::Kind::Xor || !reduced_) return;
    std::map<std::string, std::vector<std::size_t>> bySignal;
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        const PExpr& k = e.kids[i];
        // The kid's text is the bit's own name (no `~`): whether that name holds the node or its
        // complement (VarRef::inverted, an output bit driven by an inverted node) does not
        // matter to the parity of the names (F182: `odd = ^sub` after `sub` in one block).
        if (k.kind == PExpr::Kind::Ref && !k.neg && k.ref && !k.ref->signal.empty() && k.ref->width > 1 && !k.ref->byName &&
            reduced_->count(k.ref->signal))
            bySignal[k.ref->signal].push_back(i);
    }
    std::vector<std::uint8_t> drop(e.kids.size(), 0);
    std::vector<std::pair<std::size_t, PExpr>> added;
    for (auto& [sig, idx] : bySignal) {
        if (idx.size() < 2) continue;
        std::sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
            return e.kids[a].ref->offset < e.kids[b].ref->offset;
        });
        const VarRef& r0 = *e.kids[idx[0]].ref;
        for (std::size_t s = 0; s < idx.size();) {
            std::size_t t = s;
            while (t + 1 < idx.size() && e.kids[idx[t + 1]].ref->offset == e.kids[idx[t]].ref->offset + 1) ++t;
            const int lo = e.kids[idx[s]].ref->offset, hi = e.kids[idx[t]].ref->offset;
            // Two bits read as well apart (`v[1] ^ v[0]`) unless they are the whole vector.
            const bool whole = lo == 0 && hi == r0.width - 1;
            if ((t - s + 1 >= 3 || whole) && sliceText(r0, lo, hi).front() != '{') {
                PExpr c;
                c.kind = PExpr::Kind::Compare;
                c.text = "^" + sliceText(r0, lo, hi);
                c.sliceSignal = r0.signal;
                c.sliceLo = lo;
                c.sliceHi = hi;
                c.rank = e.kids[idx[s]].rank;
                std::size_t first = idx[s];
                for (std::size_t q = s; q <= t; ++q) {
                    drop[idx[q]] = 1;
                    first = std::min(first, idx[q]);
                    c.rank = std::min(c.rank, e.kids[idx[q]].rank);
                }
                added.push_back({first, std::move(c)});
            }
            s = t + 1;
        }
    }
    if (added.empty()) return;
    std::vector<PExpr> kids;
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        for (auto& [at, c] : added)
            if (at == i) kids.push_back(c);
        if (!drop[i]) kids.push_back(std::move(e.kids[i]));
    }
    e.kids = std::move(kids);
    if (e.kids.size() == 1) {
        PExpr only = std::move(e.kids[0]);
        if (e.neg) only.text = complementedCompare(only.text);   // ~(^v) reads as ~^v
        e = std::move(only);
    }
}

void collectConstants(const PExpr& e, std::set<int>& out) {
    if (e.constant >= 0) out.insert(e.constant);
    for (const auto& k : e.kids) collectConstants(k, out);
}

// ---------------------------------------------------------------- text

namespace {


void appendFlat(std::string& out, const PExpr& e) {
    switch (e.kind) {
    case PExpr::Kind::Zero: out += "1'b0"; return;
    case PExpr::Kind::One: out += "1'b1"; return;
    case PExpr::Kind::Ref:
        if (e.neg) out += '~';
        out += e.text;
        return;
    case PExpr::Kind::Compare:
        if (e.neg && isReductionText(e.text)) {
            out += complementedCompare(e.text);
            return;
        }
        if (e.neg) out += "~(";
        out += e.text;
        if (e.neg) out += ')';
        return;
    case PExpr::Kind::Mux: {
        if (e.neg) out += "~(";
        auto part = [&](const PExpr& k) {
            bool p = needsParens(PExpr::Kind::Mux, k) || (k.kind == PExpr::Kind::Compare && &k == &e.kids[0]);
            if (p) out += '(';
            appendFlat(out, k);
            if (p) out += ')';
        };
        part(e.kids[0]);
        out += " ? ";
        part(e.kids[1]);
        out += " : ";
        // A chain `a ? x : b ? y : z` needs no parentheses: ?: groups to the right (IEEE 1800 11.3.2).
        if (e.kids[2].kind == PExpr::Kind::Mux && !e.kids[2].neg) appendFlat(out, e.kids[2]);
        else part(e.kids[2]);
        if (e.neg) out += ')';
        return;
    }
    default: break;
    }
    if (e.neg) out += "~(";
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        if (i) fmt::format_to(std::back_inserter(out), " {} ", opText(e.kind));
        bool p = e.kids.size() > 1 && needsParens(e.kind, e.kids[i]);
        if (p) out += '(';
        appendFlat(out, e.kids[i]);
        if (p) out += ')';
    }
    if (e.neg) out += ')';
}

/// Lines of `e` laid out from column `col`; lines after the first are complete (with indentation).
std::vector<std::string> layoutLines(const PExpr& e, std::size_t col, std::size_t limit, std::size_t tail, bool paren) {
    std::string flat;
    if (paren) flat += '(';
    appendFlat(flat, e);
    if (paren) flat += ')';
    if (col + flat.size() + tail <= limit || e.atomic() || e.kind == PExpr::Kind::Compare) return {flat};
    std::string open = paren ? "(" : "";
    if (e.neg) open += "~(";
    std::string close = std::string(e.neg ? ")" : "") + (paren ? ")" : "");
    std::size_t kc = col + open.size();
    std::vector<std::string> lines;
    if (e.kind == PExpr::Kind::Mux && e.kids[2].kind == PExpr::Kind::Mux && !e.kids[2].neg) {
        // A chain of choices, one per line, each `: cond ? value` under the first condition.
        auto sub = [&](const PExpr& k, std::size_t c, std::size_t t) {
            // A condition that is an OR or XOR gets parentheses: `(a | b) ? X` reads unambiguously.
            bool orLike = (k.kind == PExpr::Kind::Or || k.kind == PExpr::Kind::Xor) && k.kids.size() > 1 && !k.neg;
            return layoutLines(k, c, limit, t, needsParens(PExpr::Kind::Mux, k) || orLike ||
                                                   (k.kind == PExpr::Kind::Compare));
        };
        const std::size_t colonCol = kc >= 2 ? kc - 2 : 0;
        const PExpr* link = &e;
        bool first = true;
        while (true) {
            std::string valFlat;
            appendFlat(valFlat, link->kids[1]);
            std::vector<std::string> cond = sub(link->kids[0], kc, 3 + std::min<std::size_t>(valFlat.size(), limit / 4));
            std::vector<std::string> val = sub(link->kids[1], kc, 0);
            if (first) lines = cond;
            else {
                lines.push_back(std::string(colonCol, ' ') + ": " + cond[0]);
                for (std::size_t i = 1; i < cond.size(); ++i) lines.push_back(cond[i]);
            }
            lines.back() += " ? " + val[0];
            for (std::size_t i = 1; i < val.size(); ++i) lines.push_back(val[i]);
            first = false;
            const PExpr& rest = link->kids[2];
            if (rest.kind == PExpr::Kind::Mux && !rest.neg) {
                link = &rest;
                continue;
            }
            std::vector<std::string> last = sub(rest, kc, tail + close.size());
            lines.push_back(std::string(colonCol, ' ') + ": " + last[0]);
            for (std::size_t i = 1; i < last.size(); ++i) lines.push_back(last[i]);
            break;
        }
        lines.front() = open + lines.front();
        lines.back() += close;
        return lines;
    }
    if (e.kind == PExpr::Kind::Mux) {
        auto sub = [&](const PExpr& k, std::size_t c, std::size_t t) {
            return layoutLines(k, c, limit, t, needsParens(PExpr::Kind::Mux, k));
        };
        // The condition breaks at its own operators when ` ? ` and the first branch would
        // not fit after it.
        std::string thenFlat;
        appendFlat(thenFlat, e.kids[1]);
        std::size_t thenTail = 3 + std::min<std::size_t>(thenFlat.size(), limit / 4);
        std::vector<std::string> s = sub(e.kids[0], kc, thenTail);
        lines = s;
        std::size_t qcol = (lines.size() == 1 ? kc + lines[0].size() : lines.back().size()) + 1;
        std::vector<std::string> a = sub(e.kids[1], qcol + 2, 0);
        lines.back() += " ? " + a[0];
        for (std::size_t i = 1; i < a.size(); ++i) lines.push_back(a[i]);
        std::vector<std::string> b = sub(e.kids[2], qcol + 2, tail + close.size());
        lines.push_back(std::string(qcol, ' ') + ": " + b[0]);
        for (std::size_t i = 1; i < b.size(); ++i) lines.push_back(b[i]);
        lines.front() = open + lines.front();
        lines.back() += close;
        return lines;
    }
    std::string op = opText(e.kind);
    std::size_t opCol = kc >= 2 ? kc - 2 : 0;
    for (std::size_t i = 0; i < e.kids.size(); ++i) {
        const PExpr& k = e.kids[i];
        bool p = needsParens(e.kind, k);
        std::size_t t = i + 1 == e.kids.size() ? tail + close.size() : 0;
        if (i == 0) {
            lines = layoutLines(k, kc, limit, t, p);
            continue;
        }
        // AND operands pack onto the current line while they fit; OR operands start a new line.
        std::string flatKid;
        if (p) flatKid += '(';
        appendFlat(flatKid, k);
        if (p) flatKid += ')';
        std::size_t curEnd = lines.size() == 1 ? kc + lines[0].size() : lines.back().size();
        if (e.kind == PExpr::Kind::And && curEnd + 3 + flatKid.size() + t <= limit) {
            lines.back() += " " + op + " " + flatKid;
            continue;
        }
        std::vector<std::string> sub = layoutLines(k, kc, limit, t, p);
        lines.push_back(std::string(opCol, ' ') + op + std::string(kc - opCol - op.size(), ' ') + sub[0]);
        for (std::size_t j = 1; j < sub.size(); ++j) lines.push_back(sub[j]);
    }
    lines.front() = open + lines.front();
    lines.back() += close;
    return lines;
}

/// Structural equality of two expressions with their references abstracted:
/// collects, per reference position, the references of every bit.
/// A reference may differ in polarity (`w[2]` beside `~w[3]`): vectorTemplate writes such a
/// column as the slice and a constant mask, `(w[3:2] ^ 2'b10)`, or gives up.
bool sameShape(const PExpr& a, const PExpr& b) {
    if (a.kind != b.kind || a.kids.size() != b.kids.size()) return false;
    if (a.neg != b.neg && a.kind != PExpr::Kind::Ref) return false;
    if (a.kind == PExpr::Kind::Compare && a.text != b.text) return false;
    for (std::size_t i = 0; i < a.kids.size(); ++i)
        if (!sameShape(a.kids[i], b.kids[i])) return false;
    return true;
}

void collectRefs(const PExpr& e, bool inSelect, std::vector<std::pair<const PExpr*, bool>>& out) {
    if (e.kind == PExpr::Kind::Ref) out.emplace_back(&e, inSelect);
    for (std::size_t i = 0; i < e.kids.size(); ++i)
        collectRefs(e.kids[i], inSelect || (e.kind == PExpr::Kind::Mux && i == 0), out);
}

/// `plain[i]`: the i-th reference's text carries its polarity (a mask): printed without `~`.
void replaceRefs(PExpr& e, const std::vector<std::string>& texts, const std::vector<bool>& plain, std::size_t& i) {
    if (e.kind == PExpr::Kind::Ref) {
        if (plain[i]) e.neg = false;
        e.text = texts[i++];
        e.ref = nullptr;
    }
    for (auto& k : e.kids) replaceRefs(k, texts, plain, i);
}

/// The mask of a slice read in mixed polarity: bit i set where bit i is read complemented
/// (`negLsbFirst`); binary up to 8 bits, else hex with `_` every four digits.
std::string maskText(const std::vector<bool>& negLsbFirst) {
    const int n = static_cast<int>(negLsbFirst.size());
    if (n <= 8) {
        std::string bin;
        for (int i = n - 1; i >= 0; --i) bin += negLsbFirst[static_cast<std::size_t>(i)] ? '1' : '0';
        return fmt::format("{}'b{}", n, bin);
    }
    std::string digits;   // least significant first
    for (int i = 0; i < n; i += 4) {
        int v = 0;
        for (int j = std::min(n - 1, i + 3); j >= i; --j) v = v * 2 + (negLsbFirst[static_cast<std::size_t>(j)] ? 1 : 0);
        digits += "0123456789abcdef"[v];
    }
    while (digits.size() > 1 && digits.back() == '0') digits.pop_back();
    std::string hex;
    for (std::size_t i = digits.size(); i-- > 0;) {
        hex += digits[i];
        if (i && i % 4 == 0 && digits.size() > 4) hex += '_';
    }
    return fmt::format("{}'h{}", n, hex);
}

} // namespace

std::string flatText(const PExpr& e) {
    std::string s;
    appendFlat(s, e);
    return s;
}

std::string layoutText(const PExpr& e, std::size_t col, std::size_t limit, std::size_t tail) {
    std::vector<std::string> lines = layoutLines(e, col, limit, tail, false);
    std::string s;
    for (std::size_t i = 0; i < lines.size(); ++i) {
        if (i) s += '\n';
        s += lines[i];
    }
    return s;
}

namespace {

/// A run whose bits are each `x[i] | t` or `x[i] & ~t` (the choice `t ? K[i] : x[i]` with a
/// constant arm) as one choice `t ? K : x[hi:lo]` (F288: `s ? 64'hdead_beef_0123_4567 : w`,
/// which the bits' differing operators keep from one template). Only runs mixing both shapes:
/// a run of one shape has its plain template.
std::optional<PExpr> constantChoice(std::span<const PExpr> bits) {
    auto two = [](const PExpr& b) {
        return !b.neg && (b.kind == PExpr::Kind::And || b.kind == PExpr::Kind::Or) && b.kids.size() == 2 &&
               b.kids[0].kind == PExpr::Kind::Ref && b.kids[1].kind == PExpr::Kind::Ref;
    };
    for (const auto& b : bits)
        if (!two(b)) return std::nullopt;
    for (std::size_t j = 0; j < 2; ++j) {   // which operand of the first bit is the select
        const PExpr& sel0 = bits[0].kids[j];
        // The select as the OR bits read it: `t ? 1 : x` is `x | t`, `t ? 0 : x` is `x & ~t`.
        const bool tNeg = bits[0].kind == PExpr::Kind::Or ? sel0.neg : !sel0.neg;
        std::vector<PExpr> data;
        std::vector<bool> ones;
        bool ok = true, sawOr = false, sawAnd = false;
        for (const auto& b : bits) {
            int at = b.kids[0].text == sel0.text ? 0 : b.kids[1].text == sel0.text ? 1 : -1;
            if (at < 0 || b.kids[1 - at].text == sel0.text) { ok = false; break; }
            const bool isOr = b.kind == PExpr::Kind::Or;
            if (b.kids[at].neg != (isOr ? tNeg : !tNeg)) { ok = false; break; }
            (isOr ? sawOr : sawAnd) = true;
            ones.push_back(isOr);
            data.push_back(b.kids[1 - at]);
        }
        if (!ok || !sawOr || !sawAnd) continue;
        std::optional<PExpr> x = vectorTemplate(data);
        if (!x) continue;
        PExpr sel = sel0;
        sel.neg = false;
        PExpr k;
        k.kind = PExpr::Kind::Ref;
        // `~s ? K : x` reads as `s ? x : K`.
        std::vector<bool> kbits = ones;
        k.text = maskText(kbits);
        PExpr m;
        m.kind = PExpr::Kind::Mux;
        m.kids.push_back(std::move(sel));
        if (tNeg) {
            m.kids.push_back(std::move(*x));
            m.kids.push_back(std::move(k));
        } else {
            m.kids.push_back(std::move(k));
            m.kids.push_back(std::move(*x));
        }
        return m;
    }
    return std::nullopt;
}

} // namespace

std::optional<PExpr> vectorTemplate(std::span<const PExpr> bits) {
    if (bits.size() < 2) return std::nullopt;
    for (std::size_t i = 1; i < bits.size(); ++i)
        if (!sameShape(bits[0], bits[i])) return constantChoice(bits);
    std::vector<std::vector<std::pair<const PExpr*, bool>>> refs(bits.size());
    for (std::size_t i = 0; i < bits.size(); ++i) collectRefs(bits[i], false, refs[i]);
    const int n = static_cast<int>(bits.size());
    std::vector<std::string> texts;
    std::vector<bool> plain;
    for (std::size_t pos = 0; pos < refs[0].size(); ++pos) {
        const PExpr* r0 = refs[0][pos].first;
        bool select = refs[0][pos].second;
        bool same = true, mixed = false;
        for (std::size_t i = 1; i < bits.size(); ++i) {
            same = same && refs[i][pos].first->text == r0->text;
            mixed = mixed || refs[i][pos].first->neg != r0->neg;
        }
        // Mixed polarity only on consecutive bits of a vector outside a select (F288: `w ^ MAGIC`
        // read bit by bit as `w[i]` or `~w[i]` as MAGIC's bit says).
        if (mixed && (same || select)) return std::nullopt;
        plain.push_back(mixed);
        if (same) {
            // A choice keeps one scalar select; operands widen by replication.
            texts.push_back(select ? r0->text : fmt::format("{{{}{{{}}}}}", n, r0->text));
            continue;
        }
        // Consecutive bits of one vector, rising with the output bit.
        if (select || !r0->ref || r0->ref->signal.empty()) return std::nullopt;
        for (std::size_t i = 1; i < bits.size(); ++i) {
            const VarRef* ri = refs[i][pos].first->ref;
            if (!ri || ri->signal != r0->ref->signal || ri->offset != r0->ref->offset + static_cast<int>(i))
                return std::nullopt;
        }
        std::string slice = sliceText(*r0->ref, r0->ref->offset, r0->ref->offset + n - 1);
        if (mixed) {
            std::vector<bool> mask(bits.size());
            for (std::size_t i = 0; i < bits.size(); ++i) mask[i] = refs[i][pos].first->neg;
            slice = fmt::format("({} ^ {})", slice, maskText(mask));
        }
        texts.push_back(std::move(slice));
    }
    bool varies = false;
    for (std::size_t pos = 0; pos < refs[0].size(); ++pos)
        varies = varies || refs[0][pos].first->text != refs[1][pos].first->text;
    if (!varies) return std::nullopt;   // every bit alike: written bit by bit
    // Constants must be the same in every bit; a bare constant is not a template.
    if (bits[0].atomic() && bits[0].kind != PExpr::Kind::Ref) return std::nullopt;
    PExpr t = bits[0];
    std::size_t i = 0;
    replaceRefs(t, texts, plain, i);
    // Constant leaves inside widen too.
    std::vector<PExpr*> stack{&t};
    bool constants = false;
    while (!stack.empty()) {
        PExpr* x = stack.back();
        stack.pop_back();
        if (x->kind == PExpr::Kind::Zero || x->kind == PExpr::Kind::One) constants = true;
        if (x->kind == PExpr::Kind::Compare) return std::nullopt;
        for (auto& k : x->kids) stack.push_back(&k);
    }
    if (constants) return std::nullopt;
    return t;
}

bool vectorIsEnum(const VarRef& r) {
    if (!r.module) return false;
    auto it = r.module->signals.find(r.signal);
    if (it == r.module->signals.end()) return false;
    const auto& types = r.module->ir.types;
    frontend::TypeId t = it->second.type;
    return t != frontend::kNoId && t < types.size() && types[t].kind == frontend::TypeKind::Enum;
}

std::string sliceTextOf(const VarRef& r, int loOff, int hiOff) { return sliceText(r, loOff, hiOff); }

} // namespace kerf::emit
