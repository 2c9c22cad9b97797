// proof_equivalence_test.cpp — proveEquivalent on hand-built and random
// networks. Every verdict is checked against an exhaustive truth-table
// reference (net::simulate over all input assignments), and every
// counterexample is replayed on both networks by the test itself.
#include "kerf/proof/equivalence.h"
#include "proof_support.h"

#include <gtest/gtest.h>

#include <set>

using namespace kerf;
using namespace kerf::proof;
using namespace kerf::prooftest;

namespace {

/// Names of the outputs whose truth tables differ (same input/output order on both sides).
std::vector<std::string> differingOutputs(const Network& a, const Network& b) {
    auto ta = truthTables(a), tb = truthTables(b);
    std::vector<std::string> names;
    for (std::size_t o = 0; o < ta.size(); ++o)
        if (ta[o] != tb[o]) names.push_back(a.outputs()[o].name);
    return names;
}

/// The counterexample names every input of both sides, sorted, and replays.
void expectGoodCex(const ProofResult& r, const Network& a, const Network& b) {
    ASSERT_TRUE(r.cex.has_value());
    const Counterexample& c = *r.cex;
    std::set<std::string> names;
    for (const Network* n : {&a, &b})
        for (NodeId id : n->inputs()) names.insert(n->node(id).name);
    ASSERT_EQ(c.inputs.size(), names.size());
    std::size_t k = 0;
    for (const std::string& nm : names) EXPECT_EQ(c.inputs[k++].first, nm);
    bool va = evalOutput(a, c.output, c.inputs), vb = evalOutput(b, c.output, c.inputs);
    EXPECT_NE(va, vb) << "counterexample does not separate output " << c.output;
    EXPECT_EQ(va, c.valueA);
    EXPECT_EQ(vb, c.valueB);
    ASSERT_FALSE(r.failingOutputs.empty());
    EXPECT_EQ(r.failingOutputs.front(), c.output);
}

/// Prove, then check the verdict and failing outputs against exhaustion.
void checkAgainstReference(const Network& a, const Network& b, const ProofOptions& opts, const std::string& what) {
    SCOPED_TRACE(what);
    ProofResult r = proveEquivalent(a, b, opts);
    std::vector<std::string> diff = differingOutputs(a, b);
    ASSERT_TRUE(r.undecidedOutputs.empty());
    if (diff.empty()) {
        EXPECT_EQ(r.verdict, Verdict::Equivalent);
        EXPECT_TRUE(r.failingOutputs.empty());
        EXPECT_FALSE(r.cex.has_value());
    } else {
        EXPECT_EQ(r.verdict, Verdict::Different);
        EXPECT_EQ(r.failingOutputs, diff);  // every differing output, in output order
        expectGoodCex(r, a, b);
    }
    const ProofStats& s = r.stats;
    EXPECT_EQ(s.outputs, a.outputs().size());
    EXPECT_EQ(s.byStructure + s.bySimulation + s.bySat + s.undecided, s.outputs);
    EXPECT_LE(s.byHashing, s.byStructure);
}

} // namespace

TEST(ProofEquivalence, DistributiveLawHandBuilt) {
    // a*b + a*c == a*(b + c): distributive law (common textbook identity).
    Network x;
    NodeId a = x.addInput("a"), b = x.addInput("b"), c = x.addInput("c");
    x.addOutput("y", pos(x.addLogic(cover({{pos(a), pos(b)}, {pos(a), pos(c)}}))));
    Network z;
    NodeId c2 = z.addInput("c"), a2 = z.addInput("a"), b2 = z.addInput("b");  // other input order
    NodeId bc = z.addLogic(cover({{pos(b2)}, {pos(c2)}}));
    z.addOutput("y", pos(z.addLogic(cover({{pos(a2), pos(bc)}}))));
    ProofResult r = proveEquivalent(x, z);
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_EQ(r.stats.outputs, 1u);
    EXPECT_FALSE(r.cex);
    EXPECT_NE(r.boundaryNote.find("1 outputs"), std::string::npos);
}

TEST(ProofEquivalence, ProductsThroughSharedFactorsNeedNoSat) {
    // A sum of products, and the same sum with two-literal factors taken out of several
    // products and shared (a restructuring's extracted divisors, written as wires): the products
    // are the same conjunctions (AND is associative and commutative), so hashing both sides
    // settles every output with no SAT call (F370). The factors pair literals that a balanced
    // tree over the sorted literals would not pair (x0 with x3, x2 with x6). A mutant (one
    // literal of one product flipped) is still refuted, checked against the truth tables.
    for (bool mutate : {false, true}) {
        SCOPED_TRACE(mutate ? "mutant" : "equal");
        Network x;
        std::vector<NodeId> in = addInputs(x, "x", 8);
        auto p = [&](NodeId n) { return pos(n); };
        auto q = [&](NodeId n) { return neg(n); };
        x.addOutput("y0", pos(x.addLogic(cover({{q(in[0]), p(in[1]), p(in[2]), q(in[3]), p(in[6])},
                                                 {q(in[0]), q(in[3]), p(in[4])},
                                                 {p(in[5]), p(in[6]), q(in[7])}}))));
        x.addOutput("y1", pos(x.addLogic(cover({{q(in[0]), q(in[3]), q(in[5]), p(in[7])},
                                                 {p(in[2]), p(in[6]), p(in[1]), q(in[4])}}))));
        Network z;
        std::vector<NodeId> zin = addInputs(z, "x", 8);
        NodeId nor03 = z.addLogic(cover({{neg(zin[0]), neg(zin[3])}}));   // ~(x0 | x3), shared
        NodeId and26 = z.addLogic(cover({{pos(zin[2]), pos(zin[6])}}));   // x2 & x6, shared
        Literal flip = mutate ? neg(zin[4]) : pos(zin[4]);
        z.addOutput("y0", pos(z.addLogic(cover({{pos(nor03), pos(and26), pos(zin[1])},
                                                 {pos(nor03), flip},
                                                 {pos(zin[6]), neg(zin[7]), pos(zin[5])}}))));
        z.addOutput("y1", pos(z.addLogic(cover({{pos(nor03), neg(zin[5]), pos(zin[7])},
                                                 {pos(and26), pos(zin[1]), neg(zin[4])}}))));
        ProofResult r = proveEquivalent(x, z);
        checkAgainstReference(x, z, {}, mutate ? "mutant" : "equal");
        if (!mutate) {
            EXPECT_EQ(r.verdict, Verdict::Equivalent);
            EXPECT_EQ(r.stats.byStructure, 2u);
            EXPECT_EQ(r.stats.satCalls, 0u);
        } else {
            EXPECT_EQ(r.verdict, Verdict::Different);
            EXPECT_EQ(r.failingOutputs, std::vector<std::string>{"y0"});
        }
    }
}

TEST(ProofEquivalence, AndVersusOrIsRefutedWithReplayedCounterexample) {
    Network x, z;
    NodeId a = x.addInput("a"), b = x.addInput("b");
    x.addOutput("y", pos(x.addLogic(cover({{pos(a), pos(b)}}))));
    NodeId a2 = z.addInput("a"), b2 = z.addInput("b");
    z.addOutput("y", pos(z.addLogic(cover({{pos(a2)}, {pos(b2)}}))));
    ProofResult r = proveEquivalent(x, z);
    EXPECT_EQ(r.verdict, Verdict::Different);
    EXPECT_EQ(r.stats.bySimulation, 1u);
    expectGoodCex(r, x, z);
    // a&b and a|b differ exactly when a != b.
    EXPECT_NE(r.cex->inputs[0].second, r.cex->inputs[1].second);
}

TEST(ProofEquivalence, OutputNameMismatchIsAnError) {
    Network x, z;
    NodeId a = x.addInput("a");
    x.addOutput("y", pos(a));
    x.addOutput("only_first", neg(a));
    NodeId a2 = z.addInput("a");
    z.addOutput("y", pos(a2));
    z.addOutput("only_second", pos(a2));
    try {
        proveEquivalent(x, z);
        FAIL() << "expected kerf::Error";
    } catch (const Error& e) {
        std::string m = e.what();
        EXPECT_NE(m.find("only_first"), std::string::npos) << m;
        EXPECT_NE(m.find("only_second"), std::string::npos) << m;
        EXPECT_EQ(e.code(), ExitCode::InputError);
    }
}

TEST(ProofEquivalence, RepeatedNamesAreAnError) {
    Network x, z;
    NodeId a = x.addInput("a");
    x.addInput("a");
    x.addOutput("y", pos(a));
    NodeId a2 = z.addInput("a");
    z.addOutput("y", pos(a2));
    EXPECT_THROW(proveEquivalent(x, z), Error);
    Network w;
    NodeId a3 = w.addInput("a");
    w.addOutput("y", pos(a3));
    w.addOutput("y", neg(a3));
    EXPECT_THROW(proveEquivalent(z, w), Error);
}

TEST(ProofEquivalence, OneSidedInputIsAllowed) {
    // y = a + a*u (absorption) on the first side; y = a on the second: u exists only on the first.
    Network x, z;
    NodeId a = x.addInput("a"), u = x.addInput("u");
    x.addOutput("y", pos(x.addLogic(cover({{pos(a)}, {pos(a), pos(u)}}))));
    NodeId a2 = z.addInput("a");
    NodeId v = z.addInput("v");  // only on the second side, unused
    z.addOutput("y", pos(a2));
    (void)v;
    ProofResult r = proveEquivalent(x, z);
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_NE(r.boundaryNote.find("'u'"), std::string::npos) << r.boundaryNote;
    EXPECT_NE(r.boundaryNote.find("'v'"), std::string::npos) << r.boundaryNote;

    // A one-sided input that matters: y = a*u vs y = a. The counterexample names u and v.
    Network x2;
    NodeId a3 = x2.addInput("a"), u3 = x2.addInput("u");
    x2.addOutput("y", pos(x2.addLogic(cover({{pos(a3), pos(u3)}}))));
    ProofResult r2 = proveEquivalent(x2, z);
    EXPECT_EQ(r2.verdict, Verdict::Different);
    expectGoodCex(r2, x2, z);
}

TEST(ProofEquivalence, ConstantAndInputOutputs) {
    Network x, z;
    NodeId a = x.addInput("a"), b = x.addInput("b");
    x.addOutput("k", net::kTrue);
    x.addOutput("w", pos(a));
    x.addOutput("t", pos(x.addLogic(cover({{pos(b)}, {neg(b)}}))));  // b + !b = 1
    NodeId a2 = z.addInput("a"), b2 = z.addInput("b");
    z.addOutput("k", pos(z.addLogic(cover({{pos(a2)}, {neg(a2)}}))));
    z.addOutput("w", pos(z.addLogic(cover({{pos(a2), pos(b2)}, {pos(a2), neg(b2)}}))));  // a*b + a*!b = a
    z.addOutput("t", net::kTrue);
    checkAgainstReference(x, z, {}, "constants");
    ProofResult r = proveEquivalent(x, z);
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_EQ(r.stats.byHashing, 2u);  // k and t fold to constant 1 in the graph; w needs a proof
}

TEST(ProofEquivalence, RandomRestructuringsAreProved) {
    // Restructurings by De Morgan, distribution, consensus and absorption
    // preserve the function; the exhaustive reference confirms each pair.
    for (std::uint64_t seed = 1; seed <= 40; ++seed) {
        Network a = randomNetwork(seed, 12, 50, 8);
        Network b = restructure(a, seed + 1000, 40);
        ASSERT_TRUE(sameByExhaustion(a, b)) << "rewrite helper broke seed " << seed;
        for (bool sweep : {true, false}) {
            ProofOptions o;
            o.sweepInternal = sweep;
            o.seed = seed;
            ProofResult r = proveEquivalent(a, b, o);
            ASSERT_EQ(r.verdict, Verdict::Equivalent) << "seed " << seed << " sweep " << sweep;
        }
    }
}

TEST(ProofEquivalence, MutantsAreRejectedExactlyWhenTheyDiffer) {
    int rejected = 0, kept = 0;
    for (std::uint64_t seed = 1; seed <= 30; ++seed) {
        Network a = randomNetwork(seed, 11, 40, 6);
        Network b = restructure(a, seed + 500, 20);
        const Network mutants[] = {mutateFlipLiteral(b, seed), mutateDropCube(b, seed + 1),
                                   mutateSwapInputs(b, seed + 2)};
        for (int k = 0; k < 3; ++k) {
            ProofOptions o;
            o.seed = seed;
            o.sweepInternal = (seed % 2) == 0;
            o.simWords = seed % 3 == 0 ? 0 : 64;  // a third of the cases rely on SAT alone
            checkAgainstReference(a, mutants[k], o, "seed " + std::to_string(seed) + " mutant " + std::to_string(k));
            (differingOutputs(a, mutants[k]).empty() ? kept : rejected)++;
        }
    }
    // Most mutants change the function; a few are masked by the logic.
    EXPECT_GT(rejected, 45);
}

TEST(ProofEquivalence, WithoutSimulationSatFindsEverything) {
    // No random patterns: every difference and every proof must come from SAT.
    ProofOptions o;
    o.simWords = 0;
    for (std::uint64_t seed = 1; seed <= 10; ++seed) {
        Network a = randomNetwork(seed, 10, 30, 5);
        Network b = restructure(a, seed, 15);
        checkAgainstReference(a, b, o, "equal " + std::to_string(seed));
        Network m = mutateFlipLiteral(b, seed);
        checkAgainstReference(a, m, o, "mutant " + std::to_string(seed));
        ProofResult r = proveEquivalent(a, m, o);
        EXPECT_EQ(r.stats.bySimulation, 0u);
    }
}

TEST(ProofEquivalence, VerboseTableGoesToStderr) {
    Network a = randomNetwork(3, 8, 20, 4);
    Network b = restructure(a, 3, 10);
    ProofOptions o;
    o.verbose = 1;
    testing::internal::CaptureStderr();
    ProofResult r = proveEquivalent(a, b, o);
    std::string err = testing::internal::GetCapturedStderr();
    EXPECT_EQ(r.verdict, Verdict::Equivalent);
    EXPECT_NE(err.find("kerf proof: equivalent"), std::string::npos) << err;
    EXPECT_NE(err.find("simulation"), std::string::npos) << err;
}

TEST(ProofEquivalence, DontCaresOfTheFirstDesignAreFreedom) {
    // y = x1 & x2 in A, with y free wherever x1 = 0 (the source assigns x there).
    // B = x2 agrees wherever x1 = 1, so it is equivalent under the don't-cares and
    // different without them; B = ~x2 differs where x1 = 1, and the counterexample
    // must lie in the care set. Reference: the truth tables, by exhaustion.
    Network a, dc, b, c;
    auto ia = addInputs(a, "x", 2);
    a.addOutput("y", and2(a, pos(ia[0]), pos(ia[1])));
    auto id = addInputs(dc, "x", 2);
    dc.addOutput("y", neg(id[0]));
    auto ib = addInputs(b, "x", 2);
    b.addOutput("y", pos(ib[1]));
    auto ic = addInputs(c, "x", 2);
    c.addOutput("y", neg(ic[1]));

    EXPECT_EQ(proveEquivalent(a, b, {}).verdict, Verdict::Different);
    EXPECT_EQ(proveEquivalent(a, b, {}, &dc).verdict, Verdict::Equivalent);
    ProofResult r = proveEquivalent(a, c, {}, &dc);
    ASSERT_EQ(r.verdict, Verdict::Different);
    ASSERT_TRUE(r.cex.has_value());
    bool x1 = false;
    for (const auto& [n, v] : r.cex->inputs)
        if (n == a.node(ia[0]).name) x1 = v;
    EXPECT_TRUE(x1) << "the counterexample lies where the output is a don't-care";
}
