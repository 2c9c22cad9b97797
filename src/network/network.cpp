// network.cpp — construction, ordering, measurement and simulation of the Boolean network.
#include "kerf/network/network.h"

#include <algorithm>
#include <functional>
#include <queue>

namespace kerf::net {

using algebra::literalNegated;
using algebra::literalVar;

Network::Network() {
    Node zero;
    zero.kind = NodeKind::Constant;
    zero.name = "0";
    nodes_.push_back(std::move(zero));
}

NodeId Network::addInput(std::string name) {
    Node n;
    n.kind = NodeKind::Input;
    n.name = std::move(name);
    nodes_.push_back(std::move(n));
    NodeId id = static_cast<NodeId>(nodes_.size() - 1);
    inputs_.push_back(id);
    return id;
}

NodeId Network::addLogic(Cover cover, std::string hint, SourceLoc loc) {
    Node n;
    n.kind = NodeKind::Logic;
    n.cover = std::move(cover);
    n.name = std::move(hint);
    n.loc = std::move(loc);
    nodes_.push_back(std::move(n));
    return static_cast<NodeId>(nodes_.size() - 1);
}

void Network::addOutput(std::string name, Literal driver) {
    outputs_.push_back(Output{std::move(name), driver});
}

std::vector<NodeId> Network::topoOrder() const {
    std::vector<NodeId> all(nodes_.size());
    for (NodeId id = 0; id < all.size(); ++id) all[id] = id;
    return postOrderFrom(all);
}

std::vector<NodeId> Network::postOrderFrom(const std::vector<NodeId>& roots) const {
    // Iterative DFS post-order; fanins of a live node are live by construction.
    // Each open node keeps where its walk stopped (cube, literal): resuming
    // from the start of the cover made the walk quadratic in a wide cover's
    // literals (a 100k-term decoder's outputs, F44).
    struct Frame {
        NodeId id;
        std::uint32_t cube, lit;
    };
    // State per node: 0 new logic, 1 open, 2 done, 3 not live logic. Set
    // once from the nodes, so the walk reads one byte per literal instead of
    // each fanin's node record (on a network of wide covers that was most
    // of the walk's time, engine17).
    std::vector<NodeId> order;
    std::vector<std::uint8_t> state(nodes_.size(), 3);
    for (NodeId id = 0; id < nodes_.size(); ++id)
        if (isLogic(id)) state[id] = 0;
    std::vector<Frame> stack;
    for (NodeId root : roots) {
        if (state[root] != 0) continue;
        stack.push_back({root, 0, 0});
        state[root] = 1;
        while (!stack.empty()) {
            Frame& fr = stack.back();
            const auto& cubes = nodes_[fr.id].cover.cubes;
            NodeId next = 0;
            bool pushed = false;
            while (fr.cube < cubes.size() && !pushed) {
                const auto& lits = cubes[fr.cube].lits;
                while (fr.lit < lits.size()) {
                    const NodeId v = literalVar(lits[fr.lit++]);
                    if (state[v] == 0) {
                        next = v;
                        pushed = true;
                        break;
                    }
                }
                if (!pushed) {
                    ++fr.cube;
                    fr.lit = 0;
                }
            }
            if (pushed) {
                state[next] = 1;
                stack.push_back({next, 0, 0});   // `fr` may dangle from here on
                continue;
            }
            state[fr.id] = 2;
            order.push_back(fr.id);
            stack.pop_back();
        }
    }
    return order;
}

std::vector<std::vector<NodeId>> Network::fanouts() const {
    std::vector<std::vector<NodeId>> fo(nodes_.size());
    for (NodeId id = 0; id < nodes_.size(); ++id) {
        if (!isLogic(id)) continue;
        for (const Cube& c : nodes_[id].cover.cubes)
            for (Literal l : c.lits) {
                auto& v = fo[literalVar(l)];
                if (v.empty() || v.back() != id) v.push_back(id);
            }
    }
    for (auto& v : fo) {
        std::sort(v.begin(), v.end());
        v.erase(std::unique(v.begin(), v.end()), v.end());
    }
    return fo;
}

std::vector<std::uint32_t> Network::outputRefs() const {
    std::vector<std::uint32_t> refs(nodes_.size(), 0);
    for (const Output& o : outputs_) ++refs[literalVar(o.driver)];
    return refs;
}

std::size_t Network::removeUnreachable() {
    std::vector<std::uint8_t> seen(nodes_.size(), 0);
    std::vector<NodeId> work;
    for (const Output& o : outputs_) work.push_back(literalVar(o.driver));
    while (!work.empty()) {
        NodeId id = work.back();
        work.pop_back();
        if (seen[id]) continue;
        seen[id] = 1;
        if (!isLogic(id)) continue;
        for (const Cube& c : nodes_[id].cover.cubes)
            for (Literal l : c.lits)
                if (!seen[literalVar(l)]) work.push_back(literalVar(l));
    }
    std::size_t removed = 0;
    for (NodeId id = 0; id < nodes_.size(); ++id)
        if (isLogic(id) && !seen[id]) {
            nodes_[id].dead = true;
            nodes_[id].cover = {};
            ++removed;
        }
    return removed;
}

std::size_t Network::logicCount() const {
    std::size_t n = 0;
    for (NodeId id = 0; id < nodes_.size(); ++id) n += isLogic(id);
    return n;
}

namespace {

// Combine arrival times pairwise, earliest first: the depth of a balanced
// two-input tree built by arrival time (k leaves need k-1 gates). The heap
// is built in `times` itself (a priority queue of its own allocated once per
// cube, and measuring and timing a network meet every cube: engine17).
std::size_t combineArrivals(std::vector<std::size_t>& times) {
    if (times.empty()) return 0;
    if (times.size() == 1) return times[0];
    if (times.size() == 2) return std::max(times[0], times[1]) + 1;
    const auto later = std::greater<>();
    std::make_heap(times.begin(), times.end(), later);
    for (std::size_t n = times.size(); n > 1; --n) {
        std::pop_heap(times.begin(), times.begin() + static_cast<std::ptrdiff_t>(n), later);
        const std::size_t a = times[n - 1];
        std::pop_heap(times.begin(), times.begin() + static_cast<std::ptrdiff_t>(n - 1), later);
        times[n - 2] = std::max(a, times[n - 2]) + 1;
        std::push_heap(times.begin(), times.begin() + static_cast<std::ptrdiff_t>(n - 1), later);
    }
    return times[0];
}

} // namespace

SopCost sopCost(const Cover& cover, const std::vector<std::size_t>& arrivalByVar) {
    SopCost cost;
    // Scratch kept between calls (sopCost calls nothing that calls it back).
    thread_local std::vector<std::size_t> cubeTimes, litTimes;
    cubeTimes.clear();
    for (const Cube& c : cover.cubes) {
        if (c.lits.size() > 1) cost.gates += c.lits.size() - 1;
        litTimes.clear();
        for (Literal l : c.lits) {
            auto v = literalVar(l);
            litTimes.push_back(v < arrivalByVar.size() ? arrivalByVar[v] : 0);
        }
        cubeTimes.push_back(combineArrivals(litTimes));
    }
    if (cover.cubes.size() > 1) cost.gates += cover.cubes.size() - 1;
    cost.arrival = combineArrivals(cubeTimes);
    return cost;
}

std::vector<std::size_t> arrivalTimes(const Network& net) {
    std::vector<std::size_t> at(net.nodeCount(), 0);
    for (NodeId in : net.inputs()) at[in] = net.node(in).arrival;
    for (NodeId id : net.topoOrder()) at[id] = sopCost(net.node(id).cover, at).arrival;
    return at;
}

Metrics measure(const Network& net) {
    Metrics m;
    m.inputs = net.inputs().size();
    m.outputs = net.outputs().size();
    std::vector<std::size_t> at(net.nodeCount(), 0);
    for (NodeId in : net.inputs()) at[in] = net.node(in).arrival;
    for (NodeId id : net.topoOrder()) {
        const Cover& cv = net.node(id).cover;
        SopCost c = sopCost(cv, at);
        at[id] = c.arrival;
        ++m.nodes;
        m.gates += c.gates;
        for (const Cube& cube : cv.cubes) m.literals += cube.lits.size();
    }
    for (const Output& o : net.outputs()) m.depth = std::max(m.depth, at[literalVar(o.driver)] + o.tail);
    return m;
}

std::vector<std::uint64_t> simulate(const Network& net, const std::vector<std::uint64_t>& inputWords) {
    std::vector<std::uint64_t> val(net.nodeCount(), 0);
    for (std::size_t i = 0; i < net.inputs().size() && i < inputWords.size(); ++i)
        val[net.inputs()[i]] = inputWords[i];
    auto litVal = [&](Literal l) { return literalNegated(l) ? ~val[literalVar(l)] : val[literalVar(l)]; };
    for (NodeId id : net.topoOrder()) {
        std::uint64_t sum = 0;
        for (const Cube& c : net.node(id).cover.cubes) {
            std::uint64_t prod = ~std::uint64_t{0};
            for (Literal l : c.lits) prod &= litVal(l);
            sum |= prod;
        }
        val[id] = sum;
    }
    std::vector<std::uint64_t> out;
    out.reserve(net.outputs().size());
    for (const Output& o : net.outputs()) out.push_back(litVal(o.driver));
    return out;
}

} // namespace kerf::net
