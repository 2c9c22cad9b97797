// kerf/emit/slice_regroup.h — one vector's bits in an output's product, read as one comparison.
//
// See src/emit/slice_regroup.cpp for the idea and the rules.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/passes/factored.h"

#include <cstddef>
#include <string>

namespace kerf::emit {

/// Bounds of the regrouping (named, documented in docs/guide.md).
struct SliceRegroupLimits {
    /// An output's product is regrouped only when it reads at least this many bits of one vector.
    int minBits = 3;
    /// A contiguous slice common to several products becomes one product of its own when it
    /// saves at least this many gates ((bits - 1) * (readers - 1)).
    long minSliceGain = 2;
    /// The regrouped network is kept when it costs at most this many two-input gates more than
    /// the engine's result ...
    std::size_t extraGates = 6;
    /// ... or this share of the engine's gates, whichever is larger (EPFL-sized designs move
    /// by at most 2%).
    double extraShare = 0.02;
    /// Up to this many engine gates, a kept regroup is checked by running kerf once more on the
    /// written file (flows.cpp): when that second run would rewrite anything, the engine's
    /// network is written instead (F195). Above it the check would cost a second engine run, so
    /// the margin is capped below --min-gain instead: a second run cannot gain the margin back.
    std::size_t checkGates = 20000;
};

/// What the regrouping did (for `-v`).
struct SliceRegroupResult {
    bool kept = false;
    std::size_t outputs = 0;        ///< outputs whose product was regrouped
    std::size_t gatesBefore = 0, gatesAfter = 0, depthAfter = 0;
    std::string text;               ///< one line for `-v`
};

/// Regroups, in `low.net`, each output whose logic is one product reading at least `minBits`
/// bits of one vector: that vector's bits become one product of their own (one comparison
/// when written), shared between outputs where one's bits contain another's or a contiguous
/// slice is common to several; the rest of the product keeps its signals. Kept only within
/// `depthBound` and the gate margin of the engine's figures `engine`; otherwise `low.net` is
/// left as it was. `forms` is recomputed when kept.
/// `maxExtra` (>= 0) caps the gate margin (see SliceRegroupLimits::checkGates).
SliceRegroupResult regroupSlices(frontend::Lowered& low, passes::FactoredNetwork& forms, int depthCap,
                                 std::size_t depthBound, passes::FactorCache* cache,
                                 const SliceRegroupLimits& limits = {}, double maxExtra = -1);

} // namespace kerf::emit
