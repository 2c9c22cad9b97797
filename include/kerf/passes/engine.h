// kerf/passes/engine.h — the restructuring engine: a gain-driven scheduler
// over the techniques of src/passes/, with its goal, effort and every work
// limit as named options.
//
// The engine does not follow a fixed sequence of steps. Each technique is a
// source of moves; a move is one application of the technique to the
// current network, valued by its measured gain (two-input gates of the
// written factored forms, then depth or literals). The scheduler applies
// the move with the largest gain, re-values the others lazily, and stops
// when no move pays or the effort's budget of trials is spent (see
// engine.cpp for the method and its published origin).
#pragma once

#include "kerf/minimize/twolevel.h"
#include "kerf/network/network.h"
#include "kerf/passes/dont_cares.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/inline_small.h"
#include "kerf/passes/pass.h"
#include "kerf/passes/resub_boolean.h"
#include "kerf/passes/reuse_nodes.h"
#include "kerf/passes/share_cubes.h"
#include "kerf/passes/share_divisors.h"

#include <string>
#include <utility>
#include <vector>

namespace kerf::passes {

/// What the engine optimises.
enum class Goal {
    Size,    ///< fewest two-input gates without increasing depth
    Depth,   ///< least depth without increasing two-input gates
};

/// How much work the engine may spend.
enum class Effort { Fast, Default, Thorough };

/// Parse "size"/"depth" and "fast"/"default"/"thorough"; throw kerf::Error (InputError) otherwise.
Goal parseGoal(const std::string& s);
Effort parseEffort(const std::string& s);

/// Every work bound of the engine and its techniques, by name. Defaults
/// depend on the effort (see limitsFor); `--limit NAME=VALUE` overrides one.
struct EngineLimits {
    /// Moves (trial applications of a technique) the scheduler may value.
    int trials = 40;
    /// Largest literal growth a dissolve move may allow per dissolved node;
    /// dissolve moves are tried at growth 0, 1, 2, 4, ... up to this.
    int maxGrowth = 2;
    /// Trials spent re-optimising after a dissolve, before its gain is valued.
    int regroupTrials = 6;
    /// On networks of at least this many gates, a regroup move whose
    /// recorded gain (from a valuation on an earlier network) is below the
    /// smallest gain kept is not valued again until a kept move saves
    /// readmitPermille, and when one regroup move is kept the others valued
    /// on the same network record their gain over it (F144). 0: never;
    /// regroup moves are then valued again like the other techniques.
    std::size_t regroupLazyGates = 20000;
    /// From regroupLazyGates gates on, one regroup valuation bounds the
    /// recorded gain of every other growth on that network (they are not
    /// valued there), and a kept regroup move's gain is taken off every
    /// regroup move's recorded gain, its own included (F255). false: each
    /// growth is valued on its own (F144's rule only).
    bool regroupFamily = true;
    /// From regroupLazyGates gates on, a regroup move is valued only when
    /// no other technique's recorded gain (fresh or from an earlier network)
    /// reaches the smallest gain kept: regrouping re-optimises the whole
    /// dissolved network, so it comes when the cheaper moves have run out,
    /// and its valuation is not lost to a cheaper move kept right after it
    /// (F325). false: regroup moves are ranked by recorded gain like the rest.
    bool regroupLast = true;
    /// A move is kept only when it saves at least this many thousandths of
    /// the current gates (and at least something); smaller gains end the run.
    int minGainPermille = 2;
    /// Whole-network extraction moves made before the scheduler starts: each
    /// values cube and divisor extraction and keeps the better, while it
    /// saves at least the smallest gain kept (0: no opening).
    int openingMoves = 6;
    /// A technique whose move gained nothing this many times in a row is not valued again.
    int giveUpAfter = 3;
    /// A kept move saving at least this many thousandths of the gates brings
    /// every left-out technique back (0: left out for the rest of the run).
    int readmitPermille = 150;
    /// Run kernel extraction (slower; finds multi-cube divisors pairs miss).
    bool kernels = false;
    /// Use implied don't-cares (simulation confirmed by SAT).
    bool impliedDontCares = true;
    /// Covers of more cubes are written as plain sums of products, not factored.
    std::size_t factorMaxCubes = 1000;
    /// Covers of more cubes get only the quick factored form, not the best
    /// one (whose kernel search grows faster than the cover: on the 100k
    /// decoder's outputs it was most of measuring, F174). 0: no bound.
    std::size_t factorBestMaxCubes = 512;
    /// The depth bound the techniques keep times covers of up to this many
    /// cubes by their factored forms, as the result is measured (larger
    /// covers: by the sum of products, which may be deeper). 0 or 1: sums of
    /// products only.
    std::size_t guardFactorCubes = 16;
    /// Networks of more than twice this many literals are restructured region
    /// by region, regions of about this many literals (0: always whole; each
    /// effort's value is set in limitsFor).
    std::size_t regionLiterals = 0;
    /// A network restructured region by region gets the whole-network cube
    /// extraction first only when it holds at most this many cubes; above
    /// it each region extracts its own cubes (0: no bound). That extraction
    /// pairs every cube with cubes sharing its literals and intersects
    /// literal lists that grow with the network: on the 1M decoder it ran
    /// past 578 CPU s and 11.9 GB (F145).
    std::size_t wholeCubesMax = 0;
    /// After the opening, a trial of a technique takes its candidates only
    /// from the changed region: the nodes kept moves changed since the
    /// technique was last valued (and those its own last trial changed, when
    /// it gained), with every node within changedRadius fanin/fanout steps.
    /// The whole network is valued when the technique was never valued, when
    /// the region holds more than changedFullPermille thousandths of the
    /// live nodes, and in the closing sweep (engine.cpp). false: every trial
    /// values the whole network.
    bool changedRegion = true;
    int changedRadius = 1;
    /// Inside a regroup move, the inner techniques' first trials take the
    /// nodes the dissolving changed as their changed region (false: their
    /// first trials value the whole network, later ones their changed region).
    bool changedRegroup = false;
    /// The walk that widens the changed region does not go on from inputs or
    /// from nodes with more fanin literals and fanouts than this.
    int changedWalkDegree = 64;
    int changedFullPermille = 300;
    /// The closing sweep leaves out a technique whose last whole-network
    /// valuation gained less than the smallest gain kept: the nodes changed
    /// since then were all in its later trials' changed regions (F327).
    /// false: every technique last valued on a changed region is swept.
    bool closingQuiet = true;
    minimize::MinimizeOptions minimize;
    InlineOptions dissolve;
    ShareCubesOptions cubes;
    ShareDivisorsOptions divisors;
    ReuseOptions reuse;
    BooleanResubOptions booleanResub;
    DontCareOptions dontCares;
};

/// The limits for an effort level.
EngineLimits limitsFor(Effort e);

/// Set one limit by name ("trials=80"). Throws kerf::Error (InputError)
/// naming the valid limits when the name or value is wrong.
void setLimit(EngineLimits& limits, const std::string& assignment);

/// "name  default  meaning" lines, one per limit (for --help and the docs).
std::string describeLimits();

struct EngineOptions {
    Goal goal = Goal::Size;
    Effort effort = Effort::Default;
    EngineLimits limits = limitsFor(Effort::Default);
    int maxDepth = -1;                ///< -1: the input's depth
    /// Declared don't-care conditions of the outputs, by output name (see
    /// kerf/network/network.h); null or no outputs: none.
    const net::Network* dontCares = nullptr;
    /// Shared cache of factored forms (optional; the engine makes one otherwise).
    FactorCache* cache = nullptr;
    int verbose = 0;
};

/// What one technique did over the whole run.
struct TechniqueRow {
    std::string technique;
    int trials = 0;                   ///< moves valued
    int applied = 0;                  ///< moves kept
    long long gatesSaved = 0;         ///< over the kept moves
    long long depthSaved = 0;
    int unchanged = 0;                ///< moves valued that kept no edit (gain 0, not measured)
    int skipped = 0;                  ///< opening moves not valued: their ceiling was below a gain found
    int focused = 0;                  ///< trials valued over a changed region only
    int closing = 0;                  ///< trials of the closing sweep (whole network, nothing else paid)
    double seconds = 0;               ///< wall time of its trials
    double cpuSeconds = 0;            ///< CPU time of its trials (a regroup's includes its inner trials)
    double peakMB = 0;                ///< the process's peak memory when its last trial ended (MB, largest seen)
    double peakRiseMB = 0;            ///< how far its trials raised the process's peak memory (MB, summed)
    std::vector<std::pair<std::string, long long>> counters;   ///< summed over kept moves
};

/// One kept move, in the order applied.
struct MoveRow {
    std::string technique;
    net::Metrics after;
    long long gatesSaved = 0;
    long long depthSaved = 0;
};

struct EngineResult {
    net::Metrics before, after;       ///< figures on the factored forms of the input and of the result
    std::vector<TechniqueRow> techniques;
    std::vector<MoveRow> moves;
    std::vector<std::string> limitsHit;   ///< limits that cut work short ("trials", "dont-care-conflicts", ...)
    bool keptOriginal = false;        ///< nothing better was found: the input is kept
    int depthCap = -1;                ///< the depth bound the forms were chosen under
    FactoredNetwork forms;            ///< the chosen factored form of every node (what the writer prints)
    int regions = 0;                  ///< regions restructured one by one (0: the whole network at once)
    double seconds = 0;
};

/// Restructure `net` in place. The result is never worse than the input:
/// for Goal::Size fewer gates (then literals) within the depth bound; for
/// Goal::Depth less depth (then fewer gates) with no more gates than the
/// input. Otherwise the input is kept and keptOriginal is set. The forms in
/// the result are computed once and are what the writer and report use.
EngineResult restructure(net::Network& net, const EngineOptions& opts);

/// The report printed at -v: moves kept, then per technique its trials,
/// kept moves, gains, time and counters, then the limits that cut work short.
std::string formatEngineReport(const EngineResult& r);

} // namespace kerf::passes
