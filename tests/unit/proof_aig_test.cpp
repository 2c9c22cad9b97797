// proof_aig_test.cpp — the and-inverter graph: structural hashing, folding,
// construction from SOP networks (checked against net::simulate, the
// network's own evaluator), and the pattern source.
#include "kerf/proof/aig.h"
#include "kerf/proof/simulation.h"
#include "proof_support.h"

#include <gtest/gtest.h>

#include <set>

using namespace kerf;
using namespace kerf::proof;
using namespace kerf::prooftest;

TEST(ProofAig, ConstantAndTrivialFolding) {
    // Identities of Boolean algebra (common textbook identities):
    // a&0 = 0, a&1 = a, a&a = a, a&!a = 0.
    Aig g;
    AigLit a = g.input("a");
    EXPECT_EQ(g.andOf(a, kAigFalse), kAigFalse);
    EXPECT_EQ(g.andOf(kAigTrue, a), a);
    EXPECT_EQ(g.andOf(a, a), a);
    EXPECT_EQ(g.andOf(a, aigNot(a)), kAigFalse);
    EXPECT_EQ(g.orOf(a, aigNot(a)), kAigTrue);
    EXPECT_EQ(g.andCount(), 0u);
}

TEST(ProofAig, StructuralHashingSharesNodes) {
    Aig g;
    AigLit a = g.input("a"), b = g.input("b"), c = g.input("c");
    AigLit ab = g.andOf(a, b);
    EXPECT_EQ(g.andOf(b, a), ab);  // commutative pair hashed once
    EXPECT_EQ(g.input("a"), a);    // inputs shared by name
    std::size_t before = g.andCount();
    EXPECT_EQ(g.andOfMany({c, a, b}), g.andOfMany({b, c, a}));
    EXPECT_EQ(g.andCount(), before + 1);  // ab reused, one new node for (ab)c or equivalent
    EXPECT_EQ(g.andOfMany({a, b, aigNot(a)}), kAigFalse);
    EXPECT_EQ(g.orOfMany({}), kAigFalse);
    EXPECT_EQ(g.andOfMany({}), kAigTrue);
    EXPECT_NE(g.andOf(a, aigNot(b)), ab);
}

TEST(ProofAig, ConjunctionOfConjunctionsIsOneNode) {
    // AND is associative and commutative (Boolean algebra; common textbook identities), so a
    // product written with a factor that is itself a product, (a&b)&c&d, is the product a&b&c&d:
    // andOfMany takes it over the leaves, and hashing gives the two writings one node (F370).
    Aig g;
    AigLit a = g.input("a"), b = g.input("b"), c = g.input("c"), d = g.input("d"), e = g.input("e");
    AigLit flat = g.andOfMany({a, b, c, d});
    EXPECT_EQ(g.andOfMany({g.andOf(a, b), c, d}), flat);
    EXPECT_EQ(g.andOfMany({g.andOf(c, a), g.andOf(d, b)}), flat);
    EXPECT_EQ(g.andOfMany({g.andOfMany({b, d, a}), c, a}), flat);   // a repeated leaf counts once
    // De Morgan: an OR of an OR is the OR of the leaves, (a|b)|c|d = a|b|c|d.
    EXPECT_EQ(g.orOfMany({g.orOf(a, b), c, d}), g.orOfMany({a, b, c, d}));
    // A complemented product is not a conjunction of its leaves: !(a&b)&c stays as it is.
    AigLit nab = aigNot(g.andOf(a, b));
    EXPECT_NE(g.andOfMany({nab, c}), g.andOfMany({aigNot(a), aigNot(b), c}));
    // A leaf and its complement among the leaves: the constant 0 (a & !a = 0).
    EXPECT_EQ(g.andOfMany({g.andOf(a, e), aigNot(e)}), kAigFalse);
}

TEST(ProofAig, NestedConjunctionsComputeTheirFunction) {
    // Wide and deep products (past the number of leaves a list is flattened to) and ORs of them
    // still compute the conjunction and disjunction of their inputs: checked on random patterns
    // against the values computed here (bitwise AND / OR of the input words).
    Aig g;
    std::vector<AigLit> in;
    for (int i = 0; i < 90; ++i) in.push_back(g.input("i" + std::to_string(i)));
    // ((i0&i1)&(i2&i3)) ... nested four deep, then ANDed with 20 more inputs and a complemented pair.
    std::vector<AigLit> level(in.begin(), in.begin() + 64);
    while (level.size() > 1) {
        std::vector<AigLit> up;
        for (std::size_t i = 0; i + 1 < level.size(); i += 2) up.push_back(g.andOf(level[i], level[i + 1]));
        level = up;
    }
    std::vector<AigLit> lits{level[0]};
    for (int i = 64; i < 84; ++i) lits.push_back(aigNot(in[i]));
    lits.push_back(aigNot(g.andOf(in[84], in[85])));
    AigLit wide = g.andOfMany(lits);
    AigLit sum = g.orOfMany({g.andOfMany({in[86], in[87]}), g.orOf(in[88], in[89]), wide});
    Random rng(71);
    for (int w = 0; w < 16; ++w) {
        std::vector<std::uint64_t> words(in.size());
        for (auto& x : words) x = rng.next();
        if (w % 2) for (int i = 0; i < 64; ++i) words[i] |= rng.next() | rng.next();   // make the product 1 at times
        std::vector<std::uint64_t> val;
        simulateWord(g, words, val);
        std::uint64_t want = ~std::uint64_t{0};
        for (int i = 0; i < 64; ++i) want &= words[i];
        for (int i = 64; i < 84; ++i) want &= ~words[i];
        want &= ~(words[84] & words[85]);
        ASSERT_EQ(literalValue(val, wide), want) << "word " << w;
        ASSERT_EQ(literalValue(val, sum), want | (words[86] & words[87]) | words[88] | words[89]) << "word " << w;
    }
}

TEST(ProofAig, SameNetworkTwiceIsSharedCompletely) {
    Network n = randomNetwork(7, 8, 40, 6);
    Aig g;
    auto first = g.addNetwork(n);
    std::size_t size = g.size();
    auto second = g.addNetwork(n);
    EXPECT_EQ(first, second);
    EXPECT_EQ(g.size(), size);
}

TEST(ProofAig, BuildAgreesWithNetworkSimulation) {
    // The graph of each random network must compute what net::simulate computes.
    for (std::uint64_t seed = 1; seed <= 20; ++seed) {
        Network n = randomNetwork(seed, 10, 60, 8, 5, 4);
        Aig g;
        auto outs = g.addNetwork(n);
        Random rng(seed * 77);
        for (int w = 0; w < 8; ++w) {
            std::vector<std::uint64_t> in(n.inputs().size());
            for (auto& x : in) x = rng.next();
            // The graph creates inputs in cone order: map by name.
            std::vector<std::uint64_t> gin(g.inputs().size(), 0);
            for (std::size_t i = 0; i < n.inputs().size(); ++i)
                if (auto l = g.findInput(n.node(n.inputs()[i]).name)) gin[g.inputIndex(aigNode(*l))] = in[i];
            std::vector<std::uint64_t> val;
            simulateWord(g, gin, val);
            auto ref = net::simulate(n, in);
            for (std::size_t o = 0; o < outs.size(); ++o)
                ASSERT_EQ(literalValue(val, outs[o]), ref[o]) << "seed " << seed << " output " << o;
        }
    }
}

TEST(ProofAig, ConstantCoversAndLiterals) {
    Network n;
    NodeId a = n.addInput("a");
    NodeId zero = n.addLogic(Cover::zero());
    NodeId one = n.addLogic(Cover::one());
    n.addOutput("z", pos(zero));
    n.addOutput("o", pos(one));
    n.addOutput("k0", net::kFalse);
    n.addOutput("k1", net::kTrue);
    n.addOutput("na", neg(a));
    Aig g;
    auto outs = g.addNetwork(n);
    ASSERT_EQ(outs.size(), 5u);
    EXPECT_EQ(outs[0], kAigFalse);
    EXPECT_EQ(outs[1], kAigTrue);
    EXPECT_EQ(outs[2], kAigFalse);
    EXPECT_EQ(outs[3], kAigTrue);
    EXPECT_EQ(outs[4], aigNot(*g.findInput("a")));
}

TEST(ProofAig, PatternSourceIsSeededAndMixed) {
    PatternSource s1(16, 5), s2(16, 5), s3(16, 6);
    std::vector<std::uint64_t> w1, w2, w3;
    s1.fill(0, w1);
    s2.fill(0, w2);
    s3.fill(0, w3);
    EXPECT_EQ(w1, w2);
    EXPECT_NE(w1, w3);
    for (auto x : w1) {
        EXPECT_EQ(x & 1u, 0u);  // pattern 0: all inputs 0
        EXPECT_EQ(x & 2u, 2u);  // pattern 1: all inputs 1
    }
    // Over several words the density of ones must vary (biased words exist).
    std::set<int> densities;
    for (std::size_t w = 1; w < 8; ++w) {
        s1.fill(w, w1);
        int ones = 0;
        for (auto x : w1) ones += std::popcount(x);
        densities.insert(ones * 8 / (16 * 64));
    }
    EXPECT_GE(densities.size(), 3u);
}
