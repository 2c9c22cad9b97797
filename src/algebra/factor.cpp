// factor.cpp — factored forms by repeated algebraic division.
//
// A factored form is a tree of ANDs and ORs over literals; its literal count
// is the usual estimate of the size of a multi-level implementation. The
// generic factoring scheme below is R. K. Brayton's, "Factoring logic
// functions", IBM J. Research and Development 31(2), 1987, as presented in
// G. De Micheli, "Synthesis and Optimization of Digital Circuits",
// McGraw-Hill 1994, ch. 8, and in G. D. Hachtel and F. Somenzi, "Logic
// Synthesis and Verification Algorithms", Kluwer 1996, ch. 10:
//
//   factor(f): take out the common cube c of f (f = c * f');
//              pick a divisor d of f; (q, r) = f / d;
//              if q is a single cube, factor out its best literal l:
//                  f = l * factor(f / l) + factor(r);
//              else make q cube-free and divide again, (d', r') = f / q:
//                  if d' is cube-free, f = factor(q) * factor(d') + factor(r');
//                  otherwise factor out the best literal of d''s common cube.
//
// "Best literal" is the literal occurring in most cubes of f. The divisor
// is where the two methods differ:
//   quick — a level-0 kernel, reached by dividing by the most frequent
//           literal until no literal repeats (Brayton's quick divisor);
//   best  — the kernel with a non-empty co-kernel whose division saves the
//           most literals,
//           saving = lits(f) - lits(d) - lits(q) - lits(r)
//                  = (|q| - 1) * lits(d) + (|d| - 1) * lits(q),
//           among the kernels found under the most frequent literals (all
//           repeated literals of a small cover, the 8 most frequent of a
//           large one; each enumeration bounded in proportion to its
//           sub-cover). Candidates are ranked by a lower bound on the saving
//           from their co-kernels, and the best 16 are divided exactly.
//           Greedy choices are not always best overall, so `factor` with
//           this method also runs quick and keeps the smaller result.
//
// Every step writes f exactly as an algebraic sum of products of covers with
// disjoint support, so flattening the factored form gives back the cover f,
// cube for cube, and the literal count never exceeds that of f
// (lits(d) + lits(q) + lits(r) <= lits(d*q) + lits(r) once |d|, |q| >= 1).
//
// Cost: the loop over remainders works on a shrinking set of live cubes with
// literal occurrence lists, live literal counts in a heap and a cube hash
// table, all built once per call; a step touches only the cubes under the
// literals it looks at and the cubes it takes out, not the whole remainder.
// Remainders are handled in that loop, not by recursion, so long chains of
// remainders cost no stack; recursion goes only into quotients and divisors,
// whose cubes are strictly smaller.

#include "kerf/algebra/cover.h"

#include <algorithm>
#include <unordered_map>

namespace kerf::algebra {

namespace {

Factored litNode(Literal l) {
    Factored n;
    n.kind = Factored::Kind::Lit;
    n.lit = l;
    return n;
}

Factored constNode(bool one) {
    Factored n;
    n.kind = one ? Factored::Kind::One : Factored::Kind::Zero;
    return n;
}

// AND of kids: nested ANDs flattened, constant 1 dropped, 0 absorbs.
Factored makeAnd(std::vector<Factored> kids) {
    Factored n;
    n.kind = Factored::Kind::And;
    for (Factored& k : kids) {
        if (k.kind == Factored::Kind::One) continue;
        if (k.kind == Factored::Kind::Zero) return constNode(false);
        if (k.kind == Factored::Kind::And) {
            for (Factored& g : k.kids) n.kids.push_back(std::move(g));
        } else {
            n.kids.push_back(std::move(k));
        }
    }
    if (n.kids.empty()) return constNode(true);
    if (n.kids.size() == 1) return std::move(n.kids[0]);
    return n;
}

// OR of kids: nested ORs flattened, constant 0 dropped. A constant 1 kid is
// kept (the algebraic model does not absorb x | 1).
Factored makeOr(std::vector<Factored> kids) {
    Factored n;
    n.kind = Factored::Kind::Or;
    for (Factored& k : kids) {
        if (k.kind == Factored::Kind::Zero) continue;
        if (k.kind == Factored::Kind::Or) {
            for (Factored& g : k.kids) n.kids.push_back(std::move(g));
        } else {
            n.kids.push_back(std::move(k));
        }
    }
    if (n.kids.empty()) return constNode(false);
    if (n.kids.size() == 1) return std::move(n.kids[0]);
    return n;
}

Factored cubeNode(const Cube& c) {
    std::vector<Factored> kids;
    kids.reserve(c.size());
    for (Literal l : c.lits) kids.push_back(litNode(l));
    return makeAnd(std::move(kids));
}


// The cover being factored, as a shrinking set of live cubes with literal
// counts kept up to date, so that one step of the factoring loop costs about
// the size of what it takes out of the cover, not the size of the cover.
// Cubes leave when they go into a term; the remainder is what stays live.
class Workspace {
public:
    explicit Workspace(Cover f)
        : f_(std::move(f)), index_(f_), live_(f_.size(), 1), liveCount_(f_.size()), liveLits_(f_.literalCount()) {
        const std::size_t slots = index_.literals().size();
        count_.resize(slots);
        heap_.reserve(slots);
        for (std::size_t s = 0; s < slots; ++s) {
            count_[s] = static_cast<std::uint32_t>(index_.cubesWithSlot(s).size());
            heap_.emplace_back(count_[s], static_cast<std::uint32_t>(s));
        }
        std::make_heap(heap_.begin(), heap_.end(), HeapLess{});
    }
    Workspace(const Workspace&) = delete;
    Workspace& operator=(const Workspace&) = delete;

    std::size_t liveCount() const { return liveCount_; }
    std::size_t liveLiterals() const { return liveLits_; }
    Literal literalAt(std::size_t slot) const { return index_.literals()[slot]; }

    /// The slots of the (up to) k most frequent live literals, most frequent
    /// first, ties to the smaller literal; with their counts.
    std::vector<std::pair<std::uint32_t, std::uint32_t>> top(std::size_t k) {
        std::vector<std::pair<std::uint32_t, std::uint32_t>> out;   // (slot, count)
        std::vector<std::pair<std::uint32_t, std::uint32_t>> popped;
        while (out.size() < k && !heap_.empty()) {
            std::pop_heap(heap_.begin(), heap_.end(), HeapLess{});
            auto e = heap_.back();
            heap_.pop_back();
            if (e.first == 0 || e.first != count_[e.second]) continue;   // stale
            out.emplace_back(e.second, e.first);
            popped.push_back(e);
        }
        for (auto& e : popped) {
            heap_.push_back(e);
            std::push_heap(heap_.begin(), heap_.end(), HeapLess{});
        }
        return out;
    }

    std::uint32_t count(Literal l) const {
        std::size_t s = index_.slotOf(l);
        return s == CoverIndex::npos ? 0 : count_[s];
    }

    /// Live cubes holding literal l, ascending.
    std::vector<std::uint32_t> liveWithLiteral(Literal l) const {
        std::size_t s = index_.slotOf(l);
        return s == CoverIndex::npos ? std::vector<std::uint32_t>{} : liveWith(s);
    }

    /// Live cubes holding the literal in `slot`, ascending.
    std::vector<std::uint32_t> liveWith(std::size_t slot) const {
        std::vector<std::uint32_t> out;
        for (std::uint32_t j : index_.cubesWithSlot(slot))
            if (live_[j]) out.push_back(j);
        return out;
    }

    std::vector<std::uint32_t> liveCubes() const {
        std::vector<std::uint32_t> out;
        out.reserve(liveCount_);
        for (std::uint32_t j = 0; j < f_.size(); ++j)
            if (live_[j]) out.push_back(j);
        return out;
    }

    /// The given cubes as a cover (indices ascending, so it is sorted).
    Cover cover(const std::vector<std::uint32_t>& idx) const {
        Cover g;
        g.cubes.reserve(idx.size());
        for (std::uint32_t j : idx) g.cubes.push_back(f_.cubes[j]);
        return g;
    }

    void remove(std::uint32_t j) {
        if (!live_[j]) return;
        live_[j] = 0;
        --liveCount_;
        liveLits_ -= f_.cubes[j].size();
        for (Literal l : f_.cubes[j].lits) {
            std::size_t s = index_.slotOf(l);
            if (--count_[s] > 0) {
                heap_.emplace_back(count_[s], static_cast<std::uint32_t>(s));
                std::push_heap(heap_.begin(), heap_.end(), HeapLess{});
            }
        }
    }

    /// Weak division of the live cover by d (see division.cpp); the indices
    /// of the cubes of d * quotient go to `used`.
    Cover divide(const Cover& d, std::vector<std::uint32_t>& used) const {
        used.clear();
        Cover q;
        std::size_t pivot = SIZE_MAX, pivotSlot = 0;
        std::uint32_t best = UINT32_MAX;
        for (std::size_t i = 0; i < d.cubes.size(); ++i) {
            for (Literal l : d.cubes[i].lits) {
                std::size_t s = index_.slotOf(l);
                std::uint32_t c = s == CoverIndex::npos ? 0 : count_[s];
                if (c < best) {
                    best = c;
                    pivot = i;
                    pivotSlot = s;
                }
            }
        }
        if (pivot == SIZE_MAX || best == 0) return q;   // d is all 1s, or a cube of d is nowhere
        const Cube& dp = d.cubes[pivot];
        std::vector<std::uint32_t> hit(d.cubes.size());
        std::vector<Literal> scratch;
        for (std::uint32_t j : index_.cubesWithSlot(pivotSlot)) {
            if (!live_[j] || !f_.cubes[j].hasAllOf(dp)) continue;
            Cube cand = cubeDifference(f_.cubes[j], dp);
            bool ok = true;
            for (std::size_t i = 0; i < d.cubes.size() && ok; ++i) {
                if (i == pivot) {
                    hit[i] = j;
                    continue;
                }
                if (!disjointUnion(cand.lits, d.cubes[i].lits, scratch)) {
                    ok = false;
                    break;
                }
                std::size_t k = index_.find(scratch);
                if (k == CoverIndex::npos || !live_[k]) ok = false;
                else hit[i] = static_cast<std::uint32_t>(k);
            }
            if (!ok) continue;
            used.insert(used.end(), hit.begin(), hit.end());
            q.cubes.push_back(std::move(cand));
        }
        std::sort(q.cubes.begin(), q.cubes.end());
        return q;
    }

private:
    struct HeapLess {   // max-heap on count, then on the smaller slot
        bool operator()(const std::pair<std::uint32_t, std::uint32_t>& a,
                        const std::pair<std::uint32_t, std::uint32_t>& b) const {
            return a.first != b.first ? a.first < b.first : a.second > b.second;
        }
    };

    Cover f_;
    CoverIndex index_;
    std::vector<char> live_;
    std::size_t liveCount_;
    std::size_t liveLits_;
    std::vector<std::uint32_t> count_;                              // live count per slot
    std::vector<std::pair<std::uint32_t, std::uint32_t>> heap_;     // (count, slot), may hold stale entries
};

long long saving(const Cover& d, const Cover& q) {
    if (q.isZero()) return -1;
    return (static_cast<long long>(q.size()) - 1) * static_cast<long long>(d.literalCount()) +
           (static_cast<long long>(d.size()) - 1) * static_cast<long long>(q.literalCount());
}

// How many frequent literals the best divisor looks under (all of them in
// a cover of at most kSmallCover literal occurrences), and how many candidate
// kernels it divides exactly.
constexpr std::size_t kBestLiterals = 8;
constexpr std::size_t kSmallCover = 256;
constexpr std::size_t kBestExact = 16;

// Best: the kernel (non-empty co-kernel) of the live cover whose division
// saves most literals. Every such co-kernel holds a literal in two or more
// cubes, and the kernels whose co-kernel holds literal l are exactly the
// kernels of the cubes holding l; so enumerating those for the most frequent
// literals finds all kernels when at most kBestLiterals literals repeat, and
// the kernels under the most shared literals otherwise. Each enumeration is
// bounded in proportion to its sub-cover, so a step costs about the size of
// the sub-covers, not of the whole cover.
Cover bestDivisor(Workspace& w) {
    struct Candidate {
        Cover kernel;
        std::size_t cokernels = 0;
        std::size_t cokernelLits = 0;
        long long estimate = 0;
    };
    std::vector<Candidate> cands;
    std::unordered_map<Cover, std::size_t, CoverHash> byKernel;
    std::unordered_map<Cube, char, CubeHash> seenCokernel;
    const std::size_t look = w.liveLiterals() <= kSmallCover ? SIZE_MAX : kBestLiterals;
    for (auto [slot, count] : w.top(look)) {
        if (count < 2) break;
        Cover g = w.cover(w.liveWith(slot));
        KernelOptions opts;
        opts.computeLevels = false;
        opts.maxWork = std::clamp<std::size_t>(2 * g.literalCount(), 2000, KernelOptions{}.maxWork);
        opts.maxKernels = 100;
        for (KernelPair& p : kernels(g, opts)) {
            if (!seenCokernel.emplace(p.cokernel, 0).second) continue;
            auto [it, fresh] = byKernel.emplace(p.kernel, cands.size());
            if (fresh) cands.push_back(Candidate{std::move(p.kernel)});
            Candidate& c = cands[it->second];
            c.cokernels += 1;
            c.cokernelLits += p.cokernel.size();
        }
    }
    if (cands.empty()) return {};
    // A lower bound on the saving, from the co-kernels found: q holds them all.
    for (Candidate& c : cands)
        c.estimate = static_cast<long long>(c.cokernels - 1) * static_cast<long long>(c.kernel.literalCount()) +
                     static_cast<long long>(c.kernel.size() - 1) * static_cast<long long>(c.cokernelLits);
    std::vector<std::size_t> order(cands.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return cands[a].estimate > cands[b].estimate; });
    if (order.size() > kBestExact) order.resize(kBestExact);
    std::size_t best = order[0];
    long long bestSaving = -2;
    std::vector<std::uint32_t> used;
    for (std::size_t i : order) {
        long long s = saving(cands[i].kernel, w.divide(cands[i].kernel, used));
        if (s > bestSaving || (s == bestSaving && i < best)) {
            bestSaving = s;
            best = i;
        }
    }
    return std::move(cands[best].kernel);
}

// Quick: a level-0 kernel reached from the most frequent literal.
Cover quickDivisor(Workspace& w) {
    auto t = w.top(1);
    if (t.empty() || t[0].second < 2) return {};
    return levelZeroKernel(w.cover(w.liveWith(t[0].first))).kernel;
}

// The literal of c that occurs in most live cubes (ties: smallest literal).
Literal bestLiteral(const Workspace& w, const Cube& c) {
    Literal best = c.lits.front();
    std::uint32_t bestCount = 0;
    for (Literal l : c.lits) {
        std::uint32_t n = w.count(l);
        if (n > bestCount) {
            bestCount = n;
            best = l;
        }
    }
    return best;
}

Factored factorRec(Cover f, FactorMethod method);

// l * factor(live cubes with l, l removed); those cubes leave the workspace.
Factored literalTerm(Workspace& w, Literal l, FactorMethod method) {
    std::vector<std::uint32_t> idx = w.liveWithLiteral(l);
    Cover g = w.cover(idx);
    const Cube lc{{l}};
    for (Cube& c : g.cubes) c = cubeDifference(c, lc);
    std::sort(g.cubes.begin(), g.cubes.end());
    for (std::uint32_t j : idx) w.remove(j);
    return makeAnd({litNode(l), factorRec(std::move(g), method)});
}

Factored factorRec(Cover f, FactorMethod method) {
    if (f.isZero()) return constNode(false);
    if (f.size() == 1) return cubeNode(f.cubes[0]);
    Workspace w(std::move(f));
    std::vector<Factored> terms;
    std::vector<std::uint32_t> used;
    while (w.liveCount() > 0) {
        if (w.liveCount() == 1) {
            terms.push_back(cubeNode(w.cover(w.liveCubes()).cubes[0]));
            break;
        }
        const auto top = w.top(1);
        const std::uint32_t topCount = top.empty() ? 0 : top[0].second;
        if (topCount == w.liveCount()) {   // a literal in every cube: take out the common cube
            Cube common;
            Cover g = makeCubeFree(w.cover(w.liveCubes()), &common);
            terms.push_back(makeAnd({cubeNode(common), factorRec(std::move(g), method)}));
            break;
        }
        if (topCount < 2) {   // no literal repeats: nothing to factor
            for (const Cube& c : w.cover(w.liveCubes()).cubes) terms.push_back(cubeNode(c));
            break;
        }
        const Literal topLiteral = w.literalAt(top[0].first);
        Cover d = method == FactorMethod::Best ? bestDivisor(w) : quickDivisor(w);
        Cover q = d.isZero() ? Cover{} : w.divide(d, used);
        if (q.isZero()) {   // cannot happen for a kernel with a co-kernel; keep making progress anyway
            terms.push_back(literalTerm(w, topLiteral, method));
            continue;
        }
        if (q.size() == 1) {
            terms.push_back(literalTerm(w, bestLiteral(w, q.cubes[0]), method));
            continue;
        }
        Cover qf = makeCubeFree(q);
        Cover d2 = w.divide(qf, used);
        if (isCubeFree(d2)) {
            for (std::uint32_t j : used) w.remove(j);
            terms.push_back(makeAnd({factorRec(std::move(qf), method), factorRec(std::move(d2), method)}));
            continue;
        }
        terms.push_back(literalTerm(w, bestLiteral(w, commonCube(d2)), method));
    }
    return makeOr(std::move(terms));
}

} // namespace

std::size_t Factored::gateCount() const {
    if (kind != Kind::And && kind != Kind::Or) return 0;
    std::size_t g = kids.size() > 1 ? kids.size() - 1 : 0;
    for (const Factored& k : kids) g += k.gateCount();
    return g;
}

std::size_t Factored::arrival(const std::function<std::size_t(std::uint32_t)>& at) const {
    if (kind == Kind::Lit) return at(literalVar(lit));
    if (kind != Kind::And && kind != Kind::Or) return 0;
    std::vector<std::size_t> t;
    t.reserve(kids.size());
    for (const Factored& k : kids) t.push_back(k.arrival(at));
    if (t.empty()) return 0;
    std::make_heap(t.begin(), t.end(), std::greater<>());
    while (t.size() > 1) {
        std::pop_heap(t.begin(), t.end(), std::greater<>());
        const std::size_t a = t.back();
        t.pop_back();
        std::pop_heap(t.begin(), t.end(), std::greater<>());
        t.back() = std::max(a, t.back()) + 1;
        std::push_heap(t.begin(), t.end(), std::greater<>());
    }
    return t[0];
}

std::size_t Factored::arrival(const std::vector<std::size_t>& at) const {
    return arrival([&](std::uint32_t x) { return x < at.size() ? at[x] : std::size_t{0}; });
}

std::size_t Factored::literalCount() const {
    switch (kind) {
    case Kind::Lit: return 1;
    case Kind::And:
    case Kind::Or: {
        std::size_t n = 0;
        for (const Factored& k : kids) n += k.literalCount();
        return n;
    }
    default: return 0;
    }
}

Cover Factored::toCover() const {
    switch (kind) {
    case Kind::Zero: return Cover::zero();
    case Kind::One: return Cover::one();
    case Kind::Lit: return Cover::literal(lit);
    case Kind::And: {
        Cover r = Cover::one();
        for (const Factored& k : kids) r = multiply(r, k.toCover());
        return r;
    }
    case Kind::Or: {
        Cover r;
        for (const Factored& k : kids) {
            Cover c = k.toCover();
            r.cubes.insert(r.cubes.end(), std::make_move_iterator(c.cubes.begin()),
                           std::make_move_iterator(c.cubes.end()));
        }
        r.normalize();
        return r;
    }
    }
    return {};
}

Factored sumOfProducts(const Cover& f) {
    std::vector<Factored> terms;
    terms.reserve(f.size());
    for (const Cube& c : f.cubes) terms.push_back(cubeNode(c));
    return makeOr(std::move(terms));
}

Factored factor(const Cover& f, FactorMethod method) {
    Cover g = f;
    g.normalize();
    if (method == FactorMethod::Quick) return factorRec(std::move(g), method);
    const Factored quick = factorRec(g, FactorMethod::Quick);
    return factorBest(f, quick);
}

Factored factorBest(const Cover& f, const Factored& quickForm) {
    Cover g = f;
    g.normalize();
    // Choosing the divisor that saves most at each step is greedy: now and
    // then the quick divisors end up with fewer literals overall. Best keeps
    // whichever form is smaller (ties: its own), so it is never worse than quick.
    Factored best = factorRec(std::move(g), FactorMethod::Best);
    return quickForm.literalCount() < best.literalCount() ? quickForm : std::move(best);
}

} // namespace kerf::algebra
