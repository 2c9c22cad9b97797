// kerf/flow/flows.h — the commands' work, independent of the command line.
//
// Data flows one way: read (slang) → network → passes → write → prove.
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <nlohmann/json.hpp>

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace kerf::flow {

/// Options of `kerf restructure`.
struct RestructureOptions {
    frontend::ReadOptions read;
    std::string output;              ///< "" → stdout
    bool inPlace = false;            ///< overwrite the file holding the module
    std::string backupSuffix;        ///< --backup: keep the replaced file's old text in FILE+SUFFIX
    bool quiet = false;              ///< no progress line and no summary on stderr
    bool check = false;              ///< CI mode: write nothing, exit 1 when kerf would change the file
    std::string effort = "default";   ///< fast | default | thorough
    std::string goal = "size";        ///< size | depth
    std::vector<std::string> limits;  ///< engine limits as NAME=N (see passes::describeLimits)
    int maxDepth = -1;
    int verbose = 0;
    std::string reportPath;          ///< --report FILE.json
    bool skipProof = false;
    std::int64_t proofBudget = 10000000;   ///< SAT conflicts over the whole proof
    std::string prefix;              ///< --wire-prefix: prefix of new wire names ("" = descriptive names alone)
    std::string minGain = "2";       ///< --min-gain: gates ("2") or percent ("5%") a group must save
    int textPerGate = 40;            ///< --text-per-gate: emit::WriteOptions::maxTextPerGate (0: off)
    bool diff = false;               ///< print a unified diff instead of the file
    bool dissolveInternal = false;   ///< internal signals may dissolve into the logic (their declarations go)
    std::vector<std::string> keep;   ///< --keep NAME: signals never restructured through (cut points)
    bool keepX = false;              ///< --keep-x: statements whose value can be x stay as written
    bool allModules = false;         ///< --all-modules: every module of the files (restructureAll)
    bool noOutput = false;           ///< write nothing, exit 0 (kerf draw takes the text from the outcome)
    /// Internal: this run is the check of another run's written file (F195, F235): it neither
    /// checks its own output again nor proves anything.
    bool secondRun = false;
    /// Internal, with secondRun: the module as read already (the other run's reading of the
    /// text it is about to write, whose file is the one of `read.files` it names); not read again.
    const frontend::ModuleDesc* preRead = nullptr;
    /// Internal, with secondRun: statements kept as written by their match key (the other run's
    /// statements kept after its proof's lowering agreed on them), with the reasons.
    std::map<std::string, std::string> keptKeys;
    /// Internal: statements of named-value targets whose choice form does not fit, kept as
    /// written by their match key, with the reasons (F236); the figures reported still count
    /// their logic, as `kerf stats` does.
    std::map<std::string, std::string> namedKept;
    /// Internal: runs made again with the statements of named-value targets kept (F236), and
    /// the choice decisions of the runs before (rows of the report's "naming" list).
    int namedKeepRounds = 0;
    /// Set on the run made again for a group whose rewrite named none of the constants it compared
    /// with (F346): comparisons with named constants are rebuilt to be written by their names.
    bool nameConstants = false;
    nlohmann::json namedKeptNaming = nlohmann::json::array();
};

/// What a run of `restructure` produced, for callers that go on with it.
struct RestructureOutcome {
    bool changed = false;   ///< kerf rewrote (or with --check would rewrite) the module
    std::string file;       ///< the file holding the module
    std::string text;       ///< that file's proved rewrite (its text as read when unchanged)
    std::vector<std::string> added;   ///< wires kerf added
    /// The written text's header comment and unused-bits wire (emit::WriteResult's fields), so a
    /// caller adopting `text` can fill in the header (F235).
    std::size_t headerPos = 0, headerLen = 0;
    std::string unusedWire;
    std::vector<std::string> notRead, constantsNotNamed;
    std::size_t gatesBefore = 0, gatesAfter = 0;   ///< the module's figures as read and as written
};

/// Run `kerf restructure`; returns the process exit code. Messages go to stderr.
int restructure(const RestructureOptions& opts, RestructureOutcome* outcome = nullptr);

/// Options of `kerf draw`: the restructure run to draw, and where the picture goes.
struct DrawOptions {
    RestructureOptions how;   ///< read and engine options (nothing is written)
    std::string output;       ///< FILE.dot ("" → DOT on stdout); FILE.svg beside it when `dot` is installed
};
/// Run `kerf draw` (src/flow/draw.cpp): the proved rewrite of the module as a Graphviz
/// graph of its named signals. Returns the process exit code.
int draw(const DrawOptions& opts);

/// `kerf restructure --all-modules` (with --check or --in-place): every module
/// declared in the files, one after the other, each proved on its own, one
/// summary line each and a closing count. Returns the largest exit code of any
/// module; stops early only when Python/pyslang or memory is missing.
int restructureAll(const RestructureOptions& opts);

/// Word-level operators kept as written, by kind.
struct WordOperators {
    std::size_t adders = 0;        ///< + and - (and unary -)
    std::size_t multipliers = 0;   ///< *
    std::size_t comparators = 0;   ///< < <= > >= == != between two variable words
    std::size_t shifters = 0;      ///< shifts by a variable amount
    std::size_t other = 0;
    std::size_t total() const { return adders + multipliers + comparators + shifters + other; }
    std::string str() const;       ///< "1 adder, 1 multiplier" or "none"
};

/// Figures of a module as read (before any clean-up). `restructure` reports
/// the same figures for its input ("before") and for the file it writes ("after").
struct StatsResult {
    std::string module;
    net::Metrics metrics;
    WordOperators words;
    std::size_t restructurable = 0;   ///< members kerf would restructure
    std::size_t kept = 0;             ///< members left as written
};
StatsResult stats(const frontend::ReadOptions& read, bool dissolveInternal = false);

/// Options of `kerf equiv`.
struct EquivOptions {
    frontend::ReadOptions a, b;
    bool json = false;
    std::int64_t proofBudget = 10000000;
    int verbose = 0;
};
/// Run `kerf equiv` (src/flow/equiv.cpp); returns 0 equivalent, 1 different, 3 undecided
/// (including when any statement kept as written has no counterpart with the same text).
int equiv(const EquivOptions& opts);

/// A module as read and lowered for a proof (arithmetic turned into gates).
struct ProofInput {
    frontend::ModuleDesc desc;
    frontend::Lowered low;
};
ProofInput readForProof(const frontend::ReadOptions& read, const std::string& prefix);

} // namespace kerf::flow
