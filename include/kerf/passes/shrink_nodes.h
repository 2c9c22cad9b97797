// kerf/passes/shrink_nodes.h — the technique of the `minimise-nodes` move: two-level
// minimisation of every node's cover, possibly replacing a node by its
// complement.
//
// Contract. Needs: any network. Preserves: outputs' functions, inputs, node
// count; a node's function is kept, or (when its complement has the cheaper
// cover) complemented with every fanout literal and output driver flipped.
// Gives: no node's literal count increases. Depth: respects ctx.depthCap.
#pragma once

#include "kerf/passes/pass.h"
#include "kerf/minimize/twolevel.h"

namespace kerf::passes {

struct ShrinkOptions {
    minimize::MinimizeOptions minimize;
    bool allowComplement = true;   ///< a node may become its complement when that is cheaper
};

void shrinkNodes(net::Network& net, const ShrinkOptions& opts, PassContext& ctx);

} // namespace kerf::passes
