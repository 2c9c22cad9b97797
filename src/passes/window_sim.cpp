// window_sim.cpp — the window simulation shared by the don't-care
// techniques (see window_sim.h).
#include "window_sim.h"

#include "kerf/proof/simulation.h"

#include <algorithm>

namespace kerf::passes::detail {

using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;

void WindowSimulation::renewOrder() {
    order_ = net_.topoOrder();
    pos_.assign(net_.nodeCount(), 0);
    for (std::size_t i = 0; i < order_.size(); ++i) pos_[order_[i]] = static_cast<std::uint32_t>(i);
}

void WindowSimulation::start(int exhaustiveInputs, std::size_t randomWords, std::size_t spareWords,
                             std::uint64_t seed) {
    const std::size_t n = net_.inputs().size();
    exhaustive_ = static_cast<int>(n) <= std::min(exhaustiveInputs, 20);
    words_ = exhaustive_ ? truthTableWords(n) : randomWords + spareWords;
    vals_.assign(net_.nodeCount(), Words(words_, 0));
    proof::Random rng(seed);
    for (std::size_t i = 0; i < n; ++i) {
        Words& x = vals_[net_.inputs()[i]];
        for (std::size_t w = 0; w < words_; ++w) {
            if (exhaustive_) x[w] = truthTableWord(i, w);
            else x[w] = w < randomWords ? rng.next() : 0;
        }
    }
    // Fewer than 64 patterns in a single word: the unused bits repeat
    // patterns already there (the masks are periodic), so they are harmless.
    for (NodeId v : order_) simulate(v);
}

void WindowSimulation::simulate(NodeId v) {
    for (std::size_t w = 0; w < words_; ++w) vals_[v][w] = evalCover(net_.node(v).cover, vals_, w);
}

std::vector<NodeId> WindowSimulation::fanoutCone(NodeId v) {
    std::vector<NodeId> cone{v}, stack{v};
    cone_.resize(net_.nodeCount(), 0);
    cone_[v] = 1;
    while (!stack.empty()) {
        const NodeId u = stack.back();
        stack.pop_back();
        for (NodeId x : ws_.fanouts(u))
            if (!cone_[x] && ws_.live(x)) {
                cone_[x] = 1;
                cone.push_back(x);
                stack.push_back(x);
            }
    }
    std::sort(cone.begin(), cone.end(), [&](NodeId a, NodeId b) { return pos_[a] < pos_[b]; });
    return cone;
}

void WindowSimulation::unmark(const std::vector<NodeId>& cone) {
    for (NodeId u : cone) cone_[u] = 0;
}

void WindowSimulation::setWindow(const std::vector<NodeId>& window) {
    stamp_.resize(net_.nodeCount(), 0);
    slot_.resize(net_.nodeCount(), 0);
    if (++window_ == 0) {   // the stamp wrapped: forget every old mark
        std::fill(stamp_.begin(), stamp_.end(), 0);
        window_ = 1;
    }
    for (std::size_t i = 0; i < window.size(); ++i) {
        stamp_[window[i]] = window_;
        slot_[window[i]] = static_cast<std::uint32_t>(i);
    }
}

bool WindowSimulation::readOutside(NodeId u) const {
    for (NodeId x : ws_.fanouts(u))
        if (index(x) == kNone) return true;
    return false;
}

void WindowSimulation::simulateFlipped(const std::vector<NodeId>& window, std::vector<Words>& flipped) const {
    flipped.assign(window.size(), Words(words_));
    for (std::size_t w = 0; w < words_; ++w) {
        for (std::size_t i = 0; i < window.size(); ++i) {
            const NodeId u = window[i];
            if (i == 0) { flipped[i][w] = ~vals_[u][w]; continue; }
            std::uint64_t out = 0;
            for (const Cube& c : ws_.cover(u).cubes) {
                std::uint64_t t = ~0ull;
                for (Literal l : c.lits) {
                    const std::size_t k = index(literalVar(l));
                    const std::uint64_t x = k != kNone ? flipped[k][w] : vals_[literalVar(l)][w];
                    t &= literalNegated(l) ? ~x : x;
                }
                out |= t;
            }
            flipped[i][w] = out;
        }
    }
}

std::vector<NodeId> WindowSimulation::satCone(const std::vector<NodeId>& window, const std::vector<NodeId>& seeds,
                                              int levels, std::size_t limit) {
    std::vector<NodeId> cone;
    seen_.resize(net_.nodeCount(), 0);
    free_.resize(net_.nodeCount(), 0);
    auto visit = [&](NodeId u) {
        if (seen_[u]) return;
        seen_[u] = 1;
        cone.push_back(u);
    };
    for (NodeId u : window) visit(u);
    for (NodeId u : seeds) visit(u);
    std::size_t levelEnd = cone.size();
    int level = 0;
    for (std::size_t i = 0; i < cone.size() && cone.size() <= limit; ++i) {
        if (i == levelEnd) { ++level; levelEnd = cone.size(); }
        const NodeId u = cone[i];
        if (!net_.isLogic(u)) continue;
        if (level >= levels && index(u) == kNone) { free_[u] = 1; continue; }
        for (const Cube& c : net_.node(u).cover.cubes)
            for (Literal l : c.lits) visit(literalVar(l));
    }
    for (NodeId u : cone) seen_[u] = 0;
    if (cone.size() > limit) {
        for (NodeId u : cone) free_[u] = 0;
        return cone;
    }
    std::sort(cone.begin(), cone.end(), [&](NodeId a, NodeId b) {
        const bool la = net_.isLogic(a), lb = net_.isLogic(b);
        if (la != lb) return !la;
        return la ? pos_[a] < pos_[b] : a < b;
    });
    return cone;
}

void WindowSimulation::encodeCone(Query& q, const std::vector<NodeId>& cone) {
    const int constFalse = ++q.nextVar;
    q.solver.add(-constFalse), q.solver.add(0);
    q.x[0] = constFalse;
    auto litX = [&q](Literal l) { return q.litX(l); };
    for (NodeId u : cone) {
        if (u == 0) continue;
        q.x[u] = (!net_.isLogic(u) || free_[u]) ? ++q.nextVar : encodeCover(q.solver, q.nextVar, net_.node(u).cover, litX);
    }
    for (NodeId u : cone) free_[u] = 0;
}

void WindowSimulation::encodeWindowCopy(Query& q, const std::vector<NodeId>& window, int vLiteral) const {
    auto litY = [&q](Literal l) { return q.litY(l); };
    for (std::size_t i = 0; i < window.size(); ++i)
        q.y[window[i]] = i == 0 ? vLiteral : encodeCover(q.solver, q.nextVar, net_.node(window[i]).cover, litY);
}

} // namespace kerf::passes::detail
