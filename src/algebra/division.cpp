// division.cpp — weak (algebraic) division.
//
// Weak division of a cover f by a cover d finds the largest q such that the
// algebraic product d*q is a subset of f, and the remainder r = f - d*q.
// For each cube d_i of d, let Q_i = { f_j / d_i : f_j contains d_i }; then
// q = Q_1 ∩ ... ∩ Q_m. The definition and its uniqueness are from
// R. K. Brayton and C. McMullen, "The decomposition and factorization of
// Boolean expressions", Proc. ISCAS 1982; the algorithm as usually taught is
// in G. De Micheli, "Synthesis and Optimization of Digital Circuits",
// McGraw-Hill 1994, ch. 8, and G. D. Hachtel and F. Somenzi, "Logic
// Synthesis and Verification Algorithms", Kluwer 1996, ch. 10.
//
// Instead of building every Q_i and intersecting them, we pick the cube d_p
// whose rarest literal occurs least often in f, take the candidates
// q = f_j / d_p from the cubes holding d_p (found through a literal -> cubes
// index), and keep a candidate when, for every other d_i, q and d_i share no
// literal and the cube q ∪ d_i is in f (one hash lookup). Since a kept q
// lies in every Q_i and every member of the intersection is found this way,
// the result is exactly the weak quotient. The cost is
// O(|Q_p| * |d| * k) hash probes for cubes of k literals, after an
// O(|f| * k) index: near-linear in |f| * |d| with no repeated scans of f.
// Keeping q disjoint from d_i is not an extra condition: a q holding a
// literal of d_i, or its complement, can never be f_j / d_i for a
// non-contradictory f_j, so the quotient has support disjoint from d.

#include "kerf/algebra/cover.h"

#include <algorithm>
#include <bit>

namespace kerf::algebra {

namespace {

// Must agree with CubeHash (cover.cpp) only in being a function of the
// literal sequence; the table below uses this one for both inserts and probes.
std::size_t hashLits(std::span<const Literal> lits) {
    std::size_t h = lits.size();
    for (Literal l : lits) h ^= l + 0x9e3779b97f4a7c15ull + (h << 6) + (h >> 2);
    return h * 0xff51afd7ed558ccdull ^ (h >> 29);
}

// Open-addressing table of cube indices (index + 1; 0 = empty), load <= 1/2.
void buildCubeTable(const Cover& f, std::vector<std::uint32_t>& table, std::size_t& mask) {
    std::size_t cap = std::bit_ceil(std::max<std::size_t>(4, 2 * f.cubes.size()));
    table.assign(cap, 0);
    mask = cap - 1;
    for (std::uint32_t j = 0; j < f.cubes.size(); ++j) {
        std::size_t s = hashLits(f.cubes[j].lits) & mask;
        while (table[s] != 0) {
            if (f.cubes[table[s] - 1] == f.cubes[j]) break;   // duplicate cube: keep the first
            s = (s + 1) & mask;
        }
        if (table[s] == 0) table[s] = j + 1;
    }
}

std::size_t findInCubeTable(const Cover& f, const std::vector<std::uint32_t>& table, std::size_t mask,
                            std::span<const Literal> lits) {
    std::size_t s = hashLits(lits) & mask;
    while (table[s] != 0) {
        const Cube& c = f.cubes[table[s] - 1];
        if (c.lits.size() == lits.size() && std::equal(c.lits.begin(), c.lits.end(), lits.begin()))
            return table[s] - 1;
        s = (s + 1) & mask;
    }
    return CoverIndex::npos;
}

bool isNormalized(const Cover& f) {
    for (std::size_t i = 1; i < f.cubes.size(); ++i)
        if (!(f.cubes[i - 1] < f.cubes[i])) return false;
    return true;
}


} // namespace

CoverIndex::CoverIndex(const Cover& f) : f_(&f) {
    // Literal occurrence lists in CSR form, keyed by the distinct literals.
    // When the largest literal is small against the cover (the usual case)
    // a direct table counts them in linear time; otherwise sort.
    std::size_t total = 0;
    Literal maxLit = 0;
    for (const Cube& c : f.cubes) {
        total += c.lits.size();
        if (!c.lits.empty()) maxLit = std::max(maxLit, c.lits.back());
    }
    if (static_cast<std::size_t>(maxLit) < 4 * total + 1024) {
        std::vector<std::uint32_t> count(static_cast<std::size_t>(maxLit) + 1, 0);
        for (const Cube& c : f.cubes)
            for (Literal l : c.lits) ++count[l];
        slotByLit_.assign(count.size(), 0);
        occStart_.push_back(0);
        for (Literal l = 0; l < count.size(); ++l) {
            if (count[l] == 0) continue;
            lits_.push_back(l);
            slotByLit_[l] = static_cast<std::uint32_t>(lits_.size());
            occStart_.push_back(occStart_.back() + count[l]);
        }
        occ_.resize(total);
        std::vector<std::uint32_t> fill(occStart_.begin(), occStart_.end() - 1);
        for (std::uint32_t j = 0; j < f.cubes.size(); ++j)
            for (Literal l : f.cubes[j].lits) occ_[fill[slotByLit_[l] - 1]++] = j;
    } else {
        std::vector<std::pair<Literal, std::uint32_t>> occ;
        occ.reserve(total);
        for (std::uint32_t j = 0; j < f.cubes.size(); ++j)
            for (Literal l : f.cubes[j].lits) occ.emplace_back(l, j);
        std::sort(occ.begin(), occ.end());
        occ_.reserve(total);
        for (std::size_t i = 0; i < occ.size(); ++i) {
            if (i == 0 || occ[i].first != occ[i - 1].first) {
                lits_.push_back(occ[i].first);
                occStart_.push_back(static_cast<std::uint32_t>(i));
            }
            occ_.push_back(occ[i].second);
        }
        occStart_.push_back(static_cast<std::uint32_t>(occ.size()));
    }
    buildCubeTable(f, table_, mask_);
}

std::size_t CoverIndex::slotOf(Literal l) const {
    if (!slotByLit_.empty()) return l < slotByLit_.size() && slotByLit_[l] ? slotByLit_[l] - 1 : npos;
    auto it = std::lower_bound(lits_.begin(), lits_.end(), l);
    if (it == lits_.end() || *it != l) return npos;
    return static_cast<std::size_t>(it - lits_.begin());
}

std::span<const std::uint32_t> CoverIndex::cubesWith(Literal l) const {
    std::size_t k = slotOf(l);
    if (k == npos) return {};
    return cubesWithSlot(k);
}

std::size_t CoverIndex::find(std::span<const Literal> sortedLits) const {
    return findInCubeTable(*f_, table_, mask_, sortedLits);
}

Division divideByCube(const Cover& f, const Cube& c) {
    Division res;
    if (c.empty()) {
        res.quotient = f;
        return res;
    }
    for (const Cube& x : f.cubes) {
        if (x.hasAllOf(c)) res.quotient.cubes.push_back(cubeDifference(x, c));
        else res.remainder.cubes.push_back(x);
    }
    // Removing the same literals keeps cubes distinct but may reorder them.
    if (!std::is_sorted(res.quotient.cubes.begin(), res.quotient.cubes.end()))
        std::sort(res.quotient.cubes.begin(), res.quotient.cubes.end());
    return res;
}

namespace {

// The common part of both entry points: given the pivot cube d[pivot] and the
// indices of the cubes of f that may contain it (ascending), keep each
// quotient candidate that every other divisor cube confirms through `find`.
template <class Find>
Division divideFromPivot(const Cover& f, const Cover& d, std::size_t pivot, std::span<const std::uint32_t> candidates,
                         Find&& find) {
    Division res;
    const Cube& dp = d.cubes[pivot];
    std::vector<char> used(f.cubes.size(), 0);
    std::vector<std::uint32_t> hit(d.cubes.size());
    std::vector<Literal> scratch;
    for (std::uint32_t j : candidates) {
        const Cube& fj = f.cubes[j];
        if (!fj.hasAllOf(dp)) continue;
        Cube q = cubeDifference(fj, dp);
        bool ok = true;
        for (std::size_t i = 0; i < d.cubes.size() && ok; ++i) {
            if (i == pivot) {
                hit[i] = j;
                continue;
            }
            if (!disjointUnion(q.lits, d.cubes[i].lits, scratch)) {
                ok = false;
                break;
            }
            std::size_t k = find(std::span<const Literal>(scratch));
            if (k == CoverIndex::npos) ok = false;
            else hit[i] = static_cast<std::uint32_t>(k);
        }
        if (!ok) continue;
        for (std::uint32_t k : hit) used[k] = 1;
        res.quotient.cubes.push_back(std::move(q));
    }
    // Distinct candidates give distinct quotient cubes (f_j = q ∪ d_p).
    std::sort(res.quotient.cubes.begin(), res.quotient.cubes.end());
    res.remainder.cubes.reserve(f.cubes.size() - std::min(f.cubes.size(), res.quotient.size() * d.size()));
    for (std::size_t j = 0; j < f.cubes.size(); ++j)
        if (!used[j]) res.remainder.cubes.push_back(f.cubes[j]);
    return res;
}

} // namespace

Division divide(const CoverIndex& index, const Cover& d) {
    const Cover& f = index.cover();
    Division res;
    if (d.isZero()) {          // division by 0: nothing divides, everything remains
        res.remainder = f;
        return res;
    }
    if (f.isZero()) return res;

    // Pivot: the divisor cube whose rarest literal occurs in fewest cubes of f.
    std::size_t pivot = 0, best = SIZE_MAX;
    std::span<const std::uint32_t> pivotList;
    for (std::size_t i = 0; i < d.cubes.size() && best > 0; ++i) {
        if (d.cubes[i].empty()) continue;   // the cube 1 is in every cube: the worst pivot
        for (Literal l : d.cubes[i].lits) {
            auto list = index.cubesWith(l);
            if (list.size() < best) {
                best = list.size();
                pivot = i;
                pivotList = list;
            }
        }
    }
    if (best == 0) {           // some divisor cube is in no cube of f
        res.remainder = f;
        return res;
    }
    std::vector<std::uint32_t> all;
    if (best == SIZE_MAX) {    // every divisor cube is 1 (a non-normalised d)
        all.resize(f.cubes.size());
        for (std::uint32_t j = 0; j < all.size(); ++j) all[j] = j;
        pivotList = all;
    }
    return divideFromPivot(f, d, pivot, pivotList,
                           [&](std::span<const Literal> lits) { return index.find(lits); });
}

Division divide(const Cover& f, const Cover& d) {
    if (!isNormalized(f)) {
        Cover g = f;
        g.normalize();
        return divide(g, d);
    }
    if (!isNormalized(d)) {
        Cover e = d;
        e.normalize();
        return divide(f, e);
    }
    if (d.size() == 1) return divideByCube(f, d.cubes[0]);
    Division res;
    if (d.isZero() || f.isZero()) {
        res.remainder = f;
        return res;
    }
    // One-shot division: no literal index. Pivot on the divisor cube with the
    // most literals (d is sorted, so the cube 1 is first and never chosen),
    // collect the cubes holding it in one scan, and build the cube table only
    // when there is a candidate to confirm.
    std::size_t pivot = 0;
    for (std::size_t i = 1; i < d.cubes.size(); ++i)
        if (d.cubes[i].size() > d.cubes[pivot].size()) pivot = i;
    std::vector<std::uint32_t> candidates;
    for (std::uint32_t j = 0; j < f.cubes.size(); ++j)
        if (f.cubes[j].hasAllOf(d.cubes[pivot])) candidates.push_back(j);
    if (candidates.empty()) {
        res.remainder = f;
        return res;
    }
    std::vector<std::uint32_t> table;
    std::size_t mask = 0;
    buildCubeTable(f, table, mask);
    return divideFromPivot(f, d, pivot, candidates,
                           [&](std::span<const Literal> lits) { return findInCubeTable(f, table, mask, lits); });
}

} // namespace kerf::algebra
