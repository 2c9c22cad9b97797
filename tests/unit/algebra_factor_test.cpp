// Tests for factoring (src/algebra/factor.cpp).
//
// References (from memory): R. K. Brayton, "Factoring logic functions",
// IBM J. Res. Develop. 31(2), 1987, and G. De Micheli, "Synthesis and
// Optimization of Digital Circuits", 1994, ch. 8, define factored forms and
// the literal count, and illustrate factoring on covers that are products of
// sums plus a remainder. Functional checks use truth tables over up to 16
// variables, evaluating the factored tree itself rather than its flattening.

#include "algebra_support.h"

#include <gtest/gtest.h>

#include <random>

namespace kerf::algebra {
namespace {

using testing::Vars;

const FactorMethod kMethods[] = {FactorMethod::Quick, FactorMethod::Best};

// From memory: the usual illustration (Brayton 1987; De Micheli 1994, ch. 8)
// is a product of two sums plus a lone cube; 9 literals become 5. Our own
// variables.
TEST(AlgebraFactor, ProductOfSumsPlusACube) {
    for (FactorMethod m : kMethods) {
        Vars v;
        Factored g = factor(v("p & x | p & y | q & x | q & y | z"), m);
        EXPECT_EQ(v.str(g), "(p | q) & (x | y) | z");
        EXPECT_EQ(g.literalCount(), 5u);
    }
}

// Computed by hand: the common cube comes out first.
TEST(AlgebraFactor, CommonCube) {
    for (FactorMethod m : kMethods) {
        Vars v;
        Factored g = factor(v("a & b & c | a & b & ~d"), m);
        EXPECT_EQ(v.str(g), "a & b & (c | ~d)");
        EXPECT_EQ(g.literalCount(), 4u);
    }
}

// Computed by hand: (a | b) & (c | d) & (e | f) multiplied out has 24
// literals; factoring recovers the 6-literal product.
TEST(AlgebraFactor, ProductOfThreeSums) {
    for (FactorMethod m : kMethods) {
        Vars v;
        Factored g = factor(v("(a | b) & (c | d) & (e | f)"), m);
        EXPECT_EQ(g.literalCount(), 6u) << v.str(g);
        EXPECT_EQ(g.toCover(), v("(a | b) & (c | d) & (e | f)"));
    }
}

// Computed by hand: when the divisor's quotient is a single cube, the best
// literal of it is factored out: a is in 3 cubes, so a & (b | c | d) | e.
TEST(AlgebraFactor, LiteralFactoring) {
    for (FactorMethod m : kMethods) {
        Vars v;
        Factored g = factor(v("a & b | a & c | a & d | e"), m);
        EXPECT_EQ(v.str(g), "a & (b | c | d) | e");
    }
}

TEST(AlgebraFactor, NothingToFactor) {
    for (FactorMethod m : kMethods) {
        Vars v;
        EXPECT_EQ(v.str(factor(v("a | b & c | ~a"), m)), "a | ~a | b & c");
        EXPECT_EQ(v.str(factor(Cover::zero(), m)), "0");
        EXPECT_EQ(v.str(factor(Cover::one(), m)), "1");
        EXPECT_EQ(v.str(factor(v("a & ~b"), m)), "a & ~b");
    }
}

// The algebraic model keeps the cube 1 as a term: a & b | a = a & (1 | b).
TEST(AlgebraFactor, KeepsTheCubeOneAlgebraically) {
    Vars v;
    Factored g = factor(v("a & b | a"));
    EXPECT_EQ(v.str(g), "a & (1 | b)");
    EXPECT_EQ(g.literalCount(), 2u);
}

TEST(AlgebraFactor, SumOfProductsIsTheUnfactoredTree) {
    Vars v;
    Cover f = v("a & b | c");
    Factored g = sumOfProducts(f);
    EXPECT_EQ(v.str(g), "a & b | c");
    EXPECT_EQ(g.literalCount(), f.literalCount());
    EXPECT_EQ(g.toCover(), f);
}

// Best looks at every kernel; quick takes the first level-0 kernel it reaches.
// Computed by hand: x is the most frequent literal, so quick descends to the
// kernel a | b (co-kernel x & y) and ends with
// x & (y & (a | b) | c | d | e) | w & (c | d | e), 11 literals; the kernels
// x | w and c | d | e each save 7 literals at once (best takes c | d | e,
// found first, under w), and best ends with
// (x | w) & (c | d | e) | x & y & (a | b), 9 literals.
TEST(AlgebraFactor, BestBeatsQuickWhenTheFirstKernelIsPoor) {
    Vars v;
    Cover f = v("x & y & a | x & y & b | x & c | x & d | x & e | w & c | w & d | w & e");
    Factored quick = factor(f, FactorMethod::Quick);
    Factored best = factor(f, FactorMethod::Best);
    EXPECT_EQ(quick.literalCount(), 11u) << v.str(quick);
    EXPECT_EQ(best.literalCount(), 9u) << v.str(best);
    EXPECT_EQ(v.str(best), "(x | w) & (c | d | e) | x & y & (a | b)");
    EXPECT_EQ(quick.toCover(), f);
    EXPECT_EQ(best.toCover(), f);
}

// --- Properties over random covers ----------------------------------------

TEST(AlgebraFactor, RandomCoversKeepFunctionCubesAndNeverGrow) {
    std::mt19937 rng(1987);
    std::size_t sop = 0, factoredQuick = 0, factoredBest = 0;
    for (int iter = 0; iter < 3000; ++iter) {
        const unsigned vars = iter % 10 == 0 ? 16 : 3 + rng() % 10;
        Cover f;
        if (iter % 3 == 0) {
            // Planted structure: a product of two sums plus noise.
            Cover a = testing::randomCover(rng, vars / 2, 1 + rng() % 4, 3);
            Cover b = testing::randomCover(rng, vars - vars / 2, 1 + rng() % 4, 3);
            for (Cube& c : b.cubes)
                for (Literal& l : c.lits) l += 2 * (vars / 2);
            f = add(multiply(a, b), testing::randomCover(rng, vars, rng() % 5, 4));
        } else {
            f = testing::randomCover(rng, vars, 1 + rng() % 30, 5);
        }
        const testing::Table want = testing::evalCover(f, vars);
        const bool repeats = [&] {
            std::vector<Literal> all;
            for (const Cube& c : f.cubes) all.insert(all.end(), c.lits.begin(), c.lits.end());
            std::sort(all.begin(), all.end());
            return std::adjacent_find(all.begin(), all.end()) != all.end();
        }();
        sop += f.literalCount();
        std::size_t quickLits = 0;
        for (FactorMethod m : kMethods) {   // quick first, then best
            Factored g = factor(f, m);
            (m == FactorMethod::Quick ? factoredQuick : factoredBest) += g.literalCount();
            if (m == FactorMethod::Quick) quickLits = g.literalCount();
            else ASSERT_LE(g.literalCount(), quickLits) << "iteration " << iter;
            ASSERT_EQ(testing::evalFactored(g, vars), want) << "iteration " << iter;
            // Algebraic factoring: flattening gives back f cube for cube.
            ASSERT_EQ(g.toCover(), f) << "iteration " << iter;
            ASSERT_LE(g.literalCount(), f.literalCount()) << "iteration " << iter;
            // A literal in two cubes can always be factored out.
            if (repeats) ASSERT_LT(g.literalCount(), f.literalCount()) << "iteration " << iter;
            else ASSERT_EQ(g.literalCount(), f.literalCount()) << "iteration " << iter;
        }
    }
    // Factoring does save overall, and choosing divisors by saving does find
    // smaller forms than quick on some of these covers.
    EXPECT_LT(factoredQuick, sop * 9 / 10);
    EXPECT_LT(factoredBest, factoredQuick);
}

namespace kerf::algebra {
namespace {

// Renumber variables far apart (as network node ids can be) and back.
Cover spread(const Cover& f, std::uint32_t stride) {
    Cover g;
    for (const Cube& c : f.cubes) {
        std::vector<Literal> lits;
        for (Literal l : c.lits) lits.push_back(makeLiteral(literalVar(l) * stride + 7, literalNegated(l)));
        g.cubes.emplace_back(std::move(lits));
    }
    g.normalize();
    return g;
}

// Large, sparse variable numbers take other internal paths (sorting instead
// of direct tables); the results must be the same up to renumbering.
TEST(AlgebraFactor, SparseVariableNumbersGiveTheSameResults) {
    std::mt19937 rng(31337);
    const std::uint32_t stride = 1000003;
    for (int iter = 0; iter < 300; ++iter) {
        Cover f = testing::randomCover(rng, 3 + rng() % 8, 2 + rng() % 60, 4);
        Cover d = testing::randomCover(rng, 3, 2, 2);
        Cover sf = spread(f, stride), sd = spread(d, stride);
        Division a = divide(f, d), b = divide(sf, sd);
        ASSERT_EQ(spread(a.quotient, stride), b.quotient);
        ASSERT_EQ(spread(a.remainder, stride), b.remainder);
        CoverIndex idx(sf);
        Division c = divide(idx, sd);
        ASSERT_EQ(c.quotient, b.quotient);
        std::vector<KernelPair> ka = kernels(f), kb = kernels(sf);
        ASSERT_EQ(ka.size(), kb.size());
        for (std::size_t i = 0; i < ka.size(); ++i) {
            ASSERT_EQ(spread(ka[i].kernel, stride), kb[i].kernel);
            ASSERT_EQ(ka[i].level, kb[i].level);
        }
        ASSERT_EQ(spread(levelZeroKernel(f).kernel, stride), levelZeroKernel(sf).kernel);
        Cover cf = f, csf = sf;
        removeContainedCubes(cf);
        removeContainedCubes(csf);
        ASSERT_EQ(spread(cf, stride), csf);
        for (FactorMethod m : kMethods) {
            Factored g = factor(f, m), h = factor(sf, m);
            ASSERT_EQ(g.literalCount(), h.literalCount());
            ASSERT_EQ(spread(g.toCover(), stride), h.toCover());
        }
    }
}

} // namespace
} // namespace kerf::algebra

TEST(AlgebraFactor, BestFromAGivenQuickFormIsTheSameAsBestAlone) {
    // FactorCache hands Best the quick form it already holds (factored once);
    // the result must be the one factor(f, Best) gives, with f's function.
    std::mt19937 rng(2024);
    for (int iter = 0; iter < 500; ++iter) {
        const unsigned vars = 3 + rng() % 10;
        const Cover f = testing::randomCover(rng, vars, 1 + rng() % 20, 5);
        const Factored quick = factor(f, FactorMethod::Quick);
        const Factored viaQuick = factorBest(f, quick);
        const Factored alone = factor(f, FactorMethod::Best);
        ASSERT_EQ(viaQuick.literalCount(), alone.literalCount()) << "iteration " << iter;
        ASSERT_EQ(testing::evalFactored(viaQuick, vars), testing::evalCover(f, vars)) << "iteration " << iter;
    }
}

} // namespace
} // namespace kerf::algebra
