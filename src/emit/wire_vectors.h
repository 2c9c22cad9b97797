// wire_vectors.h — new wires that share one shape over consecutive bits, as one vector
// wire (writer-internal). See wire_vectors.cpp for the idea and the rules.
#pragma once

#include "expression.h"

#include <cstddef>
#include <string>
#include <vector>

namespace kerf::emit {

/// A family of new scalar wires whose definitions share one shape over consecutive bits of
/// the same vectors: written as one vector wire whose bit k is member k.
struct WireRun {
    std::vector<std::size_t> members;   ///< indices into the definitions given, bit 0 first
    PExpr shape;                        ///< the vector-wide definition (vectorTemplate)
};

/// The families among the definitions `defs` (per wire, as printed) of at least `minRun`
/// wires, each wire in at most one; wires with different `key` (their statement group, -1 for
/// none: never in a family) are never in one family. Deterministic: families in order of
/// their first member, members in bit order.
std::vector<WireRun> findWireRuns(const std::vector<PExpr>& defs, const std::vector<int>& key,
                                  std::size_t minRun);

/// A name stem for a family from its vector-wide definition, by the rules the writer names a
/// scalar wire with (docs/guide.md): `{8{sel_is_8}} & d3` -> "sel_is_8_d3",
/// `a[7:4] | ~b[3:0]` -> "a_7_4_or_nb_3_0"; "" when the shape has no short name.
std::string familyStem(const PExpr& shape);

} // namespace kerf::emit
