// passes_transform_test.cpp — shrink-nodes, inline-small, share-cubes,
// share-divisors and reuse-nodes on small hand-built networks. Expected
// results are worked out from the definitions of the transformations as in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 (from memory)
// and J. Rajski, J. Vasudevamurthy, IEEE TCAD 1992 (two-cube divisors, from
// memory).
#include "kerf/passes/inline_small.h"
#include "kerf/passes/reuse_nodes.h"
#include "kerf/passes/share_cubes.h"
#include "kerf/passes/share_divisors.h"
#include "kerf/passes/dont_cares.h"
#include "kerf/passes/resub_boolean.h"
#include "kerf/passes/tidy.h"
#include "kerf/passes/shrink_nodes.h"

#include "passes_support.h"

#include <gtest/gtest.h>

using namespace kerf;
using namespace kerf::passes;
using namespace kerf::passes::testing;

namespace {

std::vector<NodeId> liveNodes(const Network& n) {
    std::vector<NodeId> v;
    for (NodeId id = 0; id < n.nodeCount(); ++id)
        if (n.isLogic(id)) v.push_back(id);
    return v;
}

const NodeId* findCover(const Network& n, const Cover& f, NodeId& out) {
    for (NodeId id : liveNodes(n))
        if (n.node(id).cover == f) { out = id; return &out; }
    return nullptr;
}

} // namespace

TEST(PassesShrink, MinimisesACover) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    NodeId g = n.addLogic(cover({{pos(a), pos(b)}, {neg(a), pos(c)}, {pos(b), pos(c)}}));
    n.addOutput("g", pos(g));
    Network before = n;
    PassContext ctx;
    ShrinkOptions o;
    o.allowComplement = false;
    shrinkNodes(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(g).cover, cover({{pos(a), pos(b)}, {neg(a), pos(c)}}));
    EXPECT_EQ(ctx.stats.get("literals-saved"), 2);
}

TEST(PassesShrink, TakesTheCheaperComplementAndFlipsReaders) {
    // g = a'b' + a'c' + a'd' (6 literals); ¬g = a + bcd (4 literals).
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e");
    NodeId g = n.addLogic(cover({{neg(a), neg(b)}, {neg(a), neg(c)}, {neg(a), neg(d)}}), "g_hint");
    NodeId h = n.addLogic(cover({{pos(g), pos(e)}, {neg(g), neg(e)}}));
    n.addOutput("g", pos(g));
    n.addOutput("h", pos(h));
    Network before = n;
    PassContext ctx;
    shrinkNodes(n, ShrinkOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(g).cover, cover({{pos(a)}, {pos(b), pos(c), pos(d)}}));
    EXPECT_EQ(n.outputs()[0].driver, neg(g));
    EXPECT_EQ(n.node(h).cover, cover({{neg(g), pos(e)}, {pos(g), neg(e)}}));
    EXPECT_TRUE(n.node(g).name.empty());
    EXPECT_EQ(ctx.stats.get("complemented"), 1);
}

TEST(PassesInline, CollapsesAndChainsIntoOneCube) {
    // ((a&b)&c)&d as three two-input ANDs becomes one 4-literal cube.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d");
    NodeId x = n.addLogic(cover({{pos(a), pos(b)}}));
    NodeId y = n.addLogic(cover({{pos(x), pos(c)}}));
    NodeId z = n.addLogic(cover({{pos(y), pos(d)}}));
    n.addOutput("z", pos(z));
    Network before = n;
    PassContext ctx;
    InlineOptions o;
    o.threshold = -1;
    inlineSmall(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(liveNodes(n), std::vector<NodeId>{z});
    EXPECT_EQ(n.node(z).cover, cover({{pos(a), pos(b), pos(c), pos(d)}}));
}

TEST(PassesInline, WideCoversRevaluedLaterGiveTheSameCollapse) {
    // A wide OR of 20 two-literal ANDs: its fanins are re-valued when taken
    // (revalueMaxCubes below the width) or at once; both collapse every AND
    // into the OR, keep the function and end with the same cover.
    for (std::size_t revalue : {std::size_t{0}, std::size_t{64}}) {
        Network n;
        std::vector<NodeId> in;
        for (int i = 0; i < 40; ++i) in.push_back(n.addInput("i" + std::to_string(i)));
        std::vector<algebra::Cube> terms;
        for (int k = 0; k < 20; ++k) {
            NodeId t = n.addLogic(cover({{pos(in[2 * k]), neg(in[2 * k + 1])}}));
            terms.push_back(algebra::Cube({pos(t)}));
        }
        Cover orCover;
        orCover.cubes = terms;
        orCover.normalize();
        NodeId z = n.addLogic(std::move(orCover));
        n.addOutput("z", pos(z));
        Network before = n;
        PassContext ctx;
        InlineOptions o;
        o.threshold = 0;
        o.revalueMaxCubes = revalue;
        inlineSmall(n, o, ctx);
        EXPECT_EQ(sameFunctions(before, n), "") << revalue;
        EXPECT_EQ(liveNodes(n), std::vector<NodeId>{z}) << revalue;
        EXPECT_EQ(n.node(z).cover.cubes.size(), 20u) << revalue;
    }
}

TEST(PassesInline, ComplementedReadersGetTheComplement) {
    // z = ~(a&b) & c  →  a'c + b'c
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    NodeId x = n.addLogic(cover({{pos(a), pos(b)}}));
    NodeId z = n.addLogic(cover({{neg(x), pos(c)}}));
    n.addOutput("z", pos(z));
    Network before = n;
    PassContext ctx;
    InlineOptions o;
    o.threshold = 1;   // 4 literals before (2 + 2), 4 after
    inlineSmall(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_FALSE(n.isLogic(x));
    EXPECT_EQ(n.node(z).cover, cover({{neg(a), pos(c)}, {neg(b), pos(c)}}));
}

TEST(PassesInline, ThresholdAndOutputsAreRespected) {
    // x = a&b read by three nodes: collapsing costs 3*2 - 3 - 2 = +1 literal.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e");
    NodeId x = n.addLogic(cover({{pos(a), pos(b)}}));
    NodeId p = n.addLogic(cover({{pos(x), pos(c)}, {pos(d)}}));
    NodeId q = n.addLogic(cover({{pos(x), pos(d)}, {pos(e)}}));
    NodeId r = n.addLogic(cover({{pos(x), pos(e)}, {pos(c)}}));
    n.addOutput("p", pos(p));
    n.addOutput("q", pos(q));
    n.addOutput("r", pos(r));
    n.addOutput("x", pos(x));
    Network before = n;
    PassContext ctx;
    InlineOptions o;
    o.threshold = 5;
    inlineSmall(n, o, ctx);
    EXPECT_TRUE(n.isLogic(x)) << "a node driving an output stays";
    EXPECT_EQ(sameFunctions(before, n), "");
    n.outputs().pop_back();
    Network noOut = n;
    o.threshold = 0;
    inlineSmall(n, o, ctx);
    EXPECT_TRUE(n.isLogic(x)) << "+1 literal is above threshold 0";
    o.threshold = 1;
    inlineSmall(n, o, ctx);
    EXPECT_FALSE(n.isLogic(x));
    EXPECT_EQ(sameFunctions(noOut, n), "");
}

TEST(PassesInline, CubeCapStopsExplosion) {
    // z = x & y with x, y sums of 4 single literals each: 16 cubes when collapsed.
    Network n;
    std::vector<NodeId> in;
    for (int i = 0; i < 8; ++i) in.push_back(n.addInput("i" + std::to_string(i)));
    NodeId x = n.addLogic(cover({{pos(in[0])}, {pos(in[1])}, {pos(in[2])}, {pos(in[3])}}));
    NodeId y = n.addLogic(cover({{pos(in[4])}, {pos(in[5])}, {pos(in[6])}, {pos(in[7])}}));
    NodeId z = n.addLogic(cover({{pos(x), pos(y)}}));
    n.addOutput("z", pos(z));
    Network before = n;
    PassContext ctx;
    InlineOptions o;
    o.threshold = 100;
    o.maxCubes = 8;
    inlineSmall(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");   // the cap limits the work, never the function
    EXPECT_LE(n.node(z).cover.cubes.size(), 8u);
    EXPECT_TRUE(n.isLogic(x) || n.isLogic(y));
}

TEST(PassesShareDivisors, SharedTwoCubeDivisorIsExtracted) {
    // f = ac + ad + bc + bd = (a+b)(c+d), g = ae + be = (a+b)e: a+b is shared.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e");
    NodeId f = n.addLogic(cover({{pos(a), pos(c)}, {pos(a), pos(d)}, {pos(b), pos(c)}, {pos(b), pos(d)}}));
    NodeId g = n.addLogic(cover({{pos(a), pos(e)}, {pos(b), pos(e)}}));
    n.addOutput("f", pos(f));
    n.addOutput("g", pos(g));
    Network before = n;
    PassContext ctx;
    shareDivisors(n, ShareDivisorsOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    NodeId s = 0;
    ASSERT_TRUE(findCover(n, cover({{pos(a)}, {pos(b)}}), s)) << "a+b became a node";
    EXPECT_EQ(n.node(g).cover, cover({{pos(s), pos(e)}}));
    // 12 literals before; a+b (2) + f = s(c+d) in some form + g (2) after.
    EXPECT_LE(net::measure(n).literals, 8u);
}

TEST(PassesShareDivisors, ExistingNodeIsReusedAsDivisor) {
    // p = a + b exists; f = ac + bc + d contains it.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d");
    NodeId p = n.addLogic(cover({{pos(a)}, {pos(b)}}));
    NodeId f = n.addLogic(cover({{pos(a), pos(c)}, {pos(b), pos(c)}, {pos(d)}}));
    n.addOutput("p", pos(p));
    n.addOutput("f", pos(f));
    Network before = n;
    PassContext ctx;
    shareDivisors(n, ShareDivisorsOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(f).cover, cover({{pos(p), pos(c)}, {pos(d)}}));
    EXPECT_EQ(n.logicCount(), 2u);
}

TEST(PassesShareDivisors, AFullCandidateTableTakesNoNewDivisors) {
    // Limit divisors-max-candidates (F149): once the table holds that many
    // candidates, a divisor not in it is not counted. f = ae + be + w and
    // g = af + bf + w share a + b; h = cx + dx + v and k = cy + dy + v share
    // c + d. Unbounded, both divisors become nodes. Bounded at one
    // candidate, the table holds only the first divisor counted (a + b,
    // from the first pair of cubes of f, the first node in order): g still
    // counts it, so a + b is still shared, while c + d is never a candidate
    // and h and k are left as they were; the limit is reported.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e"),
           f0 = n.addInput("f0"), x = n.addInput("x"), y = n.addInput("y"), v = n.addInput("v"), w = n.addInput("w");
    NodeId f = n.addLogic(cover({{pos(a), pos(e)}, {pos(b), pos(e)}, {pos(w)}}));
    NodeId g = n.addLogic(cover({{pos(a), pos(f0)}, {pos(b), pos(f0)}, {pos(w)}}));
    NodeId h = n.addLogic(cover({{pos(c), pos(x)}, {pos(d), pos(x)}, {pos(v)}}));
    NodeId k = n.addLogic(cover({{pos(c), pos(y)}, {pos(d), pos(y)}, {pos(v)}}));
    for (NodeId o : {f, g, h, k}) n.addOutput("o" + std::to_string(o), pos(o));
    const Network before = n;
    {
        Network m = before;
        PassContext ctx;
        ShareDivisorsOptions o;
        o.maxCandidates = 0;
        shareDivisors(m, o, ctx);
        EXPECT_EQ(sameFunctions(before, m), "");
        NodeId s = 0;
        EXPECT_TRUE(findCover(m, cover({{pos(a)}, {pos(b)}}), s));
        EXPECT_TRUE(findCover(m, cover({{pos(c)}, {pos(d)}}), s));
        EXPECT_EQ(ctx.stats.get("limit-hit:divisors-max-candidates"), 0);
    }
    Network m = before;
    PassContext ctx;
    ShareDivisorsOptions o;
    o.maxCandidates = 1;
    shareDivisors(m, o, ctx);
    EXPECT_EQ(sameFunctions(before, m), "");
    NodeId s = 0;
    ASSERT_TRUE(findCover(m, cover({{pos(a)}, {pos(b)}}), s));
    EXPECT_EQ(m.node(g).cover, cover({{pos(s), pos(f0)}, {pos(w)}}));
    EXPECT_EQ(m.node(h).cover, before.node(h).cover);
    EXPECT_EQ(m.node(k).cover, before.node(k).cover);
    EXPECT_EQ(ctx.stats.get("limit-hit:divisors-max-candidates"), 1);
    EXPECT_EQ(ctx.stats.get("candidates"), 1);
}

TEST(PassesShareDivisors, WideNodesGiveTwoLiteralDivisorsOnlyUnderTheCubePairBound) {
    // Limit divisors-cube-pair-max-cubes (engine21). f = acx + bcx + w and
    // g = acy + bcy + v share the two-cube divisor a + b (f = (a+b)cx + w:
    // weak division, Brayton and McMullen 1982, from memory) and the
    // two-literal divisors ac and bc. Unbounded, a + b (weight 2*3 - 1 = 5)
    // is extracted first. With the bound at 2 cubes, these 3-cube nodes give
    // no two-cube divisor at all, but their two-literal divisors are still
    // counted and extracted. Functions are compared by exhaustive simulation.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), x = n.addInput("x"), y = n.addInput("y"),
           v = n.addInput("v"), w = n.addInput("w");
    NodeId f = n.addLogic(cover({{pos(a), pos(c), pos(x)}, {pos(b), pos(c), pos(x)}, {pos(w)}}));
    NodeId g = n.addLogic(cover({{pos(a), pos(c), pos(y)}, {pos(b), pos(c), pos(y)}, {pos(v)}}));
    n.addOutput("f", pos(f));
    n.addOutput("g", pos(g));
    const Network before = n;
    {
        Network m = before;
        PassContext ctx;
        shareDivisors(m, ShareDivisorsOptions{}, ctx);
        EXPECT_EQ(sameFunctions(before, m), "");
        NodeId s = 0;
        EXPECT_TRUE(findCover(m, cover({{pos(a)}, {pos(b)}}), s)) << "a+b became a node";
    }
    Network m = before;
    PassContext ctx;
    ShareDivisorsOptions o;
    o.maxCubesForCubePairs = 2;
    shareDivisors(m, o, ctx);
    EXPECT_EQ(sameFunctions(before, m), "");
    NodeId s = 0;
    EXPECT_FALSE(findCover(m, cover({{pos(a)}, {pos(b)}}), s)) << "no two-cube divisor from a 3-cube node";
    for (NodeId u = 0; u < m.nodeCount(); ++u)
        if (m.isLogic(u) && u != f && u != g) EXPECT_EQ(m.node(u).cover.cubes.size(), 1u) << "only cube divisors";
    EXPECT_GT(ctx.stats.get("extracted"), 0) << "the two-literal divisors are still taken";
    EXPECT_LT(net::measure(m).gates, net::measure(before).gates);   // weights are counted in two-input gates
}

TEST(PassesShareDivisors, KernelMethodFindsCommonKernel) {
    // f = ax + ay + az + w, g = bx + by + bz: kernel x+y+z is common.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), x = n.addInput("x"), y = n.addInput("y"), z = n.addInput("z"),
           w = n.addInput("w");
    NodeId f = n.addLogic(cover({{pos(a), pos(x)}, {pos(a), pos(y)}, {pos(a), pos(z)}, {pos(w)}}));
    NodeId g = n.addLogic(cover({{pos(b), pos(x)}, {pos(b), pos(y)}, {pos(b), pos(z)}}));
    n.addOutput("f", pos(f));
    n.addOutput("g", pos(g));
    Network before = n;
    PassContext ctx;
    ShareDivisorsOptions o;
    o.method = ShareDivisorsOptions::Method::Kernels;
    shareDivisors(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    NodeId k = 0;
    ASSERT_TRUE(findCover(n, cover({{pos(x)}, {pos(y)}, {pos(z)}}), k));
    EXPECT_EQ(n.node(f).cover, cover({{pos(a), pos(k)}, {pos(w)}}));
    EXPECT_EQ(n.node(g).cover, cover({{pos(b), pos(k)}}));
}

/// Three nodes whose first cubes share a·b·c: f = abcx + y, g = abcy + z, h = abcz + x.
struct SharedAbc {
    Network n;
    NodeId a, b, c, x, y, z, f, g, h;
};
SharedAbc sharedAbc() {
    SharedAbc t;
    Network& n = t.n;
    t.a = n.addInput("a"), t.b = n.addInput("b"), t.c = n.addInput("c");
    t.x = n.addInput("x"), t.y = n.addInput("y"), t.z = n.addInput("z");
    t.f = n.addLogic(cover({{pos(t.a), pos(t.b), pos(t.c), pos(t.x)}, {pos(t.y)}}));
    t.g = n.addLogic(cover({{pos(t.a), pos(t.b), pos(t.c), pos(t.y)}, {pos(t.z)}}));
    t.h = n.addLogic(cover({{pos(t.a), pos(t.b), pos(t.c), pos(t.z)}, {pos(t.x)}}));
    n.addOutput("f", pos(t.f));
    n.addOutput("g", pos(t.g));
    n.addOutput("h", pos(t.h));
    return t;
}

TEST(PassesShareCubes, CommonCubeBecomesANode) {
    // abc appears in three cubes of three nodes: saves 3*(3-1) - 3 literals.
    SharedAbc t = sharedAbc();
    Network& n = t.n;
    const NodeId a = t.a, b = t.b, c = t.c, x = t.x, y = t.y, f = t.f;
    Network before = n;
    PassContext ctx;
    shareCubes(n, ShareCubesOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    NodeId k = 0;
    ASSERT_TRUE(findCover(n, cover({{pos(a), pos(b), pos(c)}}), k));
    EXPECT_EQ(n.node(f).cover, cover({{pos(k), pos(x)}, {pos(y)}}));
    EXPECT_EQ(net::measure(n).literals, 15u - 3u);
}

TEST(PassesCubes, InPlaceExtractionEditsCubesAsTheWorkspaceDoes) {
    // The same three nodes sharing a·b·c (from the test above), extracted in
    // place through the cube-literal index: the same result.
    SharedAbc t = sharedAbc();
    Network& n = t.n;
    const NodeId a = t.a, b = t.b, c = t.c, x = t.x, y = t.y, f = t.f;
    Network before = n;
    PassContext ctx;
    ShareCubesOptions o;
    o.inPlaceCubes = 1;
    shareCubes(n, o, ctx);
    EXPECT_EQ(ctx.stats.get("in-place"), 1);
    EXPECT_EQ(sameFunctions(before, n), "");
    NodeId k = 0;
    ASSERT_TRUE(findCover(n, cover({{pos(a), pos(b), pos(c)}}), k));
    EXPECT_EQ(n.node(f).cover, cover({{pos(k), pos(x)}, {pos(y)}}));
    EXPECT_EQ(net::measure(n).literals, 15u - 3u);
    EXPECT_GT(ctx.edits, 0u);
}

TEST(PassesCubes, InPlaceExtractionKeepsFunctionsAndTheDepthBound) {
    // Flat decoders (products of 6..9 literals over 24 inputs feeding 16
    // outputs): in place, every output keeps its function, the literals
    // fall by the saving reported, and no node gets deeper than the bound
    // unless it was already (the bound is the input's depth).
    for (std::uint32_t seed = 1; seed <= 3; ++seed) {
        std::mt19937 rng(seed);
        Network n;
        std::vector<NodeId> in;
        for (int i = 0; i < 24; ++i) in.push_back(n.addInput("i" + std::to_string(i)));
        std::vector<Cover> outs(16);
        for (int t = 0; t < 300; ++t) {
            std::vector<Literal> ls;
            std::vector<char> used(24, 0);
            const std::size_t len = 6 + rng() % 4;
            while (ls.size() < len) {
                const std::size_t i = rng() % 24;
                if (used[i]) continue;
                used[i] = 1;
                ls.push_back(makeLiteral(in[i], rng() & 1));
            }
            outs[rng() % 16].cubes.push_back(Cube(std::move(ls)));
        }
        for (Cover& f : outs) {
            f.normalize();
            n.addOutput("o" + std::to_string(n.outputs().size()), pos(n.addLogic(std::move(f))));
        }
        const Network before = n;
        const std::size_t depth = net::measure(n).depth;
        PassContext ctx;
        ctx.depthCap = depth;
        ShareCubesOptions o;
        o.inPlaceCubes = 1;
        shareCubes(n, o, ctx);
        EXPECT_EQ(sameFunctions(before, n), "") << seed;
        const auto m = net::measure(n);
        EXPECT_EQ(static_cast<long long>(net::measure(before).literals) - static_cast<long long>(m.literals),
                  ctx.stats.get("literals-saved") - ctx.stats.get("extracted"))
            << "each new node's literals are counted once in the saving, less its one gate";
        EXPECT_GT(ctx.stats.get("extracted"), 0) << seed;
        EXPECT_LE(m.depth, depth) << seed;
    }
}

TEST(PassesCubes, HoldersByLiteralPairsAreTheIntersections) {
    // F173: in place, the cubes holding each candidate are found in one
    // sweep over the cubes' literal pairs (each candidate filed under its
    // first two literals) instead of intersecting the index lists of its
    // literals per candidate. Both give the same holder sets, so the same
    // extractions in the same order: the same network, cover for cover.
    // F256: the same for the extraction that is not in place (inPlaceCubes 0,
    // as in the regions of a large network), whose holders are found the
    // same two ways.
    for (const std::size_t inPlace : {std::size_t{1}, std::size_t{0}})
    for (std::uint32_t seed = 1; seed <= 3; ++seed) {
        std::mt19937 rng(seed);
        Network n;
        std::vector<NodeId> in;
        for (int i = 0; i < 24; ++i) in.push_back(n.addInput("i" + std::to_string(i)));
        std::vector<Cover> outs(16);
        for (int t = 0; t < 300; ++t) {
            std::vector<Literal> ls;
            std::vector<char> used(24, 0);
            const std::size_t len = 6 + rng() % 4;
            while (ls.size() < len) {
                const std::size_t i = rng() % 24;
                if (used[i]) continue;
                used[i] = 1;
                ls.push_back(makeLiteral(in[i], rng() & 1));
            }
            outs[rng() % 16].cubes.push_back(Cube(std::move(ls)));
        }
        for (Cover& f : outs) {
            f.normalize();
            n.addOutput("o" + std::to_string(n.outputs().size()), pos(n.addLogic(std::move(f))));
        }
        const Network before = n;
        Network byPairs = n, byLists = n;
        ShareCubesOptions o;
        o.inPlaceCubes = inPlace;
        PassContext c1, c2;
        c1.depthCap = c2.depthCap = net::measure(n).depth;
        shareCubes(byPairs, o, c1);
        o.holdersByPairs = false;
        shareCubes(byLists, o, c2);
        EXPECT_EQ(c1.stats.get("in-place"), static_cast<long long>(inPlace)) << seed;
        EXPECT_GT(c1.stats.get("holders-by-pairs"), 0) << seed;
        EXPECT_EQ(c2.stats.get("holders-by-pairs"), 0) << seed;
        EXPECT_GT(c1.stats.get("extracted"), 0) << seed;
        EXPECT_EQ(c1.stats.get("literals-saved"), c2.stats.get("literals-saved")) << seed;
        ASSERT_EQ(byPairs.nodeCount(), byLists.nodeCount()) << seed;
        for (NodeId v = 0; v < byPairs.nodeCount(); ++v)
            EXPECT_EQ(byPairs.node(v).cover, byLists.node(v).cover) << seed << " node " << v;
        EXPECT_EQ(sameFunctions(before, byPairs), "") << seed;
    }
}

TEST(PassesReuse, DividesByAnExistingNode) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d");
    NodeId g = n.addLogic(cover({{pos(a)}, {pos(b)}}));
    NodeId f = n.addLogic(cover({{pos(a), pos(c)}, {pos(b), pos(c)}, {pos(d)}}));
    n.addOutput("g", pos(g));
    n.addOutput("f", pos(f));
    Network before = n;
    PassContext ctx;
    reuseNodes(n, ReuseOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(f).cover, cover({{pos(g), pos(c)}, {pos(d)}}));
    EXPECT_EQ(ctx.stats.get("substituted"), 1);
}

TEST(PassesReuse, DividesByAComplement) {
    // g = ab; f = a'c + b'c + e contains ¬g = a' + b'.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), e = n.addInput("e");
    NodeId g = n.addLogic(cover({{pos(a), pos(b)}}));
    NodeId f = n.addLogic(cover({{neg(a), pos(c)}, {neg(b), pos(c)}, {pos(e)}}));
    n.addOutput("g", pos(g));
    n.addOutput("f", pos(f));
    Network before = n;
    PassContext ctx;
    ReuseOptions plain;
    plain.complements = false;
    reuseNodes(n, plain, ctx);
    EXPECT_EQ(n.node(f).cover, before.node(f).cover) << "plain division cannot see ¬g";
    reuseNodes(n, ReuseOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(f).cover, cover({{neg(g), pos(c)}, {pos(e)}}));
    EXPECT_EQ(ctx.stats.get("via-complement"), 1);
}

// The candidate index files each node under two of its variables, those
// with the fewest readers (reuse_nodes.cpp, F143). Weak division of f by g
// needs only g's support inside f's (textbook algebraic division, from
// memory): here g's variables are one common and one rare input, and decoys
// that read a variable f does not read must not be tried.
TEST(PassesReuse, FindsDivisorsWhateverTheirVariablesReadership) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e");
    std::vector<NodeId> fill;
    for (int i = 0; i < 6; ++i) {   // make a and b read by many nodes
        NodeId x = n.addInput("x" + std::to_string(i));
        fill.push_back(n.addLogic(cover({{pos(a), pos(b), pos(x)}})));
        n.addOutput("y" + std::to_string(i), pos(fill.back()));
    }
    NodeId g = n.addLogic(cover({{pos(a)}, {pos(c)}}));            // a + c
    NodeId decoy = n.addLogic(cover({{pos(a)}, {pos(d)}}));        // a + d: f does not read d
    NodeId f = n.addLogic(cover({{pos(a), pos(e)}, {pos(c), pos(e)}, {pos(b)}}));   // (a + c)e + b
    n.addOutput("g", pos(g));
    n.addOutput("decoy", pos(decoy));
    n.addOutput("f", pos(f));
    Network before = n;
    PassContext ctx;
    reuseNodes(n, ReuseOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(f).cover, cover({{pos(g), pos(e)}, {pos(b)}}));
    EXPECT_EQ(n.node(decoy).cover, before.node(decoy).cover);
}

// A node rewritten in the pass is filed again under its new variables, so a
// later node reading them can be divided by it.
TEST(PassesReuse, ARewrittenNodeDividesLaterNodes) {
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"), e = n.addInput("e");
    NodeId g = n.addLogic(cover({{pos(a)}, {pos(b)}}));                      // a + b
    NodeId f1 = n.addLogic(cover({{pos(a), pos(c)}, {pos(b), pos(c)}}));     // (a + b)c -> g c
    NodeId h = n.addLogic(cover({{pos(g), pos(c), pos(e)}, {pos(d)}}));      // g c e + d -> f1 e + d
    n.addOutput("g", pos(g));
    n.addOutput("f1", pos(f1));
    n.addOutput("h", pos(h));
    Network before = n;
    PassContext ctx;
    reuseNodes(n, ReuseOptions{}, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(f1).cover, cover({{pos(g), pos(c)}}));
    EXPECT_EQ(n.node(h).cover, cover({{pos(f1), pos(e)}, {pos(d)}}));
}

// Observability don't-cares (K. A. Bartlett et al., IEEE TCAD 1988; Savoj
// and Brayton, DAC 1990 — from memory): in out = a·g with g = a⊕b, g is
// only observed when a = 1, where it equals ¬b; so g may become ¬b. Checked
// both with every input pattern simulated and through the SAT path.
TEST(PassesDontCares, UnobservedValuesAreFreed) {
    for (int exhaustive : {14, 0}) {
        Network n;
        NodeId a = n.addInput("a"), b = n.addInput("b");
        NodeId g = n.addLogic(cover({{pos(a), neg(b)}, {neg(a), pos(b)}}));
        NodeId out = n.addLogic(cover({{pos(a), pos(g)}}));
        n.addOutput("out", pos(out));
        const Network before = n;
        DontCareOptions o;
        o.exhaustiveInputs = exhaustive;
        PassContext ctx;
        minimiseWithDontCares(n, o, nullptr, ctx);
        EXPECT_EQ(sameFunctions(before, n), "");
        EXPECT_LE(n.node(g).cover.literalCount(), 1u) << "exhaustive up to " << exhaustive;
    }
}

// Satisfiability don't-cares (same sources): h = x⊕y reads x = a·b and
// y = a + b; the fanin value x = 1, y = 0 never occurs, and on the values
// that do occur h equals ¬x·y (2 literals instead of 4).
TEST(PassesDontCares, ImpossibleFaninValuesAreFreed) {
    for (int exhaustive : {14, 0}) {
        Network n;
        NodeId a = n.addInput("a"), b = n.addInput("b");
        NodeId x = n.addLogic(cover({{pos(a), pos(b)}}));
        NodeId y = n.addLogic(cover({{pos(a)}, {pos(b)}}));
        NodeId h = n.addLogic(cover({{pos(x), neg(y)}, {neg(x), pos(y)}}));
        n.addOutput("h", pos(h));
        n.addOutput("x", pos(x));
        n.addOutput("y", pos(y));
        const Network before = n;
        DontCareOptions o;
        o.exhaustiveInputs = exhaustive;
        PassContext ctx;
        minimiseWithDontCares(n, o, nullptr, ctx);
        EXPECT_EQ(sameFunctions(before, n), "");
        EXPECT_LE(n.node(h).cover.literalCount(), 2u) << "exhaustive up to " << exhaustive;
    }
}

// ---- Boolean resubstitution -------------------------------------------------
// Reference: Boolean resubstitution with don't-cares (A. Mishchenko et al.,
// FPGA 2009, from memory). Checks are on function: simulation against the
// input network, never on which divisor was picked.

TEST(PassesBooleanResub, ANodeEqualToAnExistingOneIsReplaced) {
    // y = a·b + a·c and z = a·(b + c) compute the same function with
    // different covers: algebraic division of y by z's cover finds nothing
    // (z's cover is one cube, a·t with t = b + c), Boolean resubstitution does.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    NodeId t = n.addLogic(cover({{pos(b)}, {pos(c)}}));
    NodeId z = n.addLogic(cover({{pos(a), pos(t)}}));
    NodeId y = n.addLogic(cover({{pos(a), pos(b)}, {pos(a), pos(c)}}));
    n.addOutput("y", pos(y));
    n.addOutput("z", pos(z));
    const Network input = n;
    PassContext ctx;
    resubstituteBoolean(n, BooleanResubOptions{}, ctx);
    EXPECT_EQ(sameFunctions(input, n), "");
    EXPECT_EQ(ctx.stats.get("replaced-by-one"), 1);
    EXPECT_LT(net::measure(n).literals, net::measure(input).literals);
}

TEST(PassesBooleanResub, ObservabilityDontCaresAllowATwoLiteralForm) {
    // y = a·b·c + a·b·d·c' feeds only o = y·c: where c = 0 no output
    // observes y, and where c = 1 it is a·b — so y may become the AND of
    // two existing nodes (a and b), which no algebraic method finds.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d");
    NodeId y = n.addLogic(cover({{pos(a), pos(b), pos(c)}, {pos(a), pos(b), pos(d), neg(c)}}));
    NodeId o = n.addLogic(cover({{pos(y), pos(c)}}));
    n.addOutput("o", pos(o));
    const Network input = n;
    PassContext ctx;
    resubstituteBoolean(n, BooleanResubOptions{}, ctx);
    EXPECT_EQ(sameFunctions(input, n), "");
    EXPECT_GE(ctx.stats.get("replaced-by-one") + ctx.stats.get("replaced-by-two"), 1);
    EXPECT_LT(net::measure(n).literals, net::measure(input).literals);
}

TEST(PassesBooleanResub, ManyInputsAreConfirmedBySatAndKeepFunctions) {
    // 24 inputs: random patterns propose, the SAT solver must confirm.
    long long refuted = 0, replaced = 0;
    for (std::uint32_t seed = 1; seed <= 3; ++seed) {
        Network n = randomNetwork(seed, 24, 60, 8, 4, 4);
        tidy(n);
        const Network input = n;
        PassContext ctx;
        BooleanResubOptions o;
        o.simulationWords = 2;   // few patterns: many proposals the solver must refute
        resubstituteBoolean(n, o, ctx);
        EXPECT_EQ(sameFunctions(input, n, 256), "") << "seed " << seed;
        EXPECT_GT(ctx.stats.get("sat-queries"), 0) << "seed " << seed;
        refuted += ctx.stats.get("refuted");
        replaced += ctx.stats.get("replaced-by-one") + ctx.stats.get("replaced-by-two");
    }
    EXPECT_GT(refuted, 0);    // the solver turned down proposals the patterns allowed
    EXPECT_GT(replaced, 0);   // and confirmed others
}

TEST(PassesBooleanResub, FewInputsAreExactAndKeepFunctions) {
    for (std::uint32_t seed = 1; seed <= 6; ++seed) {
        Network n = randomNetwork(seed + 40, 10, 120, 8, 4, 4);
        tidy(n);
        const Network input = n;
        PassContext ctx;
        resubstituteBoolean(n, BooleanResubOptions{}, ctx);
        EXPECT_EQ(sameFunctions(input, n), "") << "seed " << seed;
        EXPECT_LE(net::measure(n).literals, net::measure(input).literals);
    }
}

// ---- changed regions (PassContext::focus) ---------------------------------
// After the engine's opening a technique takes candidates only from the
// changed region and values them against the whole network (engine.cpp).

namespace {
std::vector<std::uint8_t> marking(const Network& n, std::initializer_list<NodeId> marked) {
    std::vector<std::uint8_t> m(n.nodeCount(), 0);
    for (NodeId v : marked) m[v] = 1;
    return m;
}
} // namespace

TEST(PassesChangedRegion, CubeFromTheRegionIsSharedWithNodesOutsideIt) {
    for (std::size_t inPlace : {std::size_t{0}, std::size_t{1}}) {
        ShareCubesOptions o;
        o.inPlaceCubes = inPlace;   // workspace path, then the indexed one
        {
            // Only f is in the region: a·b·c is found from f's cube and taken out of g and h too.
            SharedAbc t = sharedAbc();
            const Network before = t.n;
            const auto region = marking(t.n, {t.f});
            PassContext ctx;
            ctx.focus = &region;
            shareCubes(t.n, o, ctx);
            EXPECT_EQ(sameFunctions(before, t.n), "");
            NodeId k = 0;
            ASSERT_TRUE(findCover(t.n, cover({{pos(t.a), pos(t.b), pos(t.c)}}), k)) << inPlace;
            EXPECT_EQ(t.n.node(t.g).cover, cover({{pos(k), pos(t.y)}, {pos(t.z)}})) << inPlace;
            EXPECT_EQ(t.n.node(t.h).cover, cover({{pos(k), pos(t.z)}, {pos(t.x)}})) << inPlace;
        }
        {
            // An empty region: no candidate at all, the network is left as it is.
            SharedAbc t = sharedAbc();
            const Network before = t.n;
            const auto region = marking(t.n, {});
            PassContext ctx;
            ctx.focus = &region;
            shareCubes(t.n, o, ctx);
            EXPECT_EQ(ctx.edits, 0u) << inPlace;
            EXPECT_EQ(t.n.node(t.f).cover, before.node(t.f).cover) << inPlace;
        }
    }
}

TEST(PassesChangedRegion, DivisorFromTheRegionIsValuedOverEveryHolder) {
    // f = ac + ad + bc + bd, g = ae + be share a+b (the test above); only g is in the region.
    for (bool empty : {false, true}) {
        Network n;
        NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d"),
               e = n.addInput("e");
        NodeId f = n.addLogic(cover({{pos(a), pos(c)}, {pos(a), pos(d)}, {pos(b), pos(c)}, {pos(b), pos(d)}}));
        NodeId g = n.addLogic(cover({{pos(a), pos(e)}, {pos(b), pos(e)}}));
        n.addOutput("f", pos(f));
        n.addOutput("g", pos(g));
        const Network before = n;
        const auto region = empty ? marking(n, {}) : marking(n, {g});
        PassContext ctx;
        ctx.focus = &region;
        shareDivisors(n, ShareDivisorsOptions{}, ctx);
        EXPECT_EQ(sameFunctions(before, n), "");
        NodeId s = 0;
        if (empty) {
            EXPECT_EQ(ctx.edits, 0u);
            EXPECT_FALSE(findCover(n, cover({{pos(a)}, {pos(b)}}), s));
            continue;
        }
        ASSERT_TRUE(findCover(n, cover({{pos(a)}, {pos(b)}}), s));
        EXPECT_EQ(n.node(g).cover, cover({{pos(s), pos(e)}}));
        EXPECT_NE(n.node(f).cover, before.node(f).cover) << "f, outside the region, holds a+b too";
    }
}

TEST(PassesChangedRegion, ChangedNodeDividesNodesOutsideTheRegion) {
    // g = a + b changed (in the region); f = ac + bc + d, outside it, is divided by g.
    for (bool empty : {false, true}) {
        Network n;
        NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c"), d = n.addInput("d");
        NodeId g = n.addLogic(cover({{pos(a)}, {pos(b)}}));
        NodeId f = n.addLogic(cover({{pos(a), pos(c)}, {pos(b), pos(c)}, {pos(d)}}));
        n.addOutput("g", pos(g));
        n.addOutput("f", pos(f));
        const Network before = n;
        const auto region = empty ? marking(n, {}) : marking(n, {g});
        PassContext ctx;
        ctx.focus = &region;
        reuseNodes(n, ReuseOptions{}, ctx);
        EXPECT_EQ(sameFunctions(before, n), "");
        if (empty) EXPECT_EQ(n.node(f).cover, before.node(f).cover);
        else EXPECT_EQ(n.node(f).cover, cover({{pos(g), pos(c)}, {pos(d)}}));
    }
}

TEST(PassesChangedRegion, OnlyNodesInTheRegionAreMinimised) {
    // Two copies of ab + a'c + bc (the consensus term is redundant); only the second is in the region.
    Network n;
    NodeId a = n.addInput("a"), b = n.addInput("b"), c = n.addInput("c");
    const Cover redundant = cover({{pos(a), pos(b)}, {neg(a), pos(c)}, {pos(b), pos(c)}});
    NodeId g1 = n.addLogic(redundant), g2 = n.addLogic(redundant);
    n.addOutput("g1", pos(g1));
    n.addOutput("g2", pos(g2));
    const Network before = n;
    const auto region = marking(n, {g2});
    PassContext ctx;
    ctx.focus = &region;
    ShrinkOptions o;
    o.allowComplement = false;
    shrinkNodes(n, o, ctx);
    EXPECT_EQ(sameFunctions(before, n), "");
    EXPECT_EQ(n.node(g1).cover, redundant);
    EXPECT_EQ(n.node(g2).cover, cover({{pos(a), pos(b)}, {neg(a), pos(c)}}));
}
