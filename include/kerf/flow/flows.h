// kerf/flow/flows.h — the commands' work, independent of the command line.
//
// Data flows one way: read (slang) → network → passes → write → prove.
#pragma once

#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <nlohmann/json.hpp>

#include <optional>
#include <string>

namespace kerf::flow {

/// Options of `kerf restructure`.
struct RestructureOptions {
    frontend::ReadOptions read;
    std::string output;              ///< "" → stdout
    bool inPlace = false;            ///< overwrite the file holding the module
    std::string backupSuffix;        ///< --backup: keep the replaced file's old text in FILE+SUFFIX
    bool quiet = false;              ///< no progress line and no summary on stderr
    bool check = false;              ///< CI mode: write nothing, exit 1 when kerf would change the file
    std::string effort = "default";
    std::string recipe;
    int maxDepth = -1;
    int verbose = 0;
    std::string reportPath;          ///< --report FILE.json
    bool skipProof = false;
    std::int64_t proofBudget = 10000000;   ///< SAT conflicts over the whole proof
    std::string prefix = "kf_";
};

/// Run `kerf restructure`; returns the process exit code. Messages go to stderr.
int restructure(const RestructureOptions& opts);

/// Figures of a module as read (before any clean-up).
struct StatsResult {
    std::string module;
    net::Metrics metrics;
    std::size_t restructurable = 0;   ///< members kerf would restructure
    std::size_t kept = 0;             ///< members left as written
};
StatsResult stats(const frontend::ReadOptions& read);

/// Options of `kerf equiv`.
struct EquivOptions {
    frontend::ReadOptions a, b;
    bool json = false;
    std::int64_t proofBudget = 10000000;
    int verbose = 0;
};
/// Run `kerf equiv`; returns 0 equivalent, 1 different, 3 undecided.
int equiv(const EquivOptions& opts);

} // namespace kerf::flow
