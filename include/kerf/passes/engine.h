// kerf/passes/engine.h — the restructuring engine: a recipe of passes run
// over the network, each pass timed and measured, passes that break the
// depth bound undone, and the input kept when nothing better was found.
#pragma once

#include "kerf/network/network.h"
#include "kerf/passes/pass.h"

#include <string>
#include <utility>
#include <vector>

namespace kerf::passes {

struct EngineOptions {
    std::string effort = "default";   ///< fast | default | thorough (when recipe is empty)
    std::string recipe;               ///< "pass,pass:arg,..." overrides effort
    int maxDepth = -1;                ///< -1: the input's depth
    int verbose = 0;
};

struct PassRow {
    std::string pass;                 ///< the step as written ("inline-small:2")
    net::Metrics after;               ///< measureFactored after the step
    double seconds = 0;
    bool undone = false;              ///< its result broke the depth bound and was undone
    std::vector<std::pair<std::string, long long>> counters;
};

struct EngineResult {
    net::Metrics before, after;       ///< measureFactored of the input and of the result
    std::vector<PassRow> rows;
    std::string recipe;               ///< the recipe that ran
    bool keptOriginal = false;        ///< the result was not better: the input was restored
    int depthCap = -1;                ///< the bound used; pass it to factorNetwork when writing
    double seconds = 0;
};

/// Restructure `net` in place. The result is never worse than the input on
/// the cost (two-input gates of measureFactored, then literals) and never
/// deeper than the bound (or the input, if that was deeper); otherwise the
/// input is restored and keptOriginal is set. Throws kerf::Error for a bad
/// recipe or effort.
EngineResult restructure(net::Network& net, const EngineOptions& opts);

/// The table printed at -v: pass, literals, gates, depth, nodes, seconds;
/// with each pass's counters below it.
std::string formatPassTable(const EngineResult& r);

} // namespace kerf::passes
