// kerf/passes/resub_boolean.h — the technique `resubstitute-boolean`: a node
// re-expressed with nodes the network already has, wherever the don't-cares
// allow it, not only where algebraic division finds it.
//
// Contract. Needs: any network. Preserves: inputs, outputs' names and
// functions; adds no node. Gives: a node's cover is replaced by one literal
// of an existing node (or its complement), or by the AND or OR of two such
// literals, only when the two agree on every input pattern where some
// output observes the node (simulation over every input pattern when there
// are few inputs, otherwise simulation with each candidate confirmed by the
// SAT solver); each change strictly lowers the node's literals. The
// replaced node's former fanins are left for tidy to remove when unused.
// Depth: respects ctx.depthCap. Changed region (ctx.focus): only the marked
// nodes are re-expressed (with divisors from anywhere).
#pragma once

#include "kerf/passes/pass.h"

#include <cstddef>
#include <cstdint>

namespace kerf::passes {

struct BooleanResubOptions {
    int exhaustiveInputs = 14;            ///< up to this many inputs, every input pattern is simulated (no SAT needed)
    int simulationWords = 16;             ///< otherwise this many words of 64 random patterns
    std::size_t windowNodes = 100;        ///< fanout nodes re-simulated to judge observability (the window's edge counts as observed)
    std::size_t divisors = 60;            ///< existing nodes tried as divisors per node
    std::size_t coneLimit = 400;          ///< nodes in one SAT query; candidates needing more are not taken
    int coneLevels = 4;                   ///< levels of logic a SAT query reaches back (further nodes are free: sound, finds fewer)
    std::int64_t conflictsPerQuery = 500; ///< SAT conflicts of one confirmation
    std::int64_t totalConflicts = 20000;  ///< SAT conflicts of one move
    std::size_t maxQueries = 60;          ///< SAT confirmations of one move
    std::size_t formsPerNode = 3;         ///< candidate forms tried per node (cheapest first)
    std::size_t maxNetworkNodes = 5000;   ///< larger networks are left alone (the cost grows with nodes times window)
    std::size_t maxNodes = 2000;          ///< nodes examined per move
};

void resubstituteBoolean(net::Network& net, const BooleanResubOptions& opts, PassContext& ctx);

} // namespace kerf::passes
