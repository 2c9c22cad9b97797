// regions.cpp — restructuring a large network region by region.
//
// Idea. The scheduler values every move on the whole network it is given, so
// one trial costs time in proportion to that network and a run of many
// trials grows faster than the network does. A large network is therefore
// cut into regions of bounded size and the scheduler runs on each region
// as a network of its own, with the effort's limits applying per region:
// the work then grows with the number of regions, i.e. linearly. This is
// the partitioning used by multi-level optimisers to keep their work local
// (windows or partitions of the network: e.g. A. Mishchenko, R. Brayton,
// "Scalable logic synthesis using a simple circuit structure", IWLS 2006,
// from memory); the cut here is our own: output cones in output order.
//
// Regions. Logic nodes are taken in depth-first post-order from the
// outputs, one output's cone after another, and a region is closed once it
// holds `region-literals` literals; every node's fanins thus lie in its own
// or an earlier region, and regions are restructured in that order. A
// region's inputs are the nodes it reads from outside (primary inputs or
// the results of earlier regions), its outputs the nodes read outside it.
//
// Depth. The bound is kept across the cut: a region's inputs arrive at the
// earliest time the current network allows (`net::Node::arrival`) and each
// of its outputs carries the depth that follows it (`net::Output::tail`,
// from the required times of the unchanged logic after it), so a region
// kept within the bound keeps the whole network within it. The whole
// result is measured once more at the end and kept only if it is better.
//
// Sharing between regions is not looked for (a divisor common to two
// regions is extracted in each): that is the price of the bounded work.
// Above `whole-cubes-max` cubes even the whole-network cube extraction is
// left to the regions (its candidate search grows faster than the network).
#include "regions.h"

#include "kerf/passes/tidy.h"

#include <algorithm>
#include <chrono>
#include <climits>
#include <cstdio>
#include <ctime>
#include <sys/resource.h>
#include <functional>

namespace kerf::passes::detail {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;

namespace {

constexpr Literal kUnmapped = ~Literal{0};

// Regions in post-order from the outputs; region[v] = -1 for nodes outside every cone.
std::vector<int> cutRegions(const net::Network& net, std::size_t regionLiterals, int& count,
                            std::vector<net::NodeId>& order) {
    std::vector<int> region(net.nodeCount(), -1);
    std::vector<net::NodeId> roots;
    for (const net::Output& o : net.outputs()) roots.push_back(literalVar(o.driver));
    order = net.postOrderFrom(roots);
    int current = 0;
    std::size_t literals = 0;
    for (net::NodeId id : order) {
        region[id] = current;
        literals += net.node(id).cover.literalCount();
        if (literals >= regionLiterals) {
            ++current;
            literals = 0;
        }
    }
    count = literals > 0 ? current + 1 : current;
    return region;
}

void addRow(EngineResult& res, const TechniqueRow& r) {
    for (TechniqueRow& t : res.techniques) {
        if (t.technique != r.technique) continue;
        t.trials += r.trials;
        t.applied += r.applied;
        t.gatesSaved += r.gatesSaved;
        t.depthSaved += r.depthSaved;
        t.unchanged += r.unchanged;
        t.skipped += r.skipped;
        t.focused += r.focused;
        t.closing += r.closing;
        t.seconds += r.seconds;
        t.cpuSeconds += r.cpuSeconds;
        t.peakMB = std::max(t.peakMB, r.peakMB);
        t.peakRiseMB += r.peakRiseMB;
        for (const auto& kv : r.counters) {
            auto it = std::find_if(t.counters.begin(), t.counters.end(),
                                   [&](const auto& p) { return p.first == kv.first; });
            if (it == t.counters.end()) t.counters.push_back(kv);
            else it->second += kv.second;
        }
        return;
    }
    res.techniques.push_back(r);
}

} // namespace

double cpuNow() {
    timespec ts{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) * 1e-9;
}

double peakMBNow() {
    struct rusage ru {};
    getrusage(RUSAGE_SELF, &ru);
    return static_cast<double>(ru.ru_maxrss) / 1024.0;
}

bool useRegions(const net::Network& net, const EngineOptions& opts) {
    if (opts.limits.regionLiterals == 0 || opts.goal != Goal::Size) return false;
    if (opts.dontCares && !opts.dontCares->outputs().empty()) return false;   // declared don't-cares: whole network
    std::size_t literals = 0;
    for (net::NodeId v = 0; v < net.nodeCount(); ++v)
        if (net.isLogic(v)) literals += net.node(v).cover.literalCount();
    return literals > 2 * opts.limits.regionLiterals;
}

EngineResult restructureByRegions(net::Network& net, const EngineOptions& opts) {
    const auto t0 = std::chrono::steady_clock::now();
    EngineResult res;
    FactorCache ownCache;
    FactorCache& cache = opts.cache ? *opts.cache : ownCache;
    cache.setMaxCubes(opts.limits.factorMaxCubes);
    cache.setBestMaxCubes(opts.limits.factorBestMaxCubes);
    tidy(net);
    const int inputDepth = static_cast<int>(measureFactored(net, -1, &cache).depth);
    const int bound = opts.maxDepth >= 0 ? std::max(opts.maxDepth, 0) : inputDepth;
    res.before = measureFactored(net, bound, &cache);
    if (res.before.depth > static_cast<std::size_t>(bound)) res.before = measureFactored(net, -1, &cache);
    const net::Network original = net;

    // Sharing across regions: divisors and cubes common to nodes anywhere
    // are extracted on the whole network first, once each (both passes
    // work from tables updated by difference), kept when they save gates
    // within the bound.
    net::Metrics current = res.before;
    const std::size_t passCap = static_cast<std::size_t>(std::max(bound, inputDepth));
    auto wholePass = [&](const char* name, const std::function<void(net::Network&, PassContext&)>& run) {
        const auto t = std::chrono::steady_clock::now();
        const double c = cpuNow();
        const double p = peakMBNow();
        net::Network trial = net;
        PassContext ctx;
        ctx.depthCap = passCap;
        ctx.factors = &cache;
        ctx.factorTimingCubes = opts.limits.guardFactorCubes;
        run(trial, ctx);
        tidy(trial, ctx);
        const net::Metrics m = measureFactored(trial, bound, &cache);
        for (const auto& [k, v] : ctx.stats.items())
            if (v > 0 && k.rfind("limit-hit:", 0) == 0 &&
                std::find(res.limitsHit.begin(), res.limitsHit.end(), k.substr(10)) == res.limitsHit.end())
                res.limitsHit.push_back(k.substr(10));
        TechniqueRow row;
        row.technique = std::string("whole network: ") + name;
        row.trials = 1;
        if (m.depth <= std::max<std::size_t>(bound, current.depth) && m.gates < current.gates) {
            row.applied = 1;
            row.gatesSaved = static_cast<long long>(current.gates) - static_cast<long long>(m.gates);
            row.depthSaved = static_cast<long long>(current.depth) - static_cast<long long>(m.depth);
            row.counters = ctx.stats.items();
            MoveRow mv;
            mv.technique = row.technique;
            mv.after = m;
            mv.gatesSaved = row.gatesSaved;
            mv.depthSaved = row.depthSaved;
            res.moves.push_back(mv);
            net = std::move(trial);
            current = m;
        }
        row.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t).count();
        row.cpuSeconds = cpuNow() - c;
        row.peakMB = peakMBNow();
        row.peakRiseMB = row.peakMB - p;
        addRow(res, row);
    };
    const EngineLimits& L = opts.limits;
    wholePass("extract-divisors", [&L](net::Network& n, PassContext& c) {
        ShareDivisorsOptions o = L.divisors;
        o.method = ShareDivisorsOptions::Method::Pairs;
        shareDivisors(n, o, c);
    });
    std::size_t cubes = 0;
    for (net::NodeId v = 0; v < net.nodeCount(); ++v)
        if (net.isLogic(v)) cubes += net.node(v).cover.cubes.size();
    if (L.wholeCubesMax == 0 || cubes <= L.wholeCubesMax) {
        wholePass("extract-cubes", [&L](net::Network& n, PassContext& c) { shareCubes(n, L.cubes, c); });
    } else {
        // Too large for one extraction over everything (limit whole-cubes-max):
        // each region's scheduler extracts the cubes shared inside it.
        res.limitsHit.push_back("whole-cubes-max");
        if (opts.verbose >= 1)
            std::fprintf(stderr, "kerf: whole-network cube extraction left to the regions: %zu cubes (whole-cubes-max %zu)\n",
                         cubes, L.wholeCubesMax);
    }

    const DepthSlack slack = depthSlack(net, bound, &cache);
    std::vector<std::size_t> earliest = slack.earliest;
    int count = 0;
    std::vector<net::NodeId> order;
    const std::vector<int> region = cutRegions(net, opts.limits.regionLiterals, count, order);
    const std::size_t n0 = net.nodeCount();

    // Nodes read outside their region (by a later region or an output).
    std::vector<std::uint8_t> readOutside(n0, 0);
    for (const net::Output& o : net.outputs()) readOutside[literalVar(o.driver)] = 1;
    for (net::NodeId v : order)
        for (const Cube& c : net.node(v).cover.cubes)
            for (Literal l : c.lits) {
                const net::NodeId u = literalVar(l);
                if (region[u] >= 0 && region[u] != region[v]) readOutside[u] = 1;
            }

    // repl[v]: the literal that now stands for original node v's positive literal.
    std::vector<Literal> repl(n0);
    for (net::NodeId v = 0; v < n0; ++v) repl[v] = makeLiteral(v, false);
    auto mapGlobal = [&](Literal l) {
        const net::NodeId v = literalVar(l);
        if (v >= n0) return l;
        return literalNegated(l) ? negateLiteral(repl[v]) : repl[v];
    };

    EngineOptions sub = opts;
    sub.limits.regionLiterals = 0;
    sub.maxDepth = bound;
    sub.dontCares = nullptr;
    sub.cache = nullptr;
    sub.verbose = opts.verbose >= 3 ? opts.verbose : 0;

    std::vector<Literal> toSub;   // global node -> literal in the region's network
    std::vector<net::NodeId> touched;
    std::size_t pos = 0;
    for (int r = 0; r < count; ++r) {
        std::size_t end = pos;
        while (end < order.size() && region[order[end]] == r) ++end;
        net::Network part;
        for (net::NodeId u : touched) toSub[u] = kUnmapped;
        touched.clear();
        toSub.resize(net.nodeCount(), kUnmapped);
        std::vector<Literal> fromSubInput;   // by part's input index: the global literal it stands for
        auto subLit = [&](Literal g) {
            const net::NodeId u = literalVar(g);
            if (u == 0) return g;
            if (toSub[u] == kUnmapped) {
                const net::NodeId in = part.addInput("r" + std::to_string(u));
                part.node(in).arrival = static_cast<std::uint32_t>(u < earliest.size() ? earliest[u] : 0);
                toSub[u] = makeLiteral(in, false);
                touched.push_back(u);
                fromSubInput.push_back(makeLiteral(u, false));
            }
            return literalNegated(g) ? negateLiteral(toSub[u]) : toSub[u];
        };
        for (std::size_t i = pos; i < end; ++i) {
            const net::NodeId v = order[i];
            const net::Node& nd = net.node(v);
            Cover cv;
            cv.cubes.reserve(nd.cover.cubes.size());
            for (const Cube& c : nd.cover.cubes) {
                std::vector<Literal> ls;
                ls.reserve(c.lits.size());
                for (Literal l : c.lits) {
                    const net::NodeId u = literalVar(l);
                    ls.push_back(region[u] == r ? (literalNegated(l) ? negateLiteral(toSub[u]) : toSub[u])
                                                : subLit(mapGlobal(l)));
                }
                cv.cubes.push_back(Cube(std::move(ls)));
            }
            const net::NodeId w = part.addLogic(std::move(cv), nd.name, nd.loc);
            toSub[v] = makeLiteral(w, false);
            touched.push_back(v);
        }
        std::vector<net::NodeId> outsOf;   // original node of each of part's outputs
        for (std::size_t i = pos; i < end; ++i) {
            const net::NodeId v = order[i];
            if (!readOutside[v]) continue;
            part.addOutput("n" + std::to_string(v), toSub[v]);
            const long req = slack.required[v];
            part.outputs().back().tail =
                req == LONG_MAX ? 0u : static_cast<std::uint32_t>(std::max<long>(0, bound - req));
            outsOf.push_back(v);
        }

        FactorCache regionCache;
        sub.cache = &regionCache;
        EngineResult pr = restructure(part, sub);
        for (const TechniqueRow& row : pr.techniques) addRow(res, row);
        for (const std::string& l : pr.limitsHit)
            if (std::find(res.limitsHit.begin(), res.limitsHit.end(), l) == res.limitsHit.end())
                res.limitsHit.push_back(l);

        // Splice the region's result into the network.
        const DepthSlack partSlack = depthSlack(part, bound, &regionCache);
        std::vector<Literal> back(part.nodeCount(), kUnmapped);
        back[0] = net::kFalse;
        for (std::size_t i = 0; i < part.inputs().size(); ++i)
            back[part.inputs()[i]] = fromSubInput[i];
        auto toGlobal = [&](Literal l) {
            const Literal g = back[literalVar(l)];
            return literalNegated(l) ? negateLiteral(g) : g;
        };
        for (net::NodeId w : part.topoOrder()) {
            const net::Node& nd = part.node(w);
            Cover cv;
            cv.cubes.reserve(nd.cover.cubes.size());
            for (const Cube& c : nd.cover.cubes) {
                std::vector<Literal> ls;
                ls.reserve(c.lits.size());
                for (Literal l : c.lits) ls.push_back(toGlobal(l));
                cv.cubes.push_back(Cube(std::move(ls)));
            }
            const net::NodeId g = net.addLogic(std::move(cv), nd.name, nd.loc);
            back[w] = makeLiteral(g, false);
            earliest.resize(net.nodeCount(), 0);
            earliest[g] = partSlack.earliest[w];
        }
        for (std::size_t k = 0; k < outsOf.size(); ++k) repl[outsOf[k]] = toGlobal(part.outputs()[k].driver);
        for (std::size_t i = pos; i < end; ++i) {
            net::Node& nd = net.node(order[i]);
            nd.dead = true;
            nd.cover = Cover{};
        }
        pos = end;
    }
    for (net::Output& o : net.outputs()) o.driver = mapGlobal(o.driver);
    tidy(net);

    const int measureCap = bound;
    res.forms = factorNetwork(net, measureCap, &cache);
    res.after = res.forms.metrics;
    const bool withinDepth = res.after.depth <= std::max<std::size_t>(bound, res.before.depth);
    const bool better = res.after.gates < res.before.gates ||
                        (res.after.gates == res.before.gates && res.after.literals < res.before.literals);
    if (!withinDepth || !better) {
        net = original;
        res.forms = factorNetwork(net, measureCap, &cache);
        res.after = res.forms.metrics;
        res.keptOriginal = true;
    }
    res.regions = count;
    res.depthCap = measureCap;
    res.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    return res;
}

} // namespace kerf::passes::detail
