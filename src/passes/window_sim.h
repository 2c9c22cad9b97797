// window_sim.h — internal to the passes: the window simulation that the
// techniques judging a node by its surroundings share (dont_cares.cpp,
// resub_boolean.cpp).
//
// Both ask the same question of a node v: on which input patterns does a
// change of v reach an output or the edge of its fanout window? Both answer
// it the same way: input patterns (every pattern of a few inputs, random
// ones otherwise), every node simulated bit-parallel in topological order,
// v's fanout window re-simulated with v complemented, and — when the
// patterns were random — a SAT query on the window (an original copy of the
// logic the window reads, up to some levels back, and a second copy of the
// window with v changed). This file holds those steps once; what each
// technique asks of the answer stays in its own file.
#pragma once

#include "cone_logic.h"
#include "workspace.h"

#include <cstdint>
#include <unordered_map>
#include <vector>

namespace kerf::passes::detail {

/// Patterns, node values and fanout windows of a network being edited
/// through `ws` (whose fanout lists it reads).
class WindowSimulation {
public:
    WindowSimulation(const net::Network& net, const Workspace& ws) : net_(net), ws_(ws) {}

    /// Topological order and positions (renewed by renewOrder()).
    void renewOrder();
    const std::vector<NodeId>& order() const { return order_; }
    std::uint32_t pos(NodeId v) const { return pos_[v]; }

    /// Set up the patterns: every pattern of the inputs when there are at
    /// most min(exhaustiveInputs, 20) of them; otherwise `randomWords` words
    /// of random patterns from `seed`, then `spareWords` words of zeros (room
    /// for patterns found later). Every node is then simulated in order().
    void start(int exhaustiveInputs, std::size_t randomWords, std::size_t spareWords, std::uint64_t seed);
    bool exhaustive() const { return exhaustive_; }
    std::size_t words() const { return words_; }
    std::vector<Words>& values() { return vals_; }
    const std::vector<Words>& values() const { return vals_; }
    /// Re-simulate every word of v from its fanins' values.
    void simulate(NodeId v);

    /// v's whole fanout cone (live nodes), v first, in topological order.
    /// Its nodes stay marked (inCone) until unmark(cone).
    std::vector<NodeId> fanoutCone(NodeId v);
    bool inCone(NodeId u) const { return u < cone_.size() && cone_[u]; }
    void unmark(const std::vector<NodeId>& cone);

    /// Make `window` (a prefix of a fanout cone) the current window: index()
    /// then gives a node's position in it, or kNone.
    static constexpr std::size_t kNone = ~std::size_t{0};
    void setWindow(const std::vector<NodeId>& window);
    std::size_t index(NodeId u) const {
        return u < stamp_.size() && stamp_[u] == window_ ? slot_[u] : kNone;
    }
    /// Whether the current window node u is read by a live node outside the window.
    bool readOutside(NodeId u) const;

    /// flipped[i]: the value of the current window's node i with its first
    /// node (v) complemented, every word.
    void simulateFlipped(const std::vector<NodeId>& window, std::vector<Words>& flipped) const;

    /// The logic a SAT query on the current window needs: the window and
    /// `seeds`, then what they read, breadth first, up to `levels` levels;
    /// logic nodes at that level and outside the window are free variables
    /// (more behaviours than the circuit has: a query can only find more
    /// differences, so what it confirms stays sound). Stops early once the
    /// cone holds more than `limit` nodes (the caller then gives up).
    /// Inputs first, then logic in order().
    std::vector<NodeId> satCone(const std::vector<NodeId>& window, const std::vector<NodeId>& seeds, int levels,
                                std::size_t limit);

    /// A SAT query over a cone: x[u] the original logic, y[u] the window's copy.
    struct Query {
        CaDiCaL::Solver solver;
        ConflictCounter counter;
        int nextVar = 0;
        std::unordered_map<NodeId, int> x, y;
        Query() {
            solver.set("quiet", 1);
            solver.connect_learner(&counter);
        }
        int litX(algebra::Literal l) const {
            const int b = x.at(algebra::literalVar(l));
            return algebra::literalNegated(l) ? -b : b;
        }
        int litY(algebra::Literal l) const {
            auto it = y.find(algebra::literalVar(l));
            const int b = it != y.end() ? it->second : x.at(algebra::literalVar(l));
            return algebra::literalNegated(l) ? -b : b;
        }
    };
    /// Clauses of the cone's original logic (inputs and free nodes as free
    /// variables, node 0 false); clears the free marks satCone set.
    void encodeCone(Query& q, const std::vector<NodeId>& cone);
    /// Clauses of the window's copy: its first node (v) gets `vLiteral`, every
    /// other node its cover over the copy's literals.
    void encodeWindowCopy(Query& q, const std::vector<NodeId>& window, int vLiteral) const;

private:
    const net::Network& net_;
    const Workspace& ws_;
    std::vector<NodeId> order_;
    std::vector<std::uint32_t> pos_;
    bool exhaustive_ = false;
    std::size_t words_ = 0;
    std::vector<Words> vals_;
    std::vector<std::uint8_t> cone_, seen_, free_;
    std::vector<std::uint32_t> stamp_, slot_;
    std::uint32_t window_ = 0;
};

} // namespace kerf::passes::detail
