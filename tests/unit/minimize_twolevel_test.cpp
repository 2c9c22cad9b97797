// minimize_twolevel_test.cpp — the two-level minimiser (kerf::minimize).
// Expected covers come from the definitions (primes, minimum covers) as in
// R. K. Brayton et al., "Logic Minimization Algorithms for VLSI Synthesis",
// Kluwer 1984 (from memory); functions are compared by truth table.
#include "kerf/minimize/twolevel.h"

#include "passes_support.h"

#include <gtest/gtest.h>

#include <random>

using namespace kerf;
using namespace kerf::passes;
using namespace kerf::minimize;
using namespace kerf::passes::testing;

namespace {

std::vector<std::uint32_t> vars(std::uint32_t n) {
    std::vector<std::uint32_t> v;
    for (std::uint32_t i = 1; i <= n; ++i) v.push_back(i);
    return v;
}

// Variables 1..n are a, b, c, ...
const Literal a = pos(1), b = pos(2), c = pos(3), d = pos(4), na = neg(1), nb = neg(2), nc = neg(3), nd = neg(4);

} // namespace

TEST(MinimizeTwoLevel, AdjacentCubesMerge) {
    // ab + ab' = a
    Cover f = cover({{a, b}, {a, nb}});
    EXPECT_EQ(minimizeCover(f), cover({{a}}));
}

TEST(MinimizeTwoLevel, ConsensusTermIsRedundant) {
    // ab + a'c + bc: bc is the consensus of the other two, so the minimum is ab + a'c.
    Cover f = cover({{a, b}, {na, c}, {b, c}});
    Cover m = minimizeCover(f);
    EXPECT_EQ(m, cover({{a, b}, {na, c}}));
}

TEST(MinimizeTwoLevel, MajorityIsAlreadyMinimum) {
    Cover f = cover({{a, b}, {a, c}, {b, c}});
    EXPECT_EQ(minimizeCover(f).literalCount(), 6u);
}

TEST(MinimizeTwoLevel, ExactBeatsIrredundantOnCyclicCover) {
    // The cyclic function a'b + b'c + ac' (+ its consensus twin ab' + bc + a'c)
    // has two irredundant covers of 3 cubes; every cover has at least 6 literals.
    Cover f = cover({{na, b}, {nb, c}, {a, nc}});
    Cover m = minimizeCover(f);
    EXPECT_EQ(m.literalCount(), 6u);
    EXPECT_EQ(truthTable(m, vars(3)), truthTable(f, vars(3)));
}

TEST(MinimizeTwoLevel, TautologyAndImplication) {
    EXPECT_TRUE(isTautology(cover({{a}, {na}})));
    EXPECT_TRUE(isTautology(cover({{a, b}, {na}, {nb}})));
    EXPECT_FALSE(isTautology(cover({{a, b}, {na}})));
    EXPECT_TRUE(cubeImplies(Cube({a, b, c}), cover({{a, b}, {d}})));
    EXPECT_FALSE(cubeImplies(Cube({a}), cover({{a, b}, {a, c}})));
    // a implies ab + ab'
    EXPECT_TRUE(cubeImplies(Cube({a}), cover({{a, b}, {a, nb}})));
}

TEST(MinimizeTwoLevel, ComplementOfProductIsSumOfComplements) {
    Cover out;
    ASSERT_TRUE(complementCover(cover({{a, b, c}}), out));
    EXPECT_EQ(out, cover({{na}, {nb}, {nc}}));
    ASSERT_TRUE(complementCover(cover({{a}, {b}}), out));
    EXPECT_EQ(out, cover({{na, nb}}));
}

TEST(MinimizeTwoLevel, ComplementCapIsHonoured) {
    // (a1 + b1)(a2 + b2)...: its complement a1'b1' + a2'b2' + ... is small, but
    // the complement of a1b1 + a2b2 + ... + a6b6 has 2^6 cubes.
    Cover f;
    for (std::uint32_t i = 0; i < 6; ++i) f.cubes.push_back(Cube({pos(1 + 2 * i), pos(2 + 2 * i)}));
    f.normalize();
    Cover out;
    EXPECT_FALSE(complementCover(f, out, 10));
    EXPECT_TRUE(complementCover(f, out, 64));
    EXPECT_EQ(out.cubes.size(), 64u);
}

TEST(MinimizeTwoLevel, RandomCoversKeepTheirFunctionAndNeverGrow) {
    std::mt19937 rng(11);
    for (int iter = 0; iter < 300; ++iter) {
        std::uint32_t n = 2 + rng() % 11;   // 2..12 variables: exact, primes and beyond
        Cover f;
        std::size_t cubes = 1 + rng() % 10;
        for (std::size_t k = 0; k < cubes; ++k) {
            std::vector<Literal> ls;
            std::size_t len = 1 + rng() % std::min<std::uint32_t>(n, 5);
            for (std::size_t j = 0; j < len; ++j) ls.push_back(algebra::makeLiteral(1 + rng() % n, rng() & 1));
            Cube cube(std::move(ls));
            if (!cube.isContradictory()) f.cubes.push_back(cube);
        }
        f.normalize();
        Cover m = minimizeCover(f);
        EXPECT_EQ(truthTable(m, vars(n)), truthTable(f, vars(n))) << "iteration " << iter;
        EXPECT_LE(m.literalCount(), f.literalCount());
        Cover comp;
        if (complementCover(f, comp, 1000)) {
            auto tf = truthTable(f, vars(n)), tc = truthTable(comp, vars(n));
            for (std::size_t w = 0; w < tf.size(); ++w) EXPECT_EQ(tc[w], ~tf[w]) << "iteration " << iter;
        }
        // The heuristic path (no truth tables) must agree too.
        MinimizeOptions big;
        big.tableVars = 0;
        big.exactVars = 0;
        Cover h = minimizeCover(f, big);
        EXPECT_EQ(truthTable(h, vars(n)), truthTable(f, vars(n))) << "iteration " << iter;
        EXPECT_EQ(isTautology(f), truthTable(f, vars(n)) == std::vector<std::uint64_t>(truthTable(f, vars(n)).size(), ~0ull));
    }
}

TEST(MinimizeTwoLevel, IrredundantPrimeCoverOfXor) {
    auto t = truthTable(cover({{a, nb}, {na, b}}), vars(2));
    Cover m = irredundantPrimeCover(t, vars(2));
    EXPECT_EQ(m, cover({{a, nb}, {na, b}}));
}

// Incompletely specified functions: a cover of some function between the
// on-set and the on-set plus don't-cares (definition as in Brayton et al.
// 1984, from memory). a·b with a·¬b free is covered by the single literal a.
TEST(MinimizeTwoLevel, DontCaresLetTheCoverGrow) {
    auto on = truthTable(cover({{a, b}}), vars(2));
    auto up = truthTable(cover({{a}}), vars(2));
    EXPECT_EQ(minimizeInterval(on, up, vars(2)), cover({{a}}));
    // Without the freedom the cover stays a·b.
    EXPECT_EQ(minimizeInterval(on, on, vars(2)).literalCount(), 2u);
}

TEST(MinimizeTwoLevel, IntervalResultsStayInsideTheInterval) {
    std::mt19937 rng(11);
    for (int iter = 0; iter < 200; ++iter) {
        const std::uint32_t n = 2 + rng() % 9;   // exact up to 8, primes above
        const std::size_t words = n <= 6 ? 1 : std::size_t{1} << (n - 6);
        std::vector<std::uint64_t> lo(words), up(words);
        for (std::size_t w = 0; w < words; ++w) {
            std::uint64_t f = (static_cast<std::uint64_t>(rng()) << 32) | rng();
            std::uint64_t dc = (static_cast<std::uint64_t>(rng()) << 32) | rng();
            dc &= (static_cast<std::uint64_t>(rng()) << 32) | rng();   // about a quarter free
            lo[w] = f & ~dc;
            up[w] = f | dc;
        }
        if (n < 6) {   // keep the repeating layout truthTable uses below six variables
            const std::uint64_t mask = (1ull << (1u << n)) - 1;
            lo[0] &= mask;
            up[0] &= mask;
            for (unsigned s = 1u << n; s < 64; s <<= 1) { lo[0] |= lo[0] << s; up[0] |= up[0] << s; }
        }
        Cover m = minimizeInterval(lo, up, vars(n));
        auto t = truthTable(m, vars(n));
        for (std::size_t w = 0; w < words; ++w) {
            EXPECT_EQ(t[w] & lo[w], lo[w]) << "misses on-set minterms, iteration " << iter;
            EXPECT_EQ(t[w] & ~up[w], 0u) << "covers off-set minterms, iteration " << iter;
        }
        // The freedom never costs literals: the interval's cover is no larger
        // than the minimum cover of the lower bound alone (where the covering
        // search is small enough to finish, so both covers are minimum).
        if (n <= 5) EXPECT_LE(m.literalCount(), minimumCover(lo, vars(n)).literalCount()) << "iteration " << iter;
    }
}
