// passes_property_test.cpp — the core correctness check of the
// restructuring engine: on seeded random networks, after every technique
// and after every engine run, every output computes the same function as
// before (exhaustive simulation up to 16 inputs, random words above), the
// cost never rises across a run and depth stays within the bound. Also the
// EPFL files (../shared/benchmarks/epfl, read by the test-only netlist line
// reader) keep their functions through the default effort.
#include "kerf/passes/engine.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/tidy.h"
#include "kerf/passes/shrink_nodes.h"

#include <functional>

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

// Every technique the engine drives, by a name for the messages.
std::vector<std::pair<std::string, std::function<void(Network&, PassContext&)>>> techniques() {
    std::vector<std::pair<std::string, std::function<void(Network&, PassContext&)>>> t;
    t.emplace_back("tidy", [](Network& n, PassContext& c) { tidy(n, c); });
    for (int g : {0, 3}) {
        InlineOptions o;
        o.threshold = g;
        t.emplace_back("dissolve growth " + std::to_string(g), [o](Network& n, PassContext& c) { inlineSmall(n, o, c); });
    }
    t.emplace_back("minimise-nodes", [](Network& n, PassContext& c) { shrinkNodes(n, ShrinkOptions{}, c); });
    t.emplace_back("extract-cubes", [](Network& n, PassContext& c) { shareCubes(n, ShareCubesOptions{}, c); });
    ShareCubesOptions inPlace;
    inPlace.inPlaceCubes = 1;   // the indexed extraction of large networks, on every network
    t.emplace_back("extract-cubes (in place)", [inPlace](Network& n, PassContext& c) { shareCubes(n, inPlace, c); });
    for (auto m : {ShareDivisorsOptions::Method::Pairs, ShareDivisorsOptions::Method::Kernels}) {
        ShareDivisorsOptions o;
        o.method = m;
        t.emplace_back("extract-divisors", [o](Network& n, PassContext& c) { shareDivisors(n, o, c); });
    }
    t.emplace_back("resubstitute", [](Network& n, PassContext& c) { reuseNodes(n, ReuseOptions{}, c); });
    t.emplace_back("dont-care-minimise", [](Network& n, PassContext& c) {
        minimiseWithDontCares(n, DontCareOptions{}, nullptr, c);
    });
    DontCareOptions viaSat;
    viaSat.exhaustiveInputs = 0;   // force random simulation confirmed by SAT
    t.emplace_back("dont-care-minimise (SAT)", [viaSat](Network& n, PassContext& c) {
        minimiseWithDontCares(n, viaSat, nullptr, c);
    });
    return t;
}

TEST(PassesProperty, EveryTechniqueKeepsEveryOutputFunction) {
    auto nets = corpus();
    for (std::size_t i = 0; i < nets.size(); ++i) {
        Network n = nets[i];
        const Network original = n;
        for (const auto& [name, run] : techniques()) {
            PassContext ctx;
            run(n, ctx);
            ASSERT_EQ(sameFunctions(original, n), "") << "network " << i << " after " << name;
            // Structural sanity: no live node reads a dead one.
            for (NodeId v = 0; v < n.nodeCount(); ++v) {
                if (!n.isLogic(v)) continue;
                for (const auto& c : n.node(v).cover.cubes)
                    for (auto l : c.lits) {
                        NodeId u = algebra::literalVar(l);
                        ASSERT_TRUE(u == 0 || n.node(u).kind == net::NodeKind::Input || n.isLogic(u))
                            << "network " << i << " after " << name;
                    }
            }
        }
    }
}

TEST(PassesProperty, TechniquesKeepFunctionsOnAChangedRegion) {
    // A changed region (every third node marked, as the engine sets after
    // its opening): candidates come from it, edits may reach outside it.
    auto nets = corpus();
    for (std::size_t i = 0; i < nets.size(); ++i) {
        Network n = nets[i];
        const Network original = n;
        for (const auto& [name, run] : techniques()) {
            std::vector<std::uint8_t> region(n.nodeCount(), 0);
            for (NodeId v = 0; v < n.nodeCount(); v += 3) region[v] = 1;
            PassContext ctx;
            ctx.focus = &region;
            run(n, ctx);
            ASSERT_EQ(sameFunctions(original, n), "") << "network " << i << " after " << name;
        }
    }
}

TEST(PassesProperty, TechniquesRespectTheDepthBoundLocally) {
    // With the bound at the input's sum-of-products depth, no technique may end deeper.
    auto nets = corpus();
    for (std::size_t i = 0; i < nets.size(); ++i) {
        Network n = nets[i];
        tidy(n);
        const std::size_t cap = net::measure(n).depth;
        for (const auto& [name, run] : techniques()) {
            PassContext ctx;
            ctx.depthCap = cap;
            run(n, ctx);
            EXPECT_LE(net::measure(n).depth, cap) << "network " << i << " after " << name;
        }
    }
}

TEST(PassesProperty, EffortsKeepFunctionsAndNeverCostMore) {
    auto nets = corpus();
    for (const char* effort : {"fast", "default", "thorough"}) {
        for (std::size_t i = 0; i < nets.size(); ++i) {
            // Thorough differs from default only in budgets: a third of the corpus keeps the suite quick.
            if (std::string(effort) == "thorough" && i % 3 != 0) continue;
            Network n = nets[i];
            tidy(n);
            const Network input = n;
            EngineOptions o;
            o.effort = parseEffort(effort);
            o.limits = limitsFor(o.effort);
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
