// equivalence.cpp — matching two networks by input and output names,
// running the proving engine and replaying every counterexample.
//
// The engine (sweep.cpp) follows the SAT-sweeping method of Kuehlmann et
// al. (IEEE TCAD 2002, from memory); this file is the user-facing layer:
// name checks, the shared graph, the independent replay of counterexamples
// on the original networks with net::simulate, and the summary table.
#include "kerf/proof/equivalence.h"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <map>
#include <set>
#include <unordered_map>

namespace kerf::proof {

const char* verdictName(Verdict v) {
    switch (v) {
    case Verdict::Equivalent: return "equivalent";
    case Verdict::Different: return "different";
    case Verdict::Undecided: return "undecided";
    }
    return "?";
}

namespace {

std::string listNames(const std::vector<std::string>& names, std::size_t max = 8) {
    std::string s;
    for (std::size_t i = 0; i < names.size() && i < max; ++i) {
        if (i) s += ", ";
        s += "'" + names[i] + "'";
    }
    if (names.size() > max) s += fmt::format(" and {} more", names.size() - max);
    return s;
}

void checkUnique(const net::Network& n, const char* side) {
    std::set<std::string> seen;
    std::vector<std::string> dups;
    for (net::NodeId id : n.inputs())
        if (!seen.insert(n.node(id).name).second) dups.push_back(n.node(id).name);
    if (!dups.empty())
        throw Error(fmt::format("equivalence check: the {} design repeats input name(s) {}", side, listNames(dups)));
    seen.clear();
    for (const net::Output& o : n.outputs())
        if (!seen.insert(o.name).second) dups.push_back(o.name);
    if (!dups.empty())
        throw Error(fmt::format("equivalence check: the {} design repeats output name(s) {}", side, listNames(dups)));
}

void printTable(const ProofResult& r) {
    const ProofStats& s = r.stats;
    std::string t;
    t += fmt::format("kerf proof: {}: {} output pairs, {} inputs, {} AND nodes in the shared graph\n",
                     verdictName(r.verdict), s.outputs, s.aigInputs, s.aigNodes);
    t += fmt::format("  {:<22}{:>10}\n", "outputs settled by", "count");
    t += fmt::format("  {:<22}{:>10}   ({} identical straight after hashing)\n", "structure", s.byStructure,
                     s.byHashing);
    t += fmt::format("  {:<22}{:>10}\n", "simulation (refuted)", s.bySimulation);
    t += fmt::format("  {:<22}{:>10}\n", "SAT", s.bySat);
    t += fmt::format("  {:<22}{:>10}\n", "undecided (budget)", s.undecided);
    t += fmt::format("  internal points: {} merged, {} split by counterexample, {} left on budget\n",
                     s.internalMerged, s.internalRefuted, s.internalUndecided);
    t += fmt::format("  SAT calls {}, conflicts {}; time {:.3f} s (simulation {:.3f} s, SAT {:.3f} s)\n", s.satCalls,
                     s.conflicts, s.seconds, s.simSeconds, s.satSeconds);
    if (!r.failingOutputs.empty())
        t += fmt::format("  differing outputs: {}\n", listNames(r.failingOutputs));
    if (!r.undecidedOutputs.empty())
        t += fmt::format("  undecided outputs: {}\n", listNames(r.undecidedOutputs));
    if (!r.boundaryNote.empty()) t += "  " + r.boundaryNote + "\n";
    std::fputs(t.c_str(), stderr);
}

} // namespace

ProofResult proveEquivalent(const net::Network& a, const net::Network& b, const ProofOptions& opts,
                            const net::Network* dontCaresA) {
    auto t0 = std::chrono::steady_clock::now();
    checkUnique(a, "first");
    checkUnique(b, "second");

    std::unordered_map<std::string, std::size_t> outB;
    for (std::size_t j = 0; j < b.outputs().size(); ++j) outB.emplace(b.outputs()[j].name, j);
    std::vector<std::string> onlyA, onlyB;
    std::set<std::string> namesA;
    for (const net::Output& o : a.outputs()) {
        namesA.insert(o.name);
        if (!outB.count(o.name)) onlyA.push_back(o.name);
    }
    for (const net::Output& o : b.outputs())
        if (!namesA.count(o.name)) onlyB.push_back(o.name);
    if (!onlyA.empty() || !onlyB.empty()) {
        std::string msg = "equivalence check: the two designs have different outputs";
        if (!onlyA.empty()) msg += "; only in the first: " + listNames(onlyA);
        if (!onlyB.empty()) msg += "; only in the second: " + listNames(onlyB);
        throw Error(msg);
    }

    // One graph, inputs shared by name: first design's inputs, then the second's new ones.
    Aig g;
    for (net::NodeId id : a.inputs()) g.input(a.node(id).name);
    for (net::NodeId id : b.inputs()) g.input(b.node(id).name);
    std::vector<AigLit> litsA = g.addNetwork(a);
    std::vector<AigLit> litsB = g.addNetwork(b);
    // Don't-cares of the first design: both sides are compared under ~dc,
    // which is equal exactly when they agree wherever dc is 0.
    std::unordered_map<std::string, std::size_t> dcIndex;
    std::vector<AigLit> litsDc;
    if (dontCaresA) {
        checkUnique(*dontCaresA, "don't-care");
        for (net::NodeId id : dontCaresA->inputs()) g.input(dontCaresA->node(id).name);
        litsDc = g.addNetwork(*dontCaresA);
        for (std::size_t k = 0; k < dontCaresA->outputs().size(); ++k)
            dcIndex.emplace(dontCaresA->outputs()[k].name, k);
    }
    std::vector<std::pair<AigLit, AigLit>> pairs;
    std::vector<std::size_t> partner;
    std::vector<std::ptrdiff_t> dcOf;   // per output of a: index into litsDc, or -1
    for (std::size_t i = 0; i < a.outputs().size(); ++i) {
        std::size_t j = outB.at(a.outputs()[i].name);
        partner.push_back(j);
        auto d = dcIndex.find(a.outputs()[i].name);
        if (d == dcIndex.end()) {
            dcOf.push_back(-1);
            pairs.emplace_back(litsA[i], litsB[j]);
        } else {
            dcOf.push_back(static_cast<std::ptrdiff_t>(d->second));
            AigLit care = aigNot(litsDc[d->second]);
            pairs.emplace_back(g.andOf(litsA[i], care), g.andOf(litsB[j], care));
        }
    }

    PairsReport rep = provePairs(g, pairs, opts);
    ProofResult res;
    res.stats = rep.stats;

    std::vector<std::size_t> failing;
    for (std::size_t i = 0; i < pairs.size(); ++i) {
        if (rep.pairs[i].status == PairStatus::Different) failing.push_back(i);
        if (rep.pairs[i].status == PairStatus::Undecided) res.undecidedOutputs.push_back(a.outputs()[i].name);
    }

    // Replay every counterexample on the original networks, 64 at a time.
    auto inputWords = [&](const net::Network& n, const std::vector<std::size_t>& batch) {
        std::vector<std::uint64_t> words(n.inputs().size(), 0);
        for (std::size_t k = 0; k < n.inputs().size(); ++k) {
            std::uint32_t gi = g.inputIndex(aigNode(*g.findInput(n.node(n.inputs()[k]).name)));
            for (std::size_t t = 0; t < batch.size(); ++t)
                if (rep.pairs[batch[t]].pattern[gi]) words[k] |= std::uint64_t{1} << t;
        }
        return words;
    };
    bool firstDone = false;
    for (std::size_t start = 0; start < failing.size(); start += 64) {
        std::vector<std::size_t> batch(failing.begin() + start,
                                       failing.begin() + std::min(failing.size(), start + 64));
        std::vector<std::uint64_t> simA = net::simulate(a, inputWords(a, batch));
        std::vector<std::uint64_t> simB = net::simulate(b, inputWords(b, batch));
        std::vector<std::uint64_t> simDc;
        if (dontCaresA) simDc = net::simulate(*dontCaresA, inputWords(*dontCaresA, batch));
        for (std::size_t t = 0; t < batch.size(); ++t) {
            std::size_t i = batch[t];
            bool va = (simA[i] >> t) & 1u, vb = (simB[partner[i]] >> t) & 1u;
            bool free = dcOf[i] >= 0 && ((simDc[static_cast<std::size_t>(dcOf[i])] >> t) & 1u);
            if (va == vb || free)
                throw Error(fmt::format("equivalence check: internal error: the counterexample found for output "
                                        "'{}' does not make the designs differ when replayed",
                                        a.outputs()[i].name),
                            {}, ExitCode::Internal);
            res.failingOutputs.push_back(a.outputs()[i].name);
            if (!firstDone) {
                firstDone = true;
                Counterexample cex;
                cex.output = a.outputs()[i].name;
                cex.valueA = va;
                cex.valueB = vb;
                std::map<std::string, bool> values;
                for (const net::Network* n : {&a, &b})
                    for (net::NodeId id : n->inputs()) {
                        const std::string& name = n->node(id).name;
                        values[name] = rep.pairs[i].pattern[g.inputIndex(aigNode(*g.findInput(name)))] != 0;
                    }
                cex.inputs.assign(values.begin(), values.end());
                res.cex = std::move(cex);
            }
        }
    }

    res.verdict = !res.failingOutputs.empty()     ? Verdict::Different
                  : !res.undecidedOutputs.empty() ? Verdict::Undecided
                                                  : Verdict::Equivalent;

    // What the proof assumed.
    std::set<std::string> inA, inB;
    for (net::NodeId id : a.inputs()) inA.insert(a.node(id).name);
    for (net::NodeId id : b.inputs()) inB.insert(b.node(id).name);
    std::vector<std::string> onlyInA, onlyInB;
    std::set_difference(inA.begin(), inA.end(), inB.begin(), inB.end(), std::back_inserter(onlyInA));
    std::set_difference(inB.begin(), inB.end(), inA.begin(), inA.end(), std::back_inserter(onlyInB));
    res.boundaryNote = fmt::format("{} outputs matched by name over {} inputs matched by name", pairs.size(),
                                   g.inputs().size());
    if (!onlyInA.empty()) res.boundaryNote += "; inputs only in the first design (free): " + listNames(onlyInA);
    if (!onlyInB.empty()) res.boundaryNote += "; inputs only in the second design (free): " + listNames(onlyInB);

    res.stats.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    if (opts.verbose > 0) printTable(res);
    return res;
}

} // namespace kerf::proof
