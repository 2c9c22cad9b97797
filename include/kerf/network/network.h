// kerf/network/network.h — the bit-level Boolean network.
//
// Every logic node holds a sum of products (an algebra::Cover) over literals
// of other nodes; a literal is 2*node + complemented. Node 0 is the constant
// 0, so literal 0 is false and literal 1 is true. Inputs are leaves named by
// the bit they stand for ("a[3]", "b"); outputs name a bit and point to a
// literal. The network holds no Verilog: the frontend binds names to signals.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/diagnostics.h"

#include <cstdint>
#include <string>
#include <vector>

namespace kerf::net {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using NodeId = std::uint32_t;

inline constexpr Literal kFalse = 0;
inline constexpr Literal kTrue = 1;

/// What a node is.
enum class NodeKind : std::uint8_t {
    Constant,   ///< node 0 only: constant 0
    Input,      ///< a primary input bit (port, kept-code signal, word-level result)
    Logic,      ///< a sum of products over other nodes' literals
};

/// One node of the network.
struct Node {
    NodeKind kind = NodeKind::Logic;
    bool dead = false;        ///< removed; its id is never reused
    Cover cover;              ///< Logic only
    std::string name;         ///< Input: the bit name; Logic: optional hint for the writer
    SourceLoc loc;            ///< where the logic came from, when known
    /// Input only: the time (depth) at which the bit arrives; 0 for a primary
    /// input, later for a cut point of a region taken from a larger network.
    std::uint32_t arrival = 0;
};

/// A primary output: a named bit driven by a literal.
struct Output {
    std::string name;
    Literal driver = kFalse;
    /// Depth that follows this output (0 for a primary output; a region's
    /// output feeding deeper logic counts that logic). Depth figures count
    /// arrival + tail.
    std::uint32_t tail = 0;
};

// Don't-care conditions travel beside a network, never inside it, so that no
// pass has to preserve logic that only describes freedom: a second Network
// over the same input names whose output named like a main output is 1 for
// the input values where that output may take any value (the source assigns
// x there; IEEE 1364.1 / 1800 synthesis reading). Outputs without an entry
// have no don't-cares. The proof compares only where the condition is 0.

/// A DAG of sum-of-products nodes.
class Network {
public:
    Network();

    NodeId addInput(std::string name);
    NodeId addLogic(Cover cover, std::string hint = {}, SourceLoc loc = {});
    void addOutput(std::string name, Literal driver);

    std::size_t nodeCount() const { return nodes_.size(); }  ///< including dead and constant
    const Node& node(NodeId id) const { return nodes_[id]; }
    Node& node(NodeId id) { return nodes_[id]; }
    const std::vector<NodeId>& inputs() const { return inputs_; }
    const std::vector<Output>& outputs() const { return outputs_; }
    std::vector<Output>& outputs() { return outputs_; }

    bool isLogic(NodeId id) const { return nodes_[id].kind == NodeKind::Logic && !nodes_[id].dead; }
    /// Live logic nodes in topological order (fanins before fanouts), reachable or not.
    std::vector<NodeId> topoOrder() const;
    /// The logic nodes that `roots` reach (logic roots only), depth-first post-order from each
    /// root in turn: fanins before fanouts, each node once.
    std::vector<NodeId> postOrderFrom(const std::vector<NodeId>& roots) const;
    /// Fanout lists of every node (logic nodes and outputs' drivers are counted separately: see outputRefs).
    std::vector<std::vector<NodeId>> fanouts() const;
    /// Number of outputs each node drives.
    std::vector<std::uint32_t> outputRefs() const;
    /// Mark logic nodes not reachable from any output as dead.
    std::size_t removeUnreachable();
    /// Live logic node count.
    std::size_t logicCount() const;

private:
    std::vector<Node> nodes_;
    std::vector<NodeId> inputs_;
    std::vector<Output> outputs_;
};

/// Size and depth figures, counted on each node's sum of products:
/// a cube of k literals is k-1 two-input ANDs, a cover of m cubes adds m-1
/// two-input ORs, inverters are free; depth balances each AND/OR tree by
/// arrival time (inputs arrive at their `arrival`, outputs add their `tail`).
struct Metrics {
    std::size_t inputs = 0;
    std::size_t outputs = 0;
    std::size_t nodes = 0;
    std::size_t literals = 0;
    std::size_t gates = 0;
    std::size_t depth = 0;
};

Metrics measure(const Network& net);

/// Two-input gate count and balanced depth of one sum of products whose
/// literals arrive at the given times (indexed by variable).
struct SopCost {
    std::size_t gates = 0;
    std::size_t arrival = 0;
};
SopCost sopCost(const Cover& cover, const std::vector<std::size_t>& arrivalByVar);

/// Depth (arrival time) of every node, by the same counting as `measure`.
std::vector<std::size_t> arrivalTimes(const Network& net);

/// Evaluate every output for 64 input patterns at once (bit i of word j is
/// pattern i of input j, inputs in `inputs()` order). For tests and checks.
std::vector<std::uint64_t> simulate(const Network& net, const std::vector<std::uint64_t>& inputWords);

} // namespace kerf::net
