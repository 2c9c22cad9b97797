// kerf/emit/diff.h — unified diff of two texts, for `restructure --diff`.
//
// The output follows the unified format of POSIX/GNU diff (`--- a`, `+++ b`,
// `@@ -l,n +l,n @@` hunks with three lines of context), so that patch tools
// and code-review pages read it.
#pragma once

#include <string>

namespace kerf::emit {

/// Unified diff of `before` against `after`, labelled with the two names;
/// empty when the texts are equal.
std::string unifiedDiff(const std::string& before, const std::string& after, const std::string& nameBefore,
                        const std::string& nameAfter, int context = 3);

} // namespace kerf::emit
