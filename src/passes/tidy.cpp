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

#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;

void tidy(net::Network& net, PassContext& ctx) {
    const std::size_t n = net.nodeCount();
    // repl[v]: the literal v's positive literal stands for (2v when kept).
    std::vector<Literal> repl(n);
    for (net::NodeId v = 0; v < n; ++v) repl[v] = makeLiteral(v, false);
    auto map = [&](Literal l) { return literalNegated(l) ? negateLiteral(repl[literalVar(l)]) : repl[literalVar(l)]; };
    std::unordered_map<std::string, net::NodeId> seen;
    long constants = 0, buffers = 0, merged = 0, simplified = 0;
    for (net::NodeId v : net.topoOrder()) {
        Cover& cv = net.node(v).cover;
        Cover nc;
        bool changed = false;
        for (const Cube& c : cv.cubes) {
            std::vector<Literal> ls;
            ls.reserve(c.lits.size());
            for (Literal l : c.lits) {
                Literal m = map(l);
                changed |= m != l;
                ls.push_back(m);
            }
            nc.cubes.push_back(Cube(std::move(ls)));
        }
        std::size_t before = cv.literalCount(), cubesBefore = cv.cubes.size();
        // Containment is quadratic in the cubes: very large covers get it
        // only when a substitution changed them.
        if (changed || nc.cubes.size() <= 2000) detail::canonical(nc);
        else nc.normalize();
        if (!changed && (nc.literalCount() != before || nc.cubes.size() != cubesBefore)) ++simplified;
        cv = std::move(nc);
        if (cv.isZero()) { repl[v] = net::kFalse; ++constants; continue; }
        if (cv.isOne()) { repl[v] = net::kTrue; ++constants; continue; }
        if (cv.cubes.size() == 1 && cv.cubes[0].lits.size() == 1) {
            repl[v] = cv.cubes[0].lits[0];
            ++buffers;
            continue;
        }
        auto [it, fresh] = seen.emplace(detail::coverKey(cv), v);
        if (!fresh) {
            repl[v] = makeLiteral(it->second, false);
            // Keep a hint when the survivor has none.
            if (net.node(it->second).name.empty() && !net.node(v).name.empty())
                net.node(it->second).name = net.node(v).name;
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

void tidy(net::Network& net) {
    PassContext ctx;
    tidy(net, ctx);
}

} // namespace kerf::passes
