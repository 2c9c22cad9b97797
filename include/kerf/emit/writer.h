// kerf/emit/writer.h — splicing restructured logic back into the source file.
//
// The output is the file that holds the module with only the restructured
// statements replaced: every other byte stays. Declarations of internal
// signals that the network dissolved are removed from their statements.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/network/network.h"

#include <string>

namespace kerf::emit {

struct WriteOptions {
    std::string prefix = "kf_";   ///< prefix of generated wire names
    std::string banner;           ///< extra comment line for the block header (e.g. proof status)
    /// Factored form per node id to print; when null each node is factored here.
    const std::vector<algebra::Factored>* forms = nullptr;
};

struct WriteResult {
    std::string text;             ///< the whole rewritten file
    std::string file;             ///< the file it replaces
    bool changed = false;         ///< false when nothing was restructured
    std::size_t assignments = 0;  ///< generated assignments
    std::size_t wires = 0;        ///< generated intermediate wires
};

/// Produce the rewritten source of the file holding `m`.
WriteResult writeModule(const frontend::ModuleDesc& m, const frontend::Lowered& lowered,
                        const net::Network& network, const WriteOptions& opts = {});

} // namespace kerf::emit
