// kerf/passes/reuse_nodes.h — the technique of the `resubstitute` move: algebraic
// resubstitution. Each node is divided by the covers of existing nodes (and
// by their complements, used through the complemented literal); divisions
// that save literals are kept.
//
// Contract. Needs: any network. Preserves: every node's function, outputs,
// inputs; adds no node. Gives: each substitution strictly lowers the literal
// count. Depth: respects ctx.depthCap. Changed region (ctx.focus): the
// nodes divided are the marked ones and those a marked node can divide (its
// support inside theirs); divisors come from anywhere. Candidates are found
// through an index of two variables per node (see reuse_nodes.cpp), so a
// node meets only nodes whose two keyed variables it reads.
#pragma once

#include "kerf/passes/pass.h"

namespace kerf::passes {

struct ReuseOptions {
    bool complements = true;           ///< also divide by complements of nodes (through the inverted literal)
    std::size_t maxCandidates = 200;   ///< divisor nodes tried per node
    std::size_t complementCubeCap = 16;
    std::size_t maxCubes = 512;        ///< larger covers are neither divided nor used as divisors
    std::size_t fanoutScanLimit = 4096;///< nodes reading a variable with more readers are not tried as divisors
};

void reuseNodes(net::Network& net, const ReuseOptions& opts, PassContext& ctx);

} // namespace kerf::passes
