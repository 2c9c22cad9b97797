// share_cubes.cpp — the technique of the `extract-cubes` move: extract cubes common to several
// cubes of the network.
//
// Background. A cube that divides many cubes (in one node or across nodes)
// is computed once as a new node: with the cube I found in k cubes, the
// network saves k·(|I|−1) − |I| literals. Finding common cubes is the
// rectangle-covering view of the cube–literal matrix of the survey
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 (from memory). Here the
// candidate cubes are the intersections of pairs of cubes that share at
// least two literals (every prime rectangle's row set starts from such a
// pair); each candidate is valued against the current network when it is
// taken (lazy greedy), so earlier extractions are accounted for.
#include "kerf/passes/share_cubes.h"

#include "workspace.h"

#include <algorithm>
#include <queue>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalVar;

namespace {

// Saving of extracting cube I now (in two-input gates), the nodes it applies
// to, and a provider (a node whose cover is exactly I). `work` counts cubes looked at.
long valueOf(detail::Workspace& ws, const Cube& I, const std::vector<net::NodeId>* nodes,
             std::vector<net::NodeId>& targets, net::NodeId& provider, long& work) {
    targets.clear();
    provider = 0;
    // Scan the given nodes, or the fanouts of the variable with the fewest.
    const std::vector<net::NodeId>* fewest = nodes;
    for (Literal l : I.lits) {
        if (nodes) break;
        const auto& fo = ws.fanouts(literalVar(l));
        if (!fewest || fo.size() < fewest->size()) fewest = &fo;
    }
    long count = 0;
    for (net::NodeId f : *fewest) {
        if (!ws.live(f)) continue;
        const Cover& F = ws.cover(f);
        work += static_cast<long>(F.cubes.size());
        if (F.cubes.size() == 1 && F.cubes[0] == I) { provider = f; continue; }
        long k = 0;
        for (const Cube& c : F.cubes)
            if (c.hasAllOf(I)) ++k;
        if (k) { count += k; targets.push_back(f); }
    }
    long w = static_cast<long>(I.lits.size()) - 1;
    return count * w - (provider ? 0 : static_cast<long>(I.lits.size()) - 1);
}

// Indexed cubes holding every literal of I (sorted occurrence lists).
std::vector<std::uint32_t> indexedCubes(const Cube& I, std::unordered_map<Literal, std::vector<std::uint32_t>>& occ) {
    std::vector<std::uint32_t> acc = occ[I.lits[0]];
    for (std::size_t k = 1; k < I.lits.size() && !acc.empty(); ++k) {
        const auto& o = occ[I.lits[k]];
        std::vector<std::uint32_t> next;
        std::set_intersection(acc.begin(), acc.end(), o.begin(), o.end(), std::back_inserter(next));
        acc.swap(next);
    }
    return acc;
}

} // namespace

void shareCubes(net::Network& net, const ShareCubesOptions& opts, PassContext& ctx) {
    detail::Workspace ws(net, ctx);
    long extracted = 0, reused = 0, saved = 0, candidates = 0, work = 0;
    bool exhausted = false;
    for (int round = 0; round < opts.rounds; ++round) {
        // Every cube of the network with an index by literal.
        struct Ref { net::NodeId node; std::size_t cube; };
        std::vector<Ref> refs;
        std::unordered_map<Literal, std::vector<std::uint32_t>> occ;
        for (net::NodeId f : net.topoOrder()) {
            const Cover& F = ws.cover(f);
            for (std::size_t i = 0; i < F.cubes.size(); ++i) {
                if (F.cubes[i].lits.size() < opts.minLiterals) continue;
                auto id = static_cast<std::uint32_t>(refs.size());
                refs.push_back({f, i});
                for (Literal l : F.cubes[i].lits) occ[l].push_back(id);
            }
        }
        // Candidate cubes: intersections of cube pairs sharing ≥ minLiterals literals.
        std::unordered_map<std::string, std::pair<Cube, long>> cand;   // cube, pairs giving it
        std::unordered_map<std::uint32_t, std::uint32_t> shared;
        for (std::uint32_t i = 0; i < refs.size(); ++i) {
            const Cube& c = ws.cover(refs[i].node).cubes[refs[i].cube];
            shared.clear();
            std::size_t scanned = 0;
            for (Literal l : c.lits) {
                // Occurrence lists are sorted: start past i (skipping the
                // earlier cubes one by one made this quadratic in the cubes).
                const auto& o = occ[l];
                for (auto it = std::upper_bound(o.begin(), o.end(), i); it != o.end(); ++it) {
                    ++shared[*it];
                    if (++scanned > 4 * opts.partnersPerCube) break;
                }
            }
            std::size_t partners = 0;
            for (auto [j, n] : shared) {
                if (n < opts.minLiterals) continue;
                if (++partners > opts.partnersPerCube) break;
                const Cube& d = ws.cover(refs[j].node).cubes[refs[j].cube];
                std::vector<Literal> common;
                std::set_intersection(c.lits.begin(), c.lits.end(), d.lits.begin(), d.lits.end(),
                                      std::back_inserter(common));
                Cube I(std::move(common));
                auto [it, fresh] = cand.try_emplace(detail::coverKey(Cover{{I}}), I, 0);
                ++it->second.second;
            }
        }
        candidates += static_cast<long>(cand.size());
        // Upper bounds from the index (cubes only lose literals as extraction
        // goes on, so a bound stays a bound); the most promising candidates
        // first, at most maxCandidates of them.
        std::vector<std::pair<long, Cube>> ranked;
        ranked.reserve(cand.size());
        for (auto& [key, e] : cand)
            ranked.push_back({e.second * static_cast<long>(e.first.lits.size() - 1), std::move(e.first)});
        cand.clear();
        if (ranked.size() > opts.maxCandidates) {
            std::nth_element(ranked.begin(), ranked.begin() + static_cast<std::ptrdiff_t>(opts.maxCandidates),
                             ranked.end(), [](const auto& a, const auto& b) { return a.first > b.first; });
            ranked.resize(opts.maxCandidates);
        }
        using Item = std::pair<long, std::size_t>;
        // Each candidate keeps the nodes that held it when indexed: extraction
        // rewrites a cube holding I into one that still holds I, in the same
        // node, so only those nodes need looking at later.
        std::vector<Cube> list;
        std::vector<std::vector<net::NodeId>> where;
        std::priority_queue<Item> heap;
        std::vector<net::NodeId> targets;
        for (auto& [hits, I] : ranked) {
            std::vector<std::uint32_t> cubes = indexedCubes(I, occ);
            long bound = static_cast<long>(cubes.size()) * static_cast<long>(I.lits.size() - 1) + 1;
            std::vector<net::NodeId> nodes;
            for (std::uint32_t id : cubes)
                if (nodes.empty() || nodes.back() != refs[id].node) nodes.push_back(refs[id].node);
            std::sort(nodes.begin(), nodes.end());
            nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
            heap.push({bound, list.size()});
            list.push_back(std::move(I));
            where.push_back(std::move(nodes));
        }
        long roundSaved = 0;
        std::vector<net::NodeId> changed;
        std::vector<std::uint8_t> requeued(list.size(), 0);
        while (!heap.empty()) {
            auto [v, i] = heap.top();
            heap.pop();
            if (work > opts.workBudget) { exhausted = true; break; }
            net::NodeId prov = 0;
            long now = valueOf(ws, list[i], &where[i], targets, prov, work);
            if (now <= 0) continue;
            // Near-greedy: take it unless it fell well below the next bound
            // (then look at it once more later). Exact lazy greedy would
            // re-value the same candidates over and over on large covers.
            if (!heap.empty() && now < heap.top().first / 2 && !requeued[i]) {
                requeued[i] = 1;
                heap.push({now, i});
                continue;
            }
            net::NodeId created = 0;
            long gain = detail::extractDivisor(ws, Cover{{list[i]}}, targets, prov, changed, created);
            if (gain <= 0) continue;
            (prov ? reused : extracted) += 1;
            saved += gain;
            roundSaved += gain;
        }
        if (roundSaved == 0 || exhausted) break;
    }
    ctx.stats.add("extracted", extracted);
    ctx.stats.add("reused-nodes", reused);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("candidates", candidates);
    if (exhausted) ctx.stats.add("limit-hit:cubes-work", 1);
    ctx.stats.add("depth-rejects", static_cast<long long>(ws.depthRejects()));
}

} // namespace kerf::passes
