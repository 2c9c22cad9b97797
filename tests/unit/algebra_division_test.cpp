// Tests for weak division (src/algebra/division.cpp).
//
// Oracle: the definition of weak division from R. K. Brayton and
// C. McMullen, ISCAS 1982, as stated in G. De Micheli, "Synthesis and
// Optimization of Digital Circuits", 1994, ch. 8 (from memory):
// q = ∩_i { f_j / d_i : d_i ⊆ f_j }, r = f − d·q. The naive implementation
// below builds every set and intersects them; the library must agree with it
// on thousands of seeded random cases, and satisfy the algebraic identities.

#include "algebra_support.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <random>
#include <set>

namespace kerf::algebra {
namespace {

using testing::Vars;

// Straight from the definition, with std::set and no cleverness.
Division naiveDivide(const Cover& f, const Cover& d) {
    Division res;
    if (d.isZero()) {
        res.remainder = f;
        return res;
    }
    std::set<Cube> q;
    bool first = true;
    for (const Cube& di : d.cubes) {
        std::set<Cube> qi;
        for (const Cube& fj : f.cubes)
            if (fj.hasAllOf(di)) qi.insert(cubeDifference(fj, di));
        if (first) {
            q = qi;
            first = false;
        } else {
            std::set<Cube> both;
            std::set_intersection(q.begin(), q.end(), qi.begin(), qi.end(), std::inserter(both, both.end()));
            q = both;
        }
    }
    res.quotient.cubes.assign(q.begin(), q.end());
    Cover dq = multiply(d, res.quotient);
    std::set<Cube> inDq(dq.cubes.begin(), dq.cubes.end());
    for (const Cube& fj : f.cubes)
        if (!inDq.count(fj)) res.remainder.cubes.push_back(fj);
    return res;
}

bool supportsDisjoint(const Cover& a, const Cover& b) {
    auto sa = a.support(), sb = b.support();
    std::vector<std::uint32_t> both;
    std::set_intersection(sa.begin(), sa.end(), sb.begin(), sb.end(), std::back_inserter(both));
    return both.empty();
}

// --- Worked examples -------------------------------------------------------

// From memory: the usual illustration of weak division in Brayton & McMullen
// 1982 and De Micheli 1994, ch. 8 — a product of two sums plus a stray cube,
// divided by one of the sums. Our own variables.
TEST(AlgebraDivision, ProductOfSumsPlusRemainder) {
    Vars v;
    Cover f = v("p & x | p & y | q & x | q & y | z");
    Division r = divide(f, v("p | q"));
    EXPECT_EQ(v.str(r.quotient), "x | y");
    EXPECT_EQ(v.str(r.remainder), "z");
}

// Computed from the definition: Q_a = {c, d}, Q_b = {c, e}, so q = c.
TEST(AlgebraDivision, QuotientIsTheIntersectionOverDivisorCubes) {
    Vars v;
    Cover f = v("a & c | a & d | b & c | b & e");
    Division r = divide(f, v("a | b"));
    EXPECT_EQ(v.str(r.quotient), "c");
    EXPECT_EQ(v.str(r.remainder), "a & d | b & e");
}

// Computed from the definition: single-cube divisor.
TEST(AlgebraDivision, ByACube) {
    Vars v;
    Cover f = v("a & b & c | a & b & ~d | a & e");
    Division r = divide(f, v("a & b"));
    EXPECT_EQ(v.str(r.quotient), "c | ~d");
    EXPECT_EQ(v.str(r.remainder), "a & e");
    Division s = divideByCube(v("a & b & c | a & b & ~d | a & e"), v.cube("a & b"));
    EXPECT_EQ(s.quotient, r.quotient);
    EXPECT_EQ(s.remainder, r.remainder);
}

// Computed from the definition: x and ~x are unrelated literals, so dividing
// by ~a finds only the cubes holding ~a.
TEST(AlgebraDivision, ComplementIsAnotherLiteral) {
    Vars v;
    Cover f = v("a & b | ~a & c | ~a & d");
    Division r = divide(f, v("~a"));
    EXPECT_EQ(v.str(r.quotient), "c | d");
    EXPECT_EQ(v.str(r.remainder), "a & b");
}

// Computed from the definition: Q_a = {b}, Q_b = {a, 1}; empty intersection.
// (Boolean division would find f = (a | b) & b; weak division does not.)
TEST(AlgebraDivision, QuotientNeverSharesSupportWithDivisor) {
    Vars v;
    Cover f = v("a & b | b");
    Division r = divide(f, v("a | b"));
    EXPECT_TRUE(r.quotient.isZero());
    EXPECT_EQ(v.str(r.remainder), "a & b | b");
}

TEST(AlgebraDivision, Constants) {
    Vars v;
    Cover f = v("a & b | c");
    Division byOne = divide(f, Cover::one());
    EXPECT_EQ(byOne.quotient, f);
    EXPECT_TRUE(byOne.remainder.isZero());
    Division byZero = divide(f, Cover::zero());
    EXPECT_TRUE(byZero.quotient.isZero());
    EXPECT_EQ(byZero.remainder, f);
    Division ofZero = divide(Cover::zero(), v("a | b"));
    EXPECT_TRUE(ofZero.quotient.isZero());
    EXPECT_TRUE(ofZero.remainder.isZero());
    // A divisor holding the cube 1: q must be in f itself and q & c in f.
    Cover g = v("x | x & c | y | d");
    Division r = divide(g, v("1 | c"));
    EXPECT_EQ(v.str(r.quotient), "x");
    EXPECT_EQ(v.str(r.remainder), "y | d");
}

TEST(AlgebraDivision, NoMatchLeavesEverythingInTheRemainder) {
    Vars v;
    Cover f = v("a & c | b & d");
    Division r = divide(f, v("a | b"));
    EXPECT_TRUE(r.quotient.isZero());
    EXPECT_EQ(r.remainder, f);
    Division s = divide(f, v("e | a"));   // a literal absent from f
    EXPECT_TRUE(s.quotient.isZero());
    EXPECT_EQ(s.remainder, f);
}

TEST(AlgebraDivision, UnnormalisedInputsAreAccepted) {
    Vars v;
    Cover f;
    f.cubes = {v.cube("b & y"), v.cube("a & x"), v.cube("a & y"), v.cube("b & x"), v.cube("a & x")};
    Cover d;
    d.cubes = {v.cube("b"), v.cube("a")};
    Division r = divide(f, d);
    EXPECT_EQ(v.str(r.quotient), "y | x");   // y got its id before x
    EXPECT_TRUE(r.remainder.isZero());
}

TEST(AlgebraDivision, IndexLookups) {
    Vars v;
    Cover f = v("a & b | a & c | b & c");
    CoverIndex idx(f);
    EXPECT_EQ(idx.cubesWith(makeLiteral(0, false)).size(), 2u);
    EXPECT_TRUE(idx.cubesWith(makeLiteral(0, true)).empty());
    EXPECT_TRUE(idx.cubesWith(999).empty());
    Cube bc = v.cube("b & c");
    EXPECT_EQ(idx.find(bc.lits), 2u);
    EXPECT_EQ(idx.find(v.cube("a").lits), CoverIndex::npos);
}

// --- Properties over random covers ----------------------------------------

struct Case {
    Cover f, d;
};

// Mix of planted divisions (f = d*q + r) and arbitrary pairs.
Case randomCase(std::mt19937& rng) {
    const std::uint32_t vars = 4 + rng() % 9;
    Case c;
    switch (rng() % 3) {
    case 0: {   // planted: d and q on disjoint variable sets, plus noise
        std::uint32_t split = 1 + rng() % (vars - 1);
        Cover d = testing::randomCover(rng, split, 1 + rng() % 4, 3);
        Cover q = testing::randomCover(rng, vars - split, 1 + rng() % 5, 3);
        for (Cube& cube : q.cubes)
            for (Literal& l : cube.lits) l += 2 * split;   // shift q onto the upper variables
        Cover r = testing::randomCover(rng, vars, rng() % 6, 4);
        c.f = add(multiply(d, q), r);
        c.d = d;
        break;
    }
    case 1: {   // divisor taken from cubes of f (often one cube, often with quotient)
        c.f = testing::randomCover(rng, vars, 2 + rng() % 20, 4, 0.2);
        std::size_t k = 1 + rng() % 3;
        for (std::size_t i = 0; i < k; ++i) {
            const Cube& src = c.f.cubes[rng() % c.f.size()];
            std::vector<Literal> part;
            for (Literal l : src.lits)
                if (rng() % 2) part.push_back(l);
            c.d.cubes.emplace_back(std::move(part));
        }
        c.d.normalize();
        break;
    }
    default:
        c.f = testing::randomCover(rng, vars, rng() % 25, 4);
        c.d = testing::randomCover(rng, vars, 1 + rng() % 4, 2);
        break;
    }
    return c;
}

TEST(AlgebraDivision, AgreesWithTheDefinitionOnRandomCovers) {
    std::mt19937 rng(20240611);
    int nonTrivial = 0;
    for (int iter = 0; iter < 4000; ++iter) {
        Case c = randomCase(rng);
        Division got = divide(c.f, c.d);
        Division want = naiveDivide(c.f, c.d);
        ASSERT_EQ(got.quotient, want.quotient) << "iteration " << iter;
        ASSERT_EQ(got.remainder, want.remainder) << "iteration " << iter;
        nonTrivial += got.quotient.isZero() ? 0 : 1;
    }
    EXPECT_GT(nonTrivial, 1500);   // the generator does exercise real quotients
}

TEST(AlgebraDivision, IdentitiesOnRandomCovers) {
    std::mt19937 rng(77);
    for (int iter = 0; iter < 4000; ++iter) {
        Case c = randomCase(rng);
        Division r = divide(c.f, c.d);
        Cover dq = multiply(c.d, r.quotient);
        // d*q + r == f as cube sets, and the two parts do not overlap.
        ASSERT_EQ(add(dq, r.remainder), c.f) << "iteration " << iter;
        ASSERT_EQ(dq.size() + r.remainder.size(), c.f.size()) << "iteration " << iter;
        // No cube of d*q outside f; quotient and divisor share no variable.
        for (const Cube& x : dq.cubes)
            ASSERT_TRUE(std::binary_search(c.f.cubes.begin(), c.f.cubes.end(), x)) << "iteration " << iter;
        ASSERT_TRUE(supportsDisjoint(c.d, r.quotient)) << "iteration " << iter;
        // Maximal: no cube outside q, of support disjoint from d, can join q
        // with d*q still inside f. Any such cube is f_j / d_1 for some f_j, so
        // those are the candidates to try.
        const Cube& d1 = c.d.cubes[0];
        for (const Cube& fj : c.f.cubes) {
            if (!fj.hasAllOf(d1)) continue;
            Cube cand = cubeDifference(fj, d1);
            Cover candCover{{cand}};
            if (std::binary_search(r.quotient.cubes.begin(), r.quotient.cubes.end(), cand)) continue;
            if (!supportsDisjoint(candCover, c.d)) continue;
            Cover extra = multiply(c.d, candCover);
            bool inside = std::all_of(extra.cubes.begin(), extra.cubes.end(), [&](const Cube& x) {
                return std::binary_search(c.f.cubes.begin(), c.f.cubes.end(), x);
            });
            ASSERT_FALSE(inside && extra.size() == c.d.size()) << "iteration " << iter << ": quotient not maximal";
        }
    }
}

TEST(AlgebraDivision, IndexedAndCubeDivisionAgreeWithPlainDivision) {
    std::mt19937 rng(5);
    for (int iter = 0; iter < 1000; ++iter) {
        Case c = randomCase(rng);
        CoverIndex idx(c.f);
        for (int k = 0; k < 3; ++k) {
            Cover d = k == 0 ? c.d : testing::randomCover(rng, 8, 1 + rng() % 3, 2);
            Division a = divide(idx, d), b = divide(c.f, d);
            ASSERT_EQ(a.quotient, b.quotient);
            ASSERT_EQ(a.remainder, b.remainder);
        }
        const Cube& cube = c.d.cubes[0];
        Division byCube = divideByCube(c.f, cube), general = naiveDivide(c.f, Cover{{cube}});
        ASSERT_EQ(byCube.quotient, general.quotient);
        ASSERT_EQ(byCube.remainder, general.remainder);
    }
}

} // namespace
} // namespace kerf::algebra
