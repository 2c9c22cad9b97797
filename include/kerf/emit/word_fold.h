// kerf/emit/word_fold.h — word operations the engine's result fixes, folded before writing.
//
// See src/emit/word_fold.cpp for the idea and the rules.
#pragma once

#include "kerf/frontend/lower.h"

#include <cstddef>
#include <string>
#include <vector>

namespace kerf::emit {

/// Bounds of the fold. Named so that a reader of the code sees why a case is left alone.
struct WordFoldLimits {
    /// A word operation whose operands read at most this many distinct bits (after the
    /// engine) is evaluated over every value of those bits and written as gates (2^n rows).
    int maxSupport = 6;
};

/// What the fold did (for `-v`).
struct WordFoldCounts {
    std::size_t folded = 0;              ///< word operations replaced by gates or a constant
    std::vector<std::string> texts;      ///< one line per fold: the operation and why
};

/// Replaces, in `low.net`, each word operation whose result the engine's network fixes — a
/// constant result, or a comparison with an operand constant as a whole — by
/// gates over those bits (or a constant), and drops the operation and its operand outputs
/// from `low` (`wordOps`, the network's outputs, `outputBits`, `outputSources`). The network
/// is tidied afterwards by the caller (constants folded). Every other operation is untouched.
WordFoldCounts foldWordOperations(frontend::Lowered& low, const WordFoldLimits& limits = {});

} // namespace kerf::emit
