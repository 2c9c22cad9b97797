// inline_small.cpp — dissolving nodes, the first half of `regroup` moves: collapse small nodes into
// their fanouts.
//
// Background. Eliminating a node (substituting its function into every
// fanout) undoes premature structure, e.g. the two-input gates of an
// and-inverter netlist, so that the algebraic passes see sums of products
// large enough to share divisors. A node's value is the literal count after
// minus before (its own literals plus its fanouts'); nodes are eliminated
// cheapest first while the value stays within a threshold, as in the
// elimination step surveyed in R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990
// (from memory). Caps on the cubes and literals of the resulting covers keep
// flattening from exploding (a product of sums multiplies out).
//
// Where a fanout reads the node complemented, the node's complement (two-level
// minimised, see twolevel.cpp) is substituted there.
#include "kerf/passes/inline_small.h"

#include "kerf/minimize/twolevel.h"
#include "workspace.h"

#include <algorithm>
#include <queue>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::literalVar;

namespace {

struct Evaluation {
    bool ok = false;
    long value = 0;
    std::vector<Cover> covers;   // new cover per fanout, in ws.fanouts(v) order
};

// Complements of node covers, computed once per cover (irredundant primes,
// no exact search: this runs for every evaluation).
class ComplementCache {
public:
    explicit ComplementCache(std::size_t capCubes) : capCubes_(capCubes) {}
    const Cover* get(const Cover& g, std::size_t cap) {
        std::string key = detail::coverKey(g);
        auto it = cache_.find(key);
        if (it == cache_.end()) {
            Entry e;
            if (g.cubes.size() == 1) {   // De Morgan
                for (auto l : g.cubes[0].lits) e.cover.cubes.push_back(Cube({algebra::negateLiteral(l)}));
                e.cover.normalize();
                e.ok = true;
            } else {
                minimize::MinimizeOptions mo;
                mo.exactVars = 0;
                e.ok = minimize::complementCover(g, e.cover, capCubes_, mo);
            }
            it = cache_.emplace(std::move(key), std::move(e)).first;
        }
        return it->second.ok && it->second.cover.cubes.size() <= cap ? &it->second.cover : nullptr;
    }

private:
    struct Entry { bool ok = false; Cover cover; };
    std::unordered_map<std::string, Entry> cache_;
    std::size_t capCubes_;
};

Evaluation evaluate(detail::Workspace& ws, net::NodeId v, const InlineOptions& opts, ComplementCache& cc) {
    Evaluation e;
    if (!ws.live(v) || ws.outputRefs(v) > 0) return e;
    const auto& fo = ws.fanouts(v);
    if (fo.empty() || fo.size() > opts.maxFanouts) return e;
    const Cover& g = ws.cover(v);
    bool needComp = false;
    for (net::NodeId f : fo) {
        if (ws.cover(f).cubes.size() > opts.maxCubes || detail::lits(ws.cover(f)) > opts.maxLiterals) return e;
        needComp |= detail::usesNegated(ws.cover(f), v);
    }
    const Cover* comp = nullptr;
    if (needComp && !(comp = cc.get(g, opts.maxCubes))) return e;
    long before = static_cast<long>(detail::lits(g)), after = 0;
    for (net::NodeId f : fo) {
        Cover nf = detail::collapseInto(ws.cover(f), v, g, comp);
        if (nf.cubes.size() > opts.maxCubes || detail::lits(nf) > opts.maxLiterals) return e;
        before += static_cast<long>(detail::lits(ws.cover(f)));
        after += static_cast<long>(detail::lits(nf));
        e.covers.push_back(std::move(nf));
    }
    e.ok = true;
    e.value = after - before;
    return e;
}

} // namespace

void inlineSmall(net::Network& net, const InlineOptions& opts, PassContext& ctx) {
    detail::Workspace ws(net, ctx);
    ComplementCache cc(opts.complementCubeCap);
    using Item = std::pair<long, net::NodeId>;
    std::priority_queue<Item, std::vector<Item>, std::greater<>> heap;
    // queued[v]: v has an entry in the heap. Nodes whose fanouts changed are
    // queued at their last value (or the threshold) and valued when taken,
    // not at once: a node read by a wide cover is touched by every node
    // collapsed into that cover, and valuing it each time made the pass
    // grow with the square of the cover's fanins.
    std::vector<std::uint8_t> queued(net.nodeCount(), 0);
    std::vector<long> lastValue(net.nodeCount(), opts.threshold);
    long evaluations = 0;
    for (net::NodeId v : net.topoOrder()) {
        if (!ctx.inFocus(v)) continue;   // changed region: only its nodes are dissolved first
        Evaluation e = evaluate(ws, v, opts, cc);
        ++evaluations;
        if (e.ok && e.value <= opts.threshold) {
            heap.push({e.value, v});
            queued[v] = 1;
            lastValue[v] = e.value;
        }
    }
    long collapsed = 0, rejected = 0, growth = 0;
    std::vector<std::uint8_t> blocked(net.nodeCount(), 0);
    while (!heap.empty()) {
        auto [value, v] = heap.top();
        heap.pop();
        if (v < queued.size()) queued[v] = 0;
        if (v < blocked.size() && blocked[v]) continue;
        Evaluation e = evaluate(ws, v, opts, cc);
        ++evaluations;
        if (!e.ok || e.value > opts.threshold) continue;
        if (e.value > value) {   // stale entry: requeue at its real value
            heap.push({e.value, v});
            queued[v] = 1;
            lastValue[v] = e.value;
            continue;
        }
        std::vector<net::NodeId> fo = ws.fanouts(v);
        ws.begin();
        for (std::size_t i = 0; i < fo.size(); ++i) ws.setCover(fo[i], std::move(e.covers[i]));
        ws.kill(v);
        if (!ws.commit()) {
            ++rejected;
            if (v >= blocked.size()) blocked.resize(net.nodeCount(), 0);
            blocked[v] = 1;
            continue;
        }
        ++collapsed;
        growth += e.value;
        // Re-value the fanouts and every fanin of theirs (their fanouts
        // changed): at once where the fanout's cover is small, when taken
        // from the heap where it is wide (see `queued`).
        std::vector<net::NodeId> touch, later;
        for (net::NodeId f : fo) {
            touch.push_back(f);
            auto& to = ws.cover(f).cubes.size() <= opts.revalueMaxCubes ? touch : later;
            for (const Cube& c : ws.cover(f).cubes)
                for (auto l : c.lits) to.push_back(literalVar(l));
        }
        std::sort(touch.begin(), touch.end());
        touch.erase(std::unique(touch.begin(), touch.end()), touch.end());
        std::sort(later.begin(), later.end());
        later.erase(std::unique(later.begin(), later.end()), later.end());
        if (queued.size() < net.nodeCount()) {
            queued.resize(net.nodeCount(), 0);
            lastValue.resize(net.nodeCount(), opts.threshold);
        }
        for (net::NodeId u : touch) {
            if (!ws.live(u) || (u < blocked.size() && blocked[u])) continue;
            Evaluation eu = evaluate(ws, u, opts, cc);
            ++evaluations;
            if (eu.ok && eu.value <= opts.threshold) {
                heap.push({eu.value, u});
                queued[u] = 1;
                lastValue[u] = eu.value;
            }
        }
        for (net::NodeId u : later) {
            if (!ws.live(u) || (u < blocked.size() && blocked[u]) || queued[u]) continue;
            heap.push({std::min<long>(lastValue[u], opts.threshold), u});
            queued[u] = 1;
        }
    }
    ctx.stats.add("collapsed", collapsed);
    ctx.stats.add("literal-growth", growth);
    ctx.stats.add("depth-rejects", rejected);
    ctx.stats.add("evaluations", evaluations);
}

} // namespace kerf::passes
