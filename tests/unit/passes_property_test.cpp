// passes_property_test.cpp — the core correctness check of the
// restructuring engine: on seeded random networks, after every pass and
// after every recipe, every output computes the same function as before
// (exhaustive simulation up to 16 inputs, random words above), the cost
// never rises across a recipe and depth stays within the bound. Also the
// EPFL files (../shared/benchmarks/epfl, read by the test-only netlist line
// reader) keep their functions through the default recipe.
#include "kerf/passes/engine.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/tidy.h"

#include "passes_support.h"

#include <gtest/gtest.h>

#include <filesystem>

using namespace kerf;
using namespace kerf::passes;
using namespace kerf::passes::testing;

namespace {

std::vector<Network> corpus() {
    std::vector<Network> nets;
    for (std::uint32_t seed = 1; seed <= 12; ++seed) nets.push_back(randomNetwork(seed, 6 + seed % 8, 40 + 5 * seed, 5));
    for (std::uint32_t seed = 1; seed <= 8; ++seed) nets.push_back(randomAig(100 + seed, 8 + seed, 120 + 20 * seed, 6));
    nets.push_back(randomNetwork(77, 24, 150, 8, 4, 4));    // above 16 inputs: random patterns
    nets.push_back(randomAig(78, 40, 400, 10));
    return nets;
}

} // namespace

TEST(PassesProperty, EveryPassKeepsEveryOutputFunction) {
    const std::vector<std::string> steps = {"tidy",           "inline-small:-1", "inline-small:3",
                                            "shrink-nodes",   "share-cubes",     "share-divisors",
                                            "share-divisors:kernels", "reuse-nodes", "reuse-nodes:plain",
                                            "shrink-nodes:keep-polarity"};
    auto nets = corpus();
    for (std::size_t i = 0; i < nets.size(); ++i) {
        Network n = nets[i];
        const Network original = n;
        for (const std::string& step : steps) {
            RecipeStep st = parseRecipe(step).at(0);
            PassContext ctx;
            findPass(st.pass)->run(n, st.arg, ctx);
            ASSERT_EQ(sameFunctions(original, n), "") << "network " << i << " after " << step;
            // Structural sanity: no live node reads a dead one.
            for (NodeId v = 0; v < n.nodeCount(); ++v) {
                if (!n.isLogic(v)) continue;
                for (const auto& c : n.node(v).cover.cubes)
                    for (auto l : c.lits) {
                        NodeId u = algebra::literalVar(l);
                        ASSERT_TRUE(u == 0 || n.node(u).kind == net::NodeKind::Input || n.isLogic(u))
                            << "network " << i << " after " << step;
                    }
            }
        }
    }
}

TEST(PassesProperty, PassesRespectTheDepthBoundLocally) {
    // With the bound at the input's sum-of-products depth, no pass may end deeper.
    auto nets = corpus();
    for (std::size_t i = 0; i < nets.size(); ++i) {
        Network n = nets[i];
        tidy(n);
        const std::size_t cap = net::measure(n).depth;
        for (const char* step : {"inline-small:4", "shrink-nodes", "share-divisors:both", "share-cubes", "reuse-nodes"}) {
            RecipeStep st = parseRecipe(step).at(0);
            PassContext ctx;
            ctx.depthCap = cap;
            findPass(st.pass)->run(n, st.arg, ctx);
            EXPECT_LE(net::measure(n).depth, cap) << "network " << i << " after " << step;
        }
    }
}

TEST(PassesProperty, RecipesKeepFunctionsAndNeverCostMore) {
    auto nets = corpus();
    for (const char* effort : {"fast", "default", "thorough"}) {
        for (std::size_t i = 0; i < nets.size(); ++i) {
            Network n = nets[i];
            tidy(n);
            const Network input = n;
            EngineOptions o;
            o.effort = effort;
            EngineResult r = restructure(n, o);
            ASSERT_EQ(sameFunctions(input, n), "") << effort << " network " << i;
            net::Metrics before = measureFactored(input), after = measureFactored(n, r.depthCap);
            EXPECT_EQ(after.gates, r.after.gates);
            EXPECT_EQ(before.gates, r.before.gates);
            EXPECT_LE(after.gates, before.gates) << effort << " network " << i;
            if (after.gates == before.gates) EXPECT_LE(after.literals, before.literals);
            EXPECT_LE(after.depth, before.depth) << effort << " network " << i;
            EXPECT_EQ(n.inputs(), input.inputs());
        }
    }
}

TEST(PassesProperty, ExplicitDepthBoundIsKept) {
    for (std::uint32_t seed = 1; seed <= 6; ++seed) {
        Network n = randomAig(300 + seed, 12, 250, 6);
        tidy(n);
        const Network input = n;
        const std::size_t d = measureFactored(n).depth;
        EngineOptions o;
        o.maxDepth = static_cast<int>(d) - 1;   // tighter than the input: result may keep the input only
        EngineResult r = restructure(n, o);
        EXPECT_EQ(sameFunctions(input, n), "");
        EXPECT_LE(r.after.depth, d);
        EngineOptions loose;
        loose.maxDepth = static_cast<int>(d) + 4;
        Network m = input;
        EngineResult r2 = restructure(m, loose);
        EXPECT_EQ(sameFunctions(input, m), "");
        EXPECT_LE(r2.after.depth, d + 4);
        EXPECT_LE(measureFactored(m, r2.depthCap).depth, d + 4);
    }
}

TEST(PassesProperty, EpflFilesKeepTheirFunctions) {
    const std::string dir = std::string(KERF_SOURCE_DIR) + "/../shared/benchmarks/epfl";
    if (!std::filesystem::exists(dir)) GTEST_SKIP() << "EPFL benchmarks not found at " << dir;
    // Small ones only (voter and priority are left to tests/bench/passes_bench).
    for (const char* name : {"ctrl", "dec", "int2float", "router"}) {
        Network n = loadEpflAigForBench(dir + "/" + name + ".v");
        tidy(n);
        const Network input = n;
        EngineOptions o;
        EngineResult r = restructure(n, o);
        EXPECT_EQ(sameFunctions(input, n, 256), "") << name;
        // Published AND counts of the suite (see shared/benchmarks/epfl/SOURCE.md).
        if (std::string(name) == "ctrl") EXPECT_EQ(r.before.gates, 174u);
        if (std::string(name) == "dec") EXPECT_EQ(r.before.gates, 304u);
        if (std::string(name) == "int2float") EXPECT_EQ(r.before.gates, 260u);
        EXPECT_LE(r.after.gates, r.before.gates) << name;
        EXPECT_LE(r.after.depth, r.before.depth) << name;
    }
}
