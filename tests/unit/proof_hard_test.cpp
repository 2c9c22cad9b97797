// proof_hard_test.cpp — cases that separate the engines: parity pairs that
// random simulation cannot settle but SAT settles quickly, and multiplier
// pairs that a tiny conflict budget cannot prove (they must come back
// Undecided, never Equivalent).
#include "kerf/proof/equivalence.h"
#include "proof_support.h"

#include <gtest/gtest.h>

using namespace kerf;
using namespace kerf::proof;
using namespace kerf::prooftest;

namespace {

/// Parity of all inputs as a left-to-right chain of XOR nodes.
Network parityChain(int n, std::uint64_t minterm, bool addMinterm) {
    Network net;
    auto x = addInputs(net, "x", n);
    Literal acc = pos(x[0]);
    for (int i = 1; i < n; ++i) acc = xor2(net, acc, pos(x[i]));
    if (addMinterm) {
        // XOR the parity with one full minterm: the result differs from the
        // parity on exactly one of the 2^n assignments.
        std::vector<Literal> lits;
        for (int i = 0; i < n; ++i) lits.push_back(makeLiteral(x[i], ((minterm >> i) & 1u) == 0));
        Literal m = pos(net.addLogic(cover({lits})));
        acc = xor2(net, acc, m);
    }
    net.addOutput("p", acc);
    return net;
}

/// Parity as a balanced tree of XOR nodes over the inputs in reverse order.
Network parityTree(int n) {
    Network net;
    auto x = addInputs(net, "x", n);
    std::vector<Literal> level;
    for (int i = n - 1; i >= 0; --i) level.push_back(pos(x[i]));
    while (level.size() > 1) {
        std::vector<Literal> next;
        for (std::size_t i = 0; i + 1 < level.size(); i += 2) next.push_back(xor2(net, level[i], level[i + 1]));
        if (level.size() % 2) next.push_back(level.back());
        level = next;
    }
    net.addOutput("p", level[0]);
    return net;
}

} // namespace

TEST(ProofHard, ParityChainEqualsParityTree) {
    // XOR is associative and commutative (common textbook identity), so the
    // chain and the tree compute the same parity. Random patterns cannot
    // prove it; SAT must.
    Network a = parityChain(40, 0, false), b = parityTree(40);
    for (bool sweep : {true, false}) {
        ProofOptions o;
        o.sweepInternal = sweep;
        ProofResult r = proveEquivalent(a, b, o);
        EXPECT_EQ(r.verdict, Verdict::Equivalent) << "sweep " << sweep;
        EXPECT_EQ(r.stats.bySimulation, 0u);
        EXPECT_EQ(r.stats.byHashing, 0u);
        EXPECT_GT(r.stats.satCalls, 0u);
    }
}

TEST(ProofHard, ParityDifferingOnOneMintermIsFoundBySat) {
    // The two sides differ on one assignment out of 2^40: simulation with
    // 64x64 patterns misses it (chance about 2^-28), SAT finds it.
    const std::uint64_t minterm = 0x5A3C96E1D2ull & ((std::uint64_t{1} << 40) - 1);
    Network a = parityTree(40), b = parityChain(40, minterm, true);
    ProofResult r = proveEquivalent(a, b);
    ASSERT_EQ(r.verdict, Verdict::Different);
    EXPECT_EQ(r.stats.bySimulation, 0u);
    EXPECT_EQ(r.stats.bySat, 1u);
    ASSERT_TRUE(r.cex);
    // The only separating assignment is the minterm itself.
    ASSERT_EQ(r.cex->inputs.size(), 40u);
    for (const auto& [name, value] : r.cex->inputs) {
        int i = std::stoi(name.substr(2));
        EXPECT_EQ(value, ((minterm >> i) & 1u) != 0) << name;
    }
    EXPECT_NE(evalOutput(a, "p", r.cex->inputs), evalOutput(b, "p", r.cex->inputs));
}

TEST(ProofHard, SmallMultiplierCommutativityIsProved) {
    // x*y == y*x (commutativity of multiplication) with different array structures.
    Network a = multiplier(5, false), b = multiplier(5, true);
    ASSERT_TRUE(sameByExhaustion(a, b));
    ProofResult r = proveEquivalent(a, b);
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_EQ(r.stats.undecided, 0u);
}

TEST(ProofHard, TinyBudgetOnMultiplierIsUndecided) {
    // Commutativity of an 8x8 array multiplier is notoriously hard for plain
    // SAT (common trade knowledge); with 20 conflicts per query it must not be
    // claimed proved, and the middle product bits must be reported undecided.
    Network a = multiplier(8, false), b = multiplier(8, true);
    for (bool sweep : {false, true}) {
        ProofOptions o;
        o.sweepInternal = sweep;
        o.conflictsPerQuery = 20;
        o.conflictsPerInternal = 5;
        ProofResult r = proveEquivalent(a, b, o);
        EXPECT_EQ(r.verdict, Verdict::Undecided) << "sweep " << sweep;
        EXPECT_GT(r.stats.undecided, 0u);
        EXPECT_EQ(r.undecidedOutputs.size(), r.stats.undecided);
        EXPECT_TRUE(r.failingOutputs.empty());
        EXPECT_FALSE(r.cex);
        // The low bit p[0] = a0*b0 is the same node on both sides.
        EXPECT_EQ(std::count(r.undecidedOutputs.begin(), r.undecidedOutputs.end(), "p[0]"), 0);
    }
}

TEST(ProofHard, GlobalBudgetIsRespected) {
    Network a = multiplier(8, false), b = multiplier(8, true);
    ProofOptions o;
    o.totalConflicts = 200;
    ProofResult r = proveEquivalent(a, b, o);
    EXPECT_EQ(r.verdict, Verdict::Undecided);
    // The budget may be overrun by at most one query's last step, never by much.
    EXPECT_LE(r.stats.conflicts, 200 + 1);
}

TEST(ProofHard, BudgetNeverHidesADifference) {
    // A mutant multiplier with a tiny budget: either refuted with a valid
    // counterexample or undecided, never equivalent.
    Network a = multiplier(8, false);
    Network b = mutateFlipLiteral(multiplier(8, true), 11);
    ASSERT_FALSE(sameByExhaustion(a, b));
    ProofOptions o;
    o.conflictsPerQuery = 10;
    o.conflictsPerInternal = 2;
    ProofResult r = proveEquivalent(a, b, o);
    EXPECT_NE(r.verdict, Verdict::Equivalent);
    if (r.cex) {
        EXPECT_NE(evalOutput(a, r.cex->output, r.cex->inputs), evalOutput(b, r.cex->output, r.cex->inputs));
    }
}
