// engine.cpp — the restructuring engine: a gain-driven scheduler over the
// techniques.
//
// Idea. Every technique (two-level minimisation of nodes, divisor and cube
// extraction, resubstitution, minimisation against don't-cares, and
// "regroup": dissolving small nodes and re-optimising what results) is a
// source of moves. A move is valued by what it actually does to the network
// that will be written: the two-input gates and depth of the factored forms
// (passes::measureFactored), compared with the current network. The
// scheduler keeps, for every source, the gain it showed when last valued.
// It values the source with the highest recorded gain again on the current
// network; when that source's fresh gain is still at least every other
// recorded gain, its move is kept. Recorded gains of the other sources are
// kept as estimates after a change rather than re-measured at once — the
// lazy evaluation of greedy algorithms (M. Minoux, "Accelerated greedy
// algorithms for maximizing submodular set functions", 1978, from memory).
// The run stops when every source, valued on the current network, gains
// nothing, or when the effort's budget of trials is spent.
//
// Dissolving nodes (elimination) seldom pays by itself: its value is the
// structure the other techniques find afterwards. A regroup move therefore
// dissolves nodes whose elimination grows the literals by at most g, runs
// the same scheduler without regroup moves on the result for a few trials,
// and is valued by the network it ends with. Regroup sources exist for
// growth 0, 1, 2, 4, ... up to the effort's maximum growth, so the engine
// itself finds how far flattening pays on each design. On large networks
// (limit regroup-lazy-gates) regroup moves follow the lazy greedy premise
// strictly: a recorded gain is taken as a bound, so a regroup move whose
// recorded gain is below the smallest gain kept is not valued again until a
// large kept move readmits it, and keeping one regroup move lowers the other
// growths' recorded gains by its own (they are alternatives on the same
// network; see dormant and siblingsAfter); with regroup-family one
// valuation there stands for every growth (familyAfterValuing).
//
// Changed regions. After the opening, a trial of a technique looks for
// candidates only where the network changed since that technique was last
// valued (limit changed-region): the rule is
//   region = the nodes the kept moves since then changed (changedNodes: new
//            or rewritten nodes, fanins that lost a reader, output drivers),
//          + the nodes the technique's own last trial changed, when that
//            trial gained but was not kept (it found something there),
//          + every node within changed-radius fanin/fanout steps of those
//            (the walk does not go on from inputs or from nodes with more
//            than changed-walk-degree fanin literals and fanouts),
// and each technique values its candidates from the region against the
// whole network (see PassContext::focus and each technique's header). The
// whole network is valued instead when the technique was never valued
// (its first trial, and the opening), when the region holds more than
// changed-full-permille of the live nodes, and in the closing sweep: when
// nothing pays on the current network, each technique whose last trial
// looked at a region only is valued once over the whole network while the
// trial budget allows. Regroup moves dissolve over the whole network (their
// point is to undo structure anywhere); with changed-regroup their inner
// techniques start from the nodes the dissolving changed. Looking again
// only where a change can have opened a gain is the usual way to make
// repeated local rewriting incremental; the rule and its bounds are ours.
//
// Goals. For Goal::Size a move gains when it saves gates (then literals)
// within the depth bound; for Goal::Depth when it lowers depth (then gates)
// without the gates exceeding the input's.
#include "kerf/passes/engine.h"

#include "kerf/diagnostics.h"
#include "kerf/passes/shrink_nodes.h"
#include "kerf/passes/tidy.h"
#include "regions.h"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <functional>
#include <limits>
#include <map>
#include <memory>
#include <optional>

namespace kerf::passes {

void PassStats::add(const std::string& name, long long amount) {
    for (auto& [n, v] : items_)
        if (n == name) { v += amount; return; }
    items_.push_back({name, amount});
}

long long PassStats::get(const std::string& name) const {
    for (const auto& [n, v] : items_)
        if (n == name) return v;
    return 0;
}

std::string PassStats::str() const {
    std::string s;
    for (const auto& [n, v] : items_) s += fmt::format("{}{}={}", s.empty() ? "" : " ", n, v);
    return s;
}

namespace {

double since(std::chrono::steady_clock::time_point t) {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - t).count();
}


// ---- limits by name ---------------------------------------------------------

struct LimitInfo {
    const char* name;
    const char* meaning;
    std::function<void(EngineLimits&, long long)> set;    // other fields
    std::function<long long(const EngineLimits&)> get;
    long long min = 0;
};

template <class T>
LimitInfo field(const char* name, const char* meaning, T EngineLimits::*member, long long min = 0) {
    LimitInfo li{name, meaning, nullptr, nullptr, min};
    li.set = [member](EngineLimits& l, long long v) { l.*member = static_cast<T>(v); };
    li.get = [member](const EngineLimits& l) { return static_cast<long long>(l.*member); };
    return li;
}

template <class S, class T>
LimitInfo sub(const char* name, const char* meaning, S EngineLimits::*group, T S::*member, long long min = 0) {
    LimitInfo li{name, meaning, nullptr, nullptr, min};
    li.set = [group, member](EngineLimits& l, long long v) { (l.*group).*member = static_cast<T>(v); };
    li.get = [group, member](const EngineLimits& l) { return static_cast<long long>((l.*group).*member); };
    return li;
}

const std::vector<LimitInfo>& limitTable() {
    static const std::vector<LimitInfo> t = {
        field("trials", "moves the scheduler may value before it stops", &EngineLimits::trials, 1),
        field("max-growth", "largest literal growth per dissolved node in regroup moves", &EngineLimits::maxGrowth),
        field("regroup-trials", "trials spent re-optimising inside one regroup move", &EngineLimits::regroupTrials),
        field("regroup-lazy-gates",
              "from this many gates on, a regroup move whose recorded gain is below the smallest gain kept is not "
              "valued again until a kept move saves readmit-permille (0: never)",
              &EngineLimits::regroupLazyGates),
        field("regroup-family",
              "1: from regroup-lazy-gates gates on, one regroup valuation bounds the gain of every growth on that "
              "network, and a kept regroup move lowers them all (0: each growth valued on its own)",
              &EngineLimits::regroupFamily),
        field("regroup-last",
              "1: from regroup-lazy-gates gates on, a regroup move is valued only when no other technique's recorded "
              "gain reaches the smallest gain kept (0: ranked by recorded gain like the others)",
              &EngineLimits::regroupLast),
        field("closing-quiet",
              "1: the closing sweep leaves out a technique whose last whole-network trial gained less than the "
              "smallest gain kept (0: every technique last valued on a changed region)",
              &EngineLimits::closingQuiet),
        field("opening-moves",
              "whole-network extraction moves (cubes or divisors, the better) made first, while they pay",
              &EngineLimits::openingMoves),
        field("give-up-after", "valuations in a row without gain after which a technique is left out",
              &EngineLimits::giveUpAfter, 1),
        field("readmit-permille",
              "a kept move saving this many thousandths of the gates brings left-out techniques back (0: never)",
              &EngineLimits::readmitPermille),
        field("min-gain-permille", "smallest gain kept, in thousandths of the current gates",
              &EngineLimits::minGainPermille),
        field("kernels", "1: also extract common kernels (slower)", &EngineLimits::kernels),
        field("implied-dont-cares", "1: minimise nodes against implied don't-cares", &EngineLimits::impliedDontCares),
        field("factor-max-cubes", "covers with more cubes are written unfactored", &EngineLimits::factorMaxCubes, 1),
        field("factor-best-max-cubes",
              "covers with more cubes get only the quick factored form, not the best one (0: no bound)",
              &EngineLimits::factorBestMaxCubes),
        field("guard-factored-cubes",
              "the depth bound times covers up to this many cubes by their factored forms (larger: sums of products)",
              &EngineLimits::guardFactorCubes),
        field("region-literals",
              "networks of more than twice this many literals are restructured region by region (0: whole)",
              &EngineLimits::regionLiterals),
        field("whole-cubes-max",
              "region by region: the whole-network cube extraction runs only up to this many cubes (larger: per region; 0: no bound)",
              &EngineLimits::wholeCubesMax),
        field("changed-region", "1: after the opening, trials look only at the changed region (0: whole network)",
              &EngineLimits::changedRegion),
        field("changed-radius", "fanin/fanout steps around the changed nodes that a changed region takes in",
              &EngineLimits::changedRadius),
        field("changed-regroup",
              "1: a regroup move's inner trials start from the nodes its dissolving changed (0: whole network first)",
              &EngineLimits::changedRegroup),
        field("changed-walk-degree",
              "the changed region's walk does not go on from nodes with more fanin literals and fanouts",
              &EngineLimits::changedWalkDegree),
        field("changed-full-permille",
              "a changed region of more than this many thousandths of the live nodes is valued as the whole network",
              &EngineLimits::changedFullPermille),
        sub("minimise-exact-vars", "exact two-level minimum up to this many variables", &EngineLimits::minimize,
            &minimize::MinimizeOptions::exactVars),
        sub("minimise-table-vars", "truth-table minimisation up to this many variables (at most 16)",
            &EngineLimits::minimize, &minimize::MinimizeOptions::tableVars),
        sub("minimise-heuristic-cubes", "larger covers get only containment", &EngineLimits::minimize,
            &minimize::MinimizeOptions::maxHeuristicCubes),
        sub("minimise-cover-search", "branch-and-bound nodes of the exact covering search", &EngineLimits::minimize,
            &minimize::MinimizeOptions::coverSearchLimit),
        sub("minimise-implication-steps", "steps of one implication check", &EngineLimits::minimize,
            &minimize::MinimizeOptions::implicationSteps),
        sub("minimise-heuristic-steps", "steps of one expand/irredundant run", &EngineLimits::minimize,
            &minimize::MinimizeOptions::heuristicSteps),
        sub("minimise-complement-steps", "steps of one complementation", &EngineLimits::minimize,
            &minimize::MinimizeOptions::complementSteps),
        sub("dissolve-max-cubes", "cubes a cover may reach when nodes are dissolved into it", &EngineLimits::dissolve,
            &InlineOptions::maxCubes, 1),
        sub("dissolve-max-literals", "literals a cover may reach when nodes are dissolved into it",
            &EngineLimits::dissolve, &InlineOptions::maxLiterals, 1),
        sub("dissolve-max-fanouts", "nodes with more fanouts are not dissolved", &EngineLimits::dissolve,
            &InlineOptions::maxFanouts),
        sub("dissolve-complement-cubes", "largest complement computed where a node is read inverted (bounds its work)",
            &EngineLimits::dissolve, &InlineOptions::complementCubeCap, 1),
        sub("dissolve-revalue-cubes",
            "fanins of a cover up to this many cubes are re-valued at once after a dissolve (wider: when next taken)",
            &EngineLimits::dissolve, &InlineOptions::revalueMaxCubes),
        sub("cubes-min-literals", "smallest cube extracted", &EngineLimits::cubes, &ShareCubesOptions::minLiterals, 2),
        sub("cubes-partners", "cube pairs looked at per cube", &EngineLimits::cubes,
            &ShareCubesOptions::partnersPerCube, 1),
        sub("cubes-rounds", "rounds of cube extraction per move", &EngineLimits::cubes, &ShareCubesOptions::rounds, 1),
        sub("cubes-candidates", "candidate cubes valued per round", &EngineLimits::cubes,
            &ShareCubesOptions::maxCandidates, 1),
        sub("cubes-work", "cubes looked at per move", &EngineLimits::cubes, &ShareCubesOptions::workBudget, 1),
        sub("cubes-in-place", "networks of at least this many cubes get cube extraction in place, by index (0: never)",
            &EngineLimits::cubes, &ShareCubesOptions::inPlaceCubes),
        sub("divisors-pair-max-cubes", "nodes with more cubes give no divisors (two-cube or two-literal)", &EngineLimits::divisors,
            &ShareDivisorsOptions::maxCubesForPairs),
        sub("divisors-cube-pair-max-cubes",
            "nodes with more cubes give two-literal divisors only, no two-cube ones (0: divisors-pair-max-cubes)",
            &EngineLimits::divisors, &ShareDivisorsOptions::maxCubesForCubePairs),
        sub("divisors-literal-pair-max-cube", "cubes with more literals give no two-literal divisors",
            &EngineLimits::divisors, &ShareDivisorsOptions::maxCubeForLiteralPairs),
        sub("divisors-kernels-per-node", "kernels enumerated per node", &EngineLimits::divisors,
            &ShareDivisorsOptions::maxKernelsPerNode, 1),
        sub("divisors-kernel-work", "steps of one node's kernel enumeration", &EngineLimits::divisors,
            &ShareDivisorsOptions::kernelWork, 1),
        sub("divisors-max-extractions", "divisors extracted per move", &EngineLimits::divisors,
            &ShareDivisorsOptions::maxExtractions, 1),
        sub("divisors-max-candidates",
            "candidate divisors one move holds (when full, divisors not in it are not counted; 0: no bound)",
            &EngineLimits::divisors, &ShareDivisorsOptions::maxCandidates),
        sub("resub-candidates", "existing nodes tried as divisors per node", &EngineLimits::reuse,
            &ReuseOptions::maxCandidates),
        sub("resub-complement-cubes", "cubes of a complement used as a divisor", &EngineLimits::reuse,
            &ReuseOptions::complementCubeCap),
        sub("resub-max-cubes", "larger covers are neither divided nor used as divisors", &EngineLimits::reuse,
            &ReuseOptions::maxCubes),
        sub("resub-fanout-scan", "nodes reading a variable with more readers are not tried as divisors", &EngineLimits::reuse,
            &ReuseOptions::fanoutScanLimit),
        sub("bresub-divisors", "existing nodes tried as divisors per node (Boolean resubstitution)",
            &EngineLimits::booleanResub, &BooleanResubOptions::divisors),
        sub("bresub-window-nodes", "fanout nodes re-simulated to judge where a node is observed",
            &EngineLimits::booleanResub, &BooleanResubOptions::windowNodes),
        sub("bresub-exhaustive-inputs", "Boolean resubstitution simulates every input pattern up to this many inputs (at most 20)",
            &EngineLimits::booleanResub, &BooleanResubOptions::exhaustiveInputs),
        sub("bresub-simulation-words", "words of 64 random patterns otherwise (candidates then confirmed by SAT)",
            &EngineLimits::booleanResub, &BooleanResubOptions::simulationWords, 1),
        sub("bresub-cone-limit", "nodes in one confirming SAT query", &EngineLimits::booleanResub,
            &BooleanResubOptions::coneLimit),
        sub("bresub-cone-levels", "levels of logic one confirming query reaches back (further nodes are free)",
            &EngineLimits::booleanResub, &BooleanResubOptions::coneLevels, 1),
        sub("bresub-query-conflicts", "SAT conflicts of one confirmation", &EngineLimits::booleanResub,
            &BooleanResubOptions::conflictsPerQuery),
        sub("bresub-total-conflicts", "SAT conflicts of one Boolean resubstitution move", &EngineLimits::booleanResub,
            &BooleanResubOptions::totalConflicts),
        sub("bresub-queries", "SAT confirmations of one Boolean resubstitution move", &EngineLimits::booleanResub,
            &BooleanResubOptions::maxQueries),
        sub("bresub-forms-per-node", "candidate forms tried per node, cheapest first", &EngineLimits::booleanResub,
            &BooleanResubOptions::formsPerNode, 1),
        sub("bresub-max-network-nodes", "networks with more nodes get no Boolean resubstitution",
            &EngineLimits::booleanResub, &BooleanResubOptions::maxNetworkNodes),
        sub("bresub-max-nodes", "nodes examined per Boolean resubstitution move (0: technique off)",
            &EngineLimits::booleanResub, &BooleanResubOptions::maxNodes),
        sub("dc-max-fanins", "nodes reading more variables get no don't-cares (at most 16)", &EngineLimits::dontCares,
            &DontCareOptions::maxFanins),
        sub("dc-exhaustive-inputs", "simulate every input pattern up to this many inputs (at most 20)",
            &EngineLimits::dontCares, &DontCareOptions::exhaustiveInputs),
        sub("dc-simulation-words", "words of 64 random patterns otherwise", &EngineLimits::dontCares,
            &DontCareOptions::simulationWords, 1),
        sub("dc-window-nodes", "fanout nodes re-simulated to judge observability", &EngineLimits::dontCares,
            &DontCareOptions::windowNodes),
        sub("dc-cone-limit", "nodes in one SAT query", &EngineLimits::dontCares, &DontCareOptions::coneLimit),
        sub("dc-cone-levels", "levels of logic one SAT query reaches back (further nodes are free)",
            &EngineLimits::dontCares, &DontCareOptions::coneLevels, 1),
        sub("dc-work-per-node", "work of one don't-care move per network node (patterns simulated, nodes encoded)",
            &EngineLimits::dontCares, &DontCareOptions::workPerNode, 1),
        sub("dc-query-conflicts", "SAT conflicts of one query", &EngineLimits::dontCares,
            &DontCareOptions::conflictsPerQuery),
        sub("dc-refinements", "counterexamples taken per node", &EngineLimits::dontCares,
            &DontCareOptions::refinementsPerNode),
        sub("dc-total-conflicts", "SAT conflicts of one don't-care move", &EngineLimits::dontCares,
            &DontCareOptions::totalConflicts),
        sub("dc-max-network-nodes", "networks with more nodes get no don't-care moves", &EngineLimits::dontCares,
            &DontCareOptions::maxNetworkNodes),
        sub("dc-max-nodes", "nodes examined per don't-care move", &EngineLimits::dontCares,
            &DontCareOptions::maxNodes),
    };
    return t;
}

std::string validLimits() {
    std::string s;
    for (const LimitInfo& li : limitTable()) s += fmt::format("\n  {:<30} {}", li.name, li.meaning);
    return s;
}

// ---- the network's value for a goal -------------------------------------------

struct Value {
    long long gates = 0, depth = 0, literals = 0;
};

Value valueOf(const net::Metrics& m) {
    return {static_cast<long long>(m.gates), static_cast<long long>(m.depth), static_cast<long long>(m.literals)};
}

// A gain as one number for ranking: the goal's first figure dominates.
double gainOf(Goal goal, const Value& from, const Value& to) {
    const double dg = static_cast<double>(from.gates - to.gates);
    const double dd = static_cast<double>(from.depth - to.depth);
    const double dl = static_cast<double>(from.literals - to.literals);
    if (goal == Goal::Size) return dg + dl * 1e-4;
    return dd * 1e6 + dg + dl * 1e-4;
}

struct Source {
    std::string name;
    std::function<void(net::Network&, PassContext&)> run;
    int growth = -1;                       // >= 0: a regroup move dissolving at this growth
    double estimate = std::numeric_limits<double>::infinity();
    long valuedAt = -1;                    // network version of the last valuation (-1: never: whole network)
    bool lastFocused = false;              // the last valuation looked at a changed region only
    bool quietWhole = false;               // its last whole-network valuation gained less than the smallest gain kept
    std::vector<net::NodeId> ownEdits;     // nodes its last trial changed, when that trial gained (kept or not)
    bool familyBound = false;              // regroup: estimate bounded by another growth's valuation (F255)
    int misses = 0;                        // valuations in a row without a gain worth keeping
    std::unique_ptr<net::Network> pending; // the valued result (valid while valuedAt is current)
    std::optional<net::Metrics> pendingMetrics;
    MeasureMemo pendingMemo;               // the pending network's measurement (the base of later ones)
    PassStats pendingStats;
    /// Optional: an estimate from above of what one move can save on a
    /// network (the gates of the nodes the technique can rewrite), cheap to
    /// compute. The opening skips valuing a technique whose estimate is
    /// below a gain already found.
    std::function<double(const net::Network&)> ceiling;
};

// Two-input gates of the sums of products of the nodes of at most `maxCubes`
// cubes: divisor extraction rewrites no other node (larger ones are left to
// cube extraction, see share_divisors.h), so a move saves about this much at
// most (factored forms have no more gates than the sums of products; a move
// may change the depth slack of other nodes, which this does not count).
// The nodes of b (derived from a by a move: nodes only added or marked
// dead) that differ from a: live nodes whose cover changed or that are new,
// the fanins a changed or removed node read in a and no longer reads in b
// (they lost a reader), and the old and new drivers of outputs whose driver
// changed. Sorted.
std::vector<net::NodeId> changedNodes(const net::Network& a, const net::Network& b) {
    std::vector<net::NodeId> out, before, after;
    auto varsOf = [](const algebra::Cover& f, std::vector<net::NodeId>& vs) {
        vs.clear();
        for (const algebra::Cube& c : f.cubes)
            for (algebra::Literal l : c.lits) vs.push_back(algebra::literalVar(l));
        std::sort(vs.begin(), vs.end());
        vs.erase(std::unique(vs.begin(), vs.end()), vs.end());
    };
    for (net::NodeId v = 0; v < b.nodeCount(); ++v) {
        const bool la = v < a.nodeCount() && a.isLogic(v), lb = b.isLogic(v);
        if (!la && !lb) continue;
        if (la && lb && a.node(v).cover == b.node(v).cover) continue;
        if (lb) out.push_back(v);
        if (!la) continue;
        varsOf(a.node(v).cover, before);
        after.clear();
        if (lb) varsOf(b.node(v).cover, after);
        std::set_difference(before.begin(), before.end(), after.begin(), after.end(), std::back_inserter(out));
    }
    for (std::size_t i = 0; i < b.outputs().size() && i < a.outputs().size(); ++i)
        if (a.outputs()[i].driver != b.outputs()[i].driver) {
            out.push_back(algebra::literalVar(a.outputs()[i].driver));
            out.push_back(algebra::literalVar(b.outputs()[i].driver));
        }
    std::sort(out.begin(), out.end());
    out.erase(std::unique(out.begin(), out.end()), out.end());
    return out;
}

std::size_t cubeCount(const net::Network& n) {
    std::size_t total = 0;
    for (net::NodeId v = 0; v < n.nodeCount(); ++v)
        if (n.isLogic(v)) total += n.node(v).cover.cubes.size();
    return total;
}

double gatesOfNodesUpTo(const net::Network& n, std::size_t maxCubes) {
    double g = 0;
    for (net::NodeId v = 0; v < n.nodeCount(); ++v) {
        if (!n.isLogic(v)) continue;
        const algebra::Cover& cv = n.node(v).cover;
        if (cv.cubes.empty() || cv.cubes.size() > maxCubes) continue;
        g += static_cast<double>(cv.literalCount() - 1);
    }
    return g;
}

class Scheduler {
public:
    Scheduler(const EngineOptions& opts, EngineResult& res, FactorCache& cache, std::size_t passCap, int measureCap,
              long long gateCeiling)
        : opts_(opts), res_(res), cache_(cache), passCap_(passCap), measureCap_(measureCap),
          gateCeiling_(gateCeiling) {}

    std::vector<Source> makeSources(bool withRegroup) const {
        const EngineLimits& L = opts_.limits;
        std::vector<Source> s;
        auto add = [&](std::string name, std::function<void(net::Network&, PassContext&)> f, int growth = -1) {
            Source x;
            x.name = std::move(name);
            x.run = std::move(f);
            x.growth = growth;
            s.push_back(std::move(x));
        };
        ShrinkMemo* shrinkMemo = shrinkMemo_;
        add("minimise-nodes", [L, shrinkMemo](net::Network& n, PassContext& c) {
            ShrinkOptions o;
            o.minimize = L.minimize;
            shrinkNodes(n, o, c, shrinkMemo);
        });
        add("extract-divisors", [L](net::Network& n, PassContext& c) {
            ShareDivisorsOptions o = L.divisors;
            o.method = ShareDivisorsOptions::Method::Pairs;
            shareDivisors(n, o, c);
        });
        s.back().ceiling = [L](const net::Network& n) { return gatesOfNodesUpTo(n, L.divisors.maxCubesForPairs); };
        if (L.kernels)
            add("extract-kernels", [L](net::Network& n, PassContext& c) {
                ShareDivisorsOptions o = L.divisors;
                o.method = ShareDivisorsOptions::Method::Kernels;
                shareDivisors(n, o, c);
            });
        const int* passes = &openingPasses_;
        add("extract-cubes", [L, passes](net::Network& n, PassContext& c) {
            ShareCubesOptions o = L.cubes;
            o.passes = *passes;   // > 1 only for the opening's one move of passes (F293)
            o.passMinPermille = L.minGainPermille;
            shareCubes(n, o, c);
        });
        add("resubstitute", [L](net::Network& n, PassContext& c) { reuseNodes(n, L.reuse, c); });
        if (L.booleanResub.maxNodes > 0)
            add("resubstitute-boolean", [L](net::Network& n, PassContext& c) { resubstituteBoolean(n, L.booleanResub, c); });
        if (L.impliedDontCares || (opts_.dontCares && !opts_.dontCares->outputs().empty())) {
            const net::Network* declared =
                opts_.dontCares && !opts_.dontCares->outputs().empty() ? opts_.dontCares : nullptr;
            DontCareOptions o = L.dontCares;
            if (!L.impliedDontCares) o.maxNodes = 0;   // declared only: outputs' drivers (see dont_cares.cpp)
            DontCareMemo* memo = dcMemo_;
            add("dont-care-minimise", [o, declared, memo](net::Network& n, PassContext& c) {
                minimiseWithDontCares(n, o, declared, c, memo);
            });
        }
        if (withRegroup) {
            std::vector<int> growths = {0};
            for (int g = 1; g <= L.maxGrowth; g = g < 2 ? g + 1 : g * 2) growths.push_back(g);
            for (int g : growths) {
                InlineOptions o = L.dissolve;
                o.threshold = g;
                add(fmt::format("regroup(max-growth={})", g),
                    [o](net::Network& n, PassContext& c) { inlineSmall(n, o, c); }, g);
            }
        }
        return s;
    }

    /// Run the lazy greedy loop on `net` (whose figures are `current`) for at
    /// most `budget` trials. Returns the figures of the result.
    net::Metrics run(net::Network& net, net::Metrics current, std::vector<Source>& sources, int budget, bool top) {
        long version = static_cast<long>(log_.size());
        int trials = 0;
        if (top) opening(net, current, sources, budget, version, trials);
        for (;;) {
            version_ = version;
            currentGates_ = current.gates;
            // The source with the highest recorded gain (stale or fresh).
            // Regroup moves wait while another technique's recorded gain
            // reaches the smallest gain kept (regroupsWait, F325).
            const bool waitRegroups = regroupsWait(sources, current);
            Source* best = nullptr;
            bool allFresh = true;
            for (Source& s : sources) {
                if (leftOut(s)) continue;   // it keeps finding nothing
                if (waitRegroups && s.growth >= 0) continue;
                if (s.valuedAt != version) allFresh = false;
                if (!best || s.estimate > best->estimate ||
                    (s.estimate == best->estimate && best->valuedAt == version && s.valuedAt != version) ||
                    (s.estimate == best->estimate && widerStandIn(s, *best, version)))
                    best = &s;
            }
            if (!best) {
                if (top && closingSweep(net, current, sources, budget, version, trials)) continue;
                break;
            }
            if (best->valuedAt == version) {
                if (best->estimate >= minGain(current) && best->pending) {
                    const std::size_t gatesBefore = current.gates;
                    siblingsAfter(*best, version, best->estimate, sources);
                    apply(net, current, *best, top);
                    ++version;
                    if (top) readmitAfter(gatesBefore, current.gates, sources);
                    continue;
                }
                if (allFresh) {   // nothing pays on the current network
                    if (top && closingSweep(net, current, sources, budget, version, trials)) continue;
                    break;
                }
                // Fresh sources gain nothing; re-value a stale one.
                best = nullptr;
                for (Source& s : sources)
                    if (!leftOut(s) && s.valuedAt != version && !(waitRegroups && s.growth >= 0) &&
                        (!best || s.estimate > best->estimate))
                        best = &s;
            }
            if (trials >= budget) {
                if (top) limitHit("trials");
                break;
            }
            ++trials;
            value(net, current, *best, version);
            if (best->growth >= 0) familyAfterValuing(*best, version, sources);
        }
        if (baseMemoAt_ != version) baseMemo_ = MeasureMemo{};   // not this network's
        return current;
    }

private:
    // The opening: whole-network extraction, repeated while it pays (limit
    // opening-moves). Each opening move values the extraction techniques
    // (cube extraction, divisor extraction) on the current network and keeps
    // the better; a technique that gains nothing takes no further part in
    // the opening. On flat sums of products these find most of what there
    // is to find, and every other technique is then first valued on the
    // smaller network they leave: on the 10k decoder one trial of another
    // technique cost in proportion to the network, and the first trials
    // were spent on the input's 279k gates. The moves are the scheduler's
    // own, valued, kept and reported under their technique.
    void opening(net::Network& net, net::Metrics& current, std::vector<Source>& sources, int budget, long& version,
                 int& trials) {
        std::vector<Source*> takers;
        for (Source& s : sources)
            if (s.name == "extract-cubes" || s.name == "extract-divisors") takers.push_back(&s);
        // Techniques with a ceiling are valued last: when the gain already
        // found is at least that ceiling, valuing them cannot change the
        // choice (on the 10k decoder the first divisor trial alone cost 30 of
        // the engine's 66 CPU s, for an eighth of cube extraction's gain).
        std::stable_partition(takers.begin(), takers.end(), [](const Source* s) { return !s->ceiling; });
        auto rank = [&](const Source* s) { return s - sources.data(); };   // position in the list
        // On a network large enough for cube extraction in place (limit
        // cubes-in-place), the opening's cube extraction is one move: its
        // passes stand for the separate moves (each with its own work budget
        // and rounds and a cube table laid out afresh, while a pass saves at
        // least the smallest gain kept), tidied and measured once (F293).
        // Separate moves tidied the network and re-factored the 256 output
        // covers of the 100k decoder each time (7 of the opening's 19 CPU s).
        const bool keptTable = opts_.limits.cubes.inPlaceCubes > 0 &&
                               cubeCount(net) >= opts_.limits.cubes.inPlaceCubes;
        long long passesMade = 0;
        for (int k = 0; k < opts_.limits.openingMoves && !takers.empty(); ++k) {
            Source* best = nullptr;
            passesMade = 0;
            for (Source* s : takers) {
                if (trials >= budget) break;
                if (best && s->ceiling) {
                    const double ceiling = s->ceiling(net);
                    if (ceiling < best->estimate) {
                        // Not valued: kept as a stale estimate for the scheduler.
                        s->estimate = ceiling;
                        s->pending.reset();
                        ++rowFor(s->name).skipped;
                        continue;
                    }
                }
                ++trials;
                const bool kept = s->name == "extract-cubes" && keptTable;
                openingPasses_ = kept ? opts_.limits.openingMoves - k : 1;
                value(net, current, *s, version, true);
                openingPasses_ = 1;
                if (kept) passesMade = s->pendingStats.get("passes");
                // The better gain; on a tie the technique listed first (as when valued in list order).
                if (!best || s->estimate > best->estimate || (s->estimate == best->estimate && rank(s) < rank(best)))
                    best = s;
            }
            if (!best || best->estimate < minGain(current) || !best->pending) return;
            const std::size_t gatesBefore = current.gates;
            const bool merged = best->name == "extract-cubes" && keptTable;
            apply(net, current, *best, true);
            ++version;
            readmitAfter(gatesBefore, current.gates, sources);
            if (merged) {   // its passes were the opening's remaining moves
                if (passesMade >= opts_.limits.openingMoves - k) limitHit("opening-moves");
                return;
            }
            // Only a technique that paid stays in the opening.
            takers.erase(std::remove_if(takers.begin(), takers.end(),
                                        [&](Source* s) { return s != best && s->estimate < minGain(current); }),
                         takers.end());
        }
        if (opts_.limits.openingMoves > 0 && !takers.empty()) limitHit("opening-moves");
    }

    // The closing sweep: when nothing pays on the current network, every
    // technique whose last valuation looked at a changed region only is
    // valued once over the whole network, while trials remain (gains are not
    // strictly local: the depth slack and the greedy order change with every
    // kept move). True when one of them found a gain worth keeping.
    // With closing-quiet (F327), a technique whose last whole-network
    // valuation gained less than the smallest gain kept is left out: every
    // node changed since then lay in the changed region of one of its later
    // trials (each region starts from the nodes changed since the trial
    // before), so the whole network holds nothing it has not looked at since
    // it last found too little there. On the 100k decoder resubstitution's
    // sweep repeated its region trial's 12 gates for 0.9 CPU s.
    bool closingSweep(const net::Network& net, const net::Metrics& current, std::vector<Source>& sources, int budget,
                      long version, int& trials) {
        bool found = false;
        for (Source& s : sources) {
            if (!s.lastFocused) continue;
            if (opts_.limits.closingQuiet && s.quietWhole) {
                if (opts_.verbose >= 2)
                    std::fprintf(stderr, "kerf: closing sweep leaves out %s: its last whole-network trial gained too little\n",
                                 s.name.c_str());
                continue;
            }
            if (trials >= budget) {
                limitHit("trials");
                break;
            }
            ++trials;
            ++rowFor(s.name).closing;
            value(net, current, s, version, true);
            if (s.estimate >= minGain(current) && s.pending) found = true;
        }
        return found;
    }

    // The changed region of source s on `net` (at `version`): the nodes that
    // kept moves changed since s was last valued, and the nodes s's own last
    // trial changed when it gained (a trial not kept found something there),
    // with every node within changed-radius fanin/fanout steps of them. The
    // walk does not go on from inputs or from nodes with more than
    // changed-walk-degree fanin literals and fanouts (a decoder's inputs are
    // read by nearly every node, and its outputs read thousands). False when the region holds more than
    // changed-full-permille of the live nodes: the whole network is valued.
    bool regionFor(const net::Network& net, const Source& s, long version, std::vector<std::uint8_t>& mark) {
        const std::size_t n = net.nodeCount();
        mark.assign(n, 0);
        std::vector<net::NodeId> frontier, next;
        std::size_t count = 0;   // live logic nodes marked
        auto seed = [&](net::NodeId v) {
            if (v < n && !mark[v]) {
                mark[v] = 1;
                frontier.push_back(v);
                count += net.isLogic(v);
            }
        };
        for (long k = std::max<long>(s.valuedAt, 0); k < version; ++k)
            for (net::NodeId v : log_[static_cast<std::size_t>(k)]) seed(v);
        for (net::NodeId v : s.ownEdits) seed(v);
        const std::size_t live = net.logicCount();
        const double limit = static_cast<double>(live) * opts_.limits.changedFullPermille / 1000.0;
        for (int r = 0; r < opts_.limits.changedRadius && !frontier.empty(); ++r) {
            if (fanoutsAt_ != version || fanouts_.size() != n) {
                fanouts_ = net.fanouts();
                fanoutsAt_ = version;
            }
            next.clear();
            for (net::NodeId v : frontier) {
                if (!net.isLogic(v) || fanouts_[v].size() + net.node(v).cover.literalCount() >
                                           static_cast<std::size_t>(opts_.limits.changedWalkDegree))
                    continue;
                auto visit = [&](net::NodeId u) {
                    if (u < n && !mark[u]) {
                        mark[u] = 1;
                        next.push_back(u);
                        count += net.isLogic(u);
                    }
                };
                for (const algebra::Cube& c : net.node(v).cover.cubes)
                    for (algebra::Literal l : c.lits) visit(algebra::literalVar(l));
                for (net::NodeId f : fanouts_[v]) visit(f);
            }
            if (static_cast<double>(count) > limit) break;
            frontier.swap(next);
        }
        if (static_cast<double>(count) <= limit) return true;
        if (opts_.verbose >= 2)
            std::fprintf(stderr, "kerf: trial %-28s changed region over %zu of %zu live nodes: whole network\n",
                         s.name.c_str(), count, live);
        return false;
    }

    // Left out: a technique whose last give-up-after valuations gained less
    // than the smallest gain kept. Inside a regroup move the count runs over
    // all regroup moves of that growth in the run (each regroup move starts
    // a scheduler of its own, and on the 10k decoder these re-valued every
    // technique each time, for nothing, at 70% of the engine's time).
    bool leftOut(const Source& s) const {
        if (s.misses >= opts_.limits.giveUpAfter) return true;
        if (dormant(s)) return true;
        if (scope_.empty() || !innerMisses_) return false;
        auto it = innerMisses_->find(scope_ + "/" + s.name);
        return it != innerMisses_->end() && it->second >= opts_.limits.giveUpAfter;
    }

    // Dormant (limit regroup-lazy-gates, F144): on a network of at least
    // that many gates, a regroup source whose recorded gain, from a
    // valuation on an earlier network, is below the smallest gain kept.
    // Lazy greedy takes a recorded gain as a bound on what the move gains
    // later; the other techniques are valued again all the same when nothing
    // fresh pays (their gains come back after other moves), and so are
    // regroup moves on small networks (priority: a last regroup move after
    // two small moves of other techniques, 495 -> 492 gates). But a regroup
    // valuation re-optimises the whole dissolved network: on the 30k decoder
    // 9 valuations of 5-7 CPU s, the six after the first kept one gaining
    // 0.01% each.
    bool lazyRegroups(std::size_t gates) const {
        return opts_.limits.regroupLazyGates > 0 && gates >= opts_.limits.regroupLazyGates;
    }
    // Regroup last (limit regroup-last, F325): on a network of at least
    // regroup-lazy-gates gates, regroup moves are not valued while another
    // technique's recorded gain, fresh or stale, reaches the smallest gain
    // kept. A regroup valuation dissolves and re-optimises the whole
    // network (about 6 CPU s on the 100k decoder, against 1-2 for a cube
    // extraction); valued first, as a never-valued source, its result was
    // lost when a cheaper move gaining a little more was kept on the same
    // network, and it had to be valued again on the next one. Valued last,
    // it is what gets the network out of the state the cheaper moves leave.
    bool regroupsWait(const std::vector<Source>& sources, const net::Metrics& current) const {
        if (!opts_.limits.regroupLast || !lazyRegroups(current.gates)) return false;
        for (const Source& s : sources)
            if (s.growth < 0 && !leftOut(s) && s.estimate >= minGain(current)) return true;
        return false;
    }
    bool dormant(const Source& s) const {
        return s.growth >= 0 && lazyRegroups(currentGates_) && (s.valuedAt >= 0 || s.familyBound) &&
               s.valuedAt != version_ && s.estimate < minGain(currentGates_);
    }

    // One valuation for the family (limit regroup-family, F255): on a
    // network of at least regroup-lazy-gates gates, regroup moves at the
    // different growths are taken as alternatives that gain about the same
    // there (siblingsAfter): when one of them is valued, the others' recorded
    // gains are lowered to just below its fresh gain, a bound taken from the
    // valuation rather than measured. So the one valued is kept when it pays,
    // and the others are not valued on this network; on a later network they
    // are valued again only when their bound is still the highest. On the
    // 100k decoder the three growths valued on one network came within 0.01%
    // of each other (708,627 / 708,627 / 708,624 gates; 699,745 / 699,719 /
    // 699,719 on the next), for about 6 CPU s per valuation.
    // The one valued for the family is the widest growth among those tied
    // (every growth before any is valued): it dissolves about what the
    // narrower ones dissolve and more, and on the decoders it was the best
    // or within 0.01% of it (10k: 79,290 gates with growth 2, 79,370 with
    // growth 0; 100k: 699,719 and 699,745 after the same moves).
    bool widerStandIn(const Source& s, const Source& best, long version) const {
        return opts_.limits.regroupFamily && lazyRegroups(currentGates_) && s.growth > best.growth &&
               best.growth >= 0 && (s.valuedAt == version) == (best.valuedAt == version);
    }

    void familyAfterValuing(const Source& valued, long version, std::vector<Source>& sources) {
        if (!opts_.limits.regroupFamily || !lazyRegroups(currentGates_)) return;
        const double bound = std::nextafter(valued.estimate, -std::numeric_limits<double>::infinity());
        for (Source& s : sources)
            if (&s != &valued && s.growth >= 0 && s.valuedAt != version && s.estimate > bound) {
                s.estimate = bound;
                s.familyBound = true;
            }
    }

    // Regroup moves at different growths are alternatives: each dissolves
    // (about) the nodes a smaller growth dissolves and more, and re-optimises
    // the whole network. When one is kept, the others valued on the same
    // network record their gain over the kept result (at most 0 when the
    // kept one was the best) rather than their gain over the network they
    // were valued on, which the kept move has already taken.
    // With regroup-family the kept move's gain is taken off every regroup
    // move's recorded gain, its own included: dissolving again right after a
    // kept regroup move re-optimises what it has just re-optimised (on the
    // 100k decoder the growth just kept, valued again, gained 13 gates for
    // 6 CPU s).
    void siblingsAfter(Source& kept, long versionBefore, double keptGain, std::vector<Source>& sources) {
        if (kept.growth < 0 || !lazyRegroups(currentGates_)) return;
        const bool family = opts_.limits.regroupFamily;
        for (Source& s : sources)
            if (&s != &kept && s.growth >= 0 && (family || s.valuedAt == versionBefore)) s.estimate -= keptGain;
        if (family) kept.estimate -= keptGain;
    }

    // A kept move that changed the network a lot (limit readmit-permille)
    // brings every left-out technique back: what found nothing before may
    // find something now. Dormant regroup moves come back with them.
    void readmitAfter(std::size_t gatesBefore, std::size_t gatesAfter, std::vector<Source>& sources) {
        const double changed = static_cast<double>(gatesBefore) - static_cast<double>(gatesAfter);
        if (opts_.limits.readmitPermille <= 0 ||
            changed * 1000.0 < static_cast<double>(gatesBefore) * opts_.limits.readmitPermille)
            return;
        for (Source& s : sources) {
            s.misses = 0;
            if (s.growth >= 0) {
                s.estimate = std::numeric_limits<double>::infinity();
                s.familyBound = false;
            }
        }
        if (innerMisses_) innerMisses_->clear();
    }

    double minGain(const net::Metrics& current) const { return minGain(current.gates); }
    double minGain(std::size_t gates) const {
        const double rel = static_cast<double>(gates) * opts_.limits.minGainPermille / 1000.0;
        return std::max(1e-6, rel);
    }

    bool admissible(const net::Metrics& m, const net::Metrics& current) const {
        if (opts_.goal == Goal::Size) return measureCap_ < 0 || static_cast<long long>(m.depth) <= measureCap_;
        return static_cast<long long>(m.gates) <= std::max<long long>(gateCeiling_, current.gates);
    }

    /// Value source s on `net` (at `version`): over the whole network when
    /// `whole`, when s was never valued, or when changed-region is off;
    /// otherwise over its changed region (regionFor) unless that is large.
    void value(const net::Network& net, const net::Metrics& current, Source& s, long version, bool whole = false) {
        const auto t0 = std::chrono::steady_clock::now();
        const double c0 = detail::cpuNow();
        const double p0 = detail::peakMBNow();
        std::vector<std::uint8_t> region;
        const bool focused = !whole && opts_.limits.changedRegion && s.growth < 0 && s.valuedAt >= 0 &&
                             regionFor(net, s, version, region);
        auto trial = std::make_unique<net::Network>(net);
        const double c1 = detail::cpuNow();
        PassContext ctx;
        ctx.depthCap = passCap_;
        ctx.verbose = opts_.verbose;
        ctx.factors = &cache_;
        ctx.factorTimingCubes = opts_.limits.guardFactorCubes;
        ctx.focus = focused ? &region : nullptr;
        s.run(*trial, ctx);
        ctx.focus = nullptr;
        const double c2 = detail::cpuNow();
        // A technique that kept no edit left the (tidy) network as it was:
        // its gain is 0 without tidying and measuring it again. So does a
        // regroup that dissolved nothing in its changed region (re-optimising
        // an unchanged region finds what the other techniques already had).
        const bool unchanged = ctx.edits == 0 && (s.growth < 0 || focused);
        if (!unchanged) tidy(*trial, ctx, net);   // `net` is tidy: its unchanged wide covers need no simplifying
        const double c3 = detail::cpuNow();
        MeasureMemo memo;
        net::Metrics m = unchanged ? current : measure(*trial, net, version, memo);
        const double c4 = detail::cpuNow();
        if (opts_.verbose >= 2)
            std::fprintf(stderr, "kerf: trial %-28s cpu s: copy+region %.2f technique %.2f tidy %.2f measure %.2f%s\n",
                         s.name.c_str(), c1 - c0, c2 - c1, c3 - c2, c4 - c3,
                         focused ? fmt::format(" (changed region: {} nodes)",
                                               std::count_if(region.begin(), region.end(), [](auto x) { return x; }))
                                       .c_str()
                                 : "");
        if (s.growth >= 0 && !unchanged) {
            // Regroup: re-optimise what dissolving left, then value the end
            // result. With changed regions, the inner techniques start from
            // the nodes the dissolving changed.
            std::vector<Source> inner = makeSources(false);
            Scheduler sub(opts_, res_, cache_, passCap_, measureCap_, gateCeiling_);
            sub.dcMemo_ = dcMemo_;
            sub.shrinkMemo_ = shrinkMemo_;
            sub.innerMisses_ = innerMisses_;
            sub.scope_ = s.name;
            if (opts_.limits.changedRegion && opts_.limits.changedRegroup) {
                sub.log_.push_back(changedNodes(net, *trial));
                for (Source& x : inner) x.valuedAt = 0;
            }
            // The dissolved network was just measured: the inner trials'
            // measurements start from it, and the inner run's last kept
            // network, when measured, is the base after this move.
            sub.baseMemo_ = std::move(memo);
            sub.baseMemoAt_ = static_cast<long>(sub.log_.size());
            m = sub.run(*trial, m, inner, opts_.limits.regroupTrials, false);
            memo = std::move(sub.baseMemo_);
        }
        for (const auto& [k, v] : ctx.stats.items())
            if (v > 0 && k.rfind("limit-hit:", 0) == 0) limitHit(k.substr(10));
        TechniqueRow& row = rowFor(s.name);
        ++row.trials;
        if (unchanged) ++row.unchanged;
        row.seconds += since(t0);
        row.cpuSeconds += detail::cpuNow() - c0;
        const double p1 = detail::peakMBNow();
        row.peakMB = std::max(row.peakMB, p1);
        row.peakRiseMB += p1 - p0;
        s.valuedAt = version;
        s.lastFocused = focused;
        if (focused) ++row.focused;
        const bool ok = admissible(m, current);
        s.estimate = ok ? gainOf(opts_.goal, valueOf(current), valueOf(m)) : -1;
        s.misses = s.estimate >= minGain(current) ? 0 : s.misses + 1;
        if (!focused) s.quietWhole = s.estimate < minGain(current);
        if (!scope_.empty() && innerMisses_) {
            int& inner = (*innerMisses_)[scope_ + "/" + s.name];
            inner = s.misses == 0 ? 0 : inner + 1;
        }
        s.ownEdits.clear();
        if (s.estimate > 0) {
            if (opts_.limits.changedRegion) s.ownEdits = changedNodes(net, *trial);
            s.pending = std::move(trial);
            s.pendingMetrics = m;
            s.pendingMemo = std::move(memo);
            s.pendingStats = ctx.stats;
        } else {
            s.pending.reset();
            s.pendingMemo = MeasureMemo{};
        }
        if (opts_.verbose >= 2)
            std::fprintf(stderr, "kerf: trial %-28s gates %zu depth %zu literals %zu (%.2fs)%s\n    %s\n", s.name.c_str(),
                         m.gates, m.depth, m.literals, since(t0), ok ? "" : " out of bounds", ctx.stats.str().c_str());
    }

    void apply(net::Network& net, net::Metrics& current, Source& s, bool top) {
        const net::Metrics m = *s.pendingMetrics;
        if (top) {
            TechniqueRow& row = rowFor(s.name);
            ++row.applied;
            row.gatesSaved += static_cast<long long>(current.gates) - static_cast<long long>(m.gates);
            row.depthSaved += static_cast<long long>(current.depth) - static_cast<long long>(m.depth);
            for (const auto& kv : s.pendingStats.items()) {
                // Named copies, not structured bindings: clang 14 cannot capture those in a lambda.
                const auto& key = kv.first;
                auto it = std::find_if(row.counters.begin(), row.counters.end(),
                                       [&](const auto& p) { return p.first == key; });
                if (it == row.counters.end()) row.counters.emplace_back(key, kv.second);
                else it->second += kv.second;
            }
            MoveRow mv;
            mv.technique = s.name;
            mv.after = m;
            mv.gatesSaved = static_cast<long long>(current.gates) - static_cast<long long>(m.gates);
            mv.depthSaved = static_cast<long long>(current.depth) - static_cast<long long>(m.depth);
            res_.moves.push_back(mv);
            if (opts_.verbose >= 2)
                std::fprintf(stderr, "kerf: kept %-29s gates %zu -> %zu, depth %zu -> %zu\n", s.name.c_str(),
                             current.gates, m.gates, current.depth, m.depth);
        }
        log_.push_back(s.ownEdits);   // what this move changed (empty without changed regions)
        net = std::move(*s.pending);
        s.pending.reset();
        current = m;
        // The kept network's measurement is the base of the next ones (valid
        // for the version apply's caller moves to).
        baseMemo_ = std::move(s.pendingMemo);
        s.pendingMemo = MeasureMemo{};
        baseMemoAt_ = baseMemo_.entry.empty() ? -1 : static_cast<long>(log_.size());
    }

    // Measure trial `n`, derived from `base` (the network at `version`):
    // nodes unchanged since the base are taken from its measurement when
    // that is known (baseMemo_, see MeasureMemo); fills `memo` with n's.
    net::Metrics measure(const net::Network& n, const net::Network& base, long version, MeasureMemo& memo) {
        MeasureBase mb;
        if (baseMemoAt_ == version && !baseMemo_.entry.empty()) {
            mb.net = &base;
            mb.memo = &baseMemo_;
        }
        return measureFactored(n, measureCap_, cache_, mb, &memo);
    }

    TechniqueRow& rowFor(const std::string& name) {
        for (TechniqueRow& r : res_.techniques)
            if (r.technique == name) return r;
        res_.techniques.push_back({});
        res_.techniques.back().technique = name;
        return res_.techniques.back();
    }

    void limitHit(const std::string& name) {
        if (std::find(res_.limitsHit.begin(), res_.limitsHit.end(), name) == res_.limitsHit.end())
            res_.limitsHit.push_back(name);
    }

    const EngineOptions& opts_;
    EngineResult& res_;
    FactorCache& cache_;
    std::size_t passCap_;
    int measureCap_;
    long long gateCeiling_;

    // Changed regions: log_[k] holds the nodes the kept move from version k
    // to k+1 changed; the fanout lists of the current version.
    std::vector<std::vector<net::NodeId>> log_;
    std::vector<std::vector<net::NodeId>> fanouts_;
    long fanoutsAt_ = -1;
    // The current network's measurement (the measure base), valid while
    // baseMemoAt_ is the current version.
    MeasureMemo baseMemo_;
    long baseMemoAt_ = -1;
    int openingPasses_ = 1;         // passes of the extract-cubes move being valued (see opening)
    long version_ = 0;              // the run's current version and gates (for dormant)
    std::size_t currentGates_ = 0;

public:
    DontCareMemo* dcMemo_ = nullptr;   // shared by the whole run (see DontCareMemo)
    ShrinkMemo* shrinkMemo_ = nullptr; // shared by the whole run (see ShrinkMemo)
    std::map<std::string, int>* innerMisses_ = nullptr;   // "regroup/technique" -> valuations without gain (leftOut)
    std::string scope_;                                    // inside a regroup move: its name
};

bool better(Goal goal, const net::Metrics& a, const net::Metrics& b) {
    return gainOf(goal, valueOf(b), valueOf(a)) > 0;
}

} // namespace

Goal parseGoal(const std::string& s) {
    if (s == "size") return Goal::Size;
    if (s == "depth") return Goal::Depth;
    throw Error("unknown goal '" + s + "' (expected size or depth)");
}

Effort parseEffort(const std::string& s) {
    if (s == "fast") return Effort::Fast;
    if (s == "default") return Effort::Default;
    if (s == "thorough") return Effort::Thorough;
    throw Error("unknown effort '" + s + "' (expected fast, default or thorough)");
}

EngineLimits limitsFor(Effort e) {
    EngineLimits l;
    switch (e) {
    case Effort::Fast:
        l.trials = 12;
        l.maxGrowth = 0;
        l.regroupTrials = 4;
        l.minGainPermille = 5;
        l.impliedDontCares = false;
        l.regionLiterals = 20000;
        l.wholeCubesMax = 500000;
        // The whole-network extractions (opening, or before the regions)
        // look at no more than this many cubes each: linear in the network.
        l.cubes.workBudget = 20000000;
        // Two-cube divisors only from nodes of up to 16 cubes (120 pairs):
        // wider nodes give two-literal divisors (engine21).
        l.divisors.maxCubesForCubePairs = 16;
        break;
    case Effort::Default:
        break;
    case Effort::Thorough:
        l.trials = 150;
        l.maxGrowth = 8;
        l.regroupTrials = 16;
        l.minGainPermille = 0;
        l.kernels = true;
        l.dontCares.totalConflicts *= 5;
        break;
    }
    return l;
}

void setLimit(EngineLimits& limits, const std::string& assignment) {
    const std::size_t eq = assignment.find('=');
    const std::string name = assignment.substr(0, eq);
    const LimitInfo* info = nullptr;
    for (const LimitInfo& li : limitTable())
        if (name == li.name) info = &li;
    if (!info) throw Error("unknown limit '" + name + "'; valid limits:" + validLimits());
    if (eq == std::string::npos) throw Error("limit '" + name + "' needs a value: " + name + "=N");
    const std::string v = assignment.substr(eq + 1);
    long long n = 0;
    std::size_t used = 0;
    try {
        n = std::stoll(v, &used);
    } catch (...) {
        used = 0;
    }
    if (v.empty() || used != v.size() || n < info->min)
        throw Error(fmt::format("limit {}: '{}' is not a whole number >= {}", name, v, info->min));
    if ((name == "minimise-table-vars" || name == "dc-max-fanins") && n > 16)
        throw Error(fmt::format("limit {}: at most 16", name));
    if ((name == "dc-exhaustive-inputs" || name == "bresub-exhaustive-inputs") && n > 20)
        throw Error(fmt::format("limit {}: at most 20", name));
    if ((name == "kernels" || name == "implied-dont-cares" || name == "changed-region" ||
         name == "changed-regroup" || name == "regroup-family" || name == "regroup-last" || name == "closing-quiet") && n > 1)
        throw Error(fmt::format("limit {}: 0 or 1", name));
    info->set(limits, n);
}

std::string describeLimits() {
    const EngineLimits d = limitsFor(Effort::Default);
    std::string s;
    for (const LimitInfo& li : limitTable()) s += fmt::format("  {:<30} {:>9}  {}\n", li.name, li.get(d), li.meaning);
    return s;
}

EngineResult restructure(net::Network& net, const EngineOptions& opts) {
    if (detail::useRegions(net, opts)) return detail::restructureByRegions(net, opts);
    const auto t0 = std::chrono::steady_clock::now();
    EngineResult res;
    FactorCache ownCache;
    FactorCache& cache = opts.cache ? *opts.cache : ownCache;
    cache.setMaxCubes(opts.limits.factorMaxCubes);
    cache.setBestMaxCubes(opts.limits.factorBestMaxCubes);
    const std::size_t bestSkippedBefore = cache.bestSkipped();
    const double cpu0 = detail::cpuNow();
    tidy(net);
    const double cpu1 = detail::cpuNow();
    // The shallowest forms' figures: measuring with no bound bounds the
    // depth by the least depth reachable, so the same measurement stands for
    // a bound at that depth (the default size goal) and for the depth goal
    // (F295: the second measurement of the 100k decoder's input, though
    // helped by the factor cache, took about 0.35 CPU s).
    const net::Metrics shallowest = measureFactored(net, -1, &cache);
    const int inputDepth = static_cast<int>(shallowest.depth);
    // Size: forms may use depth up to the bound; depth: always the shallowest forms.
    const int sizeCap = opts.maxDepth >= 0 ? std::max(opts.maxDepth, 0) : inputDepth;
    const int measureCap = opts.goal == Goal::Size ? sizeCap : -1;
    res.before = measureCap < 0 || measureCap == inputDepth ? shallowest : measureFactored(net, measureCap, &cache);
    if (opts.goal == Goal::Size && res.before.depth > static_cast<std::size_t>(sizeCap))
        res.before = shallowest;   // the bound is below what the input reaches
    const std::size_t passCap = opts.goal == Goal::Size ? static_cast<std::size_t>(std::max<int>(sizeCap, inputDepth))
                                                        : static_cast<std::size_t>(inputDepth);
    const double cpu2 = detail::cpuNow();
    const net::Network original = net;
    if (opts.verbose >= 2)
        std::fprintf(stderr, "kerf: engine cpu s before the trials: tidy %.2f, measuring the input %.2f, copy %.2f\n",
                     cpu1 - cpu0, cpu2 - cpu1, detail::cpuNow() - cpu2);
    Scheduler sched(opts, res, cache, passCap, measureCap, static_cast<long long>(res.before.gates));
    DontCareMemo dcMemo;
    sched.dcMemo_ = &dcMemo;
    ShrinkMemo shrinkMemo;
    sched.shrinkMemo_ = &shrinkMemo;
    std::map<std::string, int> innerMisses;
    sched.innerMisses_ = &innerMisses;
    std::vector<Source> sources = sched.makeSources(true);
    if (opts.goal == Goal::Depth) {
        // Greedy depth moves from the input can stop deeper than the size
        // goal's result (smaller logic is often shallower too). So the depth
        // goal starts from the size goal's result when that is admissible
        // (no more gates than the input on the shallowest forms) and keeps
        // lowering depth from there; its depth is then never above the size
        // goal's. The input is the start otherwise.
        EngineOptions sizeOpts = opts;
        sizeOpts.goal = Goal::Size;
        sizeOpts.cache = &cache;
        sizeOpts.maxDepth = -1;
        net::Network sized = net;
        EngineResult first = restructure(sized, sizeOpts);
        const net::Metrics m = measureFactored(sized, -1, &cache);
        if (!first.keptOriginal && m.gates <= res.before.gates && better(Goal::Depth, m, res.before)) {
            net = std::move(sized);
            for (TechniqueRow row : first.techniques) {
                row.technique = "size phase: " + row.technique;
                res.techniques.push_back(std::move(row));
            }
            for (MoveRow mv : first.moves) {
                mv.technique = "size phase: " + mv.technique;
                res.moves.push_back(std::move(mv));
            }
            for (const std::string& l : first.limitsHit)
                if (std::find(res.limitsHit.begin(), res.limitsHit.end(), l) == res.limitsHit.end())
                    res.limitsHit.push_back(l);
            sched.run(net, m, sources, opts.limits.trials, true);
        } else {
            sched.run(net, res.before, sources, opts.limits.trials, true);
        }
    } else {
        sched.run(net, res.before, sources, opts.limits.trials, true);
    }
    const double cpu4 = detail::cpuNow();
    tidy(net);
    const double cpu5 = detail::cpuNow();
    res.forms = factorNetwork(net, measureCap, &cache);
    res.after = res.forms.metrics;
    if (opts.verbose >= 2)
        std::fprintf(stderr, "kerf: engine cpu s after the trials: tidy %.2f, the chosen forms %.2f\n", cpu5 - cpu4,
                     detail::cpuNow() - cpu5);
    const bool withinDepth = opts.goal == Goal::Depth || measureCap < 0 ||
                             res.after.depth <= std::max<std::size_t>(sizeCap, res.before.depth);
    const bool withinGates = opts.goal == Goal::Size || res.after.gates <= res.before.gates;
    if (!withinDepth || !withinGates || !better(opts.goal, res.after, res.before)) {
        net = original;
        res.forms = factorNetwork(net, measureCap, &cache);
        res.after = res.forms.metrics;
        res.keptOriginal = true;
    }
    if (cache.bestSkipped() > bestSkippedBefore &&
        std::find(res.limitsHit.begin(), res.limitsHit.end(), "factor-best-max-cubes") == res.limitsHit.end())
        res.limitsHit.push_back("factor-best-max-cubes");
    res.depthCap = measureCap;
    res.seconds = since(t0);
    return res;
}

std::string formatEngineReport(const EngineResult& r) {
    std::string s = fmt::format("{:<30} {:>8} {:>6} {:>9}\n", "moves kept", "gates", "depth", "literals");
    s += fmt::format("{:<30} {:>8} {:>6} {:>9}\n", "(input)", r.before.gates, r.before.depth, r.before.literals);
    for (const MoveRow& m : r.moves)
        s += fmt::format("{:<30} {:>8} {:>6} {:>9}\n", m.technique, m.after.gates, m.after.depth, m.after.literals);
    if (r.regions > 0) s += fmt::format("({} regions, restructured one by one; their moves not listed)\n", r.regions);
    s += fmt::format("{:<30} {:>8} {:>6} {:>9}\n", r.keptOriginal ? "(result: input kept)" : "(result)",
                     r.after.gates, r.after.depth, r.after.literals);
    s += fmt::format("\n{:<30} {:>6} {:>9} {:>5} {:>11} {:>11} {:>8} {:>8} {:>8} {:>8}\n", "technique", "trials",
                     "no edits", "kept", "gates saved", "depth saved", "seconds", "cpu s", "peak MB", "raised");
    for (const TechniqueRow& t : r.techniques) {
        s += fmt::format("{:<30} {:>6} {:>9} {:>5} {:>11} {:>11} {:>8.3f} {:>8.3f} {:>8.0f} {:>8.0f}\n", t.technique,
                         t.trials, t.unchanged, t.applied, t.gatesSaved, t.depthSaved, t.seconds, t.cpuSeconds,
                         t.peakMB, t.peakRiseMB);
        if (t.skipped > 0)
            s += fmt::format("    not valued {} times in the opening: at most the gain already found\n", t.skipped);
        if (t.focused > 0 || t.closing > 0)
            s += fmt::format("    {} trials over a changed region only, {} in the closing sweep\n", t.focused, t.closing);
        if (!t.counters.empty()) {
            std::string c;
            for (const auto& [n, v] : t.counters) c += fmt::format(" {}={}", n, v);
            s += "   " + c + "\n";
        }
    }
    if (!r.limitsHit.empty()) {
        s += "limits that cut work short (raise with --limit NAME=N):";
        for (const std::string& l : r.limitsHit) s += " " + l;
        s += "\n";
    }
    s += fmt::format("engine time {:.3f} s\n", r.seconds);
    return s;
}

} // namespace kerf::passes
