// reductions.h — reductions the source wrote, written as reductions (writer-internal).
//
// See reductions.cpp for the idea and the rules.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/emit/writer.h"
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <set>
#include <string>
#include <vector>

namespace kerf::emit {

/// A statement that assigns a whole reduction of one vector (or one constant slice of it) to
/// a one-bit signal: `assign irq_out = |live;`, `any_req = |req[7:4];` in a combinational block.
struct SourceReduction {
    std::string target;     ///< the one-bit signal assigned
    std::string signal;     ///< the vector reduced
    int lo = 0, hi = 0;     ///< its bits reduced, offsets from the least significant
    char op = '|';          ///< '|', '&' or '^'
    bool negated = false;   ///< `~|`, `~&`, `~^`
    std::string text;       ///< the reduction as the source spells it (`|live`), for reports
};

/// Signals some expression of the module reduces (`|v`, `&v[7:4]`, `^v`): the printer writes
/// an OR (AND) of all bits of a slice of one of them as that reduction, as the source does.
std::set<std::string> reducedSignals(const frontend::ModuleDesc& m);

/// The statements of `m` that assign a reduction whole (see SourceReduction): continuous
/// assignments, and in a combinational block an unconditional assignment at the block's top
/// level that is the block's only assignment to its target.
std::vector<SourceReduction> sourceReductions(const frontend::ModuleDesc& m);

/// The bounds a whole reduction must keep to replace its fragments: as NamingBudget.
struct ReductionBudget {
    std::size_t depthBound = 0;
    double gateMargin = 0;   ///< the --min-gain margin: fragments stay only when they save this much
    /// ... and more than this share of the module's gates with the reduction whole (0 with
    /// `--min-gain 0`, which asks for every gate).
    double share = 0.10;
};

/// Drives each output of `net` (indexed as `low.outputBits`) that a source reduction assigns
/// by that reduction whole (one new node: the OR or AND of the bits it reduces), where the
/// result stays within the depth bound and its fragments would not save the margin; records
/// each decision in `record` (form "whole reduction"). Returns the reductions made whole.
std::size_t keepReductionsWhole(const std::vector<SourceReduction>& reductions, const frontend::Lowered& low,
                                net::Network& net, std::vector<algebra::Factored>& forms,
                                const ReductionBudget& budget, NamingRecord& record, std::string* log = nullptr);

} // namespace kerf::emit
