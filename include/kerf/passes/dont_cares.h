// kerf/passes/dont_cares.h — the technique `dont-care-minimise`: two-level
// minimisation of each node against the don't-cares the network implies
// (fanin values that never occur, values no output observes) and the ones
// the source declares.
//
// Contract. Needs: any network; `declared` (may be null) holds the output
// don't-care conditions by output name. Preserves: inputs, outputs' names;
// every output's function wherever its declared condition is 0; adds no
// node. Gives: a node's cover changes only where its value is proved not to
// matter (simulation over every input pattern when there are few inputs,
// otherwise simulation with each candidate confirmed by the SAT solver);
// each change strictly lowers the node's literals. Depth: respects
// ctx.depthCap.
#pragma once

#include "kerf/minimize/twolevel.h"
#include "kerf/passes/pass.h"

#include <cstdint>

namespace kerf::passes {

struct DontCareOptions {
    int maxFanins = 10;                 ///< nodes reading more variables keep their cover
    int exhaustiveInputs = 14;          ///< up to this many inputs, every input pattern is simulated (no SAT needed)
    int simulationWords = 32;           ///< otherwise this many words of 64 random patterns
    std::size_t windowNodes = 100;      ///< fanout nodes re-simulated to judge observability; the window's edge counts as observed
    std::size_t coneLimit = 1000;       ///< nodes in one SAT query; nodes needing more keep their cover
    std::int64_t conflictsPerQuery = 2000;  ///< SAT conflicts of one query (past it: no don't-cares for that node)
    int refinementsPerNode = 24;        ///< counterexamples taken per node before it keeps its cover
    std::int64_t totalConflicts = 200000;   ///< SAT conflicts of one run
    std::size_t maxNetworkNodes = 5000; ///< larger networks are left alone (the cost grows with nodes times window)
    std::size_t maxNodes = 3000;        ///< nodes examined per run
    minimize::MinimizeOptions minimize;
};

void minimiseWithDontCares(net::Network& net, const DontCareOptions& opts, const net::Network* declared,
                           PassContext& ctx);

} // namespace kerf::passes
