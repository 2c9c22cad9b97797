// kerf/proof/equivalence.h — combinational equivalence checking of two
// Boolean networks whose inputs and outputs are matched by name.
//
// Method: both networks are built into one and-inverter graph (shared
// inputs, structural hashing), random simulation refutes cheap differences
// and groups internal nodes into candidate classes, and an incremental SAT
// solver proves candidates in topological order, merging proved-equal nodes
// before it proves each output pair (SAT sweeping; A. Kuehlmann et al.,
// "Robust Boolean reasoning for equivalence checking and functional property
// verification", IEEE TCAD 2002, and Kuehlmann and Krohm, DAC 1997 — both
// from memory). Clauses are the Tseitin (1968) encoding of each AND, added
// lazily for the cone a query needs. The SAT solver is CaDiCaL by A. Biere.
// The code is our own.
//
// Soundness rule: an output is reported Equivalent only on a structural
// identity or an UNSAT answer; a budget hit leaves it Undecided. Every
// counterexample is replayed on both networks with net::simulate before it
// is returned.
#pragma once

#include "kerf/network/network.h"
#include "kerf/proof/aig.h"

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace kerf::proof {

enum class Verdict { Equivalent, Different, Undecided };

/// "equivalent", "different" or "undecided".
const char* verdictName(Verdict v);

struct ProofOptions {
    /// Conflict budget of the SAT query for one output pair.
    std::int64_t conflictsPerQuery = 100000;
    /// Conflict budget of the SAT query for one internal candidate pair.
    std::int64_t conflictsPerInternal = 1000;
    /// Conflict budget of the whole proof; internal points may use at most half of it.
    std::int64_t totalConflicts = 10000000;
    /// Internal queries move to a fresh SAT solver once the current one has
    /// this many variables (output queries at sixteen times as many).
    int solverVarLimit = 500;
    /// Words of 64 random patterns simulated before SAT.
    int simWords = 64;
    std::uint64_t seed = 1;
    /// Prove and merge candidate-equal internal nodes before the outputs.
    bool sweepInternal = true;
    /// 0 silent; 1 a summary table on stderr; 2 also progress lines.
    int verbose = 0;
};

struct Counterexample {
    std::string output;           ///< the output that differs
    bool valueA = false, valueB = false;
    /// Every input name of both sides with its value, sorted by name.
    std::vector<std::pair<std::string, bool>> inputs;
};

struct ProofStats {
    std::size_t outputs = 0;          ///< output pairs compared
    std::size_t byStructure = 0;      ///< drivers became the same literal (hashing, or hashing after merges)
    std::size_t byHashing = 0;        ///< of byStructure: same literal straight after hashing both sides
    std::size_t bySimulation = 0;     ///< refuted by random simulation
    std::size_t bySat = 0;            ///< settled (proved or refuted) by an output SAT query
    std::size_t undecided = 0;        ///< budget exhausted
    std::size_t internalMerged = 0;   ///< internal nodes proved equal to an earlier node and merged
    std::size_t internalRefuted = 0;  ///< internal candidates split by a SAT counterexample
    std::size_t internalJustified = 0;///< of internalRefuted: split by a justified pattern, no SAT call
    std::size_t internalUndecided = 0;///< internal candidates left unmerged on budget
    std::size_t patternFolds = 0;     ///< words of 64 splitting patterns re-simulated on the whole graph
    std::size_t satCalls = 0;
    std::size_t solvers = 0;          ///< SAT solver instances used (see ProofOptions::solverVarLimit)
    std::int64_t conflicts = 0;       ///< conflicts spent (counted through learned clauses)
    std::size_t aigNodes = 0;         ///< AND nodes of the shared graph
    std::size_t aigInputs = 0;
    double seconds = 0, simSeconds = 0, satSeconds = 0;
};

struct ProofResult {
    Verdict verdict = Verdict::Undecided;
    std::vector<std::string> failingOutputs;    ///< outputs shown to differ (A's output order)
    std::optional<Counterexample> cex;          ///< for the first failing output
    std::vector<std::string> undecidedOutputs;  ///< outputs neither proved nor refuted
    ProofStats stats;
    std::string boundaryNote;                   ///< what the proof assumed (matched names, one-sided inputs)
};

/// Check that every output of `a` equals the output of `b` with the same name
/// for every assignment of the inputs (matched by name). Throws kerf::Error
/// when the output names differ or a side repeats an input or output name.
/// An input present on one side only is allowed (unused on the other side).
///
/// `dontCaresA`, when given, holds the don't-care conditions of `a`'s outputs
/// (see the note on don't-care conditions in kerf/network/network.h): an output of `a` whose name is also an output of
/// `dontCaresA` is compared only where that condition is 0 (where the source
/// assigns a value rather than x). Its inputs are matched by name too.
ProofResult proveEquivalent(const net::Network& a, const net::Network& b, const ProofOptions& opts = {},
                            const net::Network* dontCaresA = nullptr);

// ---- graph-level interface (used by proveEquivalent; also for tests) ----

enum class PairStatus { Equal, Different, Undecided };
enum class SettledBy { Hashing, Merging, Simulation, Sat, Budget };

struct PairOutcome {
    PairStatus status = PairStatus::Undecided;
    SettledBy by = SettledBy::Budget;
    /// When Different: one value per graph input (Aig::inputs() order) that
    /// makes the two literals differ.
    std::vector<std::uint8_t> pattern;
};

struct PairsReport {
    std::vector<PairOutcome> pairs;
    ProofStats stats;
};

/// Decide each pair of literals of one graph equal or different.
PairsReport provePairs(const Aig& g, const std::vector<std::pair<AigLit, AigLit>>& pairs,
                       const ProofOptions& opts = {});

} // namespace kerf::proof
