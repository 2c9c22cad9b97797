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
//
// Finding the candidates. Walking the readers of every variable f reads
// met each node once per variable it shares with f, and on a large network
// an input's readers number in the thousands (on the generated decoders the
// technique grew as n^2.4 between 10k and 30k terms, F44). Instead every
// node g is filed once under a key of two of its variables, the two with
// the fewest readers when it is filed; g can divide f only when both lie in
// f's support, so f looks only at the keys made of two of its variables
// (for each variable u of f, the partners filed with u, kept as a short
// list) and checks the whole support of the nodes found there. Candidates
// are then taken in the order of their node ids, so ties between equal
// savings do not depend on how the index was built.
#include "kerf/passes/reuse_nodes.h"

#include "kerf/minimize/twolevel.h"
#include "workspace.h"

#include <algorithm>
#include <span>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalVar;
using algebra::makeLiteral;

namespace {

bool sortedStrictly(const Cover& f) {
    for (std::size_t i = 1; i < f.cubes.size(); ++i)
        if (!(f.cubes[i - 1] < f.cubes[i])) return false;
    return true;
}

// Whether every cube of d lies in some cube of f (indexed by fi): without
// that the weak quotient is empty. Most candidates fail here, on a literal
// of d that f lacks or on the few cubes holding d's rarest literal, at a
// fraction of a division's cost (a division copies f into its remainder).
bool mayDivide(const algebra::CoverIndex& fi, const Cover& d) {
    const Cover& f = fi.cover();
    for (const Cube& c : d.cubes) {
        if (c.lits.empty()) continue;
        std::span<const std::uint32_t> rarest = fi.cubesWith(c.lits[0]);
        for (std::size_t k = 1; k < c.lits.size() && !rarest.empty(); ++k) {
            auto s = fi.cubesWith(c.lits[k]);
            if (s.size() < rarest.size()) rarest = s;
        }
        bool held = false;
        for (std::uint32_t j : rarest)
            if (f.cubes[j].hasAllOf(c)) { held = true; break; }
        if (!held) return false;
    }
    return true;
}

// f (indexed by fi, normalised) rewritten as q·lit + r with the weak
// division of f by d (normalised); false when the quotient is empty.
bool divideInto(const algebra::CoverIndex& fi, const Cover& d, Literal lit, Cover& out) {
    if (d.isZero() || d.isOne() || !mayDivide(fi, d)) return false;
    algebra::Division dv = algebra::divide(fi, d);
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
    // Complements of divisor nodes, per node (only the node being rewritten changes in this pass).
    std::vector<std::uint8_t> compKnown(net.nodeCount(), 0), compOk(net.nodeCount(), 0);
    std::vector<Cover> comps(net.nodeCount());
    auto complementOf = [&](net::NodeId g) -> const Cover* {
        if (!compKnown[g]) {
            Cover c;
            compOk[g] = minimize::complementCover(ws.cover(g), c, opts.complementCubeCap);
            if (!sortedStrictly(c)) c.normalize();
            comps[g] = std::move(c);
            compKnown[g] = 1;
        }
        return compOk[g] ? &comps[g] : nullptr;
    };
    auto normalised = [](const Cover& c, Cover& tmp) -> const Cover& {
        if (sortedStrictly(c)) return c;
        tmp = c;
        tmp.normalize();
        return tmp;
    };
    long scanCut = 0;
    long substituted = 0, viaComplement = 0, saved = 0, rejected = 0, divisions = 0, met = 0;
    // Support per node (only the node being rewritten changes in this pass).
    std::vector<std::vector<std::uint32_t>> supports(net.nodeCount());
    std::vector<std::uint8_t> suppValid(net.nodeCount(), 0);
    auto supportOf = [&](net::NodeId g) -> const std::vector<std::uint32_t>& {
        if (!suppValid[g]) {
            supports[g] = varsOf(ws.cover(g));
            suppValid[g] = 1;
        }
        return supports[g];
    };
    // Literal count per node, kept like the support: candidates are
    // filtered and ranked by it (counting their literals each time was
    // most of this technique's time on the 100k decoder, F44).
    std::vector<std::int64_t> litCount(net.nodeCount(), -1);
    auto litsOf = [&](net::NodeId g) {
        if (litCount[g] < 0) litCount[g] = static_cast<std::int64_t>(detail::lits(ws.cover(g)));
        return static_cast<std::size_t>(litCount[g]);
    };
    // The candidate index (see the top of this file): node -> key (first,
    // second variable), key -> nodes, first variable -> its partners.
    auto packKey = [](std::uint32_t a, std::uint32_t b) { return (static_cast<std::uint64_t>(a) << 32) | b; };
    std::unordered_map<std::uint64_t, std::vector<net::NodeId>> filed;
    std::vector<std::vector<std::uint32_t>> partners(net.nodeCount());
    std::vector<std::uint64_t> keyOf(net.nodeCount(), 0);
    std::vector<std::uint8_t> isFiled(net.nodeCount(), 0);
    auto divisorShape = [&](net::NodeId g) {
        return ws.live(g) && litsOf(g) >= 2 && ws.cover(g).cubes.size() <= opts.maxCubes && supportOf(g).size() >= 2;
    };
    auto file = [&](net::NodeId g) {
        if (!divisorShape(g)) return;
        const auto& sg = supportOf(g);
        std::uint32_t a = sg[0], b = sg[1];
        auto rarer = [&](std::uint32_t x, std::uint32_t y) {
            const std::size_t fx = ws.fanouts(x).size(), fy = ws.fanouts(y).size();
            return fx != fy ? fx < fy : x < y;
        };
        if (rarer(b, a)) std::swap(a, b);
        for (std::size_t i = 2; i < sg.size(); ++i) {
            if (rarer(sg[i], a)) { b = a; a = sg[i]; }
            else if (rarer(sg[i], b)) b = sg[i];
        }
        const std::uint64_t k = packKey(a, b);
        auto& list = filed[k];
        if (list.empty()) {
            auto& p = partners[a];
            if (std::find(p.begin(), p.end(), b) == p.end()) p.push_back(b);
        }
        list.push_back(g);
        keyOf[g] = k;
        isFiled[g] = 1;
    };
    auto unfile = [&](net::NodeId g) {
        if (!isFiled[g]) return;
        auto& list = filed[keyOf[g]];
        auto it = std::find(list.begin(), list.end(), g);
        if (it != list.end()) { *it = list.back(); list.pop_back(); }
        isFiled[g] = 0;
    };
    for (net::NodeId g = 0; g < net.nodeCount(); ++g) file(g);
    std::vector<std::uint8_t> inSupp(net.nodeCount(), 0);
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
            const std::vector<std::uint32_t> supp = supportOf(f);
            // Nodes whose whole support lies in supp, none of whose variables
            // has more than fanoutScanLimit readers.
            for (std::uint32_t u : supp) inSupp[u] = 1;
            std::vector<net::NodeId> cands;
            bool cutHere = false;
            for (std::uint32_t a : supp) {
                for (std::uint32_t b : partners[a]) {
                    if (!inSupp[b]) continue;
                    auto it = filed.find(packKey(a, b));
                    if (it == filed.end()) continue;
                    for (net::NodeId g : it->second) {
                        if (g == f) continue;
                        ++met;
                        const auto& sg = supportOf(g);
                        bool inside = true, wide = false;
                        for (std::uint32_t u : sg) {
                            if (!inSupp[u]) { inside = false; break; }
                            if (ws.fanouts(u).size() > opts.fanoutScanLimit) wide = true;
                        }
                        if (!inside) continue;
                        if (wide) { cutHere = true; continue; }
                        cands.push_back(g);
                    }
                }
            }
            for (std::uint32_t u : supp) inSupp[u] = 0;
            scanCut += cutHere;
            std::sort(cands.begin(), cands.end());
            if (cands.size() > opts.maxCandidates) {
                std::stable_sort(cands.begin(), cands.end(),
                                 [&](net::NodeId a, net::NodeId b) { return litsOf(a) > litsOf(b); });
                cands.resize(opts.maxCandidates);
                std::sort(cands.begin(), cands.end());
            }
            struct Option { long saving; Cover cover; bool comp; };
            std::vector<Option> options;
            const long before = static_cast<long>(detail::lits(F));
            Cover fTmp, gTmp;
            const algebra::CoverIndex fi(normalised(F, fTmp));
            for (net::NodeId g : cands) {
                Cover out;
                ++divisions;
                if (divideInto(fi, normalised(ws.cover(g), gTmp), makeLiteral(g, false), out)) {
                    long s = before - static_cast<long>(detail::lits(out));
                    if (s > 0) options.push_back({s, std::move(out), false});
                }
                if (opts.complements) {
                    const Cover* comp = complementOf(g);
                    ++divisions;
                    if (comp && divideInto(fi, *comp, makeLiteral(g, true), out)) {
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
                    unfile(f);
                    suppValid[f] = 0;
                    compKnown[f] = 0;
                    litCount[f] = -1;
                    file(f);
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
    ctx.stats.add("candidates-met", met);
    if (scanCut) ctx.stats.add("limit-hit:resub-fanout-scan", scanCut);
}

} // namespace kerf::passes
