// flows.cpp — restructure, stats and equiv: reading, passes, writing and proof glued together.
#include "kerf/flow/flows.h"

#include "kerf/emit/writer.h"
#include "kerf/frontend/lower.h"
#include "kerf/passes/engine.h"
#include "kerf/passes/tidy.h"
#include "kerf/passes/factored.h"
#include "kerf/proof/equivalence.h"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <unistd.h>

namespace kerf::flow {

namespace {

using Clock = std::chrono::steady_clock;
double since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }

std::string percent(std::size_t before, std::size_t after) {
    if (before == 0) return "0%";
    double p = 100.0 * (static_cast<double>(after) - static_cast<double>(before)) / static_cast<double>(before);
    return fmt::format("{:+.1f}%", p);
}

nlohmann::json metricsJson(const net::Metrics& m) {
    return {{"inputs", m.inputs}, {"outputs", m.outputs}, {"nodes", m.nodes},
            {"literals", m.literals}, {"gates", m.gates}, {"depth", m.depth}};
}

std::string describeCounterexample(const proof::Counterexample& cex) {
    std::string s;
    for (const auto& [name, v] : cex.inputs) s += fmt::format("  {} = {}\n", name, v ? 1 : 0);
    return s;
}

/// A temporary file that is removed when it goes out of scope.
struct TempFile {
    std::string path;
    explicit TempFile(const std::string& like) {
        std::string ext = std::filesystem::path(like).extension().string();
        if (ext.empty()) ext = ".v";
        path = (std::filesystem::temp_directory_path() / fmt::format("kerf-{}-{}{}", getpid(), counter()++, ext)).string();
    }
    ~TempFile() { std::remove(path.c_str()); }
    static int& counter() { static int c = 0; return c; }
};

/// Read the module as the proof sees it: arithmetic turned into gates.
frontend::Lowered lowerForProof(const frontend::ReadOptions& read, const std::string& prefix) {
    frontend::ModuleDesc d = frontend::readModule(read);
    frontend::LowerOptions lo;
    lo.bitBlastArithmetic = true;
    lo.prefix = prefix;
    return frontend::lower(d, lo);
}

} // namespace

StatsResult stats(const frontend::ReadOptions& read) {
    frontend::ModuleDesc d = frontend::readModule(read);
    frontend::Lowered low = frontend::lower(d);
    StatsResult r;
    r.module = d.name;
    r.metrics = net::measure(low.net);
    r.restructurable = low.replaced.size();
    r.kept = d.members.size() - low.replaced.size();
    return r;
}

int restructure(const RestructureOptions& opts) {
    auto t0 = Clock::now();
    frontend::ModuleDesc desc = frontend::readModule(opts.read);
    double readSeconds = since(t0);
    frontend::LowerOptions lo;
    lo.prefix = opts.prefix;
    frontend::Lowered low = frontend::lower(desc, lo);
    for (const auto& n : low.notes) std::cerr << n << "\n";
    net::Metrics asRead = passes::measureFactored(low.net);

    auto tPass = Clock::now();
    passes::tidy(low.net);
    passes::EngineOptions eo;
    eo.effort = opts.effort;
    eo.recipe = opts.recipe;
    eo.maxDepth = opts.maxDepth;
    eo.verbose = opts.verbose;
    passes::EngineResult er = passes::restructure(low.net, eo);
    double passSeconds = since(tPass);
    passes::FactoredNetwork forms = passes::factorNetwork(low.net, er.depthCap);
    net::Metrics after = forms.metrics;
    if (opts.verbose > 0) std::cerr << passes::formatPassTable(er);

    emit::WriteOptions wo;
    wo.prefix = opts.prefix;
    wo.forms = &forms.forms;
    if (opts.skipProof) wo.banner = "written with --skip-proof: this rewrite was NOT proved equivalent";
    emit::WriteResult wr = emit::writeModule(desc, low, low.net, wo);

    const std::string& file = desc.src.file;
    std::string summary = fmt::format("{}: module {}: gates {} -> {} ({}), literals {} -> {}, depth {} -> {}",
                                      file, desc.name, asRead.gates, after.gates, percent(asRead.gates, after.gates),
                                      asRead.literals, after.literals, asRead.depth, after.depth);
    nlohmann::json report = {{"file", file}, {"module", desc.name}, {"before", metricsJson(asRead)},
                             {"after", metricsJson(after)}, {"recipe", er.recipe},
                             {"statements_replaced", low.replaced.size()},
                             {"seconds", {{"read", readSeconds}, {"passes", passSeconds}}}};
    nlohmann::json passRows = nlohmann::json::array();
    for (const auto& row : er.rows)
        passRows.push_back({{"pass", row.pass}, {"after", metricsJson(row.after)}, {"seconds", row.seconds}});
    report["passes"] = passRows;

    if (!wr.changed) {
        std::cerr << fmt::format("{}: module {}: nothing to restructure; the file is written back unchanged\n",
                                 file, desc.name);
    }

    // ---- proof: read back what was written, through the same reader
    int exitCode = 0;
    std::string proofLine;
    if (wr.changed && !opts.skipProof) {
        auto tProof = Clock::now();
        TempFile tmp(file);
        emit::writeFileAtomic(tmp.path, wr.text);
        frontend::ReadOptions back = opts.read;
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
        back.substitute[key] = tmp.path;
        // Includes relative to the original file's folder must still resolve.
        back.includeDirs.push_back(std::filesystem::path(file).parent_path().empty()
                                       ? "."
                                       : std::filesystem::path(file).parent_path().string());
        frontend::Lowered a = lowerForProof(opts.read, opts.prefix);
        frontend::Lowered b = lowerForProof(back, opts.prefix);
        proof::ProofOptions po;
        po.totalConflicts = opts.proofBudget;
        po.verbose = opts.verbose;
        proof::ProofResult pr = proof::proveEquivalent(a.net, b.net, po);
        double proofSeconds = since(tProof);
        report["proof"] = {{"verdict", pr.verdict == proof::Verdict::Equivalent ? "equivalent"
                                       : pr.verdict == proof::Verdict::Different ? "different" : "undecided"},
                           {"seconds", proofSeconds},
                           {"outputs", pr.stats.outputs},
                           {"by_structure", pr.stats.byStructure},
                           {"by_sat", pr.stats.bySat},
                           {"boundary", "combinational equivalence at the module's ports and at kept code, "
                                        "whose outputs are matched by name and treated as free inputs"}};
        if (pr.verdict == proof::Verdict::Different) {
            std::cerr << fmt::format("{}: error: kerf's rewrite is NOT equivalent: output '{}' differs "
                                     "(original {}, rewrite {}) for:\n{}nothing was written; please report this as a kerf bug\n",
                                     file, pr.cex ? pr.cex->output : "?", pr.cex && pr.cex->valueA ? 1 : 0,
                                     pr.cex && pr.cex->valueB ? 1 : 0, pr.cex ? describeCounterexample(*pr.cex) : "");
            return static_cast<int>(ExitCode::Internal);
        }
        if (pr.verdict == proof::Verdict::Undecided) {
            std::cerr << fmt::format("{}: error: the proof ran out of budget (--proof-budget {}) on {} output(s), "
                                     "e.g. '{}'; the rewrite is unproved and was not written\n",
                                     file, opts.proofBudget, pr.undecidedOutputs.size(),
                                     pr.undecidedOutputs.empty() ? "?" : pr.undecidedOutputs.front());
            return static_cast<int>(ExitCode::Unproved);
        }
        proofLine = fmt::format(", proved equivalent in {:.2f} s ({} outputs: {} by structure, {} by SAT)",
                                proofSeconds, pr.stats.outputs, pr.stats.byStructure, pr.stats.bySat);
    } else if (wr.changed) {
        proofLine = ", NOT proved (--skip-proof)";
        std::cerr << "warning: --skip-proof: the rewrite is written without a proof of equivalence\n";
    }

    if (!opts.reportPath.empty()) emit::writeFileAtomic(opts.reportPath, report.dump(2) + "\n");

    if (opts.check) {
        bool improves = wr.changed && after.gates < asRead.gates;
        std::cerr << summary << proofLine << "\n";
        if (improves) {
            std::cerr << fmt::format("{}: kerf would restructure module {} ({} -> {} gates)\n", file, desc.name,
                                     asRead.gates, after.gates);
            return static_cast<int>(ExitCode::Different);
        }
        return 0;
    }
    if (opts.inPlace) emit::writeFileAtomic(file, wr.text);
    else if (!opts.output.empty()) emit::writeFileAtomic(opts.output, wr.text);
    else std::cout << wr.text << std::flush;
    std::cerr << summary << proofLine << "\n";
    return exitCode;
}

int equiv(const EquivOptions& opts) {
    auto t0 = Clock::now();
    frontend::Lowered a = lowerForProof(opts.a, "kf_");
    frontend::Lowered b = lowerForProof(opts.b, "kf_");
    proof::ProofOptions po;
    po.totalConflicts = opts.proofBudget;
    po.verbose = opts.verbose;
    proof::ProofResult pr = proof::proveEquivalent(a.net, b.net, po);
    double seconds = since(t0);
    const char* verdict = pr.verdict == proof::Verdict::Equivalent ? "equivalent"
                        : pr.verdict == proof::Verdict::Different ? "different" : "undecided";
    if (opts.json) {
        nlohmann::json j = {{"verdict", verdict}, {"seconds", seconds}, {"outputs", pr.stats.outputs},
                            {"by_structure", pr.stats.byStructure}, {"by_sat", pr.stats.bySat},
                            {"refuted_by_simulation", pr.stats.bySimulation},
                            {"undecided_outputs", pr.undecidedOutputs}, {"failing_outputs", pr.failingOutputs}};
        if (pr.cex) {
            nlohmann::json in = nlohmann::json::object();
            for (const auto& [n, v] : pr.cex->inputs) in[n] = v ? 1 : 0;
            j["counterexample"] = {{"output", pr.cex->output}, {"a", pr.cex->valueA ? 1 : 0},
                                   {"b", pr.cex->valueB ? 1 : 0}, {"inputs", in}};
        }
        std::cout << j.dump(2) << "\n";
    } else {
        std::cout << fmt::format("{} ({} outputs; {} by structure, {} by SAT; {:.2f} s)\n", verdict,
                                 pr.stats.outputs, pr.stats.byStructure, pr.stats.bySat, seconds);
        if (pr.cex) {
            std::cout << fmt::format("output '{}' is {} in the first design and {} in the second for:\n{}",
                                     pr.cex->output, pr.cex->valueA ? 1 : 0, pr.cex->valueB ? 1 : 0,
                                     describeCounterexample(*pr.cex));
        }
        if (!pr.undecidedOutputs.empty())
            std::cout << fmt::format("undecided within --proof-budget: {} output(s), e.g. '{}'\n",
                                     pr.undecidedOutputs.size(), pr.undecidedOutputs.front());
        std::cout << "scope: combinational equivalence at the ports; outputs of kept code (registers, instances) "
                     "are matched by name and treated as free inputs\n";
    }
    switch (pr.verdict) {
    case proof::Verdict::Equivalent: return 0;
    case proof::Verdict::Different: return static_cast<int>(ExitCode::Different);
    default: return static_cast<int>(ExitCode::Unproved);
    }
}

} // namespace kerf::flow
