// flows.cpp — restructure (and --all-modules), stats and draw: reading, passes, writing and proof glued together.
#include "kerf/flow/flows.h"

#include "kerf/emit/diff.h"
#include "kerf/emit/draw.h"
#include "kerf/emit/guard.h"
#include "kerf/emit/constant_regroup.h"
#include "kerf/emit/slice_regroup.h"
#include "kerf/emit/word_fold.h"
#include "kerf/emit/writer.h"
#include "kerf/flow/counterexample.h"
#include "kerf/frontend/lower.h"
#include "kerf/io/files.h"
#include "kerf/io/process.h"
#include "kerf/io/progress.h"
#include "kerf/io/reader.h"
#include "kerf/passes/engine.h"
#include "kerf/passes/tidy.h"
#include "kerf/passes/factored.h"
#include "kerf/proof/boundary.h"
#include "kerf/proof/equivalence.h"

#include <fmt/format.h>

#if defined(__GLIBC__)
#include <malloc.h>
#endif

#include <algorithm>
#include <tuple>
#include <cctype>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <map>
#include <memory>
#include <optional>
#include <set>
#include <string_view>

namespace kerf::flow {

namespace {

using Clock = std::chrono::steady_clock;
double since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }
/// CPU seconds of the calling thread (the progress line's thread is not counted).
double threadCpu() {
    timespec ts{};
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
    return static_cast<double>(ts.tv_sec) + static_cast<double>(ts.tv_nsec) * 1e-9;
}

/// A rewritten group that compares with at least this many named constants and names none of
/// them is kept as written (F346).
constexpr std::size_t kMinConstantsCompared = 2;

/// Enum-typed fields of more than one bit inside a packed struct of type `t` (nested structs
/// too): their bit offsets within it (lo, hi) and their path (`kind`, `hdr.kind`).
void enumFields(const frontend::Ir& ir, frontend::TypeId t, int base, const std::string& path, int depth,
                std::vector<std::tuple<int, int, std::string>>& out) {
    if (t == frontend::kNoId || t >= ir.types.size() || depth > 8) return;
    const auto& ty = ir.types[t];
    if (ty.kind != frontend::TypeKind::Struct) return;
    for (const auto& f : ty.fields) {
        if (f.type == frontend::kNoId || f.type >= ir.types.size()) continue;
        const auto& ft = ir.types[f.type];
        const std::string name = path.empty() ? f.name : path + "." + f.name;
        if (ft.kind == frontend::TypeKind::Enum && ft.width > 1)
            out.emplace_back(base + f.offset, base + f.offset + ft.width - 1, name);
        else
            enumFields(ir, f.type, base + f.offset, name, depth + 1, out);
    }
}

/// A statement group's line ranges as the summary and the `-v` table print them: "12", "14-19,23".
/// Ranges that follow each other (statements on lines 7, 8, 9) print as one ("7-9"): a flat
/// netlist's group of 14,000 one-line statements is one range, not 14,000 numbers.
std::string lineRanges(const std::vector<std::pair<int, int>>& lines) {
    std::vector<std::pair<int, int>> merged;
    for (const auto& r : lines)
        if (!merged.empty() && r.first >= merged.back().first && r.first <= merged.back().second + 1)
            merged.back().second = std::max(merged.back().second, r.second);
        else
            merged.push_back(r);
    std::string s;
    for (std::size_t i = 0; i < merged.size(); ++i)
        s += (i ? "," : "") + (merged[i].first == merged[i].second ? std::to_string(merged[i].first)
                                                                  : fmt::format("{}-{}", merged[i].first, merged[i].second));
    return s;
}

std::string percent(std::size_t before, std::size_t after) {
    if (before == 0) return "0%";
    double p = 100.0 * (static_cast<double>(after) - static_cast<double>(before)) / static_cast<double>(before);
    return fmt::format("{:+.1f}%", p);
}

nlohmann::json metricsJson(const net::Metrics& m) {
    return {{"inputs", m.inputs}, {"outputs", m.outputs}, {"nodes", m.nodes},
            {"literals", m.literals}, {"gates", m.gates}, {"depth", m.depth}};
}

nlohmann::json stagesJson(const io::StageLog& log) {
    nlohmann::json rows = nlohmann::json::array();
    for (const auto& r : log.rows())
        rows.push_back({{"stage", r.stage}, {"seconds", r.seconds}, {"cpu_seconds", r.cpuSeconds},
                        {"peak_memory_mb", (r.peakRssKb + 1023) / 1024}, {"process", r.child ? "reader" : "kerf"}});
    return rows;
}

/// Lower `d`; `prefix` is the user's --wire-prefix (generated names take "kf_" when it is
/// empty; word results named from what they compute take `prefix` alone). Internal signals stay outputs of the network (the front end pins
/// them: no declaration is deleted) unless `dissolve`. When `only` is given,
/// the internal signals kept are just those (the original's, when reading back
/// the rewrite, so that kerf's new wires are not compared).
frontend::Lowered lowerAs(const frontend::ModuleDesc& d, bool dissolve, bool bitBlast, const std::string& prefix,
                          const std::set<std::string>* only = nullptr, const std::vector<std::string>& keep = {},
                          bool keepX = false, const std::map<int, std::string>& kept = {},
                          const std::vector<std::string>& lintOnly = {}) {
    frontend::LowerOptions lo;
    lo.lintOnly = lintOnly;
    lo.keepX = keepX;
    lo.keptMembers = kept;
    lo.bitBlastArithmetic = bitBlast;
    lo.prefix = prefix.empty() ? "kf_" : prefix;
    lo.namePrefix = prefix;
    lo.keep = keep;
    lo.dissolveInternal = dissolve || only != nullptr;
    if (only && !dissolve) lo.observe.assign(only->begin(), only->end());
    frontend::Lowered low = frontend::lower(d, lo);
    // Figures count the logic that reaches an output, nothing overwritten or unread.
    low.net.removeUnreachable();
    // One node per written expression, as the engine's nodes are written (F42); with internal
    // signals dissolved a signal's logic has no node boundary to keep, so nothing is merged.
    // A written expression's node reaches at most ExpressionMergeLimits::maxCubes cubes (a larger
    // product keeps its parts as nodes of their own); above factorCubes a merge is decided from
    // cube and literal counts, without factoring (F76).
    if (!lo.dissolveInternal) low.merge = frontend::collapseExpressionNodes(low.net, frontend::ExpressionMergeLimits{});
    return low;
}

/// Members a lowering left as written, with the reasons.
std::map<int, std::string> keptIn(const frontend::Lowered& low) {
    std::map<int, std::string> k;
    for (const auto& s : low.kept) k.emplace(s.member, s.reason);
    return k;
}

/// Members of `other` whose match key (same tokens, same meaning) is that of a member of
/// `orig` in `kept`: the statements the original's lowering kept, found in the rewrite.
std::map<int, std::string> keptByKey(const frontend::ModuleDesc& orig, const std::map<int, std::string>& kept,
                                     const frontend::ModuleDesc& other) {
    std::map<std::string, std::string> keys;
    for (const auto& [id, why] : kept)
        if (id >= 0 && static_cast<std::size_t>(id) < orig.members.size() && !orig.members[id].matchKey.empty())
            keys.emplace(orig.members[id].matchKey, why);
    std::map<int, std::string> out;
    for (const auto& m : other.members)
        if (auto it = keys.find(m.matchKey); it != keys.end()) out.emplace(m.id, it->second);
    return out;
}

WordOperators countWords(const frontend::Lowered& low) {
    WordOperators w;
    for (const auto& op : low.wordOps) {
        const std::string& o = op.op;
        if (o == "+" || o == "-") ++w.adders;
        else if (o == "*") ++w.multipliers;
        else if (o == "<" || o == "<=" || o == ">" || o == ">=" || o == "==" || o == "!=") ++w.comparators;
        else if (o == "<<" || o == ">>" || o == "<<<" || o == ">>>") ++w.shifters;
        else ++w.other;
    }
    return w;
}

/// One row of the report's "naming" list.
nlohmann::json namingRow(const emit::NamingDecision& d) {
    nlohmann::json row = {{"form", d.form}, {"signal", d.signal}, {"made", d.made}, {"kept", d.kept}, {"reason", d.reason}};
    if (d.made) row["after"] = {{"gates", d.gates}, {"depth", d.depth}};
    if (d.form == "comparisons one by one") row["rewrites"] = {{"kept", d.rewritesKept}, {"tried", d.rewritesTried}};
    return row;
}

/// The lines of `text` (without their newlines), as a set: a line of a rewrite not in the set
/// of the file as read is one the rewrite added.
std::set<std::string> lineSet(const std::string& text) {
    std::set<std::string> lines;
    for (std::size_t a = 0; a < text.size();) {
        std::size_t b = text.find('\n', a);
        if (b == std::string::npos) b = text.size();
        lines.insert(text.substr(a, b - a));
        a = b + 1;
    }
    return lines;
}

std::string figuresText(const net::Metrics& a, const net::Metrics& b) {
    return fmt::format("gates {} -> {} ({}), literals {} -> {}, depth {} -> {}", a.gates, b.gates,
                       percent(a.gates, b.gates), a.literals, b.literals, a.depth, b.depth);
}

} // namespace

std::string WordOperators::str() const {
    if (total() == 0) return "none";
    std::vector<std::string> parts;
    auto add = [&](std::size_t n, const char* one, const char* many) {
        if (n) parts.push_back(fmt::format("{} {}", n, n == 1 ? one : many));
    };
    add(adders, "adder", "adders");
    add(multipliers, "multiplier", "multipliers");
    add(comparators, "comparator", "comparators");
    add(shifters, "shifter", "shifters");
    add(other, "other", "others");
    std::string s;
    for (std::size_t i = 0; i < parts.size(); ++i) s += (i ? ", " : "") + parts[i];
    return s;
}

StatsResult stats(const frontend::ReadOptions& read, bool dissolveInternal) {
    frontend::ModuleDesc d = frontend::readModule(read);
    frontend::Lowered low = lowerAs(d, dissolveInternal, false, "");
    StatsResult r;
    r.module = d.name;
    r.metrics = passes::measureFactored(low.net);
    r.words = countWords(low);
    r.restructurable = low.replaced.size();
    r.kept = d.members.size() - low.replaced.size();
    return r;
}

namespace {

/// kerf once more on the text a run is about to write (F195, F235): the same options, nothing
/// written, no proof. `written` is that text as the run read it back, from `path` (the run's
/// private copy standing for `file`); it is not read again. A run that keeps nothing of it is a
/// fixed point; otherwise its outcome holds the text it would write.
struct OwnOutputCheck {
    bool failed = false;    ///< the run stopped (its message is not shown): nothing to adopt
    bool changed = false;   ///< it would rewrite the text by at least --min-gain
    RestructureOutcome next;
};

OwnOutputCheck checkOwnOutput(const RestructureOptions& opts, const std::string& file, const std::string& path,
                              const frontend::ModuleDesc& written, const std::map<std::string, std::string>& keptKeys) {
    OwnOutputCheck r;
    RestructureOptions o = opts;
    bool found = false;
    for (auto& f : o.read.files) {
        auto sub = o.read.substitute.find(f);
        const std::string& actual = sub == o.read.substitute.end() ? f : sub->second;
        std::error_code ec;
        if (actual == file || std::filesystem::equivalent(actual, file, ec)) {
            if (sub != o.read.substitute.end()) o.read.substitute.erase(sub);
            f = path;
            found = true;
        }
    }
    if (!found) {
        r.failed = true;
        return r;
    }
    // Includes relative to the original file's folder must still resolve.
    o.read.includeDirs.push_back(std::filesystem::path(file).parent_path().empty()
                                     ? "."
                                     : std::filesystem::path(file).parent_path().string());
    o.output.clear();
    o.inPlace = false;
    o.backupSuffix.clear();
    o.quiet = true;
    o.check = false;
    o.diff = false;
    o.verbose = 0;
    o.reportPath.clear();
    o.skipProof = true;
    o.noOutput = true;
    o.secondRun = true;
    o.preRead = &written;
    o.keptKeys = keptKeys;
    // As a user's run on the file: its own rounds for names start afresh (F346).
    o.nameConstants = false;
    o.namedKeepRounds = 0;
    // Under --min-gain 0 a rewrite as large as the text it replaces is no gain to adopt (a second
    // run would only reshuffle it, F154): the check asks for a gate at least. The text rules
    // apply with a positive --min-gain only, so the check turns them off as the run it stands for
    // has them off: with them it kept a 2-gate saving of long text that a second run under
    // --min-gain 0 then wrote (ifdef_variants, F341).
    if (emit::MinGain::parse(o.minGain).value == 0) o.minGain = "1", o.textPerGate = 0;
    try {
        if (restructure(o, &r.next) != 0) r.failed = true;
    } catch (const Error& e) {
        if (e.code() == ExitCode::Resources || e.code() == ExitCode::ToolMissing) throw;
        r.failed = true;
    }
    r.changed = !r.failed && r.next.changed;
    return r;
}

} // namespace

int restructure(const RestructureOptions& opts, RestructureOutcome* outcome) {
    if (outcome) *outcome = {};
    if (!emit::validIdentifierPrefix(opts.prefix))
        throw Error(fmt::format("--wire-prefix '{}' is not the start of a Verilog identifier "
                                "(a letter or _, then letters, digits, _ or $)", opts.prefix));
    emit::WriteOptions wo;
    wo.prefix = opts.prefix;
    wo.minGain = emit::MinGain::parse(opts.minGain);
    wo.maxTextPerGate = static_cast<std::size_t>(std::max(opts.textPerGate, 0));
    const std::string& lowerPrefix = opts.prefix;

    io::StageLog stages;
    auto t0 = Clock::now();
    stages.begin("read");
    frontend::ModuleDesc desc = opts.preRead ? *opts.preRead : frontend::readModule(opts.read);
    double readSeconds = since(t0);
    if (!opts.preRead) {
        io::ReaderOutput rf = io::lastReaderFigures();
        stages.addChild("reader", rf.seconds, rf.peakRssKb, rf.cpuSeconds);
    }
    stages.begin("lower");
    // A check of another run's written file keeps what that run's proof agreed to keep (F235).
    // So does a run made again with a named-value target's statements kept (F236).
    std::map<int, std::string> keptAhead;
    std::set<int> namedKeptIds;
    for (const auto& m : desc.members) {
        if (m.matchKey.empty()) continue;
        if (auto it = opts.keptKeys.find(m.matchKey); it != opts.keptKeys.end()) keptAhead.emplace(m.id, it->second);
        if (auto it = opts.namedKept.find(m.matchKey); it != opts.namedKept.end()) {
            keptAhead.emplace(m.id, it->second);
            namedKeptIds.insert(m.id);
        }
    }
    frontend::Lowered low =
        lowerAs(desc, opts.dissolveInternal, false, lowerPrefix, nullptr, opts.keep, opts.keepX, keptAhead);
    // The original as the proof sees it (arithmetic as gates), lowered once: the last probe
    // below when it was lowered with the kept members finally agreed on.
    std::optional<frontend::Lowered> proofOriginal;
    if (!opts.skipProof) {
        // The proof lowers arithmetic into gates, where an x the language produces can reach
        // statements the word-level lowering restructures: what either lowering keeps as
        // written, both keep, so that they agree on what is kerf's to rewrite.
        for (int round = 0; round < 8; ++round) {
            std::map<int, std::string> before = keptIn(low);
            frontend::Lowered probe =
                lowerAs(desc, opts.dissolveInternal, true, lowerPrefix, nullptr, opts.keep, opts.keepX, before);
            std::map<int, std::string> both = keptIn(probe);
            if (both.size() == before.size()) {
                proofOriginal = std::move(probe);
                break;
            }
            low = lowerAs(desc, opts.dissolveInternal, false, lowerPrefix, nullptr, opts.keep, opts.keepX, both);
        }
    }
    const std::map<int, std::string> agreedKept = keptIn(low);
    if (opts.verbose > 0 && (low.merge.unfactored || low.merge.keptApart)) {
        const frontend::ExpressionMergeLimits ml;
        std::cerr << fmt::format("lowering: {} expression merge{} above {} cubes made without factoring, {} not made "
                                 "(they would multiply out above {} cubes)\n",
                                 low.merge.unfactored, low.merge.unfactored == 1 ? "" : "s", ml.factorCubes,
                                 low.merge.keptApart, ml.multiplyCubes);
    }
    for (const auto& n : low.notes)
        if (!opts.quiet) std::cerr << n << "\n";
    if (!opts.quiet) {
        // Parameters: what stays as written for them (kerf_params.py); --param restructures it.
        std::vector<std::string> keptFor;
        for (const auto& p : desc.parameters)
            if (!p.pinned && p.keptMembers > 0) keptFor.push_back(p.name);
        if (!keptFor.empty()) {
            std::string names;
            for (std::size_t i = 0; i < keptFor.size(); ++i) names += (i ? ", " : "") + keptFor[i];
            std::cerr << fmt::format("{}: module {}: logic depending on parameter{} {} (which an instance can "
                                     "override) is kept as written; --param NAME=VALUE restructures it for one "
                                     "value\n",
                                     desc.src.file, desc.name, keptFor.size() > 1 ? "s" : "", names);
        }
    }
    net::Network original = low.net;
    // Factoring the original (its figures, and the cache the engine starts from) is a stage
    // of its own: on generated sums of products it costs more than the lowering.
    stages.begin("factor");
    // Shared by the figures and the engine (no cover is factored twice); dropped before the proof.
    auto factorCache = std::make_unique<passes::FactorCache>();
    passes::FactoredNetwork originalForms = passes::factorNetwork(original, -1, factorCache.get());
    const net::Metrics asRead = originalForms.metrics;
    // The figures reported count the logic of statements kept for their names (F236) as `kerf
    // stats` does; the decisions (groups, --min-gain) are made without it, on both sides alike.
    std::map<int, std::string> keptCounted;
    for (const auto& [id, why] : keptIn(low))
        if (!namedKeptIds.count(id)) keptCounted.emplace(id, why);
    const net::Metrics shownBefore =
        namedKeptIds.empty() ? asRead
                             : passes::measureFactored(lowerAs(desc, opts.dissolveInternal, false, lowerPrefix, nullptr,
                                                               opts.keep, opts.keepX, keptCounted).net);
    const WordOperators words = countWords(low);

    stages.begin("restructure");
    auto tPass = Clock::now();
    passes::EngineOptions eo;
    eo.goal = passes::parseGoal(opts.goal);
    eo.effort = passes::parseEffort(opts.effort);
    eo.limits = passes::limitsFor(eo.effort);
    for (const std::string& l : opts.limits) passes::setLimit(eo.limits, l);
    eo.maxDepth = opts.maxDepth;
    eo.dontCares = &low.dontCares;
    eo.cache = factorCache.get();
    eo.verbose = opts.verbose;
    passes::EngineResult er = passes::restructure(low.net, eo);
    // A word operation whose operand only the engine finds constant (or that reads a few bits
    // padded with constants) becomes gates before writing (F167; emit/word_fold.cpp).
    if (emit::WordFoldCounts wf = emit::foldWordOperations(low); wf.folded) {
        passes::tidy(low.net);
        er.forms = passes::factorNetwork(low.net, er.depthCap, factorCache.get());
        er.after = er.forms.metrics;
        if (opts.verbose > 0)
            for (const std::string& t : wf.texts) std::cerr << t << "\n";
    }
    // The engine's network before the slice regroup, while the regroup is to be checked by a
    // second run on the written file (F195).
    std::optional<net::Network> beforeRegroup;
    // Small enough for kerf to run once more on the text it is about to write (F195, F235).
    const bool ownCheckable = !opts.secondRun && er.after.gates <= emit::SliceRegroupLimits{}.checkGates;
    {
        // One vector's bits in an output's product read as one comparison, within a stated margin
        // of the engine's gates (F168; emit/slice_regroup.cpp).
        const std::size_t bound = eo.goal == passes::Goal::Size
                                      ? (er.depthCap >= 0 ? static_cast<std::size_t>(er.depthCap) : asRead.depth)
                                      : er.after.depth;
        const emit::SliceRegroupLimits rl;
        // Small enough to check by a second run; otherwise a margin a second run cannot gain back.
        // (A second run itself regroups as any run would, unchecked.)
        const bool checkable = ownCheckable;
        double maxExtra = -1;
        if (er.after.gates > rl.checkGates) {
            const double gain = wo.minGain.gatesOf(er.after.gates);
            maxExtra = std::max(0.0, std::ceil(gain) - 1);
        }
        net::Network engineNet;
        if (checkable) engineNet = low.net;
        emit::SliceRegroupResult sr =
            emit::regroupSlices(low, er.forms, er.depthCap, bound, factorCache.get(), rl, maxExtra);
        if (sr.kept) er.after = er.forms.metrics;
        if (opts.verbose > 0 && !sr.text.empty()) std::cerr << sr.text << "\n";
        bool regrouped = sr.kept;
        // The comparisons rebuilt for the constants' names are not given up for the engine's
        // network when kerf on the written file would rewrite it (that network names none of
        // them): the rewrite that check finds is adopted as for any text, or, naming none of
        // them either, the group is kept as written (below).
        bool constantsRegrouped = false;
        if (opts.nameConstants) {
            // Comparisons with named constants written by their names (F346), while the result
            // still gains the --min-gain margin on the logic as written.
            const double limit =
                static_cast<double>(asRead.gates) - std::max(1.0, wo.minGain.gatesOf(asRead.gates));
            emit::ConstantRegroupResult cr = emit::regroupNamedConstants(low, desc, er.forms, er.depthCap, bound,
                                                                         factorCache.get(), limit);
            if (cr.kept) er.after = er.forms.metrics;
            constantsRegrouped = cr.kept || cr.namedAsIs;
            if (opts.verbose > 0 && !cr.text.empty()) std::cerr << cr.text << "\n";
        }
        if (regrouped && !constantsRegrouped && checkable) beforeRegroup = std::move(engineNet);
    }
    double passSeconds = since(tPass);
    const passes::FactoredNetwork& forms = er.forms;   // the engine's chosen forms, handed to the writer

    stages.begin("write");
    emit::WriteInput wi;
    wi.module = &desc;
    wi.lowered = &low;
    wi.original = &original;
    wi.network = &low.net;
    wi.forms = &forms.forms;
    wi.originalForms = &originalForms.forms;
    wi.oneGroup = opts.dissolveInternal;
    // A named form keeps the goal's depth bound: the input's depth (or --max-depth) for size,
    // the engine's result for depth.
    wo.depthBound = eo.goal == passes::Goal::Size ? (er.depthCap >= 0 ? er.depthCap : static_cast<int>(asRead.depth))
                                                  : static_cast<int>(er.after.depth);
    emit::WriteResult wr;
    const std::string& file = desc.src.file;
    std::set<std::string> authorSignals;
    for (const auto& [n, sg] : desc.signals) authorSignals.insert(n);
    // The rewrite read back from a private directory under the original's file name, so the
    // reader's messages about it read naturally; anything wrong with kerf's own output is
    // kerf's bug, and the evidence is kept.
    auto work = std::make_unique<io::WorkDir>();
    frontend::ReadOptions back = opts.read;
    auto keepEvidence = [&]() {
        try {
            work->add("description.json", io::runReader(frontend::readerArguments(opts.read)).text);
        } catch (const std::exception&) {
            // The rewrite alone still helps; the reader's own message is above.
        }
        return work->keep();
    };
    auto ownFault = [&](const Error& e, const char* what) {
        if (e.code() == ExitCode::Resources || e.code() == ExitCode::ToolMissing) throw e;
        std::string dir = keepEvidence();
        std::string why = e.what();
        if (auto cut = why.find("; nothing was written"); cut != std::string::npos) why.erase(cut);
        throw Error(fmt::format("kerf's rewrite of module {} does not {} ({}); nothing was written. "
                                "This is a kerf bug: please report it with the files kept in {}/",
                                desc.name, what, why, dir), {}, ExitCode::Internal);
    };
    // Read `text` back (into `written`) and measure it.
    std::string writtenPath;                 // the private copy readBack read last
    std::vector<std::string> earlierUnused;  // unused-bits wires of texts adopted from a rerun (F235)
    auto lintWires = [&]() {
        std::vector<std::string> v = earlierUnused;
        if (!wr.unusedWire.empty() && std::find(v.begin(), v.end(), wr.unusedWire) == v.end())
            v.push_back(wr.unusedWire);
        return v;
    };
    // The original's member texts, so that the reader of the rewrite describes only what the
    // measure and the proof use (F216, F247); computed once, on the first reading back. Not when
    // kerf runs itself on the written text (F235): that run takes the reading as its input and
    // needs all of it (comments, named constants, every match key).
    std::optional<std::optional<std::string>> memberTexts;
    std::map<std::string, double> proveCpu;   // CPU s of the proof's steps, shown with -v
    if (ownCheckable) memberTexts.emplace(std::nullopt);
    auto readBack = [&](const std::string& text, frontend::ModuleDesc& written) {
        const std::string rewrittenName = std::filesystem::path(file).filename().string();
        std::string rewritten = work->add(rewrittenName, text);
        writtenPath = rewritten;
        back = opts.read;
        if (!memberTexts) memberTexts = frontend::memberTextList(desc);
        if (*memberTexts)
            back.readBackTexts = work->add(rewrittenName == "member-texts" ? "member-texts.list" : "member-texts",
                                           **memberTexts);
        // The rewritten file replaces the one that holds the module; a proof that
        // silently read the original twice would prove nothing, so insist on a match.
        std::string key;
        for (const auto& f : opts.read.files) {
            std::error_code ec;
            if (f == file || std::filesystem::equivalent(f, file, ec)) key = f;
        }
        if (key.empty())
            throw Error(fmt::format("cannot prove the rewrite: the module's file '{}' is not one of the files given "
                                    "(is the module in an included file?)", file), {}, ExitCode::Internal);
        back.substitute[key] = rewritten;
        // Includes relative to the original file's folder must still resolve.
        back.includeDirs.push_back(std::filesystem::path(file).parent_path().empty()
                                       ? "."
                                       : std::filesystem::path(file).parent_path().string());
        try {
            written = frontend::readModule(back);
        } catch (const Error& e) {
            ownFault(e, "read back");
        }
        {
            // The reader's second run (on the rewrite) is a process of its own: its time is not the proof's.
            io::ReaderOutput rf = io::lastReaderFigures();
            stages.addChild("reader (rewrite)", rf.seconds, rf.peakRssKb, rf.cpuSeconds);
        }
        frontend::Lowered writtenLow;
        double c0 = threadCpu();
        try {
            writtenLow = lowerAs(written, opts.dissolveInternal, false, lowerPrefix, nullptr, opts.keep, opts.keepX,
                                 keptByKey(desc, agreedKept, written), lintWires());
        } catch (const Error& e) {
            ownFault(e, "lower");
        }
        double c1 = threadCpu();
        net::Metrics m = passes::measureFactored(writtenLow.net);
        proveCpu["lower the rewrite"] += c1 - c0;
        proveCpu["measure the rewrite"] += threadCpu() - c1;
        return m;
    };
    // Names are weighed on the forms the writer prints; the file as read back is the measure.
    // Over the depth bound, or above the engine's gates by more than the margin, the file is
    // written again by bits (the engine's forms are read back at the engine's figures).
    std::optional<std::pair<frontend::ModuleDesc, net::Metrics>> checked;
    double checkedSeconds = 0;   // reading back the file `checked` holds: part of the proof's time
    auto writeChecked = [&]() {
        wr = emit::writeModule(wi, wo);
        if (wr.changed && (!wr.namedDomains.empty() || !wr.namedChoices.empty())) {
            frontend::ModuleDesc w;
            auto tCheck = Clock::now();
            net::Metrics m = readBack(wr.text, w);
            checkedSeconds = since(tCheck);
            const double margin = wo.minGain.gatesOf(er.after.gates);
            const auto bound = static_cast<std::size_t>(std::max(wo.depthBound, static_cast<int>(er.after.depth)));
            const bool over =
                m.depth > bound || static_cast<double>(m.gates) > static_cast<double>(er.after.gates) + margin;
            emit::NamingDecision d;
            d.form = "written file";
            d.kept = !over;
            d.gates = m.gates;
            d.depth = m.depth;
            d.reason = over ? fmt::format("the file with names reads back at {} gates, depth {}: over the depth bound {} "
                                          "or the engine's {} gates plus the --min-gain margin; written by bits",
                                          m.gates, m.depth, bound, er.after.gates)
                            : fmt::format("the file with names reads back within the depth bound {} and the engine's "
                                          "{} gates plus the --min-gain margin", bound, er.after.gates);
            wr.naming.decisions.push_back(d);
            if (over) {
                wr.namingLog += fmt::format("naming: the written file reads back at {} gates, depth {} (bound {}, "
                                            "bitwise {} gates + margin): written by bits\n", m.gates, m.depth, bound,
                                            er.after.gates);
                std::string why = std::move(wr.namingLog);
                emit::NamingRecord record = std::move(wr.naming);
                emit::WriteOptions bits = wo;
                bits.names = false;
                wr = emit::writeModule(wi, bits);
                wr.namingLog = std::move(why);
                wr.naming = std::move(record);
                work = std::make_unique<io::WorkDir>();
            } else {
                checked.emplace(std::move(w), m);
            }
        }
    };
    writeChecked();
    // A target the source only assigns named values (a next-state register: `state_d = ARB;`)
    // that the writer would write bit by bit, its choice among the names not fitting the depth
    // bound or the --min-gain margin, ties the text to today's encoding (F189): its statements
    // are kept as written instead, and the module is restructured again without them (F236).
    if (wr.changed && opts.namedKeepRounds < 4) {
        std::set<std::string> rewritten;
        for (const auto& g : wr.groups)
            if (g.replaced) rewritten.insert(g.outputs.begin(), g.outputs.end());
        const bool byBits = std::any_of(wr.naming.decisions.begin(), wr.naming.decisions.end(),
                                        [](const emit::NamingDecision& d) { return d.form == "written file" && !d.kept; });
        std::map<std::string, std::string> more;
        std::vector<std::string> targets;
        for (const auto& d : wr.naming.decisions) {
            if (d.form != "choice" || !d.made || (d.kept && !byBits) || !rewritten.count(d.signal)) continue;
            const std::string reason =
                d.kept ? fmt::format("'{}' takes only named values; the file with its choice among them reads back "
                                     "over the bounds, and by bits its names would become bit positions", d.signal)
                       : fmt::format("'{}' takes only named values and one choice among them does not fit ({} gates, "
                                     "depth {}; bounds: {:.0f} gates, depth {}); by bits ({} gates, depth {}) its "
                                     "names would become bit positions", d.signal, d.gates, d.depth,
                                     wr.naming.gateLimit, wr.naming.depthBound, wr.naming.bitwiseGates,
                                     wr.naming.bitwiseDepth);
            bool any = false;
            for (const auto& m : desc.members)
                if (std::find(m.writes.begin(), m.writes.end(), d.signal) != m.writes.end() && !m.matchKey.empty() &&
                    !agreedKept.count(m.id)) {
                    more.emplace(m.matchKey, reason);
                    any = true;
                }
            if (any) targets.push_back(d.signal);
        }
        if (!more.empty()) {
            if (opts.verbose > 0) {
                std::cerr << wr.namingLog;
                for (const auto& t : targets)
                    std::cerr << fmt::format("named values: {} would be written by bits: the statements writing it "
                                             "are kept as written and the module is restructured again\n", t);
            }
            RestructureOptions o = opts;
            o.preRead = &desc;
            o.namedKept.insert(more.begin(), more.end());
            for (const auto& d : wr.naming.decisions)
                if (d.form == "choice" && std::find(targets.begin(), targets.end(), d.signal) != targets.end()) {
                    nlohmann::json row = namingRow(d);
                    row["statements_kept_as_written"] = true;
                    row["bound"] = {{"depth", wr.naming.depthBound}, {"gates", wr.naming.gateLimit}};
                    o.namedKeptNaming.push_back(std::move(row));
                }
            ++o.namedKeepRounds;
            return restructure(o, outcome);
        }
    }
    // Idempotence by construction (F235): kerf on its own output must change nothing. The engine's
    // result depends on where it starts (the input's nodes or the written file's, F71, F94) and on
    // its don't-care budget (F196), and a regroup costs up to its margin more gates than the
    // engine (F195). So kerf runs once more on the text it is about to write, as a user would
    // (same options, no proof), on the reading the proof takes anyway; when that run would rewrite
    // it by at least --min-gain, its text is written instead, and checked the same way, a
    // bounded number of times. The final text is proved against the original, with the
    // original's don't-cares. A kept regroup the rerun would undo gives way to the engine's
    // network first (F195: the engine's forms are what a rerun rebuilds).
    struct {
        int checks = 0, adopted = 0;
        bool fixedPoint = false;
        std::string log;
    } own;
    constexpr int kOwnRounds = 3;
    if (ownCheckable && wr.changed) {
        stages.begin("second run");   // the reading of the written file is the proof's (checkedSeconds)
        std::map<std::string, std::string> keptKeys;
        for (const auto& [id, why] : agreedKept)
            if (id >= 0 && static_cast<std::size_t>(id) < desc.members.size() && !desc.members[id].matchKey.empty())
                keptKeys.emplace(desc.members[id].matchKey, why);
        while (wr.changed && own.checks < kOwnRounds) {
            if (!checked) {
                frontend::ModuleDesc w;
                auto tCheck = Clock::now();
                net::Metrics m = readBack(wr.text, w);
                checkedSeconds = since(tCheck);
                checked.emplace(std::move(w), m);
            }
            const std::size_t gatesNow = checked->second.gates;
            OwnOutputCheck c = checkOwnOutput(opts, file, writtenPath, checked->first, keptKeys);
            ++own.checks;
            if (!c.failed && !c.changed) {
                own.fixedPoint = true;
                break;
            }
            if (beforeRegroup) {
                low.net = std::move(*beforeRegroup);
                beforeRegroup.reset();
                er.forms = passes::factorNetwork(low.net, er.depthCap, factorCache.get());
                er.after = er.forms.metrics;
                checked.reset();
                work = std::make_unique<io::WorkDir>();
                writeChecked();
                own.log += fmt::format("slices: kerf on the written file would rewrite it: the engine's network is "
                                       "written instead ({} gates)\n", er.after.gates);
                continue;
            }
            if (c.failed) {
                // Not kerf's result to adopt; the text stands, proved as any other.
                own.log += "own output: kerf's run on the written file stopped; the text is written as it is\n";
                break;
            }
            own.log += fmt::format("own output: kerf on the written file would rewrite it ({} -> {} gates): its "
                                   "rewrite is written instead\n", gatesNow, c.next.gatesAfter);
            ++own.adopted;
            if (!wr.unusedWire.empty()) earlierUnused.push_back(wr.unusedWire);
            wr.text = std::move(c.next.text);
            wr.headerPos = c.next.headerPos;
            wr.headerLen = c.next.headerLen;
            if (!c.next.unusedWire.empty()) {
                wr.unusedWire = c.next.unusedWire;
                wr.notRead = c.next.notRead;
                wr.constantsNotNamed = c.next.constantsNotNamed;
            }
            for (const std::string& n : c.next.added)
                if (std::find(wr.wiresAdded.begin(), wr.wiresAdded.end(), n) == wr.wiresAdded.end())
                    wr.wiresAdded.push_back(n);
            checked.reset();
            work = std::make_unique<io::WorkDir>();
        }
        if (own.adopted > 0) {
            // A group kept as written that the rerun rewrote after all is reported as rewritten.
            const std::string asWritten = io::readFile(file);
            for (auto& g : wr.groups) {
                if (g.replaced) continue;
                for (int id : g.members) {
                    const auto& src = desc.members[static_cast<std::size_t>(id)].src;
                    if (src.end <= src.start || src.end > asWritten.size()) continue;
                    if (wr.text.find(asWritten.substr(src.start, src.end - src.start)) == std::string::npos) {
                        g.replaced = true;
                        g.reason.clear();
                        break;
                    }
                }
            }
        }
        if (!own.fixedPoint && own.checks == kOwnRounds && !beforeRegroup)
            own.log += fmt::format("own output: still not a fixed point after {} runs on the written file\n",
                                   kOwnRounds);
        beforeRegroup.reset();
    }
    // Statements a naming rule keeps as written (`more`: match key -> reason; `lines`: the reasons
    // shown under -v, after `rule`): the module is restructured again from the same reading with
    // them kept, one round more (F346, F349).
    auto keepAndRestructureAgain = [&](std::string_view rule, const std::map<std::string, std::string>& more,
                                       const std::vector<std::string>& lines) {
        if (opts.verbose > 0)
            for (const auto& l : lines)
                std::cerr << fmt::format("{}: {}: its statements are kept as written and the module is restructured "
                                         "again\n", rule, l);
        RestructureOptions o = opts;
        o.preRead = &desc;
        o.namedKept.insert(more.begin(), more.end());
        ++o.namedKeepRounds;
        return restructure(o, outcome);
    };
    // A group whose statements compare a signal with named constants (a `case (csr_addr)` over a
    // package's addresses) and whose rewrite names none of them reads as bit patterns where the
    // source read names: the constants would survive only in the unused-signal wire. Such a
    // group is kept as written and the module restructured again without it (F346; the rule is
    // in docs/guide.md, "Named constants"). A rewrite naming at least one of them is written.
    if (wr.changed && opts.namedKeepRounds < 4) {
        // Named by the text as written (after the check of kerf's own output, which may have
        // written another text): in the lines the rewrite added, outside the unused-signal wire,
        // as an identifier of its own (`is_CSR_MSTATUS_11_3`, a wire's name, does not count).
        std::set<int> named;
        {
            const std::set<std::string> old = lineSet(io::readFile(file));
            std::string added;
            bool inUnused = false;
            for (std::size_t a = 0; a < wr.text.size();) {
                std::size_t b = wr.text.find('\n', a);
                if (b == std::string::npos) b = wr.text.size();
                const std::string line = wr.text.substr(a, b - a);
                a = b + 1;
                if (!wr.unusedWire.empty() && line.find(" " + wr.unusedWire + " ") != std::string::npos) inUnused = true;
                if (!inUnused && !old.count(line)) added += line + "\n";
                if (inUnused && line.find(';') != std::string::npos) inUnused = false;
            }
            auto ident = [](char ch) { return std::isalnum(static_cast<unsigned char>(ch)) || ch == '_' || ch == '$'; };
            for (std::size_t ci = 0; ci < desc.constants.size(); ++ci) {
                const std::string& ref = desc.constants[ci].ref;
                for (std::size_t at = added.find(ref); at != std::string::npos; at = added.find(ref, at + 1))
                    if ((at == 0 || !ident(added[at - 1])) &&
                        (at + ref.size() >= added.size() || !ident(added[at + ref.size()]))) {
                        named.insert(static_cast<int>(ci));
                        break;
                    }
            }
        }
        std::map<int, const frontend::Member*> byId;
        for (const auto& m : desc.members) byId[m.id] = &m;
        std::map<std::string, std::string> more;
        std::vector<std::string> lines;
        for (const auto& g : wr.groups) {
            if (!g.replaced) continue;
            std::set<int> compared;
            for (int id : g.members)
                if (auto it = byId.find(id); it != byId.end())
                    for (int c : it->second->constants)
                        if (c >= 0 && static_cast<std::size_t>(c) < desc.constants.size() &&
                            !desc.constants[static_cast<std::size_t>(c)].compared.empty())
                            compared.insert(c);
            if (compared.size() < kMinConstantsCompared ||
                std::any_of(compared.begin(), compared.end(), [&](int c) { return named.count(c) > 0; }))
                continue;
            std::string list;
            std::size_t shown = 0;
            for (int c : compared) {
                if (shown == 3) {
                    list += ", ...";
                    break;
                }
                list += (shown++ ? ", " : "") + desc.constants[static_cast<std::size_t>(c)].name;
            }
            const std::string reason = fmt::format("the rewrite would name none of the {} named constants it compares "
                                                   "with ({})", compared.size(), list);
            bool any = false;
            for (int id : g.members)
                if (auto it = byId.find(id); it != byId.end() && !it->second->matchKey.empty() && !agreedKept.count(id)) {
                    more.emplace(it->second->matchKey, reason);
                    any = true;
                }
            if (any) lines.push_back(reason);
        }
        if (!more.empty() && !opts.nameConstants) {
            // First made again with the comparisons rebuilt to be written by the constants' names.
            if (opts.verbose > 0)
                for (const auto& l : lines)
                    std::cerr << fmt::format("named constants: {}: the module is restructured again with its "
                                             "comparisons written by the constants' names\n", l);
            RestructureOptions o = opts;
            o.preRead = &desc;
            o.nameConstants = true;
            ++o.namedKeepRounds;
            return restructure(o, outcome);
        }
        if (!more.empty()) return keepAndRestructureAgain("named constants", more, lines);
    }
    // An enum field of a struct (`d.kind`, of `kind_e`) that the rewrite would write by bit
    // positions of the struct (`d[4] = ...`), where the source assigns it named values (`d.kind =
    // RD`): Icarus 11 simulates `d.kind[0] = ...` wrongly (F192), so no bit of the field is
    // written through its name, and a raw position is what the issue rules out. The statements
    // writing the struct are kept as written and the module is restructured again (F349).
    if (wr.changed && opts.namedKeepRounds < 4) {
        std::map<std::string, std::string> more;
        std::vector<std::string> lines;
        std::set<std::string> rewritten;
        for (const auto& g : wr.groups)
            if (g.replaced) rewritten.insert(g.outputs.begin(), g.outputs.end());
        const std::set<std::string> old = lineSet(io::readFile(file));
        for (const auto& [name, sig] : desc.signals) {
            if (!rewritten.count(name)) continue;
            std::vector<std::tuple<int, int, std::string>> fields;
            enumFields(desc.ir, sig.type, 0, "", 0, fields);
            if (fields.empty()) continue;
            // Assignments to a raw position of the struct in the lines the rewrite added.
            std::string hit;
            for (std::size_t a = 0; a < wr.text.size() && hit.empty();) {
                std::size_t b = wr.text.find('\n', a);
                if (b == std::string::npos) b = wr.text.size();
                const std::string line = wr.text.substr(a, b - a);
                a = b + 1;
                if (old.count(line)) continue;
                std::size_t at = line.find_first_not_of(" \t");
                if (at == std::string::npos || line.compare(at, name.size() + 1, name + "[") != 0) continue;
                std::size_t close = line.find(']', at);
                std::size_t eq = line.find('=', at);
                if (close == std::string::npos || eq == std::string::npos || close > eq || line[eq + 1] == '=') continue;
                const std::string idx = line.substr(at + name.size() + 1, close - at - name.size() - 1);
                if (idx.empty() || idx.find_first_not_of("0123456789:") != std::string::npos) continue;
                const int hi = std::stoi(idx);
                const int lo = idx.find(':') == std::string::npos ? hi : std::stoi(idx.substr(idx.find(':') + 1));
                for (const auto& [flo, fhi, path] : fields)
                    if (lo <= fhi && hi >= flo) {
                        hit = fmt::format("'{}.{}' (an enum) would be written by bit positions ({}[{}] = ...) where "
                                          "the source writes it by its named values", name, path, name, idx);
                        break;
                    }
            }
            if (hit.empty()) continue;
            bool any = false;
            for (const auto& m : desc.members)
                if (std::find(m.writes.begin(), m.writes.end(), name) != m.writes.end() && !m.matchKey.empty() &&
                    !agreedKept.count(m.id)) {
                    more.emplace(m.matchKey, hit);
                    any = true;
                }
            if (any) lines.push_back(hit);
        }
        if (!more.empty()) return keepAndRestructureAgain("named values", more, lines);
    }
    if (!wr.changed) proofOriginal.reset();   // nothing to prove
    // What only the engine and the writer needed goes before the rewrite is read back and
    // lowered twice: on a generated design the original's network, its copy, their forms
    // and the factoring cache were most of this process's memory at its peak (F83).
    // `low` keeps what the summary reads (kept statements, notes, don't-care counts).
    original = net::Network();
    low.net = net::Network();
    originalForms.forms = {};
    er.forms.forms = {};
    factorCache.reset();
#if defined(__GLIBC__)
    // Those were millions of small blocks: freed, they stay in the process (glibc keeps freed
    // blocks below its heap's top) while the reader on the rewrite, a process of its own,
    // needs as much again. Hand the free pages back first (F368).
    malloc_trim(0);
#endif
    const std::string original_text = io::readFile(file);

    std::size_t groupsReplaced = 0;
    for (const auto& g : wr.groups) groupsReplaced += g.replaced ? 1 : 0;
    // --param values the written logic is specialised for (the writer put their guard in the file).
    std::vector<emit::PinnedValue> pins;
    if (wr.changed) {
        std::set<int> replacedNow;
        for (const auto& g : wr.groups)
            if (g.replaced) replacedNow.insert(g.members.begin(), g.members.end());
        pins = emit::pinnedValues(desc, replacedNow);
    }
    const bool pinned = !pins.empty();

    // ---- proof and figures of the written file: read back what was written, through the same reader
    net::Metrics after = asRead;
    net::Metrics shownAfter = shownBefore;
    nlohmann::json proofJson = {{"verdict", "not run (--skip-proof)"}};
    std::string proofText;
    if (wr.changed) {
        stages.begin("prove");
        io::Progress::global().stage("prove (reading the rewrite back)");   // the share shown is the lowering's
        auto tProof = Clock::now();
        frontend::ModuleDesc written;
        if (checked) {
            // Read back and measured when the names were weighed: that reading is the proof's
            // first step, and its time is the proof's (F124).
            written = std::move(checked->first);
            after = checked->second;
            checked.reset();
            tProof -= std::chrono::duration_cast<Clock::duration>(std::chrono::duration<double>(checkedSeconds));
        } else {
            after = readBack(wr.text, written);
        }
        shownAfter = after;
        if (!namedKeptIds.empty()) {
            try {
                shownAfter = passes::measureFactored(lowerAs(written, opts.dissolveInternal, false, lowerPrefix, nullptr,
                                                             opts.keep, opts.keepX, keptByKey(desc, keptCounted, written),
                                                             lintWires()).net);
            } catch (const Error& e) {
                ownFault(e, "lower");
            }
        }
        // The file as a whole must get smaller by the margin too: groups are judged on the
        // engine's figures, the file on what the reader makes of the text.
        double gain = static_cast<double>(asRead.gates) - static_cast<double>(after.gates);
        bool enough = wo.minGain.percent ? gain * 100.0 >= wo.minGain.value * static_cast<double>(asRead.gates)
                                         : gain >= wo.minGain.value;
        // A group that writes a signal as the constant it is (F355) pays without gates.
        const bool folds = gain >= 0 && std::any_of(wr.groups.begin(), wr.groups.end(), [](const auto& g) {
            return g.replaced && g.foldsToConstant;
        });
        if (!folds && !(enough && (gain > 0 || wo.minGain.value == 0))) {
            for (auto& g : wr.groups)
                if (g.replaced)
                    g.replaced = false, g.reason = fmt::format("the written file would not be smaller by --min-gain "
                                                               "{} ({} -> {} gates)", wo.minGain.str(),
                                                               asRead.gates, after.gates);
            wr.text = original_text;
            wr.changed = false;
            wr.wiresAdded.clear();
            wr.namesKept.clear();
            after = asRead;
            shownAfter = shownBefore;
            groupsReplaced = 0;
        } else if (!opts.skipProof) {
            double c0 = threadCpu();
            frontend::Lowered a = proofOriginal ? std::move(*proofOriginal)
                                                : lowerAs(desc, opts.dissolveInternal, true, lowerPrefix, nullptr,
                                                          opts.keep, opts.keepX, agreedKept);
            proofOriginal.reset();
            // The writer's unused wire only reads bits for lint: what it reads may be x.
            frontend::Lowered b = lowerAs(written, opts.dissolveInternal, true, lowerPrefix, &authorSignals, opts.keep,
                                          opts.keepX, keptByKey(desc, agreedKept, written), lintWires());
            double c1 = threadCpu();
            proveCpu["lower both for the proof"] += c1 - c0;
            io::Progress::global().stage("prove");
            proof::ProofOptions po;
            po.totalConflicts = opts.proofBudget;
            po.verbose = opts.verbose;
            // kerf writes no x of its own: x in the rewrite where the original has none would be a
            // difference the comparison under the original's don't-cares cannot see. The rewrite may
            // be x only where the original is (an author's x kept as written, or lowered alike): its
            // x conditions must imply the original's, output by output (proved, not assumed).
            if (b.dontCareBits > 0) {
                std::set<std::string> bNames;
                for (const auto& o : b.dontCares.outputs()) bNames.insert(o.name);
                net::Network aSub = a.dontCares;
                auto& outs = aSub.outputs();
                outs.erase(std::remove_if(outs.begin(), outs.end(), [&](const net::Output& o) { return !bNames.count(o.name); }),
                           outs.end());
                bool contained = outs.size() == bNames.size();
                if (contained) {
                    aSub.removeUnreachable();
                    proof::ProofOptions xo = po;
                    xo.verbose = false;
                    // Compared only where the original is known: there the rewrite's x condition must be 0.
                    contained = proof::proveEquivalent(aSub, b.dontCares, xo, &aSub).verdict == proof::Verdict::Equivalent;
                }
                if (!contained)
                    ownFault(Error("the rewrite can be x where kerf wrote logic", {}, ExitCode::Internal), "stay free of x");
            }
            double c2 = threadCpu();
            proveCpu["x conditions"] += c2 - c1;
            proof::BoundedResult br = proof::proveBounded({desc, a}, {written, b}, po);
            proveCpu["compare"] += threadCpu() - c2;
            if (opts.verbose > 0) {
                std::string line = "prove, CPU s:";
                for (const auto& [k, v] : proveCpu) line += fmt::format(" {} {:.2f},", k, v);
                line.pop_back();
                std::cerr << line << "\n";
            }
            const proof::ProofResult& pr = br.proof;
            double proofSeconds = since(tProof);
            // The boundary of the proof (kerf/proof/boundary.h) is kerf's own doing here: every
            // statement kept as written comes back with its partner, byte for byte; the only
            // statement the rewrite may add is the --param guard; every output is compared.
            std::vector<std::string> keptProblems;
            for (const auto& k : br.kept.onlyA)
                keptProblems.push_back(fmt::format("{} is missing from the rewrite", proof::describeKept(k)));
            // The guard, and in SystemVerilog the text of its Icarus Verilog branch (which the
            // reader sees as text the defines leave out), may be new.
            std::vector<std::pair<std::string, std::pair<std::size_t, std::size_t>>> guards;
            auto isGuardText = [&](const auto& k) {
                if (!pinned || k.what != "generate" || !k.writes.empty()) return false;
                std::string bytes = io::readFile(k.src.file);
                std::string text = k.src.end <= bytes.size() ? bytes.substr(k.src.start, k.src.end - k.src.start) : "";
                return text.find("kerf_parameter_guard") != std::string::npos;
            };
            for (const auto& k : br.kept.onlyB)
                if (isGuardText(k)) guards.push_back({k.src.file, {k.src.start, k.src.end}});
            for (const auto& k : br.kept.onlyB) {
                bool isGuard = isGuardText(k);
                for (const auto& [file, range] : guards)
                    isGuard = isGuard || (k.what == "excluded_text" && k.src.file == file &&
                                          k.src.start >= range.first && k.src.end <= range.second);
                if (!isGuard)
                    keptProblems.push_back(fmt::format("the rewrite has a statement kerf would keep as written that "
                                                       "the original does not have: {}", proof::describeKept(k)));
            }
            for (const auto& w : proof::keptTextDiffers(br.kept))
                keptProblems.push_back(fmt::format("the statement at {} is kept as written but its text changed", w));
            for (const auto& o : br.oneSided) keptProblems.push_back(fmt::format("output {} is not compared", o));
            for (const auto& o : br.undrivenOnOneSide) keptProblems.push_back(o);
            if (!keptProblems.empty()) {
                std::string msg = "kerf's rewrite does not keep the boundary of its proof: " + keptProblems.front();
                for (std::size_t i = 1; i < keptProblems.size() && i < 5; ++i) msg += "; " + keptProblems[i];
                std::string dir = keepEvidence();
                throw Error(fmt::format("{}; nothing was written. This is a kerf bug: please report it with the "
                                        "files kept in {}/", msg, dir), {}, ExitCode::Internal);
            }
            proofJson = {{"verdict", pr.verdict == proof::Verdict::Equivalent ? "equivalent"
                                     : pr.verdict == proof::Verdict::Different ? "different" : "undecided"},
                         {"seconds", proofSeconds},
                         {"outputs", pr.stats.outputs},
                         {"by_structure", pr.stats.byStructure},
                         {"by_sat", pr.stats.bySat},
                         {"kept_statements_paired", br.kept.matched.size()},
                         {"boundary", "combinational equivalence at the module's ports, at its internal signals "
                                      "and at kept code, whose statements are paired by their text and whose "
                                      "outputs are free inputs"}};
            if (pr.verdict == proof::Verdict::Different) {
                std::string dir = keepEvidence();
                std::string shown;
                if (pr.cex) shown = formatCounterexample(showCounterexample(*pr.cex, desc, a, written, b));
                std::cerr << fmt::format("{}: error: kerf's rewrite is NOT equivalent: output '{}' differs "
                                         "(original {}, rewrite {})\n{}nothing was written. This is a kerf bug: "
                                         "please report it with the rewrite and the reader's description kept in {}/\n",
                                         file, pr.cex ? pr.cex->output : "?", pr.cex && pr.cex->valueA ? 1 : 0,
                                         pr.cex && pr.cex->valueB ? 1 : 0, shown, dir);
                return static_cast<int>(ExitCode::Internal);
            }
            if (pr.verdict == proof::Verdict::Undecided) {
                std::cerr << fmt::format("{}: error: the proof ran out of budget (--proof-budget {}) on {} output(s), "
                                         "e.g. '{}'; the rewrite is unproved and was not written\n",
                                         file, opts.proofBudget, pr.undecidedOutputs.size(),
                                         pr.undecidedOutputs.empty() ? "?" : pr.undecidedOutputs.front());
                return static_cast<int>(ExitCode::Unproved);
            }
            proofText = fmt::format("proved equivalent in {:.2f} s ({} outputs: {} by structure, {} by SAT)",
                                    proofSeconds, pr.stats.outputs, pr.stats.byStructure, pr.stats.bySat);
            emit::setHeader(wr, fmt::format("{} of {} group{} rewritten, gates {} -> {}, depth {} -> {}, "
                                            "proved equivalent", groupsReplaced, wr.groups.size(),
                                            wr.groups.size() == 1 ? "" : "s", shownBefore.gates, shownAfter.gates,
                                            shownBefore.depth, shownAfter.depth));
        } else {
            proofText = "NOT proved (--skip-proof)";
            if (!opts.secondRun)
                std::cerr << "warning: --skip-proof: the rewrite is written without a proof of equivalence\n";
            emit::setHeader(wr, fmt::format("{} of {} group{} rewritten, gates {} -> {}, depth {} -> {}, "
                                            "NOT proved (--skip-proof)", groupsReplaced, wr.groups.size(),
                                            wr.groups.size() == 1 ? "" : "s", shownBefore.gates, shownAfter.gates,
                                            shownBefore.depth, shownAfter.depth));
        }
    }

    if (opts.verbose > 0) {
        std::cerr << passes::formatEngineReport(er);
        std::cerr << wr.namingLog;
        std::cerr << own.log;
        std::cerr << fmt::format("{:<24} {:>9} {:>8} {:>6} {:>7}\n", "(written file)", after.literals, after.gates,
                                 after.depth, after.nodes);
        if (!namedKeptIds.empty())
            std::cerr << fmt::format("named values: with the statements kept for their names counted (as kerf stats "
                                     "counts them): {}\n", figuresText(shownBefore, shownAfter));
        for (const auto& g : wr.groups)
            std::cerr << fmt::format("  statements at line{} {}: {} -> {} gates, {}\n", g.lines.size() == 1 ? "" : "s",
                                     lineRanges(g.lines), g.gatesBefore, g.gatesAfter,
                                     g.replaced ? "rewritten" : "kept as written: " + g.reason);
        // Statements kerf does not restructure at all, each with its reason (kept code,
        // parameter-dependent logic, text other defines could change).
        for (const auto& k : proof::keptStatements(desc, low)) std::cerr << "  " << proof::describeKept(k) << "\n";
    }

    // What stays as written, and why, on one line after the summary: each reason once, with the
    // lines it covers (statements kerf does not restructure, and groups without enough gain).
    std::string keptText;
    {
        std::vector<std::pair<std::string, std::vector<std::string>>> byReason;
        auto add = [&](const std::string& reason, const std::string& lines) {
            for (auto& [r, ls] : byReason)
                if (r == reason) { ls.push_back(lines); return; }
            byReason.push_back({reason, {lines}});
        };
        // Unchanged, the groups the text rule kept are still listed: they gain, by gates.
        for (const auto& g : wr.groups) {
            if (g.replaced || g.lines.empty() || (!wr.changed && !emit::keptForText(g))) continue;
            add(g.reason, lineRanges(g.lines));
        }
        for (const auto& k : proof::keptStatements(desc, low)) add(k.what + ": " + k.reason, std::to_string(k.src.line));
        constexpr std::size_t kShown = 10;   // lines listed per reason; the report has all of them
        for (const auto& [reason, ls] : byReason) {
            std::string lines;
            for (std::size_t i = 0; i < ls.size() && i < kShown; ++i) lines += (i ? ", " : "") + ls[i];
            if (ls.size() > kShown) lines += fmt::format(" and {} more", ls.size() - kShown);
            bool many = ls.size() > 1 || ls[0].find_first_of(",-") != std::string::npos;
            keptText += fmt::format("{}line{} {} ({})", keptText.empty() ? "" : "; ", many ? "s" : "", lines, reason);
        }
        if (!keptText.empty())
            keptText = fmt::format("{}: module {}: kept as written: {}", file, desc.name, keptText);
    }

    std::string outputPath = opts.inPlace ? file : opts.output;
    std::string summary = fmt::format("{}: module {}: {}, word operators {}", file, desc.name,
                                      figuresText(shownBefore, shownAfter), words.str());
    if (!wr.changed) {
        const bool forText = std::any_of(wr.groups.begin(), wr.groups.end(), emit::keptForText);
        summary += wr.groups.empty() ? "; nothing to restructure, the file is unchanged"
                   : forText ? "; nothing gains enough for its text (below), the file is unchanged"
                             : fmt::format("; nothing gains at least --min-gain {}, the file is unchanged",
                                           wo.minGain.str());
    } else {
        summary += fmt::format("; {} of {} statement group{} rewritten", groupsReplaced, wr.groups.size(),
                               wr.groups.size() == 1 ? "" : "s");
        if (groupsReplaced < wr.groups.size()) summary += fmt::format(" (the rest kept as written)");
        summary += ", " + proofText;
        if (pinned) summary += fmt::format(", specialised for {} (--param; the file stops other values)",
                                           emit::pinnedList(pins));
    }
    if (low.dontCareBits > 0)
        summary += fmt::format("; {} output bit{} can be x in the source and {} used as don't-care{} (--keep-x keeps "
                               "such statements)", low.dontCareBits, low.dontCareBits == 1 ? "" : "s",
                               low.dontCareBits == 1 ? "was" : "were", low.dontCareBits == 1 ? "" : "s");

    if (!opts.reportPath.empty()) {
        nlohmann::json groups = nlohmann::json::array();
        nlohmann::json kept = nlohmann::json::array();
        nlohmann::json ranges = nlohmann::json::array();
        for (const auto& g : wr.groups) {
            nlohmann::json lines = nlohmann::json::array();
            for (const auto& [a, b] : g.lines) lines.push_back({a, b});
            groups.push_back({{"lines", lines}, {"outputs", g.outputs}, {"gates_before", g.gatesBefore},
                              {"gates_after", g.gatesAfter}, {"rewritten", g.replaced}});
            if (g.replaced && wr.changed)
                for (const auto& [a, b] : g.lines) ranges.push_back({a, b});
            else
                kept.push_back({{"lines", lines}, {"reason", wr.changed || !g.replaced ? g.reason : "no change"}});
        }
        nlohmann::json moveRows = nlohmann::json::array();
        for (const auto& m : er.moves) moveRows.push_back({{"technique", m.technique}, {"after", metricsJson(m.after)}});
        nlohmann::json techRows = nlohmann::json::array();
        for (const auto& t : er.techniques) {
            nlohmann::json counters = nlohmann::json::object();
            for (const auto& [n, v] : t.counters) counters[n] = v;
            techRows.push_back({{"technique", t.technique}, {"trials", t.trials}, {"kept", t.applied},
                                {"gates_saved", t.gatesSaved}, {"depth_saved", t.depthSaved},
                                {"seconds", t.seconds}, {"counters", counters}});
        }
        nlohmann::json report = {
            {"schema", "kerf-restructure-report"},
            {"schema_version", 2},
            {"input", file},
            {"output", opts.diff || opts.check ? nlohmann::json(nullptr)
                                                : nlohmann::json(outputPath.empty() ? "-" : outputPath)},
            {"module", desc.name},
            {"changed", wr.changed},
            {"min_gain", wo.minGain.str()},
            {"before", metricsJson(shownBefore)},
            {"after", metricsJson(shownAfter)},
            {"word_operators", {{"unit", "operators kept as written, each counted once; not in gates"},
                                {"adders", words.adders}, {"multipliers", words.multipliers},
                                {"comparators", words.comparators}, {"shifters", words.shifters},
                                {"other", words.other}}},
            {"groups", groups},
            {"statements_replaced", [&] {
                 std::size_t n = 0;
                 if (wr.changed)
                     for (const auto& g : wr.groups) n += g.replaced ? g.members.size() : 0;
                 return n;
             }()},
            {"lines_replaced", ranges},
            {"kept_as_written", kept},
            {"statements_not_restructured", [&] {
                 nlohmann::json ks = nlohmann::json::array();
                 for (const auto& k : proof::keptStatements(desc, low))
                     ks.push_back({{"file", k.src.file}, {"line", k.src.line}, {"what", k.what}, {"reason", k.reason}});
                 return ks;
             }()},
            {"signals_added", wr.changed ? wr.wiresAdded : std::vector<std::string>{}},
            {"signals_kept", wr.changed ? wr.namesKept : std::vector<std::string>{}},
            {"no_longer_read", [&] {
                 // What the unused wire reads: bits the logic no longer depends on, and named
                 // constants it no longer names (docs/guide.md, "What the written logic reads").
                 std::vector<std::string> bits, constants(wr.constantsNotNamed);
                 if (wr.changed)
                     for (const auto& n : wr.notRead)
                         if (std::find(constants.begin(), constants.end(), n) == constants.end()) bits.push_back(n);
                 if (!wr.changed) constants.clear();
                 return nlohmann::json{{"wire", wr.changed ? wr.unusedWire : std::string()},
                                       {"bits", bits},
                                       {"constants", constants}};
             }()},
            {"goal", opts.goal},
            {"effort", opts.effort},
            {"moves", moveRows},
            {"techniques", techRows},
            {"limits_hit", er.limitsHit},
            {"own_output", {{"runs", own.checks},
                            {"rewrites_adopted", own.adopted},
                            {"fixed_point", !wr.changed ? nlohmann::json("unchanged file")
                                            : own.checks == 0 ? nlohmann::json("not checked")
                                                              : nlohmann::json(own.fixedPoint)}}},
            {"proof", wr.changed ? proofJson : nlohmann::json({{"verdict", "not needed: file unchanged"}})},
            {"parameters", [&] {
                 nlohmann::json ps = nlohmann::json::array();
                 for (const auto& p : desc.parameters) {
                     bool used = std::any_of(pins.begin(), pins.end(), [&](const emit::PinnedValue& v) {
                         return v.name == p.name;
                     });
                     ps.push_back({{"name", p.name}, {"value", p.value}, {"pinned", p.pinned},
                                   {"specialised_for", used}, {"statements_kept", p.keptMembers}});
                 }
                 return ps;
             }()},
            {"naming", [&] {
                 // What the naming weighed (naming_cost.cpp): the bitwise form, the bounds a
                 // named form keeps, and per register or target the form tried, kept or not, why.
                 const emit::NamingRecord& n = wr.naming;
                 // The choices that kept a target's statements as written come first (F236): the
                 // run that weighed them was made again without those statements.
                 nlohmann::json ds = opts.namedKeptNaming;
                 for (const auto& d : n.decisions) ds.push_back(namingRow(d));
                 if (!n.weighed) return nlohmann::json{{"weighed", false}, {"decisions", ds}};
                 return nlohmann::json{{"weighed", true},
                                       {"bitwise", {{"gates", n.bitwiseGates}, {"depth", n.bitwiseDepth}}},
                                       {"bound", {{"depth", n.depthBound}, {"gates", n.gateLimit}}},
                                       {"decisions", ds}};
             }()},
            {"seconds", {{"read", readSeconds}, {"passes", passSeconds}}}};
        stages.end();
        report["stages"] = stagesJson(stages);
        io::writeFileAtomic(opts.reportPath, report.dump(2) + "\n");
    }
    stages.end();   // the last stage, also without --report
    if (opts.verbose > 0) std::cerr << stages.line() << "\n";
    if (!opts.secondRun) io::Progress::global().stop();   // the first run goes on showing it

    if (outcome) {
        *outcome = RestructureOutcome{};
        outcome->changed = wr.changed;
        outcome->file = file;
        outcome->text = wr.text;
        if (wr.changed) outcome->added = wr.wiresAdded;
        outcome->headerPos = wr.headerPos;
        outcome->headerLen = wr.headerLen;
        outcome->unusedWire = wr.changed ? wr.unusedWire : std::string();
        outcome->notRead = wr.notRead;
        outcome->constantsNotNamed = wr.constantsNotNamed;
        outcome->gatesBefore = asRead.gates;
        outcome->gatesAfter = after.gates;
    }
    if (opts.noOutput) {
        if (!opts.quiet) std::cerr << summary << "\n" << (keptText.empty() ? "" : keptText + "\n");
        return 0;
    }
    if (opts.check) {
        if (!opts.quiet) std::cerr << summary << "\n" << (keptText.empty() ? "" : keptText + "\n");
        if (wr.changed) {
            std::cerr << fmt::format("{}: kerf would restructure module {} ({} -> {} gates)\n", file, desc.name,
                                     shownBefore.gates, shownAfter.gates);
            return static_cast<int>(ExitCode::Different);
        }
        return 0;
    }
    io::WriteFileOptions fo;
    fo.backupSuffix = opts.backupSuffix;
    if (opts.diff) {
        io::writeStdout(emit::unifiedDiff(original_text, wr.text, "a/" + file, "b/" + file));
    } else if (opts.inPlace) {
        if (wr.changed) io::writeFileAtomic(file, wr.text, fo);
    } else if (!opts.output.empty()) {
        io::writeFileAtomic(opts.output, wr.text, fo);
    } else {
        io::writeStdout(wr.text);
    }
    if (!opts.quiet) std::cerr << summary << "\n" << (keptText.empty() ? "" : keptText + "\n");
    return 0;
}

int restructureAll(const RestructureOptions& opts) {
    std::vector<std::string> args;
    for (const auto& d : opts.read.includeDirs) { args.push_back("-I"); args.push_back(d); }
    for (const auto& d : opts.read.defines) { args.push_back("-D"); args.push_back(d); }
    for (const auto& f : opts.read.files) {
        io::checkSourceFile(f);
        args.push_back(f);
    }
    std::vector<std::string> names = io::listModules(args);
    if (names.empty()) {
        // A package file, say, in a pre-commit run over changed files: nothing to do.
        if (!opts.quiet) std::cerr << "--all-modules: the given files declare no module; nothing to do\n";
        return 0;
    }
    // Each module is read, restructured, proved and (with --in-place) written on its
    // own, in file order: a later module of the same file is read with the earlier
    // one's proved rewrite in place. A module that fails leaves its text as it was.
    int worst = 0;
    std::size_t rewritten = 0, unchanged = 0, failed = 0;
    for (const std::string& name : names) {
        RestructureOptions o = opts;
        o.read.top = name;
        RestructureOutcome outcome;
        int rc = 0;
        try {
            io::Progress::global().start(!o.quiet);
            rc = restructure(o, &outcome);
        } catch (const Error& e) {
            io::Progress::global().stop();
            // Without Python/pyslang or memory no other module can do better.
            if (e.code() == ExitCode::ToolMissing || e.code() == ExitCode::Resources) throw;
            std::cerr << e.render() << "\n";
            rc = static_cast<int>(e.code());
        }
        io::Progress::global().stop();
        if (rc != 0 && !(opts.check && rc == static_cast<int>(ExitCode::Different))) {
            ++failed;
            std::cerr << fmt::format("module {}: not restructured (exit {}); its text is unchanged\n", name, rc);
        } else if (outcome.changed) {
            ++rewritten;
        } else {
            ++unchanged;
        }
        worst = std::max(worst, rc);
    }
    if (!opts.quiet || failed > 0)
        std::cerr << fmt::format("--all-modules: {} module{}: {} {}, {} unchanged, {} failed\n", names.size(),
                                 names.size() == 1 ? "" : "s", rewritten,
                                 opts.check ? "would be rewritten" : "rewritten", unchanged, failed);
    return worst;
}

int draw(const DrawOptions& opts) {
    RestructureOptions o = opts.how;
    o.noOutput = true;
    RestructureOutcome done;
    io::Progress::global().start(!o.quiet);
    if (int rc = restructure(o, &done); rc != 0) return rc;
    // The graph is of the written text, read back as the proof read it.
    io::WorkDir work;
    std::string rewritten = work.add(std::filesystem::path(done.file).filename().string(), done.text);
    frontend::ReadOptions back = o.read;
    for (const auto& f : o.read.files) {
        std::error_code ec;
        if (f == done.file || std::filesystem::equivalent(f, done.file, ec)) back.substitute[f] = rewritten;
    }
    back.includeDirs.push_back(std::filesystem::path(done.file).parent_path().empty()
                                   ? "."
                                   : std::filesystem::path(done.file).parent_path().string());
    frontend::ModuleDesc written = frontend::readModule(back);
    frontend::Lowered low = lowerAs(written, o.dissolveInternal, false, o.prefix);
    std::set<std::string> added(done.added.begin(), done.added.end());
    std::string dot = emit::toDot(emit::signalGraph(written, low), written.name, added);
    if (opts.output.empty()) {
        io::writeStdout(dot);
        return 0;
    }
    io::writeFileAtomic(opts.output, dot);
    // SVG beside it when Graphviz's `dot` is installed.
    std::filesystem::path svg = opts.output;
    svg.replace_extension(".svg");
    io::ProcessResult r = io::runCaptured({"dot", "-Tsvg", opts.output});
    if (r.spawnError != 0) {
        if (!o.quiet) std::cerr << fmt::format("{}: written; Graphviz 'dot' is not installed, so no SVG\n", opts.output);
        return 0;
    }
    if (r.exitCode != 0)
        throw Error(fmt::format("Graphviz 'dot' failed on {} (exit {}); the .dot file is written, no SVG",
                                opts.output, r.exitCode), {}, ExitCode::Internal);
    io::writeFileAtomic(svg.string(), r.out);
    if (!o.quiet) std::cerr << fmt::format("{} and {}: written\n", opts.output, svg.string());
    return 0;
}

} // namespace kerf::flow
