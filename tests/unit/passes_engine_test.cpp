// passes_engine_test.cpp — recipes, the engine's bookkeeping and the
// factored-form figures (final-factor).
#include "kerf/passes/engine.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/tidy.h"

#include "kerf/diagnostics.h"
#include "passes_support.h"

#include <gtest/gtest.h>

using namespace kerf;
using namespace kerf::passes;
using namespace kerf::passes::testing;

TEST(PassesRecipe, ParsesPassesAndArguments) {
    auto steps = parseRecipe(" tidy, inline-small:3/16 ,share-divisors:kernels,depth-cap:12,final-factor");
    ASSERT_EQ(steps.size(), 5u);
    EXPECT_EQ(steps[0].pass, "tidy");
    EXPECT_EQ(steps[1].pass, "inline-small");
    EXPECT_EQ(steps[1].arg, "3/16");
    EXPECT_EQ(steps[2].arg, "kernels");
    EXPECT_EQ(steps[3].str(), "depth-cap:12");
}

TEST(PassesRecipe, RejectsUnknownPassesListingTheValidOnes) {
    try {
        parseRecipe("tidy,collapse-all");
        FAIL() << "expected an error";
    } catch (const Error& e) {
        std::string m = e.what();
        EXPECT_NE(m.find("collapse-all"), std::string::npos);
        for (const PassInfo& p : passRegistry()) EXPECT_NE(m.find(p.name), std::string::npos) << p.name;
        EXPECT_EQ(e.code(), ExitCode::InputError);
    }
}

TEST(PassesRecipe, RejectsBadArguments) {
    EXPECT_THROW(parseRecipe("inline-small:lots"), Error);
    EXPECT_THROW(parseRecipe("inline-small:2/0"), Error);
    EXPECT_THROW(parseRecipe("share-divisors:all"), Error);
    EXPECT_THROW(parseRecipe("tidy:1"), Error);
    EXPECT_THROW(parseRecipe("depth-cap:-3"), Error);
    EXPECT_THROW(parseRecipe("tidy,,shrink-nodes"), Error);
    EXPECT_THROW(parseRecipe(""), Error);
    EXPECT_THROW(builtinRecipe("extreme"), Error);
    for (const char* e : {"fast", "default", "thorough"}) EXPECT_NO_THROW(parseRecipe(builtinRecipe(e)));
}

TEST(PassesEngine, RowsFollowTheRecipeAndTheTableShowsThem) {
    Network n = randomAig(5, 10, 200, 5);
    tidy(n);
    EngineOptions o;
    o.recipe = "tidy,inline-small:-1,shrink-nodes,final-factor";
    EngineResult r = restructure(n, o);
    ASSERT_EQ(r.rows.size(), 4u);
    EXPECT_EQ(r.rows[1].pass, "inline-small:-1");
    EXPECT_EQ(r.recipe, o.recipe);
    std::string t = formatPassTable(r);
    for (const char* col : {"pass", "literals", "gates", "depth", "nodes", "seconds", "inline-small:-1", "collapsed="})
        EXPECT_NE(t.find(col), std::string::npos) << col;
}

TEST(PassesEngine, WorseResultRestoresTheInput) {
    // A chain of XORs (3 gates each) collapsed into one sum of products is
    // the 8-cube parity of four inputs, far bigger even when factored; the
    // engine must give the input back.
    Network n;
    std::vector<NodeId> in;
    for (int i = 0; i < 4; ++i) in.push_back(n.addInput("i" + std::to_string(i)));
    auto xorOf = [&](NodeId x, NodeId y) { return n.addLogic(cover({{pos(x), neg(y)}, {neg(x), pos(y)}})); };
    NodeId p = xorOf(xorOf(xorOf(in[0], in[1]), in[2]), in[3]);
    n.addOutput("p", pos(p));
    const Network input = n;
    EngineOptions o;
    o.recipe = "depth-cap:none,inline-small:1000/256";
    EngineResult r = restructure(n, o);
    EXPECT_TRUE(r.keptOriginal);
    EXPECT_EQ(n.node(p).cover, input.node(p).cover);
    EXPECT_EQ(r.after.gates, r.before.gates);
    EXPECT_EQ(sameFunctions(input, n), "");
}

TEST(PassesFactored, CountsGatesOnFactoredForms) {
    // f = ab + ac factors as a(b + c): 2 gates, depth 2 (its SOP has 3 gates).
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    NodeId f = n.addLogic(cover({{pos(a), pos(b)}, {pos(a), pos(c)}}));
    n.addOutput("f", pos(f));
    net::Metrics m = measureFactored(n);
    EXPECT_EQ(m.gates, 2u);
    EXPECT_EQ(m.literals, 3u);
    EXPECT_EQ(m.depth, 2u);
    EXPECT_EQ(net::measure(n).gates, 3u);
}

TEST(PassesFactored, FormsComputeTheirNodesAndRespectTheBound) {
    for (std::uint32_t seed = 1; seed <= 10; ++seed) {
        Network n = randomNetwork(seed, 8, 50, 5, 5, 4);
        tidy(n);
        FactoredNetwork fn = factorNetwork(n);
        // The earliest-arrival forms give a depth no worse than the sums of products.
        EXPECT_LE(fn.metrics.depth, net::measure(n).depth);
        // Each form is the node's cover (algebraically).
        for (NodeId v : n.topoOrder()) {
            Cover back = fn.forms[v].toCover();
            back.normalize();
            Cover cv = n.node(v).cover;
            cv.normalize();
            EXPECT_EQ(back, cv) << "seed " << seed << " node " << v;
        }
        FactoredNetwork loose = factorNetwork(n, 1000);
        EXPECT_LE(loose.metrics.gates, fn.metrics.gates);
        EXPECT_EQ(formCost(sopForm(Cover{}), {}).gates, 0u);
    }
}
