// engine.cpp — recipes and the restructuring engine.
//
// A recipe is a comma-separated list of passes, each with an optional
// argument after a colon. The engine runs them in order on the network,
// measuring the factored forms after each (see factored.cpp). The depth
// bound works at two levels: every pass checks its own edits against the
// sum-of-products arrival times and undoes an edit that makes a node later
// than the bound (local undo, see workspace.h); the engine then measures the
// factored depth and undoes a whole pass whose result is deeper than the
// bound (a snapshot taken before the pass). At the end the result is kept
// only if it is no worse than the input on the cost (two-input gates, then
// literals); otherwise the input is restored. The best network seen after
// any step is kept, so a recipe may explore (collapse, re-extract) freely. The order of the built-in
// recipes follows the usual order of multi-level algebraic optimisation
// (clean up, collapse, minimise nodes, extract shared divisors, reuse nodes,
// minimise again) as surveyed in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 (from memory).
#include "kerf/passes/engine.h"

#include "kerf/diagnostics.h"
#include "kerf/passes/factored.h"
#include "kerf/passes/inline_small.h"
#include "kerf/passes/reuse_nodes.h"
#include "kerf/passes/share_cubes.h"
#include "kerf/passes/share_divisors.h"
#include "kerf/passes/shrink_nodes.h"
#include "kerf/passes/tidy.h"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <stdexcept>

namespace kerf::passes {

// ---- statistics --------------------------------------------------------------

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

// ---- registry ----------------------------------------------------------------

namespace {

[[noreturn]] void badArg(const std::string& pass, const std::string& arg, const std::string& expected) {
    throw Error(fmt::format("recipe: pass '{}' does not take the argument '{}' (expected {})", pass, arg, expected));
}

bool parseInt(const std::string& s, long& out) {
    if (s.empty()) return false;
    std::size_t pos = 0;
    try {
        out = std::stol(s, &pos);
    } catch (const std::exception&) {
        return false;
    }
    return pos == s.size();
}

InlineOptions inlineOptions(const std::string& arg) {
    InlineOptions o;
    if (arg.empty()) return o;
    std::string a = arg, b;
    if (auto slash = arg.find('/'); slash != std::string::npos) {
        a = arg.substr(0, slash);
        b = arg.substr(slash + 1);
    }
    long t = 0, c = 0;
    if (!parseInt(a, t) || t < -1000 || t > 1000) badArg("inline-small", arg, "N or N/CUBES, N an integer literal growth");
    o.threshold = static_cast<int>(t);
    if (!b.empty()) {
        if (!parseInt(b, c) || c < 1 || c > 4096) badArg("inline-small", arg, "N or N/CUBES, CUBES from 1 to 4096");
        o.maxCubes = static_cast<std::size_t>(c);
    }
    return o;
}

ShareDivisorsOptions divisorOptions(const std::string& arg) {
    ShareDivisorsOptions o;
    if (arg.empty() || arg == "pairs") o.method = ShareDivisorsOptions::Method::Pairs;
    else if (arg == "kernels") o.method = ShareDivisorsOptions::Method::Kernels;
    else if (arg == "both") o.method = ShareDivisorsOptions::Method::Both;
    else badArg("share-divisors", arg, "pairs, kernels or both");
    return o;
}

ShrinkOptions shrinkOptions(const std::string& arg) {
    ShrinkOptions o;
    if (arg == "keep-polarity") o.allowComplement = false;
    else if (!arg.empty()) badArg("shrink-nodes", arg, "nothing or keep-polarity");
    return o;
}

ReuseOptions reuseOptions(const std::string& arg) {
    ReuseOptions o;
    if (arg == "plain") o.complements = false;
    else if (!arg.empty()) badArg("reuse-nodes", arg, "nothing or plain");
    return o;
}

void noArg(const std::string& pass, const std::string& arg) {
    if (!arg.empty()) badArg(pass, arg, "no argument");
}

// depth-cap argument: -2 none, -1 input, else N.
long depthCapArg(const std::string& arg) {
    if (arg == "none") return -2;
    if (arg == "input" || arg.empty()) return -1;
    long n = 0;
    if (!parseInt(arg, n) || n < 0) badArg("depth-cap", arg, "a depth N >= 0, input or none");
    return n;
}

std::vector<PassInfo> makeRegistry() {
    std::vector<PassInfo> r;
    r.push_back({"tidy", "", "propagate constants, drop buffers and inverter pairs, merge identical nodes, remove dead logic",
                 [](const std::string& a) { noArg("tidy", a); },
                 [](net::Network& n, const std::string&, PassContext& c) { tidy(n, c); }});
    r.push_back({"inline-small", "N[/CUBES]",
                 "collapse nodes into their fanouts when literals grow by at most N (default 0), covers capped at CUBES cubes",
                 [](const std::string& a) { inlineOptions(a); },
                 [](net::Network& n, const std::string& a, PassContext& c) { inlineSmall(n, inlineOptions(a), c); }});
    r.push_back({"shrink-nodes", "[keep-polarity]",
                 "two-level minimisation of every node, complementing a node when that is cheaper",
                 [](const std::string& a) { shrinkOptions(a); },
                 [](net::Network& n, const std::string& a, PassContext& c) { shrinkNodes(n, shrinkOptions(a), c); }});
    r.push_back({"share-cubes", "", "extract cubes common to several cubes as new nodes",
                 [](const std::string& a) { noArg("share-cubes", a); },
                 [](net::Network& n, const std::string&, PassContext& c) { shareCubes(n, ShareCubesOptions{}, c); }});
    r.push_back({"share-divisors", "[pairs|kernels|both]",
                 "extract multi-cube divisors shared by nodes: two-cube divisors (pairs) or common kernels",
                 [](const std::string& a) { divisorOptions(a); },
                 [](net::Network& n, const std::string& a, PassContext& c) { shareDivisors(n, divisorOptions(a), c); }});
    r.push_back({"reuse-nodes", "[plain]",
                 "divide every node by existing nodes (and their complements unless plain) where that saves literals",
                 [](const std::string& a) { reuseOptions(a); },
                 [](net::Network& n, const std::string& a, PassContext& c) { reuseNodes(n, reuseOptions(a), c); }});
    r.push_back({"depth-cap", "N|input|none", "set the depth bound for the passes that follow",
                 [](const std::string& a) { depthCapArg(a); }, nullptr});
    r.push_back({"final-factor", "", "measure the factored forms that will be written (changes nothing)",
                 [](const std::string& a) { noArg("final-factor", a); }, nullptr});
    return r;
}

std::string validNames() {
    std::string s;
    for (const PassInfo& p : passRegistry())
        s += fmt::format("\n  {:<16} {}", p.argHelp.empty() ? p.name : p.name + ":" + p.argHelp, p.summary);
    return s;
}

std::string trim(const std::string& s) {
    std::size_t b = s.find_first_not_of(" \t\n");
    if (b == std::string::npos) return {};
    std::size_t e = s.find_last_not_of(" \t\n");
    return s.substr(b, e - b + 1);
}

double since(std::chrono::steady_clock::time_point t) {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - t).count();
}

bool costBetterOrEqual(const net::Metrics& a, const net::Metrics& b) {
    return a.gates < b.gates || (a.gates == b.gates && a.literals <= b.literals);
}

} // namespace

const std::vector<PassInfo>& passRegistry() {
    static const std::vector<PassInfo> registry = makeRegistry();
    return registry;
}

const PassInfo* findPass(const std::string& name) {
    for (const PassInfo& p : passRegistry())
        if (p.name == name) return &p;
    return nullptr;
}

std::vector<RecipeStep> parseRecipe(const std::string& recipe) {
    std::vector<RecipeStep> steps;
    std::size_t start = 0;
    while (start <= recipe.size()) {
        std::size_t comma = recipe.find(',', start);
        std::string item = trim(recipe.substr(start, comma == std::string::npos ? std::string::npos : comma - start));
        start = comma == std::string::npos ? recipe.size() + 1 : comma + 1;
        if (item.empty()) {
            if (comma == std::string::npos && !steps.empty()) break;
            throw Error("recipe: empty step in '" + recipe + "'; valid passes:" + validNames());
        }
        RecipeStep st;
        std::size_t colon = item.find(':');
        st.pass = trim(item.substr(0, colon));
        if (colon != std::string::npos) st.arg = trim(item.substr(colon + 1));
        const PassInfo* info = findPass(st.pass);
        if (!info) throw Error("recipe: unknown pass '" + st.pass + "'; valid passes:" + validNames());
        info->checkArg(st.arg);
        steps.push_back(std::move(st));
    }
    return steps;
}

std::string builtinRecipe(const std::string& effort) {
    // One round = minimise nodes, extract shared divisors, resubstitute,
    // extract common cubes; rounds are separated by a mild collapse
    // (inline-small:1) that dissolves small nodes so the next round can
    // regroup them. The shape follows the classic algebraic scripts; the
    // thresholds were chosen on the EPFL random/control files (passes_bench).
    const std::string round = "shrink-nodes,share-divisors,reuse-nodes,share-cubes";
    const std::string roundK = "shrink-nodes,share-divisors:both,reuse-nodes,share-cubes";
    if (effort == "fast")
        return "tidy,inline-small:-1,inline-small:1," + round + ",inline-small:-1,tidy,final-factor";
    if (effort == "default")
        return "tidy,inline-small:-1,inline-small:1," + round + ",inline-small:1," + round + ",inline-small:1," +
               round + ",inline-small:-1,tidy,final-factor";
    if (effort == "thorough")
        return "tidy,inline-small:-1,inline-small:1," + roundK + ",inline-small:1," + roundK + ",inline-small:1," +
               round + ",inline-small:2," + round + ",inline-small:0," + round + ",inline-small:-1,tidy,final-factor";
    throw Error("unknown effort '" + effort + "' (expected fast, default or thorough)");
}

EngineResult restructure(net::Network& net, const EngineOptions& opts) {
    const auto t0 = std::chrono::steady_clock::now();
    EngineResult res;
    res.recipe = opts.recipe.empty() ? builtinRecipe(opts.effort) : opts.recipe;
    const std::vector<RecipeStep> steps = parseRecipe(res.recipe);
    FactorCache cache;
    res.before = measureFactored(net, -1, &cache);
    const long inputDepth = static_cast<long>(res.before.depth);
    long cap = opts.maxDepth >= 0 ? opts.maxDepth : inputDepth;   // -2 (none) only from a recipe step
    auto passCap = [&]() { return cap < 0 ? kNoDepthCap : static_cast<std::size_t>(cap); };
    auto measureCap = [&]() { return cap < 0 ? 1 << 30 : static_cast<int>(cap); };
    auto depthOk = [&](std::size_t depth, std::size_t previous) {
        return cap < 0 || static_cast<long>(depth) <= std::max<long>(cap, static_cast<long>(previous));
    };
    const net::Network original = net;
    net::Metrics current = res.before;
    // The best network seen after any step (cost first, depth within the bound).
    net::Network best = net;
    net::Metrics bestM = res.before;
    bool bestIsInput = true;
    for (const RecipeStep& step : steps) {
        const auto ts = std::chrono::steady_clock::now();
        PassRow row;
        row.pass = step.str();
        if (step.pass == "depth-cap") {
            long c = depthCapArg(step.arg);
            cap = c == -1 ? inputDepth : c;
            row.after = current;
        } else if (step.pass == "final-factor") {
            current = measureFactored(net, measureCap(), &cache);
            row.after = current;
        } else {
            const PassInfo* info = findPass(step.pass);
            net::Network snapshot = net;
            PassContext ctx;
            ctx.depthCap = passCap();
            ctx.verbose = opts.verbose;
            info->run(net, step.arg, ctx);
            net::Metrics m = measureFactored(net, measureCap(), &cache);
            if (!depthOk(m.depth, current.depth)) {
                net = std::move(snapshot);
                row.undone = true;
                m = current;
            }
            current = m;
            row.after = m;
            row.counters = ctx.stats.items();
            if (!row.undone && depthOk(m.depth, res.before.depth) &&
                (m.gates < bestM.gates || (m.gates == bestM.gates && m.literals < bestM.literals))) {
                best = net;
                bestM = m;
                bestIsInput = false;
            }
        }
        row.seconds = since(ts);
        if (opts.verbose >= 2)
            std::fprintf(stderr, "kerf: %-22s literals %zu gates %zu depth %zu (%.2fs)%s\n", row.pass.c_str(),
                         row.after.literals, row.after.gates, row.after.depth, row.seconds,
                         row.undone ? " undone: too deep" : "");
        res.rows.push_back(std::move(row));
    }
    res.after = measureFactored(net, measureCap(), &cache);
    if (!bestIsInput && (bestM.gates < res.after.gates ||
                         (bestM.gates == res.after.gates && bestM.literals < res.after.literals))) {
        net = std::move(best);   // a later step made it worse: go back to the best seen
        res.after = measureFactored(net, measureCap(), &cache);
    }
    const bool depthFine = depthOk(res.after.depth, res.before.depth);
    if (!depthFine || !costBetterOrEqual(res.after, res.before)) {
        net = original;
        res.after = res.before;
        res.keptOriginal = true;
    }
    res.depthCap = measureCap();
    res.seconds = since(t0);
    return res;
}

std::string formatPassTable(const EngineResult& r) {
    std::string s = fmt::format("{:<24} {:>9} {:>8} {:>6} {:>7} {:>9}\n", "pass", "literals", "gates", "depth",
                                "nodes", "seconds");
    auto line = [&](const std::string& name, const net::Metrics& m, double sec, const std::string& note) {
        s += fmt::format("{:<24} {:>9} {:>8} {:>6} {:>7} {:>9.3f}{}\n", name, m.literals, m.gates, m.depth, m.nodes,
                         sec, note);
    };
    line("(input)", r.before, 0.0, "");
    for (const PassRow& row : r.rows) line(row.pass, row.after, row.seconds, row.undone ? "  undone: too deep" : "");
    line(r.keptOriginal ? "(result: input kept)" : "(result)", r.after, r.seconds, "");
    bool any = false;
    for (const PassRow& row : r.rows) {
        if (row.counters.empty()) continue;
        if (!any) s += "pass counters:\n";
        any = true;
        std::string c;
        for (const auto& [n, v] : row.counters) c += fmt::format(" {}={}", n, v);
        s += fmt::format("  {}:{}\n", row.pass, c);
    }
    return s;
}

} // namespace kerf::passes
