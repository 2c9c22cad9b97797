// cone_logic.h — internal to the passes: what the techniques that reason
// about a window of the network share — bit-parallel evaluation of a cover,
// its clauses for the SAT solver (the usual Tseitin encoding, common trade
// practice), and a conflict counter for SAT budgets.
#pragma once

#include "kerf/algebra/cover.h"

#include <cadical.hpp>

#include <cstdint>
#include <vector>

namespace kerf::passes::detail {

using Words = std::vector<std::uint64_t>;

/// Counts the solver's conflicts (through its learner hook) for budgets.
struct ConflictCounter : CaDiCaL::Learner {
    std::int64_t count = 0;
    bool learning(int) override {
        ++count;
        return false;
    }
    void learn(int) override {}
};

/// Word w of input i's column in the truth table over all inputs (input i
/// toggles every 2^i patterns): exhaustive simulation of a small window.
inline std::uint64_t truthTableWord(std::size_t i, std::size_t w) {
    static constexpr std::uint64_t kPeriodic[6] = {0xAAAAAAAAAAAAAAAAull, 0xCCCCCCCCCCCCCCCCull,
                                                   0xF0F0F0F0F0F0F0F0ull, 0xFF00FF00FF00FF00ull,
                                                   0xFFFF0000FFFF0000ull, 0xFFFFFFFF00000000ull};
    return i < 6 ? kPeriodic[i] : (((w >> (i - 6)) & 1) ? ~0ull : 0ull);
}

/// Words of 64 patterns needed to hold every pattern of n inputs.
inline std::size_t truthTableWords(std::size_t n) { return n <= 6 ? 1 : std::size_t{1} << (n - 6); }

/// Word w of the cover's value, its variables' values in vals[var][w].
inline std::uint64_t evalCover(const algebra::Cover& f, const std::vector<Words>& vals, std::size_t w) {
    std::uint64_t out = 0;
    for (const algebra::Cube& c : f.cubes) {
        std::uint64_t t = ~0ull;
        for (algebra::Literal l : c.lits) {
            const std::uint64_t x = vals[algebra::literalVar(l)][w];
            t &= algebra::literalNegated(l) ? ~x : x;
            if (!t) break;
        }
        out |= t;
        if (out == ~0ull) break;
    }
    return out;
}

// Clauses for `z = cover` where each literal of the cover maps to a solver
// literal through `lit`. Returns z's solver literal.
template <class LitMap>
inline int encodeCover(CaDiCaL::Solver& s, int& nextVar, const algebra::Cover& f, LitMap lit) {
    if (f.isZero()) {
        int z = ++nextVar;
        s.add(-z), s.add(0);
        return z;
    }
    std::vector<int> cubes;
    for (const algebra::Cube& c : f.cubes) {
        if (c.lits.size() == 1) { cubes.push_back(lit(c.lits[0])); continue; }
        if (c.lits.empty()) {
            int t = ++nextVar;
            s.add(t), s.add(0);
            cubes.push_back(t);
            continue;
        }
        int a = ++nextVar;
        for (algebra::Literal l : c.lits) s.add(-a), s.add(lit(l)), s.add(0);
        s.add(a);
        for (algebra::Literal l : c.lits) s.add(-lit(l));
        s.add(0);
        cubes.push_back(a);
    }
    if (cubes.size() == 1) return cubes[0];
    int z = ++nextVar;
    s.add(-z);
    for (int c : cubes) s.add(c);
    s.add(0);
    for (int c : cubes) s.add(z), s.add(-c), s.add(0);
    return z;
}

} // namespace kerf::passes::detail
