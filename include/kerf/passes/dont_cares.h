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
// ctx.depthCap. Changed region (ctx.focus): only the marked nodes are
// examined (their windows still reach outside it).
#pragma once

#include "kerf/minimize/twolevel.h"
#include "kerf/passes/pass.h"

#include <cstdint>
#include <unordered_set>

namespace kerf::passes {

struct DontCareOptions {
    int maxFanins = 10;                 ///< nodes reading more variables keep their cover
    int exhaustiveInputs = 14;          ///< up to this many inputs, every input pattern is simulated (no SAT needed)
    int simulationWords = 32;           ///< otherwise this many words of 64 random patterns
    std::size_t windowNodes = 100;      ///< fanout nodes re-simulated to judge observability; the window's edge counts as observed
    std::size_t coneLimit = 1000;       ///< nodes in one SAT query; nodes needing more keep their cover
    int coneLevels = 1000;              ///< levels of logic a SAT query reaches back; nodes beyond are free variables (sound, finds fewer)
    std::int64_t workPerNode = 20000;   ///< work of one run (window patterns simulated + nodes encoded) per network node
    std::int64_t conflictsPerQuery = 2000;  ///< SAT conflicts of one query (past it: no don't-cares for that node)
    int refinementsPerNode = 24;        ///< counterexamples taken per node before it keeps its cover
    std::int64_t totalConflicts = 200000;   ///< SAT conflicts of one run
    std::size_t maxNetworkNodes = 5000; ///< larger networks are left alone (the cost grows with nodes times window)
    std::size_t maxNodes = 3000;        ///< nodes examined per run
    minimize::MinimizeOptions minimize;
};

/// Nodes already examined without result, by a fingerprint of the node's
/// cover and its neighbours' covers. Shared across the runs of one engine
/// run, so that a run on a network that changed in a few places examines
/// mostly those places (a node whose neighbourhood is unchanged would most
/// likely find nothing again; skipping it can only miss a gain).
struct DontCareMemo {
    std::unordered_set<std::uint64_t> fruitless;
};

void minimiseWithDontCares(net::Network& net, const DontCareOptions& opts, const net::Network* declared,
                           PassContext& ctx, DontCareMemo* memo = nullptr);

} // namespace kerf::passes
