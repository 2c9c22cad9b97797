// flows.cpp — restructure, stats and equiv: reading, passes, writing and proof glued together.
#include "kerf/flow/flows.h"

#include "kerf/emit/writer.h"
#include "kerf/frontend/lower.h"
#include "kerf/io/files.h"
#include "kerf/io/progress.h"
#include "kerf/io/reader.h"
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

/// Read the module as the proof sees it: arithmetic turned into gates.
frontend::Lowered lowerForProof(const frontend::ReadOptions& read, const std::string& prefix) {
    frontend::ModuleDesc d = frontend::readModule(read);
    frontend::LowerOptions lo;
    lo.bitBlastArithmetic = true;
    lo.prefix = prefix;
    return frontend::lower(d, lo);
}

nlohmann::json stagesJson(const io::StageLog& log) {
    nlohmann::json rows = nlohmann::json::array();
    for (const auto& r : log.rows())
        rows.push_back({{"stage", r.stage}, {"seconds", r.seconds}, {"peak_memory_mb", (r.peakRssKb + 1023) / 1024},
                        {"process", r.child ? "reader" : "kerf"}});
    return rows;
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
    io::StageLog stages;
    auto t0 = Clock::now();
    stages.begin("read");
    frontend::ModuleDesc desc = frontend::readModule(opts.read);
    double readSeconds = since(t0);
    {
        io::ReaderOutput rf = io::lastReaderFigures();
        stages.addChild("reader", rf.seconds, rf.peakRssKb);
    }
    stages.begin("lower");
    frontend::LowerOptions lo;
    lo.prefix = opts.prefix;
    frontend::Lowered low = frontend::lower(desc, lo);
    for (const auto& n : low.notes) std::cerr << n << "\n";
    net::Metrics asRead = passes::measureFactored(low.net);

    stages.begin("restructure");
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

    stages.begin("write");
    emit::WriteOptions wo;
    wo.prefix = opts.prefix;
    wo.forms = &forms.forms;
    if (opts.skipProof) wo.banner = "written with --skip-proof: this rewrite was NOT proved equivalent";
    emit::WriteResult wr = emit::writeModule(desc, low, low.net, wo);
    // A file written with CR LF stays so (the generated lines included).
    if (wr.changed) wr.text = io::keepLineEndings(io::readFile(desc.src.file), std::move(wr.text));

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

    if (!wr.changed && !opts.quiet) {
        std::cerr << fmt::format("{}: module {}: nothing to restructure; the file is written back unchanged\n",
                                 file, desc.name);
    }

    // ---- proof: read back what was written, through the same reader
    int exitCode = 0;
    std::string proofLine;
    if (wr.changed && !opts.skipProof) {
        stages.begin("prove");
        auto tProof = Clock::now();
        // The rewrite is read back from a private directory under the original's
        // file name, so the reader's messages about it read naturally.
        io::WorkDir work;
        std::string rewritten = work.add(std::filesystem::path(file).filename().string(), wr.text);
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
        back.substitute[key] = rewritten;
        // Includes relative to the original file's folder must still resolve.
        back.includeDirs.push_back(std::filesystem::path(file).parent_path().empty()
                                       ? "."
                                       : std::filesystem::path(file).parent_path().string());
        // Anything wrong with kerf's own output is kerf's bug: keep the evidence.
        auto keepEvidence = [&]() {
            try {
                work.add("description.json", io::runReader(frontend::readerArguments(opts.read)).text);
            } catch (const std::exception&) {
                // The rewrite alone still helps; the reader's own message is above.
            }
            return work.keep();
        };
        frontend::Lowered a = lowerForProof(opts.read, opts.prefix);
        frontend::Lowered b;
        try {
            b = lowerForProof(back, opts.prefix);
        } catch (const Error& e) {
            if (e.code() == ExitCode::Resources || e.code() == ExitCode::ToolMissing) throw;
            std::string dir = keepEvidence();
            std::string why = e.what();
            if (auto cut = why.find("; nothing was written"); cut != std::string::npos) why.erase(cut);
            throw Error(fmt::format("kerf's rewrite of module {} does not read back ({}); nothing was written. "
                                    "This is a kerf bug: please report it with the files kept in {}/",
                                    desc.name, why, dir), {}, ExitCode::Internal);
        }
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
            std::string dir = keepEvidence();
            std::cerr << fmt::format("{}: error: kerf's rewrite is NOT equivalent: output '{}' differs "
                                     "(original {}, rewrite {}) for:\n{}nothing was written. This is a kerf bug: "
                                     "please report it with the rewrite and the reader's description kept in {}/\n",
                                     file, pr.cex ? pr.cex->output : "?", pr.cex && pr.cex->valueA ? 1 : 0,
                                     pr.cex && pr.cex->valueB ? 1 : 0, pr.cex ? describeCounterexample(*pr.cex) : "",
                                     dir);
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

    // The report comes before the output: a report that cannot be written leaves
    // the output untouched. Its stage figures end here.
    auto writeReport = [&]() {
        stages.end();
        report["stages"] = stagesJson(stages);
        if (!opts.reportPath.empty()) io::writeFileAtomic(opts.reportPath, report.dump(2) + "\n");
        if (opts.verbose > 0) std::cerr << stages.line() << "\n";
        io::Progress::global().stop();
    };

    if (opts.check) {
        bool improves = wr.changed && after.gates < asRead.gates;
        writeReport();
        if (!opts.quiet) std::cerr << summary << proofLine << "\n";
        if (improves) {
            std::cerr << fmt::format("{}: kerf would restructure module {} ({} -> {} gates)\n", file, desc.name,
                                     asRead.gates, after.gates);
            return static_cast<int>(ExitCode::Different);
        }
        return 0;
    }
    io::WriteFileOptions fo;
    fo.backupSuffix = opts.backupSuffix;
    writeReport();
    if (opts.inPlace) io::writeFileAtomic(file, wr.text, fo);
    else if (!opts.output.empty()) io::writeFileAtomic(opts.output, wr.text, fo);
    else io::writeStdout(wr.text);
    if (!opts.quiet) std::cerr << summary << proofLine << "\n";
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
