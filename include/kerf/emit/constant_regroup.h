// kerf/emit/constant_regroup.h — comparisons with named constants rebuilt as one product each.
//
// See src/emit/constant_regroup.cpp for the idea and the rules.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/passes/factored.h"

#include <cstddef>
#include <string>
#include <vector>

namespace kerf::emit {

/// What the rebuilding did (for `-v`).
struct ConstantRegroupResult {
    bool kept = false;
    /// Nothing to rebuild: every product holding such a comparison already holds it as one
    /// product (a slice regroup made them, F357), within the bounds: the network stands as it is.
    bool namedAsIs = false;
    std::size_t nodes = 0;                  ///< nodes rebuilt as one comparison
    std::size_t gatesBefore = 0, gatesAfter = 0, depthAfter = 0;
    std::vector<std::string> constants;     ///< the constants those comparisons name, source order
    std::string text;                       ///< one line for `-v`
};

/// Rebuilds, in `low.net`, each node whose function is a product containing a comparison of bits
/// of one vector with a named constant the source compared it with (the whole constant, or a
/// leading slice of at least 4 bits of one of at least 6: what the printer writes by the
/// constant's name): the comparison becomes one product of those bits (built on a smaller such
/// comparison it already reads), and the node reads it beside its other literals; when no such
/// node names a constant, a product only some of whose literals are products of input bits is
/// taken too, its other literals kept beside (F357). Kept when the
/// result has at most `maxGates` gates and depth at most `depthBound`; otherwise `low.net` is
/// left as it was. `forms` is recomputed when kept.
ConstantRegroupResult regroupNamedConstants(frontend::Lowered& low, const frontend::ModuleDesc& desc,
                                            passes::FactoredNetwork& forms, int depthCap, std::size_t depthBound,
                                            passes::FactorCache* cache, double maxGates);

} // namespace kerf::emit
