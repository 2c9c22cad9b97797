// passes_workspace_test.cpp — the incremental bookkeeping of the passes'
// Workspace (src/passes/workspace.cpp): after any sequence of kept or undone
// edits, every node's arrival equals a from-scratch recomputation
// (net::arrivalTimes) and the fanout lists match the covers.
//
// Reference for the arrival model: a balanced two-input tree built by
// merging the two earliest-arriving signals first (the Huffman-style
// construction; common trade practice), computed here with a priority queue
// independently of the counting method the workspace uses.
#include "../../src/passes/workspace.h"

#include "passes_support.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <queue>
#include <random>

using namespace kerf;
using namespace kerf::passes::testing;
namespace detail = kerf::passes::detail;

namespace {

std::size_t referenceMerge(const std::vector<std::size_t>& times) {
    if (times.empty()) return 0;
    std::priority_queue<std::size_t, std::vector<std::size_t>, std::greater<>> q(times.begin(), times.end());
    while (q.size() > 1) {
        const std::size_t a = q.top();
        q.pop();
        const std::size_t b = q.top();
        q.pop();
        q.push(std::max(a, b) + 1);
    }
    return q.top();
}

// Arrivals and fanouts kept by `ws` against a recomputation on its network.
void expectInStep(detail::Workspace& ws) {
    const net::Network& n = ws.net();
    const std::vector<std::size_t> at = net::arrivalTimes(n);
    for (NodeId v = 0; v < n.nodeCount(); ++v) {
        if (!n.isLogic(v)) continue;
        ASSERT_EQ(ws.arrival(v), at[v]) << "node " << v;
        for (NodeId u : n.node(v).cover.support()) {
            const auto& fo = ws.fanouts(u);
            EXPECT_EQ(std::count(fo.begin(), fo.end(), v), 1) << "node " << v << " reads " << u;
        }
    }
    for (NodeId u = 0; u < n.nodeCount(); ++u)
        for (NodeId g : ws.fanouts(u)) {
            ASSERT_TRUE(n.isLogic(g));
            const auto s = n.node(g).cover.support();
            EXPECT_TRUE(std::binary_search(s.begin(), s.end(), u)) << g << " listed as reading " << u;
        }
}

// A random cover over variables ranked below `limit` (reading only lower
// ranks keeps the network acyclic; rank[] is a topological numbering).
Cover randomCover(std::mt19937& rng, const net::Network& n, const std::vector<double>& rank, double limit,
                  std::size_t maxCubes) {
    std::vector<NodeId> vars;
    for (NodeId v = 1; v < n.nodeCount() && v < rank.size(); ++v)
        if ((n.node(v).kind == net::NodeKind::Input || n.isLogic(v)) && rank[v] < limit) vars.push_back(v);
    Cover f;
    const std::size_t cubes = 1 + rng() % maxCubes;
    for (std::size_t c = 0; c < cubes; ++c) {
        std::vector<Literal> ls;
        const std::size_t len = 1 + rng() % 6;
        for (std::size_t k = 0; k < len; ++k) ls.push_back(makeLiteral(vars[rng() % vars.size()], rng() % 2));
        Cube cube(std::move(ls));
        if (!cube.isContradictory()) f.cubes.push_back(std::move(cube));
    }
    if (f.cubes.empty()) f = Cover::literal(makeLiteral(vars[0], false));
    f.normalize();
    return f;
}

} // namespace

TEST(PassesWorkspace, BalancedArrivalMatchesPairwiseMerging) {
    std::mt19937 rng(3);
    for (int round = 0; round < 2000; ++round) {
        std::vector<std::size_t> times(rng() % 40);
        for (auto& t : times) t = rng() % (round % 2 ? 4 : 30);
        std::vector<std::uint32_t> hist;
        for (std::size_t t : times) {
            if (t >= hist.size()) hist.resize(t + 1, 0);
            ++hist[t];
        }
        const std::size_t expected = referenceMerge(times);
        EXPECT_EQ(detail::balancedArrival(hist), expected);
        std::vector<std::size_t> copy = times;
        EXPECT_EQ(detail::balancedArrival(copy.data(), copy.size()), expected);
    }
}

TEST(PassesWorkspace, ArrivalsAndFanoutsStayInStepWithTheCovers) {
    for (std::uint32_t seed = 1; seed <= 6; ++seed) {
        std::mt19937 rng(seed);
        net::Network n = randomNetwork(seed, 8, 40, 6, 12, 5);
        // Half the runs bound the depth, so some edits are undone by commit.
        const std::size_t cap = seed % 2 ? passes::kNoDepthCap : net::measure(n).depth;
        detail::Workspace ws(n, cap);
        expectInStep(ws);
        std::vector<double> rank(n.nodeCount());
        for (NodeId v = 0; v < n.nodeCount(); ++v) rank[v] = v;   // the generator reads earlier ids only
        std::size_t kept = 0, undone = 0;
        for (int step = 0; step < 150; ++step) {
            std::vector<NodeId> logic;
            for (NodeId v = 0; v < n.nodeCount(); ++v)
                if (n.isLogic(v)) logic.push_back(v);
            const NodeId v = logic[rng() % logic.size()];
            const net::Network before = n;
            ws.begin();
            switch (rng() % 4) {
            case 0: {   // swap one cube of v for a fresh one
                Cover f = ws.cover(v);
                f.cubes[rng() % f.cubes.size()] = randomCover(rng, n, rank, rank[v], 1).cubes[0];
                f.normalize();
                ws.setCover(v, std::move(f));
                break;
            }
            case 1: {   // a new node computing some cubes, read by v
                double below = -1;   // the new node ranks just under v
                for (double r : rank)
                    if (r < rank[v]) below = std::max(below, r);
                const NodeId d = ws.addNode(randomCover(rng, n, rank, rank[v], 3));
                rank.resize(n.nodeCount(), 0);
                rank[d] = (below + rank[v]) / 2;
                Cover f = ws.cover(v);
                f.cubes.push_back(Cube({makeLiteral(d, rng() % 2)}));
                f.normalize();
                ws.setCover(v, std::move(f));
                break;
            }
            case 2:   // replace v's cover entirely
                ws.setCover(v, randomCover(rng, n, rank, rank[v], 8));
                break;
            default: {   // two edits in one step, the second reading the first
                Cover f = ws.cover(v);
                if (f.cubes.size() > 1) f.cubes.pop_back();
                ws.setCover(v, std::move(f));
                const auto& fo = ws.fanouts(v);
                if (!fo.empty()) {
                    const NodeId g = fo[rng() % fo.size()];
                    Cover h = ws.cover(g);
                    h.cubes.push_back(Cube({makeLiteral(v, false), makeLiteral(1, true)}));
                    h.normalize();
                    ws.setCover(g, std::move(h));
                }
            }
            }
            rank.resize(n.nodeCount(), 0);
            if (ws.commit()) {
                ++kept;
            } else {
                ++undone;
                for (NodeId u = 0; u < before.nodeCount(); ++u)
                    ASSERT_EQ(n.node(u).cover, before.node(u).cover) << "undo left node " << u << " changed";
            }
            ASSERT_NO_FATAL_FAILURE(expectInStep(ws)) << "seed " << seed << " step " << step;
        }
        EXPECT_GT(kept, 0u);
        if (cap != passes::kNoDepthCap) EXPECT_GT(undone, 0u) << "seed " << seed;
    }
}

TEST(PassesWorkspace, SwappingACubeOfALargeCoverTimesOnlyTheSwappedCubes) {
    // 2000 cubes over 16 inputs: replacing one cube must not re-time the rest.
    std::mt19937 rng(11);
    net::Network n;
    std::vector<NodeId> in;
    for (int i = 0; i < 16; ++i) in.push_back(n.addInput("a" + std::to_string(i)));
    Cover big;
    for (int c = 0; c < 2000; ++c) {
        std::vector<Literal> ls;
        for (int k = 0; k < 8; ++k) ls.push_back(makeLiteral(in[rng() % 16], false));
        big.cubes.push_back(Cube(std::move(ls)));
    }
    big.normalize();
    const NodeId v = n.addLogic(big);
    n.addOutput("y", makeLiteral(v, false));
    detail::Workspace ws(n, passes::kNoDepthCap);
    // The first commit on a node builds its record in full; later ones do not.
    ws.begin();
    Cover f = ws.cover(v);
    f.cubes.pop_back();
    ws.setCover(v, std::move(f));
    ASSERT_TRUE(ws.commit());
    const std::size_t afterFirst = ws.cubesTimed();
    for (int k = 0; k < 20; ++k) {
        ws.begin();
        const NodeId d = ws.addNode(Cover{{Cube({makeLiteral(in[0], false), makeLiteral(in[1], false)})}});
        Cover g = ws.cover(v);
        g.cubes[static_cast<std::size_t>(k)] = Cube({makeLiteral(d, false), makeLiteral(in[2 + k % 14], false)});
        g.normalize();
        ws.setCover(v, std::move(g));
        ASSERT_TRUE(ws.commit());
    }
    // Each step: the new node's cube, one cube out and one in (well under the cover's size).
    EXPECT_LE(ws.cubesTimed() - afterFirst, 20u * 4u);
    expectInStep(ws);
}
