// kernels.cpp — kernels and co-kernels of a cover.
//
// A kernel of f is a cube-free quotient f / c of f by a cube c, its
// co-kernel; cube-free means no literal is common to all (two or more)
// cubes. Kernels are the candidate multiple-cube divisors of the algebraic
// model: two covers share a multiple-cube algebraic divisor only if they have
// kernels with a common multiple-cube part. The notion, the theorem behind
// it and the recursive enumeration used here are from R. K. Brayton and
// C. McMullen, "The decomposition and factorization of Boolean expressions",
// Proc. ISCAS 1982; we follow the presentation in G. De Micheli, "Synthesis
// and Optimization of Digital Circuits", McGraw-Hill 1994, ch. 8 (recursive
// kernel computation with a literal order), also in G. D. Hachtel and
// F. Somenzi, "Logic Synthesis and Verification Algorithms", Kluwer 1996.
//
// Enumeration: with f cube-free and literals in ascending order, for each
// literal l (from a start index on) that occurs in at least two cubes, take
// the largest cube C common to the cubes holding l; if C holds a literal
// below l, the same co-kernel is reached from that literal, so skip it;
// otherwise f / C is cube-free and we recurse on it from l + 1 with co-kernel
// multiplied by C. Every kernel/co-kernel pair is produced exactly once.
// A cover that is not cube-free is first divided by its common cube c, and c
// multiplies every co-kernel; the cover itself is a kernel (co-kernel 1) only
// when it is cube-free.
//
// Level: a kernel is of level 0 when it has no kernel but itself (no literal
// repeats in it), and otherwise one more than the highest level among its
// other kernels. Every kernel of a kernel K is a kernel of some cube-free
// K / l for a repeated literal l, and those are kernels of K themselves, so
// level(K) = 1 + max over repeated l of level(cube-free part of K / l),
// computed with a memo over distinct kernels.
//
// Implementation: the cover is renumbered onto dense literal slots (same
// order) and kept flat (one array of literals plus cube offsets); literal
// counts go through slot-indexed arrays cleared via the list of slots
// touched, so expanding a node costs time linear in the node's size.

#include "kerf/algebra/cover.h"

#include <algorithm>
#include <iterator>
#include <span>
#include <unordered_map>

namespace kerf::algebra {

namespace {

// A cover in flat form over dense literal slots (slot order = literal order).
struct Flat {
    std::vector<std::uint32_t> start{0};
    std::vector<std::uint32_t> lits;
    std::size_t size() const { return start.size() - 1; }
    std::span<const std::uint32_t> cube(std::size_t i) const {
        return {lits.data() + start[i], lits.data() + start[i + 1]};
    }
    void endCube() { start.push_back(static_cast<std::uint32_t>(lits.size())); }
};

// Dense slots for the literals of a cover, in literal order. A direct table
// maps literals to slots when the largest literal is small against the
// cover (the usual case); otherwise sort and binary search.
class SlotMap {
public:
    explicit SlotMap(const Cover& f) {
        std::size_t total = 0;
        Literal maxLit = 0;
        for (const Cube& c : f.cubes) {
            total += c.lits.size();
            if (!c.lits.empty()) maxLit = std::max(maxLit, c.lits.back());
        }
        if (static_cast<std::size_t>(maxLit) < 4 * total + 1024) {
            slotByLit_.assign(static_cast<std::size_t>(maxLit) + 1, 0);
            for (const Cube& c : f.cubes)
                for (Literal l : c.lits) slotByLit_[l] = 1;
            for (Literal l = 0; l < slotByLit_.size(); ++l)
                if (slotByLit_[l]) {
                    lits.push_back(l);
                    slotByLit_[l] = static_cast<std::uint32_t>(lits.size() - 1);
                }
        } else {
            lits.reserve(total);
            for (const Cube& c : f.cubes) lits.insert(lits.end(), c.lits.begin(), c.lits.end());
            std::sort(lits.begin(), lits.end());
            lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
        }
    }
    std::uint32_t slot(Literal l) const {
        if (!slotByLit_.empty()) return slotByLit_[l];
        return static_cast<std::uint32_t>(std::lower_bound(lits.begin(), lits.end(), l) - lits.begin());
    }
    std::vector<Literal> lits;   // slot -> literal

private:
    std::vector<std::uint32_t> slotByLit_;
};

Flat toFlat(const Cover& f, const SlotMap& slots) {
    Flat flat;
    flat.start.reserve(f.size() + 1);
    flat.lits.reserve(f.literalCount());
    for (const Cube& c : f.cubes) {
        for (Literal l : c.lits) flat.lits.push_back(slots.slot(l));
        flat.endCube();
    }
    return flat;
}

Cube toCube(std::span<const std::uint32_t> slots, const std::vector<Literal>& slotLits) {
    Cube c;
    c.lits.reserve(slots.size());
    for (std::uint32_t sl : slots) c.lits.push_back(slotLits[sl]);
    return c;
}

Cover toCover(const Flat& f, const std::vector<Literal>& slotLits) {
    Cover k;
    k.cubes.reserve(f.size());
    for (std::size_t i = 0; i < f.size(); ++i) k.cubes.push_back(toCube(f.cube(i), slotLits));
    std::sort(k.cubes.begin(), k.cubes.end());
    return k;
}

// Canonical serialisation of a flat cover (cubes sorted), for the level memo.
std::vector<std::uint32_t> canonicalKey(const Flat& f) {
    std::vector<std::uint32_t> order(f.size());
    for (std::uint32_t i = 0; i < order.size(); ++i) order[i] = i;
    std::sort(order.begin(), order.end(), [&](std::uint32_t a, std::uint32_t b) {
        auto x = f.cube(a), y = f.cube(b);
        return std::lexicographical_compare(x.begin(), x.end(), y.begin(), y.end());
    });
    std::vector<std::uint32_t> key;
    key.reserve(f.lits.size() + f.size() + 1);
    key.push_back(static_cast<std::uint32_t>(f.size()));
    for (std::uint32_t i : order) {
        auto c = f.cube(i);
        key.push_back(static_cast<std::uint32_t>(c.size()));
        key.insert(key.end(), c.begin(), c.end());
    }
    return key;
}

struct KeyHash {
    std::size_t operator()(const std::vector<std::uint32_t>& v) const noexcept {
        std::uint64_t h = 0x9e3779b97f4a7c15ull ^ v.size();
        for (std::uint32_t x : v) {
            h ^= x;
            h *= 0xff51afd7ed558ccdull;
            h ^= h >> 32;
        }
        return static_cast<std::size_t>(h);
    }
};

// The literals of a flat cover that occur in two or more cubes, with the
// cubes holding each (CSR: members[off[g] .. off[g+1]) for slots[g]).
struct Groups {
    bool repeats = false;                  // some literal (of any slot) repeats
    std::vector<std::uint32_t> slots;      // ascending, only slots >= the minimum asked for
    std::vector<std::uint32_t> off;
    std::vector<std::uint32_t> members;
    std::uint32_t size(std::size_t g) const { return off[g + 1] - off[g]; }
};

// Node expansion shared by the enumeration, the levels and the level-0 descent.
class Expander {
public:
    explicit Expander(std::size_t slots) : count_(slots, 0), group_(slots, 0) {}

    void groups(const Flat& f, std::uint32_t minSlot, Groups& g, std::size_t& work) {
        touched_.clear();
        for (std::uint32_t sl : f.lits)
            if (count_[sl]++ == 0) touched_.push_back(sl);
        work += f.lits.size() + f.size();
        g.repeats = false;
        g.slots.clear();
        for (std::uint32_t sl : touched_) {
            if (count_[sl] < 2) continue;
            g.repeats = true;
            if (sl >= minSlot) g.slots.push_back(sl);
        }
        std::sort(g.slots.begin(), g.slots.end());
        g.off.assign(g.slots.size() + 1, 0);
        for (std::size_t k = 0; k < g.slots.size(); ++k) {
            g.off[k + 1] = g.off[k] + count_[g.slots[k]];
            group_[g.slots[k]] = static_cast<std::uint32_t>(k + 1);
        }
        g.members.resize(g.off.back());
        fill_.assign(g.off.begin(), g.off.end() - 1);
        if (!g.slots.empty())
            for (std::uint32_t i = 0; i < f.size(); ++i)
                for (std::uint32_t sl : f.cube(i))
                    if (std::uint32_t k = group_[sl]) g.members[fill_[k - 1]++] = i;
        for (std::uint32_t sl : touched_) count_[sl] = 0;
        for (std::uint32_t sl : g.slots) group_[sl] = 0;
    }

    // The largest cube common to the cubes of group k. True when it holds no
    // slot below the group's own (the first time this co-kernel is reached).
    static bool common(const Flat& f, const Groups& g, std::size_t k, std::vector<std::uint32_t>& c,
                       std::size_t& work) {
        auto first = f.cube(g.members[g.off[k]]);
        c.assign(first.begin(), first.end());
        work += first.size();
        std::vector<std::uint32_t> next;
        for (std::uint32_t t = g.off[k] + 1; t < g.off[k + 1] && c.size() > 1; ++t) {
            auto x = f.cube(g.members[t]);
            work += x.size();
            next.clear();
            std::set_intersection(c.begin(), c.end(), x.begin(), x.end(), std::back_inserter(next));
            c.swap(next);
        }
        return c.front() == g.slots[k];
    }

    // The cubes of group k divided by c (cube-free when c is their common cube).
    static void quotient(const Flat& f, const Groups& g, std::size_t k, const std::vector<std::uint32_t>& c, Flat& sub,
                         std::size_t& work) {
        sub.start.assign(1, 0);
        sub.lits.clear();
        for (std::uint32_t t = g.off[k]; t < g.off[k + 1]; ++t) {
            auto x = f.cube(g.members[t]);
            work += x.size();
            std::set_difference(x.begin(), x.end(), c.begin(), c.end(), std::back_inserter(sub.lits));
            sub.endCube();
        }
    }

private:
    std::vector<std::uint32_t> count_, group_, touched_, fill_;
};

class LevelCalculator {
public:
    LevelCalculator(Expander& ex, std::size_t budget) : ex_(ex), budget_(budget) {}

    int level(const Flat& k) {
        std::vector<std::uint32_t> key = canonicalKey(k);
        auto it = memo_.find(key);
        if (it != memo_.end()) return it->second;
        Groups g;
        ex_.groups(k, 0, g, work);
        int lvl = 0;
        if (g.repeats) {
            lvl = 1;
            std::vector<std::uint32_t> c;
            Flat sub;
            for (std::size_t i = 0; i < g.slots.size(); ++i) {
                if (work > budget_) {
                    exact = false;
                    break;
                }
                // A common cube holding a lower literal gives a kernel of the
                // one found from that literal, whose level is no lower.
                if (!Expander::common(k, g, i, c, work)) continue;
                Expander::quotient(k, g, i, c, sub, work);
                lvl = std::max(lvl, 1 + level(sub));
            }
        }
        memo_.emplace(std::move(key), lvl);
        return lvl;
    }

    std::size_t work = 0;
    bool exact = true;

private:
    Expander& ex_;
    std::size_t budget_;
    std::unordered_map<std::vector<std::uint32_t>, int, KeyHash> memo_;
};

// The recursive enumeration described at the top of the file.
class Enumerator {
public:
    Enumerator(const KernelOptions& opts, const std::vector<Literal>& slotLits, Cube outerCube)
        : opts_(opts), slotLits_(slotLits), outer_(std::move(outerCube)), ex_(slotLits.size()),
          levels_(ex_, opts.maxWork) {}

    void run(const Flat& f) { recurse(f, 0, {}); }

    std::vector<KernelPair> pairs;
    std::size_t work = 0;
    bool truncated = false;
    std::size_t levelWork() const { return levels_.work; }
    bool levelsExact() const { return levels_.exact; }

private:
    bool overBudget() {
        if (work > opts_.maxWork || pairs.size() >= opts_.maxKernels) truncated = true;
        return truncated;
    }

    void recurse(const Flat& f, std::uint32_t start, const std::vector<std::uint32_t>& cok) {
        if (overBudget()) return;
        Groups g;
        ex_.groups(f, start, g, work);
        if (!opts_.levelZeroOnly || !g.repeats) {
            int level = 0;
            if (g.repeats) level = opts_.computeLevels ? levels_.level(f) : 1;
            Cube c = toCube(cok, slotLits_);
            pairs.push_back(KernelPair{toCover(f, slotLits_), outer_.empty() ? std::move(c) : cubeProduct(outer_, c),
                                       level});
            if (overBudget()) return;
        }
        std::vector<std::uint32_t> common, subCok;
        Flat sub;
        for (std::size_t k = 0; k < g.slots.size(); ++k) {
            if (!Expander::common(f, g, k, common, work)) continue;   // reached from a lower literal
            Expander::quotient(f, g, k, common, sub, work);
            subCok.clear();
            std::set_union(cok.begin(), cok.end(), common.begin(), common.end(), std::back_inserter(subCok));
            recurse(sub, g.slots[k] + 1, subCok);
            if (truncated || overBudget()) return;
        }
    }

    const KernelOptions& opts_;
    const std::vector<Literal>& slotLits_;
    Cube outer_;   // common cube of the whole cover, part of every co-kernel
    Expander ex_;
    LevelCalculator levels_;
};

bool normalized(const Cover& f) {
    for (std::size_t i = 1; i < f.cubes.size(); ++i)
        if (!(f.cubes[i - 1] < f.cubes[i])) return false;
    return true;
}

} // namespace

std::vector<KernelPair> kernels(const Cover& f, const KernelOptions& opts, KernelStats* stats) {
    if (!normalized(f)) {
        Cover g = f;
        g.normalize();
        return kernels(g, opts, stats);
    }
    if (stats) *stats = KernelStats{};
    if (f.size() < 2) return {};
    Cube c0;
    Cover g = makeCubeFree(f, &c0);
    const SlotMap slots(g);
    Enumerator en(opts, slots.lits, c0);
    en.run(toFlat(g, slots));
    if (stats) {
        stats->work = en.work + en.levelWork();
        stats->truncated = en.truncated;
        stats->levelsExact = en.levelsExact();
    }
    return std::move(en.pairs);
}

std::vector<KernelPair> kernels(const Cover& f, const KernelOptions& opts) {
    return kernels(f, opts, nullptr);
}

KernelPair levelZeroKernel(const Cover& f) {
    if (!normalized(f)) {
        Cover g = f;
        g.normalize();
        return levelZeroKernel(g);
    }
    KernelPair res;
    if (f.size() < 2) return res;
    Cover g = makeCubeFree(f, &res.cokernel);
    const SlotMap slots(g);
    const std::vector<Literal>& slotLits = slots.lits;
    Expander ex(slotLits.size());
    Flat cur = toFlat(g, slots), sub;
    Groups groups;
    std::vector<std::uint32_t> common, cok;
    std::size_t work = 0;
    for (;;) {
        ex.groups(cur, 0, groups, work);
        if (!groups.repeats) break;
        // Most frequent literal; ties go to the smallest.
        std::size_t best = 0;
        for (std::size_t k = 1; k < groups.slots.size(); ++k)
            if (groups.size(k) > groups.size(best)) best = k;
        Expander::common(cur, groups, best, common, work);
        Expander::quotient(cur, groups, best, common, sub, work);
        std::vector<std::uint32_t> merged;
        std::set_union(cok.begin(), cok.end(), common.begin(), common.end(), std::back_inserter(merged));
        cok.swap(merged);
        std::swap(cur, sub);
    }
    res.kernel = toCover(cur, slotLits);
    res.cokernel = cubeProduct(res.cokernel, toCube(cok, slotLits));
    res.level = 0;
    return res;
}

} // namespace kerf::algebra
