// kerf/emit/guard.h — the elaboration-time guard for pinned parameters.
//
// `kerf restructure --param NAME=VALUE` specialises the logic that depends on
// NAME for that value. The written file then carries a generate branch that
// is elaborated only when a build sets NAME to something else, and that
// stops the build there. In SystemVerilog files it is an elaboration-time
// `$error` naming the pinned values (IEEE 1800-2017 20.11). Verilog-2005 has
// no such task, and Icarus Verilog 11 does not read one as a module item, so
// `.v` files — and `.sv` files under Icarus (`ifdef __ICARUS__`) — declare a
// net whose initial value replicates a negative number of times, which no
// tool elaborates (IEEE 1364-2005 5.1.14, IEEE 1800-2017 11.4.12.1); the
// net's name and the comment above it say what happened. Measured: slang and
// Verilator stop on the `$error`, Icarus Verilog 11 on the net. The writer
// prints the text this file produces; the proof checks that it is the only
// statement the rewrite adds to what kerf keeps as written.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <set>
#include <string>
#include <vector>

namespace kerf::emit {

/// A parameter the rewrite is specialised for.
struct PinnedValue {
    std::string name;
    std::string value;        ///< as slang prints it, for messages
    std::string literal;      ///< sized literal for the comparison
    bool implicitType = false;///< declared without a type: compare the width too (SystemVerilog only: $bits)
};

/// Pinned parameters that the statements `replaced` (member ids) depend on, declaration order.
std::vector<PinnedValue> pinnedValues(const frontend::ModuleDesc& m, const std::set<int>& replaced);

/// The guard block (lines ending in '\n', each starting with `indent`), or "" when `pins` is empty.
std::string parameterGuard(const std::vector<PinnedValue>& pins, bool systemVerilog, const std::string& indent);

/// `text` between double quotes, with `"` and `\\` escaped: a Verilog string literal
/// (IEEE 1800-2017 5.9) and a Graphviz DOT quoted identifier alike.
std::string doubleQuoted(const std::string& text);

/// "W = 4, MODE = 2'b01" — for headers and summaries.
std::string pinnedList(const std::vector<PinnedValue>& pins);

} // namespace kerf::emit
