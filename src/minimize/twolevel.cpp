// minimize/twolevel.cpp — two-level minimisation of one sum of products,
// with or without don't-care minterms. A library used by the restructuring
// techniques, not a technique itself.
//
// Background. A cover is minimised the way two-level minimisers have done it
// since the 1980s: make every cube prime (expand: drop literals while the
// cube still implies the function), drop cubes covered by the others
// (irredundant), and choose among primes a cheapest set covering every
// minterm. The expand/irredundant heuristic and the unate recursive paradigm
// for tautology and complement follow R. K. Brayton, G. D. Hachtel,
// C. T. McMullen and A. L. Sangiovanni-Vincentelli, "Logic Minimization
// Algorithms for VLSI Synthesis", Kluwer 1984 (from memory). The irredundant
// sum of primes straight from a truth table is the recursive procedure of
// S. Minato, "Fast generation of prime-irredundant covers from binary
// decision diagrams", IEICE Trans. Fundamentals 1993, after E. Morreale
// (1970) (from memory). For at most `exactVars` variables all primes are
// enumerated over the 3^n cubes and a minimum-literal cover is searched by
// branch and bound after taking the essential primes (the Quine–McCluskey
// formulation, common textbook material).
//
// Functions here are Boolean: x and ¬x are complementary, unlike in the
// algebraic model of algebra/.
#include "kerf/minimize/twolevel.h"

#include <algorithm>
#include <bit>
#include <unordered_map>

namespace kerf::minimize {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;
using TT = std::vector<std::uint64_t>;

namespace {

// Normalise, drop constant literals (literal 1 in a cube, cubes holding literal 0)
// and contained cubes.
void canonical(Cover& f) {
    std::vector<Cube> out;
    out.reserve(f.cubes.size());
    for (Cube& c : f.cubes) {
        bool zero = false, constant = false;
        for (Literal l : c.lits)
            if (literalVar(l) == 0) { constant = true; zero |= l == 0; }
        if (zero) continue;
        if (!constant) { out.push_back(std::move(c)); continue; }
        std::vector<Literal> ls;
        for (Literal l : c.lits) if (literalVar(l) != 0) ls.push_back(l);
        out.push_back(Cube(std::move(ls)));
    }
    f.cubes = std::move(out);
    f.normalize();
    for (const Cube& c : f.cubes)
        if (c.empty()) { f = Cover::one(); return; }
    if (f.cubes.size() > 1) algebra::removeContainedCubes(f);
}

constexpr std::uint64_t kVarMask[6] = {
    0xAAAAAAAAAAAAAAAAull, 0xCCCCCCCCCCCCCCCCull, 0xF0F0F0F0F0F0F0F0ull,
    0xFF00FF00FF00FF00ull, 0xFFFF0000FFFF0000ull, 0xFFFFFFFF00000000ull};

std::size_t wordsFor(int n) { return n <= 6 ? 1 : std::size_t{1} << (n - 6); }

TT varTable(int i, int n) {
    TT t(wordsFor(n));
    for (std::size_t w = 0; w < t.size(); ++w)
        t[w] = i < 6 ? kVarMask[i] : (((w >> (i - 6)) & 1) ? ~0ull : 0ull);
    return t;
}

bool isZeroTT(const TT& t) {
    for (auto w : t) if (w) return false;
    return true;
}
bool isOneTT(const TT& t) {
    for (auto w : t) if (~w) return false;
    return true;
}

TT cofactor(const TT& t, int i, bool value) {
    TT out(t.size());
    if (i < 6) {
        unsigned s = 1u << i;
        for (std::size_t w = 0; w < t.size(); ++w) {
            if (value) {
                std::uint64_t x = t[w] & kVarMask[i];
                out[w] = x | (x >> s);
            } else {
                std::uint64_t x = t[w] & ~kVarMask[i];
                out[w] = x | (x << s);
            }
        }
    } else {
        std::size_t stride = std::size_t{1} << (i - 6);
        for (std::size_t w = 0; w < t.size(); ++w) out[w] = value ? t[w | stride] : t[w & ~stride];
    }
    return out;
}

bool dependsOn(const TT& t, int i) { return cofactor(t, i, false) != cofactor(t, i, true); }

bool bitAt(const TT& t, std::uint32_t m) { return (t[m >> 6] >> (m & 63)) & 1; }

std::vector<std::uint32_t> supportOf(const Cover& f) {
    std::vector<std::uint32_t> s;
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits)
            if (literalVar(l) != 0) s.push_back(literalVar(l));
    std::sort(s.begin(), s.end());
    s.erase(std::unique(s.begin(), s.end()), s.end());
    return s;
}

bool cheaper(const Cover& a, const Cover& b) {
    std::size_t la = a.literalCount(), lb = b.literalCount();
    return la < lb || (la == lb && a.cubes.size() < b.cubes.size());
}

// ---- Minato–Morreale irredundant sum of primes -----------------------------

TT isopRec(const TT& L, const TT& U, int var, std::vector<Literal>& path,
           std::vector<std::vector<Literal>>& cubes) {
    if (isZeroTT(L)) return TT(L.size(), 0);
    if (isOneTT(U)) {
        cubes.push_back(path);
        return TT(L.size(), ~0ull);
    }
    int v = var;
    while (v >= 0 && !dependsOn(L, v) && !dependsOn(U, v)) --v;
    // L ⊆ U, L ≠ 0, U ≠ 1 and neither depends on any variable cannot happen.
    TT L0 = cofactor(L, v, false), L1 = cofactor(L, v, true);
    TT U0 = cofactor(U, v, false), U1 = cofactor(U, v, true);
    TT a(L.size()), b(L.size());
    for (std::size_t w = 0; w < L.size(); ++w) a[w] = L0[w] & ~U1[w];
    path.push_back(makeLiteral(static_cast<std::uint32_t>(v), true));
    TT R0 = isopRec(a, U0, v - 1, path, cubes);
    path.back() = makeLiteral(static_cast<std::uint32_t>(v), false);
    for (std::size_t w = 0; w < L.size(); ++w) b[w] = L1[w] & ~U0[w];
    TT R1 = isopRec(b, U1, v - 1, path, cubes);
    path.pop_back();
    TT Ln(L.size()), Un(L.size());
    for (std::size_t w = 0; w < L.size(); ++w) {
        Ln[w] = (L0[w] & ~R0[w]) | (L1[w] & ~R1[w]);
        Un[w] = U0[w] & U1[w];
    }
    TT Rs = isopRec(Ln, Un, v - 1, path, cubes);
    TT x = varTable(v, L.size() == 1 ? 6 : static_cast<int>(std::countr_zero(L.size())) + 6);
    TT R(L.size());
    for (std::size_t w = 0; w < L.size(); ++w) R[w] = (~x[w] & R0[w]) | (x[w] & R1[w]) | Rs[w];
    return R;
}

Cover fromLocalCubes(const std::vector<std::vector<Literal>>& cubes, const std::vector<std::uint32_t>& support) {
    Cover f;
    for (const auto& lc : cubes) {
        std::vector<Literal> ls;
        for (Literal l : lc) ls.push_back(makeLiteral(support[literalVar(l)], literalNegated(l)));
        f.cubes.push_back(Cube(std::move(ls)));
    }
    f.normalize();
    return f;
}

// ---- unate recursive tautology and complement on covers -------------------

// The recursive procedures below take `work`, the steps left for the current
// call of the public function (see MinimizeOptions). When it runs out,
// tautology answers "no" and complementation fails: both are the safe answers
// for their callers.

Cover cofactorLit(const Cover& f, Literal l) {
    Cover out;
    for (const Cube& c : f.cubes) {
        if (c.contains(negateLiteral(l))) continue;
        if (c.contains(l)) {
            std::vector<Literal> ls;
            for (Literal x : c.lits) if (x != l) ls.push_back(x);
            out.cubes.push_back(Cube(std::move(ls)));
        } else {
            out.cubes.push_back(c);
        }
    }
    return out;
}

Cover cofactorCube(const Cover& f, const Cube& c) {
    Cover out;
    for (const Cube& d : f.cubes) {
        bool clash = false;
        std::vector<Literal> ls;
        for (Literal l : d.lits) {
            if (c.contains(negateLiteral(l))) { clash = true; break; }
            if (!c.contains(l)) ls.push_back(l);
        }
        if (!clash) out.cubes.push_back(Cube(std::move(ls)));
    }
    return out;
}

bool tautRec(Cover f, long& work);

bool cubeImpliesRaw(const Cube& c, const Cover& f, long& work) {
    if (c.isContradictory()) return true;
    return tautRec(cofactorCube(f, c), work);
}

// Most binate variable (occurs in both polarities, most often); returns false if none.
bool mostBinate(const Cover& f, std::uint32_t& var, bool& anyBinate) {
    std::unordered_map<std::uint32_t, std::pair<int, int>> cnt;
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits) {
            auto& p = cnt[literalVar(l)];
            (literalNegated(l) ? p.second : p.first)++;
        }
    anyBinate = false;
    int best = -1;
    for (auto& [v, p] : cnt) {
        bool binate = p.first > 0 && p.second > 0;
        int score = (binate ? 1 << 20 : 0) + p.first + p.second;
        if (binate) anyBinate = true;
        if (score > best || (score == best && v < var)) { best = score; var = v; }
    }
    return best >= 0;
}

bool tautRec(Cover f, long& work) {
    if (--work < 0) return false;
    if (f.cubes.empty()) return false;
    for (const Cube& c : f.cubes) if (c.empty()) return true;
    std::vector<std::uint32_t> supp = supportOf(f);
    if (supp.size() <= 12) return isOneTT(truthTable(f, supp));
    // Unate reduction: a cube holding a literal whose variable is unate can be dropped.
    std::unordered_map<std::uint32_t, int> pol;   // bit0 positive, bit1 negative
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits) pol[literalVar(l)] |= literalNegated(l) ? 2 : 1;
    Cover g;
    for (const Cube& c : f.cubes) {
        bool unate = false;
        for (Literal l : c.lits) if (pol[literalVar(l)] != 3) { unate = true; break; }
        if (!unate) g.cubes.push_back(c);
    }
    if (g.cubes.empty()) return false;
    std::uint32_t v = 0;
    bool anyBinate = false;
    mostBinate(g, v, anyBinate);
    if (!anyBinate) return false;
    return tautRec(cofactorLit(g, makeLiteral(v, false)), work) && tautRec(cofactorLit(g, makeLiteral(v, true)), work);
}

bool complementRec(const Cover& f, Cover& out, std::size_t cap, int depth, long& work) {
    out = Cover{};
    if (f.cubes.empty()) { out = Cover::one(); return true; }
    for (const Cube& c : f.cubes) if (c.empty()) return true;
    if (f.cubes.size() == 1) {
        for (Literal l : f.cubes[0].lits) out.cubes.push_back(Cube({negateLiteral(l)}));
        out.normalize();
        return out.cubes.size() <= cap;
    }
    if (depth > 64 || --work < 0) return false;
    std::uint32_t v = 0;
    bool anyBinate = false;
    mostBinate(f, v, anyBinate);
    Cover c0, c1;
    if (!complementRec(cofactorLit(f, makeLiteral(v, true)), c0, cap, depth + 1, work)) return false;
    if (!complementRec(cofactorLit(f, makeLiteral(v, false)), c1, cap, depth + 1, work)) return false;
    // out = ¬v·c0 + v·c1, merging cubes present in both.
    std::sort(c0.cubes.begin(), c0.cubes.end());
    std::sort(c1.cubes.begin(), c1.cubes.end());
    for (const Cube& c : c0.cubes) {
        if (std::binary_search(c1.cubes.begin(), c1.cubes.end(), c)) {
            out.cubes.push_back(c);
        } else {
            std::vector<Literal> ls = c.lits;
            ls.push_back(makeLiteral(v, true));
            out.cubes.push_back(Cube(std::move(ls)));
        }
    }
    for (const Cube& c : c1.cubes) {
        if (std::binary_search(c0.cubes.begin(), c0.cubes.end(), c)) continue;
        std::vector<Literal> ls = c.lits;
        ls.push_back(makeLiteral(v, false));
        out.cubes.push_back(Cube(std::move(ls)));
    }
    canonical(out);
    return out.cubes.size() <= cap;
}

// Each implication check gets its own small budget; the whole call a larger one.
bool impliedWithin(const Cube& c, const Cover& f, long& total, long perCheck) {
    if (total <= 0) return false;
    long work = std::min<long>(perCheck, total);
    const long start = work;
    bool r = cubeImpliesRaw(c, f, work);
    total -= start - std::max<long>(work, 0);
    return r && work >= 0;
}

Cover expandIrredundant(Cover f, const MinimizeOptions& opts) {
    canonical(f);
    if (f.cubes.size() > opts.maxHeuristicCubes || f.cubes.size() < 2) return f;
    long total = opts.heuristicSteps;
    // Expand: biggest cubes first, drop every literal the function allows.
    std::vector<std::size_t> order(f.cubes.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return f.cubes[a].size() > f.cubes[b].size(); });
    for (std::size_t i : order) {
        Cube c = f.cubes[i];
        for (std::size_t k = 0; k < c.lits.size();) {
            std::vector<Literal> ls = c.lits;
            ls.erase(ls.begin() + static_cast<std::ptrdiff_t>(k));
            Cube trial(std::move(ls));
            if (impliedWithin(trial, f, total, opts.implicationSteps)) c = trial;
            else ++k;
        }
        f.cubes[i] = c;
    }
    f.normalize();
    algebra::removeContainedCubes(f);
    // Irredundant: drop a cube implied by the others (largest cubes first).
    std::stable_sort(f.cubes.begin(), f.cubes.end(),
                     [](const Cube& a, const Cube& b) { return a.size() > b.size(); });
    for (std::size_t i = 0; i < f.cubes.size();) {
        Cover rest;
        for (std::size_t j = 0; j < f.cubes.size(); ++j)
            if (j != i) rest.cubes.push_back(f.cubes[j]);
        if (impliedWithin(f.cubes[i], rest, total, opts.implicationSteps)) f.cubes.erase(f.cubes.begin() + static_cast<std::ptrdiff_t>(i));
        else ++i;
    }
    f.normalize();
    return f;
}

} // namespace

std::vector<std::uint64_t> truthTable(const Cover& f, const std::vector<std::uint32_t>& support) {
    int n = static_cast<int>(support.size());
    TT out(wordsFor(n), 0);
    std::vector<TT> vars;
    for (int i = 0; i < n; ++i) vars.push_back(varTable(i, n));
    TT cube(out.size());
    for (const Cube& c : f.cubes) {
        std::fill(cube.begin(), cube.end(), ~0ull);
        bool zero = false;
        for (Literal l : c.lits) {
            std::uint32_t v = literalVar(l);
            if (v == 0) {
                if (l == 0) { zero = true; break; }
                continue;
            }
            auto it = std::lower_bound(support.begin(), support.end(), v);
            const TT& t = vars[static_cast<std::size_t>(it - support.begin())];
            for (std::size_t w = 0; w < cube.size(); ++w) cube[w] &= literalNegated(l) ? ~t[w] : t[w];
        }
        if (zero) continue;
        for (std::size_t w = 0; w < out.size(); ++w) out[w] |= cube[w];
    }
    return out;
}

Cover irredundantPrimeCover(const std::vector<std::uint64_t>& on, const std::vector<std::uint32_t>& support) {
    std::vector<Literal> path;
    std::vector<std::vector<Literal>> cubes;
    isopRec(on, on, static_cast<int>(support.size()) - 1, path, cubes);
    return fromLocalCubes(cubes, support);
}

Cover minimumCover(const std::vector<std::uint64_t>& on, const std::vector<std::uint32_t>& support, long searchLimit) {
    return minimumCover(on, on, support, searchLimit);
}

Cover irredundantPrimeCover(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                            const std::vector<std::uint32_t>& support) {
    std::vector<Literal> path;
    std::vector<std::vector<Literal>> cubes;
    isopRec(lower, upper, static_cast<int>(support.size()) - 1, path, cubes);
    return fromLocalCubes(cubes, support);
}

Cover minimumCover(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                   const std::vector<std::uint32_t>& support, long searchLimit) {
    const int n = static_cast<int>(support.size());
    if (n > 10) return irredundantPrimeCover(lower, upper, support);
    if (isZeroTT(lower)) return Cover::zero();
    if (isOneTT(upper)) return Cover::one();
    const TT& on = lower;
    std::vector<std::uint32_t> pow3(static_cast<std::size_t>(n) + 1, 1);
    for (int i = 1; i <= n; ++i) pow3[static_cast<std::size_t>(i)] = pow3[static_cast<std::size_t>(i) - 1] * 3;
    const std::uint32_t n3 = pow3[static_cast<std::size_t>(n)];
    std::vector<std::uint8_t> imp(n3, 0);
    std::vector<std::uint8_t> digits(static_cast<std::size_t>(n));
    for (std::uint32_t c = 0; c < n3; ++c) {
        std::uint32_t t = c, m = 0;
        int dash = -1;
        for (int i = 0; i < n; ++i) {
            std::uint32_t d = t % 3;
            t /= 3;
            if (d == 2) { dash = i; break; }
            if (d == 1) m |= 1u << i;
        }
        imp[c] = dash < 0 ? bitAt(upper, m) : (imp[c - 2 * pow3[static_cast<std::size_t>(dash)]] &&
                                             imp[c - pow3[static_cast<std::size_t>(dash)]]);
    }
    // Minterms of the on-set.
    const std::uint32_t nm = 1u << n;
    std::vector<int> mindex(nm, -1);
    std::vector<std::uint32_t> minterms;
    for (std::uint32_t m = 0; m < nm; ++m)
        if (bitAt(on, m)) { mindex[m] = static_cast<int>(minterms.size()); minterms.push_back(m); }
    const std::size_t mw = (minterms.size() + 63) / 64;
    struct Prime { std::vector<Literal> lits; std::vector<std::uint64_t> cov; long cost; };
    std::vector<Prime> primes;
    for (std::uint32_t c = 0; c < n3; ++c) {
        if (!imp[c]) continue;
        std::uint32_t t = c;
        for (int i = 0; i < n; ++i) { digits[static_cast<std::size_t>(i)] = static_cast<std::uint8_t>(t % 3); t /= 3; }
        bool prime = true;
        for (int i = 0; i < n && prime; ++i) {
            auto d = digits[static_cast<std::size_t>(i)];
            if (d != 2 && imp[c + (2u - d) * pow3[static_cast<std::size_t>(i)]]) prime = false;
        }
        if (!prime) continue;
        Prime p;
        std::uint32_t base = 0;
        std::vector<int> dashes;
        for (int i = 0; i < n; ++i) {
            auto d = digits[static_cast<std::size_t>(i)];
            if (d == 2) dashes.push_back(i);
            else {
                p.lits.push_back(makeLiteral(static_cast<std::uint32_t>(i), d == 0));
                if (d == 1) base |= 1u << i;
            }
        }
        p.cov.assign(mw, 0);
        for (std::uint32_t s = 0; s < (1u << dashes.size()); ++s) {
            std::uint32_t m = base;
            for (std::size_t k = 0; k < dashes.size(); ++k)
                if ((s >> k) & 1) m |= 1u << dashes[k];
            int idx = mindex[m];
            if (idx < 0) continue;   // a don't-care minterm
            p.cov[static_cast<std::size_t>(idx) >> 6] |= 1ull << (idx & 63);
        }
        p.cost = static_cast<long>(p.lits.size()) * 1024 + 1;
        primes.push_back(std::move(p));
    }
    // Which primes cover each minterm.
    std::vector<std::vector<int>> rows(minterms.size());
    for (int p = 0; p < static_cast<int>(primes.size()); ++p)
        for (std::size_t i = 0; i < minterms.size(); ++i)
            if ((primes[static_cast<std::size_t>(p)].cov[i >> 6] >> (i & 63)) & 1) rows[i].push_back(p);
    for (auto& r : rows)
        std::sort(r.begin(), r.end(), [&](int a, int b) {
            return primes[static_cast<std::size_t>(a)].cost < primes[static_cast<std::size_t>(b)].cost;
        });

    std::vector<std::uint64_t> uncovered(mw, 0);
    for (std::size_t i = 0; i < minterms.size(); ++i) uncovered[i >> 6] |= 1ull << (i & 63);
    auto take = [&](std::vector<std::uint64_t>& u, int p) {
        for (std::size_t w = 0; w < mw; ++w) u[w] &= ~primes[static_cast<std::size_t>(p)].cov[w];
    };
    auto empty = [&](const std::vector<std::uint64_t>& u) {
        for (auto w : u) if (w) return false;
        return true;
    };
    // Essential primes.
    std::vector<int> chosen;
    long fixedCost = 0;
    for (std::size_t i = 0; i < minterms.size(); ++i)
        if (rows[i].size() == 1 && ((uncovered[i >> 6] >> (i & 63)) & 1)) {
            int p = rows[i][0];
            chosen.push_back(p);
            fixedCost += primes[static_cast<std::size_t>(p)].cost;
            take(uncovered, p);
        }
    // Greedy solution as the first bound.
    std::vector<int> best = chosen;
    long bestCost = fixedCost;
    {
        std::vector<std::uint64_t> u = uncovered;
        while (!empty(u)) {
            int bp = -1;
            double bscore = -1;
            for (int p = 0; p < static_cast<int>(primes.size()); ++p) {
                int gain = 0;
                for (std::size_t w = 0; w < mw; ++w) gain += std::popcount(u[w] & primes[static_cast<std::size_t>(p)].cov[w]);
                if (!gain) continue;
                double score = gain / static_cast<double>(primes[static_cast<std::size_t>(p)].cost);
                if (score > bscore) { bscore = score; bp = p; }
            }
            best.push_back(bp);
            bestCost += primes[static_cast<std::size_t>(bp)].cost;
            take(u, bp);
        }
    }
    // Branch and bound over the rest.
    long nodes = 0;
    std::vector<int> cur = chosen;
    auto search = [&](auto&& self, std::vector<std::uint64_t>& u, long cost) -> void {
        if (++nodes > searchLimit) return;
        if (empty(u)) {
            if (cost < bestCost) { bestCost = cost; best = cur; }
            return;
        }
        // The uncovered minterm with the fewest primes.
        std::size_t pick = 0, fewest = SIZE_MAX;
        for (std::size_t i = 0; i < minterms.size(); ++i)
            if (((u[i >> 6] >> (i & 63)) & 1) && rows[i].size() < fewest) { fewest = rows[i].size(); pick = i; }
        long minCost = primes[static_cast<std::size_t>(rows[pick][0])].cost;
        if (cost + minCost >= bestCost) return;
        for (int p : rows[pick]) {
            long c = cost + primes[static_cast<std::size_t>(p)].cost;
            if (c >= bestCost) continue;
            std::vector<std::uint64_t> next = u;
            take(next, p);
            cur.push_back(p);
            self(self, next, c);
            cur.pop_back();
            if (nodes > searchLimit) return;
        }
    };
    search(search, uncovered, fixedCost);
    std::vector<std::vector<Literal>> cubes;
    std::sort(best.begin(), best.end());
    best.erase(std::unique(best.begin(), best.end()), best.end());
    for (int p : best) cubes.push_back(primes[static_cast<std::size_t>(p)].lits);
    return fromLocalCubes(cubes, support);
}

Cover minimizeCover(const Cover& f, const MinimizeOptions& opts) {
    Cover F = f;
    canonical(F);
    if (F.isZero() || F.isOne()) return F;
    std::vector<std::uint32_t> supp = supportOf(F);
    const int n = static_cast<int>(supp.size());
    Cover best = F;
    if (n <= opts.tableVars && n <= 16) {
        TT tt = truthTable(F, supp);
        if (isZeroTT(tt)) return Cover::zero();
        if (isOneTT(tt)) return Cover::one();
        Cover cand = n <= opts.exactVars ? minimumCover(tt, supp, opts.coverSearchLimit)
                                         : irredundantPrimeCover(tt, supp);
        if (cheaper(cand, best)) best = std::move(cand);
    } else {
        Cover cand = expandIrredundant(F, opts);
        if (cheaper(cand, best)) best = std::move(cand);
    }
    return best;
}

bool complementCover(const Cover& f, Cover& out, std::size_t cubeCap, const MinimizeOptions& opts) {
    Cover F = f;
    canonical(F);
    if (F.isZero()) { out = Cover::one(); return true; }
    if (F.isOne()) { out = Cover::zero(); return true; }
    std::vector<std::uint32_t> supp = supportOf(F);
    const int n = static_cast<int>(supp.size());
    if (n <= opts.tableVars && n <= 16) {
        TT tt = truthTable(F, supp);
        for (auto& w : tt) w = ~w;
        out = n <= opts.exactVars ? minimumCover(tt, supp, opts.coverSearchLimit) : irredundantPrimeCover(tt, supp);
        return out.cubes.size() <= cubeCap;
    }
    long work = opts.complementSteps;
    if (!complementRec(F, out, cubeCap, 0, work)) return false;
    out = expandIrredundant(out, opts);
    return out.cubes.size() <= cubeCap;
}

bool isTautology(const Cover& f, long steps) {
    Cover F = f;
    canonical(F);
    long work = steps;
    return tautRec(F, work) && work >= 0;
}

bool cubeImplies(const Cube& c, const Cover& f, long steps) {
    long work = steps;
    return cubeImpliesRaw(c, f, work) && work >= 0;
}

} // namespace kerf::minimize

namespace kerf::minimize {

Cover minimizeInterval(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                       const std::vector<std::uint32_t>& support, const MinimizeOptions& opts) {
    const int n = static_cast<int>(support.size());
    if (n <= opts.exactVars) return minimumCover(lower, upper, support, opts.coverSearchLimit);
    return irredundantPrimeCover(lower, upper, support);
}

std::vector<std::uint64_t> variableTable(int i, int n) { return varTable(i, n); }

} // namespace kerf::minimize
