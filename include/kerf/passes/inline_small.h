// kerf/passes/inline_small.h — dissolving nodes, the first half of `regroup` moves: collapse a node into
// its fanouts when that grows the literal count by at most a threshold.
//
// Contract. Needs: any network. Preserves: outputs' functions and the nodes
// that drive outputs; inputs. Gives: collapsed nodes are dead; no resulting
// cover exceeds maxCubes cubes or maxLiterals literals. Total literal count
// grows by at most `threshold` per collapsed node (never, for threshold ≤ 0).
// Depth: respects ctx.depthCap. Changed region (ctx.focus): only the marked
// nodes are valued at the start (nodes whose fanouts a collapse changed are
// valued again wherever they are).
#pragma once

#include "kerf/passes/pass.h"

namespace kerf::passes {

struct InlineOptions {
    int threshold = 0;              ///< allowed literal growth per collapse (the argument)
    std::size_t maxCubes = 48;      ///< cap on a fanout cover's cubes after collapsing
    std::size_t maxLiterals = 256;  ///< cap on a fanout cover's literals after collapsing
    std::size_t maxFanouts = 24;    ///< nodes with more fanouts are not collapsed
    /// Largest complement computed for inverted reads. It also bounds the work:
    /// every step of the complementation tidies a cover of up to this many
    /// cubes, and only complements of at most maxCubes cubes are used anyway.
    std::size_t complementCubeCap = 64;
    /// After a collapse, the fanins of a fanout cover of up to this many
    /// cubes are re-valued at once; those of wider covers when next taken
    /// (valuing them at once costs the square of the cover's width).
    std::size_t revalueMaxCubes = 16;
};

void inlineSmall(net::Network& net, const InlineOptions& opts, PassContext& ctx);

} // namespace kerf::passes
