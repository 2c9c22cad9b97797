// passes_bench.cpp — figures of the restructuring engine.
//
// For every EPFL random/control file in ../shared/benchmarks/epfl (loaded by
// the test-only AIG line reader of tests/unit/passes_support.h, then tidied
// as the frontend does) it runs the engine at the chosen effort and prints
// two-input gates before/after (counted on the written factored forms),
// their ratio, depth before/after, seconds and the peak resident memory of
// that run (each case runs in its own child process). It then times
// synthetic decoders (1k, 10k, 100k product terms over 64 inputs and 256
// outputs, the issue-9 shape) with the time each technique took.
// Every result is also checked by random simulation against the input.
//
// Then a set of case-style decoders with x defaults, restructured with the x
// read as 0 and with it declared as don't-care (the "checked" column
// compares outputs wherever the condition is 0).
//
// Usage: passes_bench [--effort E] [--goal size|depth] [--limit NAME=N]... [--techniques] [--epfl DIR]
//                     [--skip-synthetic] [--only NAME|synthetic|dont-cares|cube-extraction|resubstitution|overheads] [--min-terms N] [--max-terms N]
//                     [--terms N]... [--shape decoder|sopwide] [-v]
// --terms N (repeatable) times decoders of exactly these sizes instead of
// 1k/10k/100k (e.g. 3000 and 30000 to measure how the time grows).
// --shape sopwide: the synthetic networks have scale_bench.py's `sopwide`
// shape (40 products to an output, terms / 40 outputs) instead of the
// decoder's 256 outputs: the engine alone on it, with its peak memory.
#include "../unit/passes_support.h"

#include "kerf/passes/engine.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/share_cubes.h"
#include "kerf/passes/reuse_nodes.h"
#include "kerf/passes/share_divisors.h"
#include "kerf/passes/tidy.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <ctime>
#include <filesystem>
#include <string>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

using namespace kerf;
using namespace kerf::passes::testing;

namespace {

struct Figures {
    std::size_t gatesBefore = 0, gatesAfter = 0, depthBefore = 0, depthAfter = 0;
    std::size_t litsBefore = 0, litsAfter = 0;
    double seconds = 0;
    double engineCpu = 0;   // CPU seconds of the engine call alone (the child also generates, tidies and checks)
    int equivalent = 1;
    int kept = 0;
    // Seconds per technique (the engine's own timers; plain data: it crosses a pipe).
    int techniques = 0;
    char techName[16][40] = {};
    double techSeconds[16] = {};
    double techCpu[16] = {};
    double techPeakMB[16] = {}, techRiseMB[16] = {};
    int techTrials[16] = {};
};

// Decoder-style PLA: `terms` product terms over `inputs` inputs, each a
// masked compare of 8..20 input bits, each feeding 1..3 of `outputs` outputs.
net::Network syntheticDecoder(std::size_t terms, std::size_t inputs, std::size_t outputs, std::uint32_t seed) {
    std::mt19937 rng(seed);
    net::Network n;
    std::vector<net::NodeId> in;
    for (std::size_t i = 0; i < inputs; ++i) in.push_back(n.addInput("a" + std::to_string(i)));
    std::vector<algebra::Cover> outs(outputs);
    for (std::size_t t = 0; t < terms; ++t) {
        std::size_t len = 8 + rng() % 13;
        std::vector<algebra::Literal> ls;
        std::vector<char> used(inputs, 0);
        while (ls.size() < len) {
            std::size_t i = rng() % inputs;
            if (used[i]) continue;
            used[i] = 1;
            ls.push_back(algebra::makeLiteral(in[i], rng() & 1));
        }
        algebra::Cube c(std::move(ls));
        std::size_t fan = 1 + rng() % 3;
        for (std::size_t k = 0; k < fan; ++k) outs[rng() % outputs].cubes.push_back(c);
    }
    for (std::size_t o = 0; o < outputs; ++o) {
        outs[o].normalize();
        n.addOutput("d" + std::to_string(o), algebra::makeLiteral(n.addLogic(std::move(outs[o])), false));
    }
    return n;
}

// The `sopwide` shape of tests/bench/scale_bench.py, as a network: outputs
// of 40 product terms each (terms / 40 outputs) over 64 inputs, every
// product of 6 to 12 distinct inputs in random polarity. Its outputs grow
// with the terms where the decoder's stay at 256 (F149: the engine's memory
// on it).
net::Network syntheticSopWide(std::size_t terms, std::uint32_t seed) {
    constexpr std::size_t kInputs = 64, kChain = 40;
    std::mt19937 rng(seed);
    net::Network n;
    std::vector<net::NodeId> in;
    for (std::size_t i = 0; i < kInputs; ++i) in.push_back(n.addInput("x" + std::to_string(i)));
    const std::size_t outputs = std::max<std::size_t>(1, terms / kChain);
    for (std::size_t o = 0; o < outputs; ++o) {
        algebra::Cover f;
        for (std::size_t t = 0; t < kChain; ++t) {
            const std::size_t len = 6 + rng() % 7;
            std::vector<algebra::Literal> ls;
            std::vector<char> used(kInputs, 0);
            while (ls.size() < len) {
                const std::size_t i = rng() % kInputs;
                if (used[i]) continue;
                used[i] = 1;
                ls.push_back(algebra::makeLiteral(in[i], rng() & 1));
            }
            f.cubes.push_back(algebra::Cube(std::move(ls)));
        }
        f.normalize();
        n.addOutput("y" + std::to_string(o), algebra::makeLiteral(n.addLogic(std::move(f)), false));
    }
    return n;
}

// Outputs of a and b agree on 32 words of random patterns wherever the declared condition is 0.
bool equalWhereCared(const net::Network& a, const net::Network& b, const net::Network& dc) {
    std::mt19937_64 rng(5);
    for (int w = 0; w < 32; ++w) {
        std::vector<std::uint64_t> in(a.inputs().size());
        for (auto& x : in) x = rng();
        auto va = net::simulate(a, in), vb = net::simulate(b, in), vd = net::simulate(dc, in);
        for (std::size_t o = 0; o < va.size(); ++o)
            if ((va[o] ^ vb[o]) & ~vd[o]) return false;
    }
    return true;
}

// A decoder as a case statement with listed codes and an x default: each of
// `outputs` outputs is 1 for some of `codes` listed input codes (full
// compares of `inputs` bits), 0 for the others, and free (x) for every code
// not listed. Returns the network with x read as 0 and fills `dc` with the
// don't-care condition (no listed code matches), both over the same inputs.
net::Network caseDecoder(std::size_t codes, std::size_t inputs, std::size_t outputs, std::uint32_t seed,
                         net::Network& dc) {
    std::mt19937 rng(seed);
    net::Network n;
    dc = net::Network{};
    std::vector<net::NodeId> in, din;
    for (std::size_t i = 0; i < inputs; ++i) {
        in.push_back(n.addInput("a" + std::to_string(i)));
        din.push_back(dc.addInput("a" + std::to_string(i)));
    }
    std::vector<std::uint32_t> listed;
    while (listed.size() < codes) {
        std::uint32_t c = rng() & ((1u << inputs) - 1);
        if (std::find(listed.begin(), listed.end(), c) == listed.end()) listed.push_back(c);
    }
    auto cube = [&](std::uint32_t code, const std::vector<net::NodeId>& vars) {
        std::vector<algebra::Literal> ls;
        for (std::size_t i = 0; i < inputs; ++i) ls.push_back(algebra::makeLiteral(vars[i], !((code >> i) & 1)));
        return algebra::Cube(std::move(ls));
    };
    algebra::Cover any;
    for (std::uint32_t c : listed) any.cubes.push_back(cube(c, din));
    any.normalize();
    const net::NodeId anyNode = dc.addLogic(std::move(any));
    for (std::size_t o = 0; o < outputs; ++o) {
        algebra::Cover f;
        for (std::uint32_t c : listed)
            if (rng() % 3 == 0) f.cubes.push_back(cube(c, in));
        f.normalize();
        const std::string name = "d" + std::to_string(o);
        n.addOutput(name, algebra::makeLiteral(n.addLogic(std::move(f)), false));
        dc.addOutput(name, algebra::makeLiteral(anyNode, true));
    }
    return n;
}

std::string gGoal = "size";
std::vector<std::string> gLimits;
bool gTechniques = false;

Figures runCase(net::Network net, const std::string& effort, int verbose, const net::Network* dontCares = nullptr) {
    Figures f;
    passes::tidy(net);
    const net::Network input = net;
    passes::EngineOptions o;
    o.goal = passes::parseGoal(gGoal);
    o.effort = passes::parseEffort(effort);
    o.limits = passes::limitsFor(o.effort);
    for (const auto& l : gLimits) passes::setLimit(o.limits, l);
    o.dontCares = dontCares;
    o.verbose = verbose;
    auto t0 = std::chrono::steady_clock::now();
    timespec c0{}, c1{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
    passes::EngineResult r = passes::restructure(net, o);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c1);
    f.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    f.engineCpu = static_cast<double>(c1.tv_sec - c0.tv_sec) + static_cast<double>(c1.tv_nsec - c0.tv_nsec) * 1e-9;
    f.gatesBefore = r.before.gates;
    f.gatesAfter = r.after.gates;
    f.depthBefore = r.before.depth;
    f.depthAfter = r.after.depth;
    f.litsBefore = r.before.literals;
    f.litsAfter = r.after.literals;
    f.kept = r.keptOriginal;
    for (const auto& t : r.techniques) {
        if (f.techniques >= 16) break;
        std::snprintf(f.techName[f.techniques], sizeof f.techName[0], "%s", t.technique.c_str());
        f.techSeconds[f.techniques] = t.seconds;
        f.techCpu[f.techniques] = t.cpuSeconds;
        f.techPeakMB[f.techniques] = t.peakMB;
        f.techRiseMB[f.techniques] = t.peakRiseMB;
        f.techTrials[f.techniques] = t.trials;
        ++f.techniques;
    }
    f.equivalent = dontCares ? equalWhereCared(input, net, *dontCares) : sameFunctions(input, net, 32).empty();
    if (verbose || gTechniques) std::fprintf(stderr, "%s", passes::formatEngineReport(r).c_str());
    return f;
}

double gLastCpu = 0;   // user CPU seconds of the last isolated run (the machine is shared: wall time is noisy)

// Run `work` in a child; returns its figures and peak RSS (KiB); its user CPU time in gLastCpu.
template <typename Work>
bool isolated(Work work, Figures& out, long& rssKiB) {
    int fd[2];
    if (pipe(fd) != 0) return false;
    pid_t pid = fork();
    if (pid == 0) {
        close(fd[0]);
        Figures f = work();
        ssize_t w = write(fd[1], &f, sizeof f);
        (void)w;
        _exit(0);
    }
    close(fd[1]);
    Figures f;
    ssize_t got = read(fd[0], &f, sizeof f);
    close(fd[0]);
    int status = 0;
    struct rusage ru {};
    wait4(pid, &status, 0, &ru);
    rssKiB = ru.ru_maxrss;
    gLastCpu = static_cast<double>(ru.ru_utime.tv_sec) + static_cast<double>(ru.ru_utime.tv_usec) / 1e6;
    out = f;
    return got == static_cast<ssize_t>(sizeof f) && WIFEXITED(status) && WEXITSTATUS(status) == 0;
}

// One whole-network cube extraction on a synthetic decoder (the engine's
// opening move on it), by the workspace or in place through the
// cube-literal index: its CPU time (in gLastCpu), literals and SOP depth
// before/after (bound: the input's SOP depth), extractions in seconds.
// Path 2: one whole-network divisor extraction (two-cube and two-literal
// divisors) instead, the other opening move on it.
Figures cubeExtraction(std::size_t terms, int path) {
    const bool inPlace = path == 1;
    net::Network net = syntheticDecoder(terms, 64, 256, 7);
    passes::tidy(net);
    const net::Network input = net;
    const net::Metrics before = net::measure(net);
    passes::PassContext ctx;
    ctx.depthCap = before.depth;
    passes::EngineLimits limits = passes::limitsFor(passes::Effort::Default);
    for (const auto& l : gLimits) passes::setLimit(limits, l);
    passes::ShareCubesOptions o = limits.cubes;
    o.inPlaceCubes = inPlace ? 1 : 0;
    passes::ShareDivisorsOptions d = limits.divisors;
    d.method = passes::ShareDivisorsOptions::Method::Pairs;
    auto t0 = std::chrono::steady_clock::now();
    if (path == 2) passes::shareDivisors(net, d, ctx);
    else passes::shareCubes(net, o, ctx);
    Figures f;
    f.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    const net::Metrics after = net::measure(net);
    f.litsBefore = before.literals;
    f.litsAfter = after.literals;
    f.depthBefore = before.depth;
    f.depthAfter = after.depth;
    f.gatesBefore = static_cast<std::size_t>(ctx.stats.get("extracted") + ctx.stats.get("reused-nodes"));
    f.kept = ctx.stats.get("limit-hit:cubes-work") > 0 || ctx.stats.get("limit-hit:divisors-max-extractions") > 0;
    f.equivalent = sameFunctions(input, net, 8).empty();
    return f;
}

// CPU seconds of this process.
double cpu() {
    timespec ts{};
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) * 1e-9;
}

// Resubstitution alone (F44, F143) on the decoder after the engine's two
// opening cube extractions: its CPU seconds (in f.seconds), literals
// before/after, substitutions (gatesBefore) and candidates met (gatesAfter).
Figures resubstitution(std::size_t terms) {
    net::Network net = syntheticDecoder(terms, 64, 256, 7);
    passes::tidy(net);
    passes::PassContext ctx;
    ctx.depthCap = net::measure(net).depth;
    passes::EngineLimits limits = passes::limitsFor(passes::Effort::Default);
    for (const auto& l : gLimits) passes::setLimit(limits, l);
    for (int k = 0; k < 2; ++k) {
        passes::shareCubes(net, limits.cubes, ctx);
        passes::tidy(net);
    }
    const net::Network input = net;
    const net::Metrics before = net::measure(net);
    passes::PassContext rc;
    rc.depthCap = before.depth;
    const double t0 = cpu();
    passes::reuseNodes(net, limits.reuse, rc);
    Figures f;
    f.seconds = cpu() - t0;
    const net::Metrics after = net::measure(net);
    f.litsBefore = before.literals;
    f.litsAfter = after.literals;
    f.depthBefore = before.depth;
    f.depthAfter = after.depth;
    f.gatesBefore = static_cast<std::size_t>(rc.stats.get("substituted"));
    f.gatesAfter = static_cast<std::size_t>(rc.stats.get("candidates-met"));
    f.kept = rc.stats.get("limit-hit:resub-fanout-scan") > 0;
    f.equivalent = sameFunctions(input, net, 8).empty();
    return f;
}

// The costs every trial of the engine pays on the whole network besides
// its technique (F44): copying the network, tidying it and measuring its
// factored forms (cache warm: the covers were factored once before). The
// network is the decoder after one whole-network cube extraction (the
// engine's state after its first opening move). CPU seconds, mean of 3.
// `m.base` measures the same copy with the network it was copied from as
// the measure base (passes::MeasureBase, as the engine measures its trials).
struct Overheads {
    std::size_t nodes = 0, gates = 0;
    double copy = 0, tidy = 0, measure = 0, measureBase = 0, order = 0;
};

Overheads trialOverheads(std::size_t terms) {
    net::Network net = syntheticDecoder(terms, 64, 256, 7);
    passes::tidy(net);
    passes::PassContext ctx;
    ctx.depthCap = net::measure(net).depth;
    passes::ShareCubesOptions o = passes::limitsFor(passes::Effort::Default).cubes;
    o.inPlaceCubes = 1;
    passes::shareCubes(net, o, ctx);
    passes::tidy(net);
    passes::FactorCache cache;
    Overheads r;
    const net::Metrics m = passes::measureFactored(net, -1, &cache);
    // The entries of the network the trial was copied from: the engine's
    // measure base (a trial's unchanged covers need no lookup).
    passes::MeasureMemo memo;
    (void)passes::measureFactored(net, static_cast<int>(m.depth), cache, passes::MeasureBase{}, &memo);
    r.nodes = net.logicCount();
    r.gates = m.gates;
    const int reps = 3;
    for (int k = 0; k < reps; ++k) {
        double t = cpu();
        net::Network copy = net;
        r.copy += cpu() - t;
        t = cpu();
        passes::PassContext tc;
        passes::tidy(copy, tc, net);   // as the engine tidies a trial: against the network it was copied from
        r.tidy += cpu() - t;
        t = cpu();
        (void)passes::measureFactored(copy, static_cast<int>(m.depth), &cache);
        r.measure += cpu() - t;
        t = cpu();
        (void)passes::measureFactored(copy, static_cast<int>(m.depth), cache, passes::MeasureBase{&net, &memo},
                                      nullptr);
        r.measureBase += cpu() - t;
        t = cpu();
        (void)copy.topoOrder();
        r.order += cpu() - t;
    }
    r.copy /= reps, r.tidy /= reps, r.measure /= reps, r.measureBase /= reps, r.order /= reps;
    return r;
}

} // namespace

int main(int argc, char** argv) {
    std::string effort = "default", dir, only, shape = "decoder";
    bool synthetic = true;
    int verbose = 0;
    std::size_t maxTerms = 0, minTerms = 0;
    std::vector<std::size_t> sizes;   // --terms: decoder sizes other than 1k/10k/100k
    for (int i = 1; i < argc; ++i) {
        std::string a = argv[i];
        if (a == "--effort" && i + 1 < argc) effort = argv[++i];
        else if (a == "--epfl" && i + 1 < argc) dir = argv[++i];
        else if (a == "--only" && i + 1 < argc) only = argv[++i];
        else if (a == "--goal" && i + 1 < argc) gGoal = argv[++i];
        else if (a == "--limit" && i + 1 < argc) gLimits.push_back(argv[++i]);
        else if (a == "--techniques") gTechniques = true;
        else if (a == "--skip-synthetic") synthetic = false;
        else if (a == "--max-terms" && i + 1 < argc) maxTerms = std::stoul(argv[++i]);
        else if (a == "--min-terms" && i + 1 < argc) minTerms = std::stoul(argv[++i]);
        else if (a == "--terms" && i + 1 < argc) sizes.push_back(std::stoul(argv[++i]));
        else if (a == "--shape" && i + 1 < argc) shape = argv[++i];
        else if (a == "-v") ++verbose;
        else {
            std::fprintf(stderr, "usage: passes_bench [--effort E] [--goal size|depth] [--limit NAME=N]... [--techniques] [--epfl DIR] "
                                 "[--only NAME|synthetic|dont-cares|cube-extraction|resubstitution|overheads] [--skip-synthetic] [--min-terms N] [--max-terms N] [--terms N]... [--shape decoder|sopwide] [-v]\n");
            return 2;
        }
    }
    if (shape != "decoder" && shape != "sopwide") {
        std::fprintf(stderr, "passes_bench: unknown shape '%s' (decoder or sopwide)\n", shape.c_str());
        return 2;
    }
    if (dir.empty()) dir = std::string(KERF_SOURCE_DIR) + "/../shared/benchmarks/epfl";
    int failures = 0;
    std::printf("effort: %s, goal: %s%s\n", effort.c_str(), gGoal.c_str(), gLimits.empty() ? "" : ", limits set:");
    for (const auto& l : gLimits) std::printf("  %s\n", l.c_str());
    std::printf("%-14s %8s %8s %7s %7s %7s %9s %9s %10s %s\n", "file", "gates", "after", "ratio", "depth", "after",
                "seconds", "cpu", "peakRSS", "notes");
    double logSum = 0;
    int count = 0;
    const char* files[] = {"ctrl", "dec", "int2float", "router", "priority", "voter"};
    if (!std::filesystem::exists(dir)) {
        std::printf("(EPFL benchmarks not found at %s: skipped)\n", dir.c_str());
    } else {
        for (const char* name : files) {
            if (!only.empty() && only != name) continue;   // --only synthetic / dont-cares skip them all
            std::string path = dir + "/" + name + ".v";
            Figures f;
            long rss = 0;
            bool ok = isolated([&] { return runCase(loadEpflAigForBench(path), effort, verbose); }, f, rss);
            if (!ok) {
                std::printf("%-14s crashed\n", name);
                ++failures;
                continue;
            }
            double ratio = f.gatesBefore ? double(f.gatesAfter) / double(f.gatesBefore) : 1.0;
            logSum += std::log(ratio);
            ++count;
            std::string notes;
            if (!f.equivalent) { notes += " NOT-EQUIVALENT"; ++failures; }
            if (f.kept) notes += " input-kept";
            if (f.gatesAfter > f.gatesBefore) { notes += " GREW"; ++failures; }
            if (f.depthAfter > f.depthBefore) { notes += " DEEPER"; ++failures; }
            std::printf("%-14s %8zu %8zu %7.3f %7zu %7zu %9.2f %9.2f %8.1fMB%s\n", name, f.gatesBefore, f.gatesAfter,
                        ratio, f.depthBefore, f.depthAfter, f.seconds, gLastCpu, rss / 1024.0, notes.c_str());
            std::fflush(stdout);
        }
        if (count) std::printf("geometric mean ratio: %.3f over %d files\n", std::exp(logSum / count), count);
    }
    if (synthetic && (only.empty() || only == "synthetic")) {
        std::printf("\n%-22s %8s %8s %9s %7s %7s %9s %9s %10s\n", shape == "sopwide" ? "synthetic sopwide" : "synthetic decoder", "lits", "after", "gates", "after",
                    "depth", "seconds", "cpu", "peakRSS");
        struct Cfg { std::size_t terms, inputs, outputs; };
        // The shape of the issue-9 generator at every size: 64 inputs, 256 outputs.
        std::vector<Cfg> cfgs = {Cfg{1000, 64, 256}, Cfg{10000, 64, 256}, Cfg{100000, 64, 256}};
        if (!sizes.empty()) {
            cfgs.clear();
            for (std::size_t t : sizes) cfgs.push_back(Cfg{t, 64, 256});
        }
        for (Cfg c : cfgs) {
            if (minTerms && c.terms < minTerms) continue;
            if (maxTerms && c.terms > maxTerms) continue;
            Figures f;
            long rss = 0;
            bool ok = isolated(
                [&] {
                    return runCase(shape == "sopwide" ? syntheticSopWide(c.terms, 7)
                                                      : syntheticDecoder(c.terms, c.inputs, c.outputs, 7),
                                   effort, verbose);
                },
                f, rss);
            std::string label = std::to_string(c.terms) + (shape == "sopwide" ? " terms/sopwide" : " terms/") +
                                (shape == "sopwide" ? "" : std::to_string(c.inputs) + " in");
            if (!ok) {
                std::printf("%-22s crashed\n", label.c_str());
                ++failures;
                continue;
            }
            std::printf("%-22s %8zu %8zu %9zu %7zu %7zu %9.2f %9.2f %8.1fMB%s\n", label.c_str(), f.litsBefore,
                        f.litsAfter, f.gatesBefore, f.gatesAfter, f.depthAfter, f.seconds, gLastCpu, rss / 1024.0,
                        f.equivalent ? "" : " NOT-EQUIVALENT");
            if (!f.equivalent) ++failures;
            // CPU time: wall time on a shared machine says little. A regroup's
            // time includes the inner trials also counted under their techniques.
            std::printf("    engine alone: %.2f CPU s (the rest of the cpu column: generating the network, "
                        "its first tidy and the simulation check)\n",
                        f.engineCpu);
            std::string per = "    CPU time per technique (s, trials):";
            for (int t = 0; t < f.techniques; ++t)
                per += " " + std::string(f.techName[t]) + " " + std::to_string(f.techCpu[t]).substr(0, 6) + " (" +
                       std::to_string(f.techTrials[t]) + ")";
            std::printf("%s\n", per.c_str());
            // The process's peak memory when the technique's last trial
            // ended, and how far its trials raised it (MB).
            std::string mem = "    peak MB per technique (peak, raised):";
            for (int t = 0; t < f.techniques; ++t)
            {
                char buf[96];
                std::snprintf(buf, sizeof buf, " %s %.0f (%.0f)", f.techName[t], f.techPeakMB[t], f.techRiseMB[t]);
                mem += buf;
            }
            std::printf("%s\n", mem.c_str());
            std::fflush(stdout);
        }
    }
    if (only == "overheads") {
        std::printf("\nper-trial costs outside the technique (CPU s, mean of 3), after one cube extraction\n");
        std::printf("%-10s %9s %9s %8s %8s %8s %8s %8s\n", "terms", "nodes", "gates", "copy", "tidy", "measure",
                    "m.base", "order");
        for (std::size_t terms : {1000u, 10000u, 100000u}) {
            if (minTerms && terms < minTerms) continue;
            if (maxTerms && terms > maxTerms) continue;
            Overheads r;
            int fd[2];
            if (pipe(fd) != 0) return 1;
            const pid_t pid = fork();
            if (pid == 0) {
                close(fd[0]);
                const Overheads x = trialOverheads(terms);
                ssize_t w = write(fd[1], &x, sizeof x);
                (void)w;
                _exit(0);
            }
            close(fd[1]);
            const ssize_t got = read(fd[0], &r, sizeof r);
            close(fd[0]);
            int status = 0;
            waitpid(pid, &status, 0);
            if (got != static_cast<ssize_t>(sizeof r)) {
                std::printf("%-10zu crashed\n", terms);
                ++failures;
                continue;
            }
            std::printf("%-10zu %9zu %9zu %8.3f %8.3f %8.3f %8.3f %8.3f\n", terms, r.nodes, r.gates, r.copy,
                        r.tidy, r.measure, r.measureBase, r.order);
            std::fflush(stdout);
        }
        return failures ? 1 : 0;
    }
    if (only == "resubstitution") {
        // Resubstitution alone after the opening's two cube extractions, at
        // the --terms sizes (default 10k and 30k): how its candidate search grows.
        std::printf("\n%-10s %9s %9s %6s %6s %11s %13s %9s %s\n", "terms", "lits", "after", "depth", "after",
                    "substituted", "candidates", "cpu resub", "notes");
        std::vector<std::size_t> ts = sizes.empty() ? std::vector<std::size_t>{10000, 30000} : sizes;
        for (std::size_t terms : ts) {
            Figures f;
            long rss = 0;
            bool ok = isolated([&] { return resubstitution(terms); }, f, rss);
            if (!ok) {
                std::printf("%-10zu crashed\n", terms);
                ++failures;
                continue;
            }
            std::string notes = f.equivalent ? "" : " NOT-EQUIVALENT";
            if (!f.equivalent) ++failures;
            if (f.depthAfter > f.depthBefore) { notes += " DEEPER"; ++failures; }
            if (f.kept) notes += " limit-hit:resub-fanout-scan";
            std::printf("%-10zu %9zu %9zu %6zu %6zu %11zu %13zu %9.2f%s\n", terms, f.litsBefore, f.litsAfter,
                        f.depthBefore, f.depthAfter, f.gatesBefore, f.gatesAfter, f.seconds, notes.c_str());
            std::fflush(stdout);
        }
        return failures ? 1 : 0;
    }
    if (only == "cube-extraction") {
        // F44: the engine's first move on the synthetic decoders, alone. The
        // workspace path rewrites every target cover per extraction; in place
        // edits cubes through the index. The workspace path at 100k terms
        // took about 1000 s (F44): it runs there only with --max-terms 0.
        std::printf("\n%-10s %-10s %9s %9s %6s %6s %11s %9s %9s %s\n", "terms", "path", "lits", "after", "depth",
                    "after", "extractions", "seconds", "cpu", "notes");
        for (std::size_t terms : {1000u, 10000u, 100000u}) {
            if (minTerms && terms < minTerms) continue;
            if (maxTerms && terms > maxTerms) continue;
            for (int path : {0, 1, 2}) {
                const char* pathName = path == 0 ? "workspace" : path == 1 ? "in place" : "divisors";
                if (path == 0 && terms >= 100000 && maxTerms != 0 && maxTerms < 100000) continue;
                if (path == 0 && terms >= 100000 && maxTerms == 0) {
                    std::printf("%-10zu %-10s (not run: about 1000 s, F44; --max-terms 100000 runs it)\n", terms,
                                "workspace");
                    continue;
                }
                Figures f;
                long rss = 0;
                bool ok = isolated([&] { return cubeExtraction(terms, path); }, f, rss);
                if (!ok) {
                    std::printf("%-10zu %-10s crashed\n", terms, pathName);
                    ++failures;
                    continue;
                }
                std::string notes = f.equivalent ? "" : " NOT-EQUIVALENT";
                if (!f.equivalent) ++failures;
                if (f.depthAfter > f.depthBefore) { notes += " DEEPER"; ++failures; }
                if (f.kept) notes += " a work limit cut it short";
                std::printf("%-10zu %-10s %9zu %9zu %6zu %6zu %11zu %9.2f %9.2f%s\n", terms, pathName, f.litsBefore, f.litsAfter, f.depthBefore,
                            f.depthAfter, f.gatesBefore, f.seconds, gLastCpu, notes.c_str());
                std::fflush(stdout);
            }
        }
        return failures ? 1 : 0;
    }
    if (only.empty() || only == "dont-cares") {
        // Declared x defaults: the same decoders restructured with x read as 0
        // and with the x positions given to the engine as don't-cares.
        std::printf("\n%-26s %8s %9s %9s %9s %10s\n", "case decoder, x default", "gates", "x as 0", "x free",
                    "seconds", "checked");
        struct Dc { std::size_t codes, inputs, outputs; };
        for (Dc c : {Dc{12, 6, 4}, Dc{24, 8, 8}, Dc{40, 10, 8}, Dc{64, 12, 16}, Dc{100, 14, 16}}) {
            net::Network dc;
            const net::Network n = caseDecoder(c.codes, c.inputs, c.outputs, static_cast<std::uint32_t>(c.codes), dc);
            Figures f0, f1;
            long rss = 0;
            bool ok0 = isolated([&] { return runCase(n, effort, verbose); }, f0, rss);
            bool ok1 = isolated([&] { return runCase(n, effort, verbose, &dc); }, f1, rss);
            std::string label = std::to_string(c.codes) + " codes/" + std::to_string(c.inputs) + " in/" +
                                std::to_string(c.outputs) + " out";
            if (!ok0 || !ok1) {
                std::printf("%-26s crashed\n", label.c_str());
                ++failures;
                continue;
            }
            const bool good = f0.equivalent && f1.equivalent;
            std::printf("%-26s %8zu %9zu %9zu %9.2f %10s\n", label.c_str(), f0.gatesBefore, f0.gatesAfter,
                        f1.gatesAfter, f1.seconds, good ? "equal" : "NOT-EQUIVALENT");
            if (!good) ++failures;
            std::fflush(stdout);
        }
    }
    return failures ? 1 : 0;
}
