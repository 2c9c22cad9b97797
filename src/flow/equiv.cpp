// equiv.cpp — `kerf equiv`: two versions of one module, compared honestly.
//
// Both files are read for this build (parameters as elaborated, the defines
// given) and lowered with arithmetic turned into gates. The proof boundary
// (kerf/proof/boundary.h) pairs the statements each side keeps as written by
// their text; every output is compared or accounted for. The verdict is
// "equivalent" (exit 0) only when every output both sides compute is proved
// equal and every kept statement has a partner; a compared output that
// differs gives "different" (exit 1) with a counterexample; anything left
// uncompared gives "undecided" (exit 3) naming the statements (file:line).
#include "kerf/flow/counterexample.h"
#include "kerf/flow/flows.h"
#include "kerf/proof/boundary.h"

#include <fmt/format.h>

#include <chrono>
#include <iostream>

namespace kerf::flow {

ProofInput readForProof(const frontend::ReadOptions& read, const std::string& prefix) {
    ProofInput in;
    in.desc = frontend::readModule(read);
    frontend::LowerOptions lo;
    lo.bitBlastArithmetic = true;
    lo.prefix = prefix;
    // Compared at the ports and at kept code: internal signals may differ between the two.
    lo.dissolveInternal = true;
    in.low = frontend::lower(in.desc, lo);
    return in;
}

namespace {

std::string buildScope(const frontend::ModuleDesc& a) {
    std::string s = "scope: combinational equivalence at the ports, for this build";
    std::vector<std::string> values;
    for (const auto& p : a.parameters) values.push_back(fmt::format("{} = {}", p.name, p.value));
    if (!values.empty()) {
        s += " (parameters as elaborated: ";
        for (std::size_t i = 0; i < values.size(); ++i) s += (i ? ", " : "") + values[i];
        s += ")";
    }
    if (!a.conditionals.empty())
        s += fmt::format("; the module has conditional regions ({}{}) and other defines are not compared",
                         a.conditionals.front(), a.conditionals.size() > 1 ? ", ..." : "");
    s += "; signals driven by statements both designs keep as written (paired by their text) are free inputs";
    return s;
}

} // namespace

int equiv(const EquivOptions& opts) {
    auto t0 = std::chrono::steady_clock::now();
    frontend::ReadOptions ra = opts.a, rb = opts.b;
    ra.asBuilt = rb.asBuilt = true;
    ProofInput a = readForProof(ra, "kf_");
    ProofInput b = readForProof(rb, "kf_");
    proof::ProofOptions po;
    po.totalConflicts = opts.proofBudget;
    po.verbose = opts.verbose;
    proof::BoundedResult r = proof::proveBounded({a.desc, a.low}, {b.desc, b.low}, po);
    double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    const proof::ProofResult& pr = r.proof;

    std::optional<ShownCounterexample> shown;
    if (pr.cex) shown = showCounterexample(*pr.cex, a.desc, a.low, b.desc, b.low);
    auto isInert = [&](const proof::KeptStatement& k) {
        for (const auto& i : r.inert)
            if (i.src.file == k.src.file && i.src.start == k.src.start && i.src.end == k.src.end) return true;
        return false;
    };
    std::vector<std::pair<const char*, const proof::KeptStatement*>> unmatched, inert;
    for (const auto& k : r.kept.onlyA) (isInert(k) ? inert : unmatched).emplace_back("first", &k);
    for (const auto& k : r.kept.onlyB) (isInert(k) ? inert : unmatched).emplace_back("second", &k);

    if (opts.json) {
        nlohmann::json un = nlohmann::json::array();
        for (const auto& [side, k] : unmatched)
            un.push_back({{"design", side}, {"file", k->src.file}, {"line", k->src.line}, {"what", k->what},
                          {"reason", k->reason}});
        nlohmann::json in = nlohmann::json::array();
        for (const auto& [side, k] : inert)
            in.push_back({{"design", side}, {"file", k->src.file}, {"line", k->src.line}, {"what", k->what},
                          {"reason", k->reason}});
        nlohmann::json j = {{"verdict", proof::verdictName(r.verdict)},
                            {"statements_driving_nothing", in},
                            {"seconds", seconds},
                            {"outputs", r.comparedOutputs},
                            {"by_structure", pr.stats.byStructure},
                            {"by_sat", pr.stats.bySat},
                            {"refuted_by_simulation", pr.stats.bySimulation},
                            {"kept_matched", r.kept.matched.size()},
                            {"uncompared_statements", un},
                            {"one_sided_outputs", r.oneSided},
                            {"undriven_on_one_side", r.undrivenOnOneSide},
                            {"undecided_outputs", pr.undecidedOutputs},
                            {"failing_outputs", pr.failingOutputs}};
        if (shown) j["counterexample"] = counterexampleJson(*shown);
        std::cout << j.dump(2) << "\n";
    } else {
        std::string t;
        switch (r.verdict) {
        case proof::Verdict::Equivalent:
            t += fmt::format("equivalent: {} output bits compared ({} by structure, {} by SAT)", r.comparedOutputs,
                             pr.stats.byStructure, pr.stats.bySat);
            if (!r.kept.matched.empty())
                t += fmt::format(", {} statement{} kept as written paired by their text", r.kept.matched.size(),
                                 r.kept.matched.size() == 1 ? "" : "s");
            t += fmt::format("; {:.2f} s\n", seconds);
            break;
        case proof::Verdict::Different:
            if (shown) {
                t += fmt::format("different: output '{}' is {} in the first design and {} in the second\n",
                                 shown->output, shown->valueA ? 1 : 0, shown->valueB ? 1 : 0);
                t += formatCounterexample(*shown);
                if (pr.failingOutputs.size() > 1)
                    t += fmt::format("  ({} output bits differ in all)\n", pr.failingOutputs.size());
            }
            for (const auto& u : r.undrivenOnOneSide) t += fmt::format("different: {}\n", u);
            break;
        case proof::Verdict::Undecided:
            t += "undecided: ";
            if (!unmatched.empty()) {
                t += fmt::format("{} statement{} kept as written {} no counterpart with the same text in the other "
                                 "design, so what {} drive{} is not compared:\n",
                                 unmatched.size(), unmatched.size() == 1 ? "" : "s",
                                 unmatched.size() == 1 ? "has" : "have", unmatched.size() == 1 ? "it" : "they",
                                 unmatched.size() == 1 ? "s" : "");
                for (const auto& [side, k] : unmatched)
                    t += fmt::format("  {} design: {}\n", side, proof::describeKept(*k));
            } else if (!r.oneSided.empty()) {
                t += "some outputs are computed by one design only:\n";
            } else {
                t += fmt::format("{} output bit{} not settled within --proof-budget {}, e.g. '{}'\n",
                                 pr.undecidedOutputs.size(), pr.undecidedOutputs.size() == 1 ? "" : "s",
                                 opts.proofBudget, pr.undecidedOutputs.empty() ? "?" : pr.undecidedOutputs.front());
            }
            for (std::size_t i = 0; i < r.oneSided.size() && i < 8; ++i)
                t += fmt::format("  not compared: {}\n", r.oneSided[i]);
            if (r.oneSided.size() > 8) t += fmt::format("  not compared: {} more\n", r.oneSided.size() - 8);
            t += fmt::format("  {} output bits both designs compute were compared{}\n", r.comparedOutputs,
                             pr.undecidedOutputs.empty()
                                 ? " and found equal"
                                 : fmt::format("; {} not settled within --proof-budget", pr.undecidedOutputs.size()));
            break;
        }
        for (const auto& [side, k] : inert)
            t += fmt::format("  not compared, drives no signal ({} design only): {}\n", side, proof::describeKept(*k));
        t += buildScope(a.desc) + "\n";
        std::cout << t;
    }
    switch (r.verdict) {
    case proof::Verdict::Equivalent: return 0;
    case proof::Verdict::Different: return static_cast<int>(ExitCode::Different);
    default: return static_cast<int>(ExitCode::Unproved);
    }
}

} // namespace kerf::flow
