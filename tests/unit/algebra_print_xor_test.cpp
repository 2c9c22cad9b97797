// algebra_print_xor_test.cpp — exclusive-or shapes print with `^`.
//
// Reference: the identities x ^ y = x & ~y | ~x & y and ~(x ^ y) = x & y | ~x & ~y
// (common textbook Boolean algebra) and IEEE 1800-2017 table 11-2 for the
// precedence of `~`, `&`, `^`, `|` (so `a & (x ^ y)` needs its parentheses).
#include "kerf/algebra/cover.h"

#include <gtest/gtest.h>

using namespace kerf::algebra;

namespace {
Factored lit(Literal l) { Factored f; f.kind = Factored::Kind::Lit; f.lit = l; return f; }
Factored node(Factored::Kind k, std::vector<Factored> kids) { Factored f; f.kind = k; f.kids = std::move(kids); return f; }
}

TEST(AlgebraPrintXor, SumOfOppositePairsPrintsAsXor) {
    std::vector<std::string> names{"x", "y", "a"};
    Literal x = makeLiteral(0, false), y = makeLiteral(1, false), a = makeLiteral(2, false);
    using K = Factored::Kind;
    Factored xo = node(K::Or, {node(K::And, {lit(x), lit(negateLiteral(y))}), node(K::And, {lit(negateLiteral(x)), lit(y)})});
    EXPECT_EQ(toString(xo, names), "x ^ y");
    Factored xn = node(K::Or, {node(K::And, {lit(x), lit(y)}), node(K::And, {lit(negateLiteral(x)), lit(negateLiteral(y))})});
    EXPECT_EQ(toString(xn, names), "~(x ^ y)");
    EXPECT_EQ(toString(node(K::And, {lit(a), xo}), names), "a & (x ^ y)");
    EXPECT_EQ(toString(node(K::And, {lit(a), xn}), names), "a & ~(x ^ y)");
    // Not an exclusive-or: the second pair is not the complement of the first.
    Factored other = node(K::Or, {node(K::And, {lit(x), lit(y)}), node(K::And, {lit(negateLiteral(x)), lit(a)})});
    EXPECT_EQ(toString(other, names), "x & y | ~x & a");
    // The printed form still means the same function as its cover.
    EXPECT_EQ(xo.toCover().size(), 2u);
}
