// passes_tidy_test.cpp — the clean-up pass `tidy`, on hand-built networks
// whose expected result follows from the definitions (constant propagation,
// buffer/inverter substitution, merging equal covers, dead logic).
#include "kerf/passes/tidy.h"

#include "passes_support.h"

#include <gtest/gtest.h>

using namespace kerf;
using namespace kerf::passes;
using namespace kerf::passes::testing;

TEST(PassesTidy, BuffersAndInverterPairsDisappear) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b");
    NodeId inv1 = n.addLogic(cover({{neg(a)}}));        // ~a
    NodeId inv2 = n.addLogic(cover({{neg(inv1)}}));     // ~~a
    NodeId g = n.addLogic(cover({{pos(inv2), pos(b)}}));
    n.addOutput("y", pos(g));
    n.addOutput("z", pos(inv1));
    Network before = n;
    tidy(n);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.logicCount(), 1u);
    EXPECT_EQ(n.node(g).cover, cover({{pos(a), pos(b)}}));
    EXPECT_EQ(n.outputs()[1].driver, neg(a));
}

TEST(PassesTidy, ConstantsPropagate) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b");
    NodeId zero = n.addLogic(Cover{});                       // constant 0
    NodeId g = n.addLogic(cover({{pos(a), pos(zero)}, {pos(b)}}));   // a&0 | b = b
    NodeId h = n.addLogic(cover({{neg(zero), pos(a)}, {pos(b), pos(a)}}));   // ~0&a | ab = a
    NodeId k = n.addLogic(cover({{pos(a), neg(zero)}, {neg(a)}}));   // a | ~a: not algebraic, stays
    n.addOutput("g", pos(g));
    n.addOutput("h", pos(h));
    n.addOutput("k", pos(k));
    n.addOutput("c", neg(zero));
    Network before = n;
    tidy(n);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.outputs()[0].driver, pos(b));
    EXPECT_EQ(n.outputs()[1].driver, pos(a));
    EXPECT_EQ(n.outputs()[3].driver, net::kTrue);
    EXPECT_FALSE(n.isLogic(zero));
}

TEST(PassesTidy, IdenticalCoversMergeAndDeadLogicGoes) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    NodeId g1 = n.addLogic(cover({{pos(a), pos(b)}, {pos(c)}}), "first");
    NodeId g2 = n.addLogic(cover({{pos(c)}, {pos(b), pos(a)}}));   // same cover, other order
    NodeId h = n.addLogic(cover({{pos(g1), neg(g2)}}));
    NodeId dead = n.addLogic(cover({{pos(a), pos(c)}}));
    (void)dead;
    n.addOutput("h", pos(h));
    n.addOutput("g2", pos(g2));
    Network before = n;
    tidy(n);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_TRUE(n.isLogic(g1));
    EXPECT_FALSE(n.isLogic(g2));
    EXPECT_FALSE(n.isLogic(dead));
    EXPECT_EQ(n.outputs()[1].driver, pos(g1));
    EXPECT_EQ(n.node(g1).name, "first");
    // h = g1 & ~g1 is contradictory: constant 0.
    EXPECT_EQ(n.outputs()[0].driver, net::kFalse);
}

TEST(PassesTidy, RandomNetworksKeepTheirFunctions) {
    for (std::uint32_t seed = 1; seed <= 30; ++seed) {
        Network n = randomNetwork(seed, 8, 60, 6);
        Network before = n;
        tidy(n);
        EXPECT_EQ(sameFunctions(before, n), "") << "seed " << seed;
        EXPECT_LE(net::measure(n).literals, net::measure(before).literals) << "seed " << seed;
        for (NodeId v = 0; v < n.nodeCount(); ++v) {
            if (!n.isLogic(v)) continue;
            const Cover& cv = n.node(v).cover;
            EXPECT_FALSE(cv.isZero() || cv.isOne());
            EXPECT_FALSE(cv.cubes.size() == 1 && cv.cubes[0].lits.size() == 1) << "buffer left, seed " << seed;
        }
    }
}
