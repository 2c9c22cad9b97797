// cover.cpp — cubes, covers, single-cube containment and the algebraic product.
//
// The algebraic model treats a sum of products as a polynomial over literals:
// x and ~x are two unrelated symbols, a cube is a set of literals and a cover
// a set of cubes. Products and sums are then set operations, which is what
// makes division, kernels and factoring fast and predictable (at the price of
// ignoring Boolean identities such as x & ~x = 0 or x | x & y = x, except
// where this file drops contradictory cubes on request). The model goes back
// to R. K. Brayton and C. McMullen, "The decomposition and factorization of
// Boolean expressions", Proc. ISCAS 1982; the textbook account followed here
// is G. De Micheli, "Synthesis and Optimization of Digital Circuits",
// McGraw-Hill 1994, ch. 8 (algebraic model, algebraic product of covers with
// disjoint support).
//
// Representation: a cube is a sorted vector of literals (2*var + neg), so a
// contradiction x & ~x shows up as two neighbours 2v, 2v+1; a cover is a
// vector of cubes kept sorted and duplicate-free by `normalize`.

#include "kerf/algebra/cover.h"

#include <span>

#include <algorithm>
#include <numeric>

namespace kerf::algebra {

namespace {

inline std::size_t mix(std::size_t h, std::size_t v) {
    // 64-bit mixing step (multiply-xorshift); deterministic across runs.
    h ^= v + 0x9e3779b97f4a7c15ull + (h << 6) + (h >> 2);
    return h;
}

} // namespace

Cube::Cube(std::vector<Literal> literals) : lits(std::move(literals)) {
    if (!std::is_sorted(lits.begin(), lits.end())) std::sort(lits.begin(), lits.end());
    lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
}

bool Cube::contains(Literal l) const {
    return std::binary_search(lits.begin(), lits.end(), l);
}

bool Cube::hasAllOf(const Cube& other) const {
    if (other.lits.size() > lits.size()) return false;
    return std::includes(lits.begin(), lits.end(), other.lits.begin(), other.lits.end());
}

bool Cube::isContradictory() const {
    for (std::size_t i = 1; i < lits.size(); ++i)
        if ((lits[i - 1] ^ 1u) == lits[i]) return true;   // 2v followed by 2v+1
    return false;
}

std::size_t CubeHash::operator()(const Cube& c) const noexcept {
    std::size_t h = c.lits.size();
    for (Literal l : c.lits) h = mix(h, l);
    return h;
}

std::size_t CoverHash::operator()(const Cover& f) const noexcept {
    std::size_t h = f.cubes.size();
    CubeHash ch;
    for (const Cube& c : f.cubes) h = mix(h, ch(c));
    return h;
}

std::size_t Cover::literalCount() const {
    std::size_t n = 0;
    for (const Cube& c : cubes) n += c.size();
    return n;
}

std::vector<std::uint32_t> Cover::support() const {
    std::vector<std::uint32_t> vars;
    vars.reserve(literalCount());
    for (const Cube& c : cubes)
        for (Literal l : c.lits) vars.push_back(literalVar(l));
    std::sort(vars.begin(), vars.end());
    vars.erase(std::unique(vars.begin(), vars.end()), vars.end());
    return vars;
}

void Cover::normalize() {
    for (Cube& c : cubes)
        if (!std::is_sorted(c.lits.begin(), c.lits.end()) ||
            std::adjacent_find(c.lits.begin(), c.lits.end()) != c.lits.end())
            c = Cube(std::move(c.lits));
    std::erase_if(cubes, [](const Cube& c) { return c.isContradictory(); });
    if (!std::is_sorted(cubes.begin(), cubes.end())) std::sort(cubes.begin(), cubes.end());
    cubes.erase(std::unique(cubes.begin(), cubes.end()), cubes.end());
}

Cube cubeProduct(const Cube& a, const Cube& b) {
    Cube r;
    r.lits.reserve(a.size() + b.size());
    std::set_union(a.lits.begin(), a.lits.end(), b.lits.begin(), b.lits.end(), std::back_inserter(r.lits));
    return r;
}

Cube cubeIntersection(const Cube& a, const Cube& b) {
    Cube r;
    r.lits.reserve(std::min(a.size(), b.size()));
    std::set_intersection(a.lits.begin(), a.lits.end(), b.lits.begin(), b.lits.end(),
                          std::back_inserter(r.lits));
    return r;
}

Cube cubeDifference(const Cube& a, const Cube& b) {
    Cube r;
    r.lits.reserve(a.size());
    std::set_difference(a.lits.begin(), a.lits.end(), b.lits.begin(), b.lits.end(), std::back_inserter(r.lits));
    return r;
}

namespace {

// Marks in `keep` the cubes no smaller kept cube is contained in, visiting
// cubes by ascending size (`order`). Small covers: pairwise checks.
void keepUncontainedPairwise(const Cover& f, const std::vector<std::uint32_t>& order, std::vector<char>& keep) {
    std::vector<std::uint32_t> kept;
    for (std::uint32_t idx : order) {
        const Cube& a = f.cubes[idx];
        if (std::none_of(kept.begin(), kept.end(), [&](std::uint32_t b) { return a.hasAllOf(f.cubes[b]); })) {
            keep[idx] = 1;
            kept.push_back(idx);
        }
    }
}

// Same, with an index literal -> kept cubes: for a candidate A, count how
// many literals of each kept B it hits; B is in A when all of them are.
void keepUncontainedIndexed(const Cover& f, const std::vector<std::uint32_t>& order, std::vector<char>& keep) {
    // Literals renumbered densely (covers may use large node numbers).
    std::vector<Literal> lits;
    for (const Cube& c : f.cubes) lits.insert(lits.end(), c.lits.begin(), c.lits.end());
    std::sort(lits.begin(), lits.end());
    lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
    auto slot = [&](Literal l) {
        return static_cast<std::size_t>(std::lower_bound(lits.begin(), lits.end(), l) - lits.begin());
    };
    std::vector<std::vector<std::uint32_t>> keptWith(lits.size());
    std::vector<std::uint32_t> hits(f.cubes.size(), 0);
    std::vector<std::uint32_t> touched;
    for (std::uint32_t idx : order) {
        const Cube& a = f.cubes[idx];
        bool contained = false;
        touched.clear();
        for (Literal l : a.lits) {
            for (std::uint32_t b : keptWith[slot(l)]) {
                if (hits[b]++ == 0) touched.push_back(b);
                if (hits[b] == f.cubes[b].size()) contained = true;
            }
            if (contained) break;
        }
        for (std::uint32_t b : touched) hits[b] = 0;
        if (contained) continue;
        keep[idx] = 1;
        for (Literal l : a.lits) keptWith[slot(l)].push_back(idx);
    }
}

} // namespace

void removeContainedCubes(Cover& f) {
    // Cube A is redundant when some other cube B has all its literals in A.
    f.normalize();
    const std::size_t n = f.cubes.size();
    if (n < 2) return;
    if (std::any_of(f.cubes.begin(), f.cubes.end(), [](const Cube& c) { return c.empty(); })) {
        f = Cover::one();
        return;
    }
    std::vector<std::uint32_t> order(n);
    std::iota(order.begin(), order.end(), 0u);
    std::stable_sort(order.begin(), order.end(),
                     [&](std::uint32_t x, std::uint32_t y) { return f.cubes[x].size() < f.cubes[y].size(); });
    std::vector<char> keep(n, 0);
    if (n <= 32) keepUncontainedPairwise(f, order, keep);
    else keepUncontainedIndexed(f, order, keep);
    std::vector<Cube> out;
    out.reserve(n);
    for (std::size_t i = 0; i < n; ++i)
        if (keep[i]) out.push_back(std::move(f.cubes[i]));
    f.cubes = std::move(out);   // still sorted: we kept the original order
}

Cover multiply(const Cover& a, const Cover& b) {
    Cover r;
    r.cubes.reserve(a.size() * b.size());
    for (const Cube& x : a.cubes)
        for (const Cube& y : b.cubes) r.cubes.push_back(cubeProduct(x, y));
    r.normalize();
    return r;
}

Cover add(const Cover& a, const Cover& b) {
    Cover r;
    r.cubes.reserve(a.size() + b.size());
    r.cubes.insert(r.cubes.end(), a.cubes.begin(), a.cubes.end());
    r.cubes.insert(r.cubes.end(), b.cubes.begin(), b.cubes.end());
    r.normalize();
    return r;
}

Cube commonCube(const Cover& f) {
    if (f.cubes.empty()) return {};
    Cube c = f.cubes[0];
    for (std::size_t i = 1; i < f.cubes.size() && !c.empty(); ++i) {
        const Cube& d = f.cubes[i];
        auto out = c.lits.begin();
        std::size_t j = 0;
        for (Literal l : c.lits) {
            while (j < d.lits.size() && d.lits[j] < l) ++j;
            if (j < d.lits.size() && d.lits[j] == l) *out++ = l;
        }
        c.lits.erase(out, c.lits.end());
    }
    return c;
}

bool isCubeFree(const Cover& f) {
    return f.cubes.size() >= 2 && commonCube(f).empty();
}

Cover makeCubeFree(const Cover& f, Cube* common) {
    Cube c = commonCube(f);
    Cover r;
    if (c.empty()) {
        r = f;
    } else {
        r.cubes.reserve(f.size());
        for (const Cube& x : f.cubes) r.cubes.push_back(cubeDifference(x, c));
        // Removing the same literals from every cube keeps distinct cubes
        // distinct, but may change the order.
        if (!std::is_sorted(r.cubes.begin(), r.cubes.end())) std::sort(r.cubes.begin(), r.cubes.end());
    }
    if (common) *common = std::move(c);
    return r;
}

bool disjointUnion(std::span<const Literal> a, std::span<const Literal> b, std::vector<Literal>& out) {
    out.clear();
    std::size_t i = 0, j = 0;
    while (i < a.size() && j < b.size()) {
        if (a[i] < b[j]) out.push_back(a[i++]);
        else if (b[j] < a[i]) out.push_back(b[j++]);
        else return false;
    }
    out.insert(out.end(), a.begin() + static_cast<std::ptrdiff_t>(i), a.end());
    out.insert(out.end(), b.begin() + static_cast<std::ptrdiff_t>(j), b.end());
    return true;
}

} // namespace kerf::algebra
