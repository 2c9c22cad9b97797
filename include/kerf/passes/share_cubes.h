// kerf/passes/share_cubes.h — the technique of the `extract-cubes` move: extract cubes common to
// several cubes of the network (in one node or several) as new nodes.
//
// Contract. Needs: any network. Preserves: every node's function, outputs,
// inputs. Gives: each extraction saves literals (the network's literal count
// strictly decreases with each). Depth: respects ctx.depthCap.
// Changed region (ctx.focus): candidate cubes come from pairs of cubes of
// which at least one lies in a marked node; each candidate is valued over
// every cube holding it.
#pragma once

#include "kerf/passes/pass.h"

namespace kerf::passes {

struct ShareCubesOptions {
    std::size_t minLiterals = 2;      ///< smallest cube extracted
    std::size_t partnersPerCube = 64; ///< candidate cube pairs looked at per cube
    int rounds = 4;
    std::size_t maxCandidates = 20000;   ///< candidates valued per round (most promising first)
    long workBudget = 100000000;          ///< cubes looked at over the pass; past it the pass stops early
    /// Networks of at least this many cubes are edited in place through a
    /// cube-literal index, covers written back once (0: never). Below it
    /// each extraction rewrites its targets' covers through the workspace.
    std::size_t inPlaceCubes = 50000;
    /// In place: the candidates' holder cubes may be found in one sweep over
    /// the cubes' literal pairs when that costs less than intersecting index
    /// lists per candidate (the same holders either way; false: intersections only).
    bool holdersByPairs = true;
    /// In place: passes in one call, each with its own work budget and up
    /// to `rounds` rounds, each laying the cube table out afresh from the
    /// covers the last pass wrote back, as separate moves would, but without
    /// tidying and measuring the network in between (the engine's opening,
    /// F293). A pass that saves less than `passMinPermille` thousandths of the
    /// table's literals (or nothing) ends the extraction. 1: one pass.
    int passes = 1;
    int passMinPermille = 0;
};

void shareCubes(net::Network& net, const ShareCubesOptions& opts, PassContext& ctx);

} // namespace kerf::passes
