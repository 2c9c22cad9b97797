// Tests for cubes, covers, containment, products and printing
// (src/algebra/cover.cpp, src/algebra/print.cpp).
// Expected values are computed by hand from the definitions of the algebraic
// model (cube = set of literals, cover = set of cubes), as defined in
// G. De Micheli, "Synthesis and Optimization of Digital Circuits", 1994,
// ch. 8 (from memory).

#include "algebra_support.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <random>

namespace kerf::algebra {
namespace {

using testing::Vars;

TEST(AlgebraCube, ConstructorSortsAndDeduplicates) {
    Cube c({7, 2, 7, 4});
    EXPECT_EQ(c.lits, (std::vector<Literal>{2, 4, 7}));
    EXPECT_TRUE(c.contains(4));
    EXPECT_FALSE(c.contains(5));
    EXPECT_TRUE(c.hasAllOf(Cube({2, 7})));
    EXPECT_FALSE(c.hasAllOf(Cube({2, 3})));
    EXPECT_TRUE(c.hasAllOf(Cube{}));
    EXPECT_FALSE(Cube({2}).hasAllOf(c));
}

TEST(AlgebraCube, ContradictionIsALiteralWithItsComplement) {
    EXPECT_TRUE(Cube({makeLiteral(3, false), makeLiteral(3, true)}).isContradictory());
    // 2*1+1 = 3 and 2*2 = 4 are neighbours but different variables.
    EXPECT_FALSE(Cube({makeLiteral(1, true), makeLiteral(2, false)}).isContradictory());
    EXPECT_FALSE(Cube{}.isContradictory());
}

TEST(AlgebraCube, LiteralEncoding) {
    EXPECT_EQ(makeLiteral(5, true), 11u);
    EXPECT_EQ(literalVar(11), 5u);
    EXPECT_TRUE(literalNegated(11));
    EXPECT_EQ(negateLiteral(11), 10u);
}

TEST(AlgebraCube, ProductIntersectionDifference) {
    Cube a({1, 4, 6}), b({4, 8});
    EXPECT_EQ(cubeProduct(a, b).lits, (std::vector<Literal>{1, 4, 6, 8}));
    EXPECT_EQ(cubeIntersection(a, b).lits, (std::vector<Literal>{4}));
    EXPECT_EQ(cubeDifference(a, b).lits, (std::vector<Literal>{1, 6}));
}

TEST(AlgebraCover, NormalizeSortsDropsDuplicatesAndContradictions) {
    Cover f;
    f.cubes = {Cube({4, 2}), Cube({0, 1}), Cube({2, 4}), Cube({0})};
    f.normalize();
    ASSERT_EQ(f.size(), 2u);
    EXPECT_EQ(f.cubes[0].lits, (std::vector<Literal>{0}));
    EXPECT_EQ(f.cubes[1].lits, (std::vector<Literal>{2, 4}));
    EXPECT_EQ(f.literalCount(), 3u);
    EXPECT_EQ(f.support(), (std::vector<std::uint32_t>{0, 1, 2}));
}

TEST(AlgebraCover, Constants) {
    EXPECT_TRUE(Cover::zero().isZero());
    EXPECT_TRUE(Cover::one().isOne());
    EXPECT_FALSE(Cover::literal(3).isOne());
    EXPECT_EQ(Cover::literal(3).literalCount(), 1u);
}

TEST(AlgebraCover, RemoveContainedCubes) {
    Vars v;
    Cover f = v("a | a & b | b & c | a & b & c | ~a & c");
    removeContainedCubes(f);
    EXPECT_EQ(v.str(f), "a | ~a & c | b & c");
    Cover g = v("a & b | 1");
    removeContainedCubes(g);
    EXPECT_TRUE(g.isOne());
}

TEST(AlgebraCover, RemoveContainedCubesMatchesPairwiseCheck) {
    std::mt19937 rng(101);
    for (int iter = 0; iter < 500; ++iter) {
        // Up to 80 cubes: both the pairwise and the indexed paths.
        Cover f = testing::randomCover(rng, 6 + iter % 3, 1 + rng() % 80, 4);
        Cover expect;
        for (std::size_t i = 0; i < f.size(); ++i) {
            bool contained = false;
            for (std::size_t j = 0; j < f.size() && !contained; ++j)
                contained = i != j && f.cubes[i].hasAllOf(f.cubes[j]);
            if (!contained) expect.cubes.push_back(f.cubes[i]);
        }
        Cover got = f;
        removeContainedCubes(got);
        EXPECT_EQ(got, expect);
    }
}

TEST(AlgebraCover, MultiplyIsTheAlgebraicProduct) {
    Vars v;
    // Parse in a fixed order first: argument evaluation order is unspecified.
    Cover ab = v("a | b"), cd = v("c | d"), ac = v("a | c"), a = v("a"), na_b = v("~a | b");
    EXPECT_EQ(v.str(multiply(ab, cd)), "a & c | a & d | b & c | b & d");
    // Shared support: x & x = x and x & ~x vanishes (cube-level identities only).
    EXPECT_EQ(v.str(multiply(ab, ac)), "a | a & b | a & c | b & c");
    EXPECT_EQ(v.str(multiply(a, na_b)), "a & b");
    EXPECT_TRUE(multiply(a, Cover::zero()).isZero());
    EXPECT_EQ(multiply(ab, Cover::one()), ab);
}

TEST(AlgebraCover, AddIsTheUnion) {
    Vars v;
    Cover ab = v("a | b"), bc = v("b | c"), a = v("a");
    EXPECT_EQ(v.str(add(ab, bc)), "a | b | c");
    EXPECT_EQ(add(Cover::zero(), a), a);
}

TEST(AlgebraCover, CommonCubeAndCubeFree) {
    Vars v;
    EXPECT_EQ(v.str(commonCube(v("a & b & c | a & b & d | a & e & b"))), "a & b");
    EXPECT_TRUE(commonCube(v("a | b")).empty());
    EXPECT_TRUE(isCubeFree(v("a | b")));
    EXPECT_FALSE(isCubeFree(v("a & b | a & c")));
    EXPECT_FALSE(isCubeFree(v("a & b")));         // one cube: never cube-free
    EXPECT_FALSE(isCubeFree(Cover::zero()));
    EXPECT_TRUE(isCubeFree(v("a | 1")));          // the cube 1 shares nothing
    Cube c;
    Cover g = makeCubeFree(v("a & b & c | a & b & d"), &c);
    EXPECT_EQ(v.str(c), "a & b");
    EXPECT_EQ(v.str(g), "c | d");
}

TEST(AlgebraPrint, CoversInVerilogSyntax) {
    Vars v;
    EXPECT_EQ(v.str(Cover::zero()), "0");
    EXPECT_EQ(v.str(Cover::one()), "1");
    EXPECT_EQ(v.str(v("a & ~b | c")), "a & ~b | c");
    // Unnamed variables get a placeholder name.
    EXPECT_EQ(toString(Cover::literal(makeLiteral(9, true)), {}), "~v9");
}

TEST(AlgebraPrint, FactoredFormsUseMinimalParentheses) {
    using K = Factored::Kind;
    auto lit = [](Literal l) { Factored f; f.kind = K::Lit; f.lit = l; return f; };
    auto node = [](K k, std::vector<Factored> kids) { Factored f; f.kind = k; f.kids = std::move(kids); return f; };
    std::vector<std::string> names{"a", "b", "c", "d"};
    Factored sum = node(K::Or, {lit(0), lit(3)});                      // a | ~b
    Factored prod = node(K::And, {sum, lit(4)});                       // (a | ~b) & c
    EXPECT_EQ(toString(prod, names), "(a | ~b) & c");
    EXPECT_EQ(toString(node(K::Or, {prod, lit(6)}), names), "(a | ~b) & c | d");
    EXPECT_EQ(toString(node(K::And, {node(K::Or, {sum}), lit(4)}), names), "(a | ~b) & c");
    EXPECT_EQ(toString(node(K::And, {lit(0), node(K::And, {lit(2), lit(4)})}), names), "a & b & c");
    Factored zero, one;
    one.kind = K::One;
    EXPECT_EQ(toString(zero, names), "0");
    EXPECT_EQ(toString(one, names), "1");
    EXPECT_EQ(prod.literalCount(), 3u);
}

} // namespace
} // namespace kerf::algebra
