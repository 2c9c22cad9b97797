// kerf/proof/simulation.h — bit-parallel simulation of an and-inverter graph
// and the seeded input patterns the equivalence checker uses.
//
// One 64-bit word carries 64 input patterns; simulating a word evaluates
// every node for all 64 at once (common trade practice in equivalence
// checking and SAT sweeping, e.g. Kuehlmann et al., IEEE TCAD 2002, from
// memory). Patterns mix uniform random words, mostly-zero and mostly-one
// words, and words with a single 1 (or single 0) per pattern, which reach
// wide ANDs and ORs that uniform patterns almost never excite.
#pragma once

#include "kerf/proof/aig.h"

#include <cstdint>
#include <vector>

namespace kerf::proof {

/// A small deterministic generator (splitmix64 by S. Vigna, public domain
/// algorithm, from memory).
class Random {
public:
    explicit Random(std::uint64_t seed) : state_(seed) {}
    std::uint64_t next() {
        std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ull);
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
        return z ^ (z >> 31);
    }

private:
    std::uint64_t state_;
};

/// Produces one word of patterns per input for each word index.
class PatternSource {
public:
    PatternSource(std::size_t inputCount, std::uint64_t seed);
    /// Words for every input (in Aig::inputs() order) for word number `w`.
    /// Word 0 starts with the all-zero pattern (bit 0) and the all-one pattern (bit 1).
    void fill(std::size_t w, std::vector<std::uint64_t>& inputWords);

private:
    std::size_t inputs_;
    Random rng_;
};

/// Values of every node for one word of patterns (index = node id; node 0 is 0).
/// When `nodes` is non-null only those AND nodes (ascending ids) are evaluated.
void simulateWord(const Aig& g, const std::vector<std::uint64_t>& inputWords, std::vector<std::uint64_t>& values,
                  const std::vector<AigNode>* nodes = nullptr);

/// Value of a literal given node values.
inline std::uint64_t literalValue(const std::vector<std::uint64_t>& values, AigLit l) {
    return aigNegated(l) ? ~values[aigNode(l)] : values[aigNode(l)];
}

} // namespace kerf::proof
