// reuse_nodes.cpp — the technique of the `resubstitute` move: algebraic resubstitution.
//
// Background. A node f may already contain, algebraically, the function of
// another node g: f = q·g + r by weak division of f's cover by g's. Then g's
// literal can replace those cubes. Trying g's complement as a divisor too
// (f = q·¬g + r, where ¬g's cover comes from two-level complementation)
// finds more. This is algebraic resubstitution as surveyed in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 (from memory).
//
// Candidates for f are nodes whose support lies inside f's (otherwise the
// algebraic quotient is empty); such a g can never depend on f, so no cycle
// appears. The division saving the most literals is kept, and f is tried
// again until nothing saves.
#include "kerf/passes/reuse_nodes.h"

#include "kerf/minimize/twolevel.h"
#include "workspace.h"

#include <algorithm>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalVar;
using algebra::makeLiteral;

namespace {

bool divideInto(const Cover& f, const Cover& d, Literal lit, Cover& out) {
    if (d.isZero() || d.isOne()) return false;
    algebra::Division dv = d.cubes.size() == 1 ? algebra::divideByCube(f, d.cubes[0]) : algebra::divide(f, d);
    if (dv.quotient.isZero()) return false;
    out = algebra::add(algebra::multiply(dv.quotient, Cover::literal(lit)), dv.remainder);
    out.normalize();   // no containment can appear (see detail::rewriteWith)
    return true;
}

std::vector<std::uint32_t> varsOf(const Cover& f) {
    std::vector<std::uint32_t> s;
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits) s.push_back(literalVar(l));
    std::sort(s.begin(), s.end());
    s.erase(std::unique(s.begin(), s.end()), s.end());
    return s;
}

} // namespace

void reuseNodes(net::Network& net, const ReuseOptions& opts, PassContext& ctx) {
    detail::Workspace ws(net, ctx);
    std::unordered_map<std::string, std::pair<bool, Cover>> compCache;
    auto complementOf = [&](const Cover& g) -> const std::pair<bool, Cover>& {
        std::string key = detail::coverKey(g);
        auto it = compCache.find(key);
        if (it != compCache.end()) return it->second;
        Cover c;
        bool ok = minimize::complementCover(g, c, opts.complementCubeCap);
        return compCache.emplace(std::move(key), std::make_pair(ok, std::move(c))).first->second;
    };
    long scanCut = 0;
    long substituted = 0, viaComplement = 0, saved = 0, rejected = 0, divisions = 0;
    std::vector<std::uint32_t> count(net.nodeCount(), 0);
    // Support size per node (only the node being rewritten changes in this pass).
    std::vector<std::int64_t> suppSize(net.nodeCount(), -1);
    auto supportSize = [&](net::NodeId g) {
        if (suppSize[g] < 0) suppSize[g] = static_cast<std::int64_t>(varsOf(ws.cover(g)).size());
        return static_cast<std::size_t>(suppSize[g]);
    };
    // Literal count per node, kept like the support size: candidates are
    // filtered and ranked by it, and on a large network one node's candidate
    // scan meets thousands of nodes (counting their literals each time was
    // most of this technique's time on the 100k decoder, F44).
    std::vector<std::int64_t> litCount(net.nodeCount(), -1);
    auto litsOf = [&](net::NodeId g) {
        if (litCount[g] < 0) litCount[g] = static_cast<std::int64_t>(detail::lits(ws.cover(g)));
        return static_cast<std::size_t>(litCount[g]);
    };
    // Changed region: the nodes divided are the marked ones and those a
    // marked node g can divide (their support holds g's, so they read g's
    // fanin with the fewest readers).
    std::vector<std::uint8_t> target;
    if (ctx.focus) {
        target.assign(net.nodeCount(), 0);
        for (net::NodeId g : net.topoOrder()) {
            if (!ctx.inFocus(g)) continue;
            target[g] = 1;
            const Cover& G = ws.cover(g);
            if (detail::lits(G) < 2 || G.cubes.size() > opts.maxCubes) continue;
            const std::vector<net::NodeId>* fewest = nullptr;
            for (std::uint32_t u : varsOf(G))
                if (!fewest || ws.fanouts(u).size() < fewest->size()) fewest = &ws.fanouts(u);
            if (fewest && fewest->size() <= opts.fanoutScanLimit)
                for (net::NodeId f : *fewest) target[f] = 1;
        }
    }
    for (net::NodeId f : net.topoOrder()) {
        if (ctx.focus && (f >= target.size() || !target[f])) continue;
        for (int attempt = 0; attempt < 8; ++attempt) {
            if (!ws.live(f)) break;
            const Cover F = ws.cover(f);
            if (detail::lits(F) < 3 || F.cubes.size() > opts.maxCubes) break;
            std::vector<std::uint32_t> supp = varsOf(F);
            // Nodes whose whole support lies in supp.
            if (count.size() < net.nodeCount()) count.resize(net.nodeCount(), 0);
            std::vector<net::NodeId> seen;
            for (std::uint32_t u : supp) {
                const auto& fo = ws.fanouts(u);
                if (fo.size() > opts.fanoutScanLimit) { ++scanCut; continue; }
                for (net::NodeId g : fo) {
                    if (g == f || !ws.live(g)) continue;
                    if (count[g]++ == 0) seen.push_back(g);
                }
            }
            std::vector<net::NodeId> cands;
            for (net::NodeId g : seen) {
                if (count[g] == supportSize(g) && litsOf(g) >= 2 && ws.cover(g).cubes.size() <= opts.maxCubes)
                    cands.push_back(g);
            }
            for (net::NodeId g : seen) count[g] = 0;
            if (cands.size() > opts.maxCandidates) {
                std::partial_sort(cands.begin(), cands.begin() + static_cast<std::ptrdiff_t>(opts.maxCandidates),
                                  cands.end(), [&](net::NodeId a, net::NodeId b) { return litsOf(a) > litsOf(b); });
                cands.resize(opts.maxCandidates);
            }
            struct Option { long saving; Cover cover; bool comp; };
            std::vector<Option> options;
            const long before = static_cast<long>(detail::lits(F));
            for (net::NodeId g : cands) {
                Cover out;
                ++divisions;
                if (divideInto(F, ws.cover(g), makeLiteral(g, false), out)) {
                    long s = before - static_cast<long>(detail::lits(out));
                    if (s > 0) options.push_back({s, std::move(out), false});
                }
                if (opts.complements) {
                    const auto& [ok, comp] = complementOf(ws.cover(g));
                    ++divisions;
                    if (ok && divideInto(F, comp, makeLiteral(g, true), out)) {
                        long s = before - static_cast<long>(detail::lits(out));
                        if (s > 0) options.push_back({s, std::move(out), true});
                    }
                }
            }
            if (options.empty()) break;
            std::stable_sort(options.begin(), options.end(),
                             [](const Option& a, const Option& b) { return a.saving > b.saving; });
            bool done = false;
            for (std::size_t i = 0; i < options.size() && i < 4 && !done; ++i) {
                ws.begin();
                ws.setCover(f, options[i].cover);
                if (ws.commit()) {
                    suppSize[f] = -1;
                    litCount[f] = -1;
                    done = true;
                    ++substituted;
                    viaComplement += options[i].comp;
                    saved += options[i].saving;
                } else {
                    ++rejected;
                }
            }
            if (!done) break;
        }
    }
    ctx.stats.add("substituted", substituted);
    ctx.stats.add("via-complement", viaComplement);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("divisions", divisions);
    ctx.stats.add("depth-rejects", rejected);
    if (scanCut) ctx.stats.add("limit-hit:resub-fanout-scan", scanCut);
}

} // namespace kerf::passes
