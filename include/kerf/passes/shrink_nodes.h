// kerf/passes/shrink_nodes.h — the technique of the `minimise-nodes` move: two-level
// minimisation of every node's cover, possibly replacing a node by its
// complement.
//
// Contract. Needs: any network. Preserves: outputs' functions, inputs, node
// count; a node's function is kept, or (when its complement has the cheaper
// cover) complemented with every fanout literal and output driver flipped.
// Gives: no node's literal count increases. Depth: respects ctx.depthCap.
// Changed region (ctx.focus): only the marked nodes are minimised.
#pragma once

#include "kerf/passes/pass.h"
#include "kerf/minimize/twolevel.h"

#include <cstdint>
#include <unordered_map>
#include <unordered_set>

namespace kerf::passes {

struct ShrinkOptions {
    minimize::MinimizeOptions minimize;
    bool allowComplement = true;   ///< a node may become its complement when that is cheaper
};

/// What minimisation found for covers of read nodes, shared across the runs
/// of one engine run: minimisation is a function of the cover alone, so a
/// run on a network that changed in a few places minimises only those
/// places. `minimal` holds covers found minimal, by hash (a collision can
/// only leave a node unminimised, never change one); `found` holds the
/// cheaper cover found for the others, keyed by the whole cover (a trial
/// that is not kept leaves its nodes as they were, and the next trial of
/// minimise-nodes would minimise them again: on the 3k decoder that was
/// 6-7 CPU s per trial).
struct ShrinkMemo {
    struct Found {
        algebra::Cover cover;   ///< the cheaper cover (of the complement when flip)
        bool flip = false;
    };
    std::unordered_set<std::uint64_t> minimal;
    std::unordered_map<algebra::Cover, Found, algebra::CoverHash> found;
};

void shrinkNodes(net::Network& net, const ShrinkOptions& opts, PassContext& ctx, ShrinkMemo* memo = nullptr);

} // namespace kerf::passes
