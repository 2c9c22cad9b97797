// shrink_nodes.cpp — the technique of the `minimise-nodes` move: two-level minimisation of
// every node, taking the complement when its cover is cheaper.
//
// Background. Treating each node of a multi-level network as a two-level
// function and minimising it on its own (node simplification in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990, from memory)
// uses the minimisers of R. K. Brayton et al., "Logic Minimization
// Algorithms for VLSI Synthesis", Kluwer 1984 (from memory); see
// twolevel.cpp for the minimiser itself. Since inverters cost nothing here,
// a node may hold the cheaper of f and ¬f: when ¬f is cheaper, the node is
// complemented and every literal that reads it (fanout cubes and output
// drivers) is flipped, which leaves every other function unchanged.
#include "kerf/passes/shrink_nodes.h"

#include "workspace.h"

namespace kerf::passes {

using algebra::Cover;

void shrinkNodes(net::Network& net, const ShrinkOptions& opts, PassContext& ctx, ShrinkMemo* memo) {
    detail::Workspace ws(net, ctx);
    long shrunk = 0, complemented = 0, saved = 0, rejected = 0, remembered = 0, recalled = 0;
    for (net::NodeId v : net.topoOrder()) {
        if (!ws.live(v) || !ctx.inFocus(v)) continue;   // changed region: a node's own cover only
        const Cover& cv = ws.cover(v);
        std::size_t before = detail::lits(cv);
        if (before <= 1) continue;
        // One cube without a variable in both polarities is its own minimum:
        // no sum of products of the function has fewer literals, and its
        // complement (one literal per cube) has as many in more cubes. Most
        // nodes cube extraction creates are such cubes (134,000 on the 100k
        // decoder), each once minimised and then hashed by every trial (F257).
        if (cv.cubes.size() == 1) {
            const auto& ls = cv.cubes[0].lits;
            bool clash = false;
            for (std::size_t k = 1; k < ls.size() && !clash; ++k)
                clash = algebra::literalVar(ls[k]) == algebra::literalVar(ls[k - 1]);
            if (!clash) continue;
        }
        // Very large covers over many variables: nothing but containment would
        // run on them, and that is quadratic; leave them alone.
        if (cv.cubes.size() > 4 * opts.minimize.maxHeuristicCubes && cv.support().size() > 16) continue;
        const bool read = !ws.fanouts(v).empty() || ws.outputRefs(v) > 0;
        const std::uint64_t key = memo ? algebra::CoverHash{}(cv) : 0;
        if (memo && read && memo->minimal.count(key)) { ++remembered; continue; }
        Cover best;
        bool flip = false;
        const ShrinkMemo::Found* known = nullptr;
        if (memo && read) {
            auto it = memo->found.find(cv);
            if (it != memo->found.end()) known = &it->second;
        }
        if (known) {
            best = known->cover;
            flip = known->flip;
            ++recalled;
        } else {
            best = minimize::minimizeCover(cv, opts.minimize);
            // A cover of more cubes than the heuristic minimiser takes
            // (minimise-heuristic-cubes) gets containment only, and no
            // complement either: its complement, of up to four times as many
            // cubes, would need the expansion that limit rules out. On the
            // 100k decoder the 256 output covers (200-800 cubes, changed by
            // every kept move) were complemented in every trial, about 1.4
            // CPU s each, never once cheaper (F296).
            if (opts.allowComplement && read && cv.cubes.size() <= opts.minimize.maxHeuristicCubes) {
                Cover comp;
                if (minimize::complementCover(cv, comp, 4 * cv.cubes.size() + 16, opts.minimize)) {
                    std::size_t lc = detail::lits(comp), lb = detail::lits(best);
                    if (lc < lb || (lc == lb && comp.cubes.size() < best.cubes.size())) {
                        best = std::move(comp);
                        flip = true;
                    }
                }
            }
        }
        std::size_t after = detail::lits(best);
        bool better = after < before || (after == before && best.cubes.size() < cv.cubes.size());
        if (!better) {
            if (memo && read) memo->minimal.insert(key);
            continue;
        }
        if (memo && read && !known) memo->found.emplace(cv, ShrinkMemo::Found{best, flip});
        ws.begin();
        if (flip) {
            ws.flipNode(v, std::move(best));
        } else {
            ws.setCover(v, std::move(best));
        }
        if (!ws.commit()) { ++rejected; continue; }
        if (flip) net.node(v).name.clear();   // the hint named the old polarity
        ++shrunk;
        complemented += flip;
        saved += static_cast<long>(before) - static_cast<long>(after);
    }
    ctx.stats.add("shrunk", shrunk);
    ctx.stats.add("complemented", complemented);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("depth-rejects", rejected);
    if (remembered) ctx.stats.add("known-minimal", remembered);
    if (recalled) ctx.stats.add("known-result", recalled);
}

} // namespace kerf::passes
