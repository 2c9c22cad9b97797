// kerf/passes/tidy.h — the clean-up pass `tidy`.
//
// Contract. Needs: any network. Preserves: every output's function, inputs.
// Gives: no constant or single-literal logic nodes (buffers and inverters are
// substituted into their fanouts and the outputs), no constant literals
// inside covers, covers normalised with contained cubes removed, no two live
// nodes with the same cover, and no logic node unreachable from an output.
// Depth never increases.
#pragma once

#include "kerf/passes/pass.h"

namespace kerf::passes {

/// Clean the network up (see the contract above). Called by the frontend
/// right after reading.
void tidy(net::Network& net);

/// Same, reporting counters (constants, buffers, merged, dead) into ctx.stats.
void tidy(net::Network& net, PassContext& ctx);

/// Same, where `net` was copied from `base`, a network tidied before: a
/// wide cover whose fanins keep their literals and that equals its node's
/// cover in `base` is already in canonical form and is not simplified again
/// (the engine tidies every trial; on wide covers that was most of it, F44).
void tidy(net::Network& net, PassContext& ctx, const net::Network& base);

} // namespace kerf::passes
