// tidy.cpp — the clean-up pass `tidy`.
//
// Background. Sweeping a Boolean network — propagating constants, removing
// buffers and inverter pairs, deleting logic no output needs and merging
// structurally identical nodes — is the housekeeping step every multi-level
// optimiser runs between real transformations (it appears as such in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990, from memory).
//
// One walk in topological order does it all: each node's cover first gets
// the replacements already decided for its fanins (so chains of buffers and
// inverters collapse in one step), is simplified (constants, containment),
// and then either becomes a replacement itself (constant, single literal,
// same cover as an earlier node) or is recorded. Outputs take the
// replacements of their drivers; unreachable nodes are marked dead.
#include "kerf/passes/tidy.h"

#include "workspace.h"

#include <unordered_set>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;

namespace {

// Covers of more cubes are compared with the base before simplifying (below
// that, simplifying costs about as much as the comparison).
constexpr std::size_t kCompareCubes = 32;

void tidyImpl(net::Network& net, PassContext& ctx, const net::Network* base) {
    const std::size_t n = net.nodeCount();
    // repl[v]: the literal v's positive literal stands for (2v when kept).
    std::vector<Literal> repl(n);
    for (net::NodeId v = 0; v < n; ++v) repl[v] = makeLiteral(v, false);
    auto map = [&](Literal l) { return literalNegated(l) ? negateLiteral(repl[literalVar(l)]) : repl[literalVar(l)]; };
    // Kept nodes by cover (hash of the cover, equality on it): a kept
    // node's cover is final, so the set can look covers up in the network.
    // (A string key per node cost a copy of every cover on each call; the
    // engine tidies after every trial, F44.)
    const algebra::CoverHash coverHash;
    auto hashOf = [&](net::NodeId v) { return coverHash(net.node(v).cover); };
    auto sameCover = [&](net::NodeId a, net::NodeId b) { return net.node(a).cover == net.node(b).cover; };
    std::unordered_set<net::NodeId, decltype(hashOf), decltype(sameCover)> seen(1024, hashOf, sameCover);
    long constants = 0, buffers = 0, merged = 0, simplified = 0;
    for (net::NodeId v : net.topoOrder()) {
        Cover& cv = net.node(v).cover;
        bool changed = false;
        for (const Cube& c : cv.cubes) {
            for (Literal l : c.lits)
                if (map(l) != l) { changed = true; break; }
            if (changed) break;
        }
        std::size_t before = cv.literalCount(), cubesBefore = cv.cubes.size();
        if (changed) {
            Cover nc;
            nc.cubes.reserve(cv.cubes.size());
            for (const Cube& c : cv.cubes) {
                std::vector<Literal> ls;
                ls.reserve(c.lits.size());
                for (Literal l : c.lits) ls.push_back(map(l));
                nc.cubes.push_back(Cube(std::move(ls)));
            }
            cv = std::move(nc);
        }
        const bool known = !changed && base && cv.cubes.size() > kCompareCubes && v < base->nodeCount() &&
                           base->isLogic(v) && base->node(v).cover == cv;
        // Containment is quadratic in the cubes: very large covers get it
        // only when a substitution changed them.
        if (known) {}   // canonical already (tidied in the base)
        else if (changed || cv.cubes.size() <= 2000) detail::canonical(cv);
        else cv.normalize();
        if (!changed && (cv.literalCount() != before || cv.cubes.size() != cubesBefore)) ++simplified;
        if (cv.isZero()) { repl[v] = net::kFalse; ++constants; continue; }
        if (cv.isOne()) { repl[v] = net::kTrue; ++constants; continue; }
        if (cv.cubes.size() == 1 && cv.cubes[0].lits.size() == 1) {
            repl[v] = cv.cubes[0].lits[0];
            ++buffers;
            continue;
        }
        auto [it, fresh] = seen.insert(v);
        if (!fresh) {
            repl[v] = makeLiteral(*it, false);
            // Keep a hint when the survivor has none.
            if (net.node(*it).name.empty() && !net.node(v).name.empty())
                net.node(*it).name = net.node(v).name;
            ++merged;
        }
    }
    for (net::Output& o : net.outputs()) o.driver = map(o.driver);
    std::size_t dead = net.removeUnreachable();
    ctx.stats.add("constants", constants);
    ctx.stats.add("buffers", buffers);
    ctx.stats.add("merged", merged);
    ctx.stats.add("simplified", simplified);
    ctx.stats.add("dead", static_cast<long long>(dead));
}

} // namespace

void tidy(net::Network& net, PassContext& ctx) { tidyImpl(net, ctx, nullptr); }

void tidy(net::Network& net, PassContext& ctx, const net::Network& base) { tidyImpl(net, ctx, &base); }

void tidy(net::Network& net) {
    PassContext ctx;
    tidy(net, ctx);
}

} // namespace kerf::passes
