// proof_bench.cpp — scale benchmark of the equivalence checker on a large
// synthetic decoder: the same set of product terms built two ways and
// proved equal, and a mutant of one side refuted.
//
// The decoder is an invented instruction-decode style table: 48 input bits
// in eight 6-bit fields; every term fixes the first field (an "opcode"),
// usually part of the second, and a few of the others, with some bits left
// free. Each of the outputs is the OR of a share of the terms.
//   flat    one sum-of-products node per output, every term over the inputs
//   prefix  terms built as a trie: each term extends a shared node for its
//           prefix by one literal (shared-prefix structure)
//   factor  each output factored by opcode: opcode * (sum of the rests)
// Prints proof time and how the outputs were settled. Figures only; no
// pass/fail threshold (performance is judged by reading them).
//
// Usage: proof_bench [--terms N] [--outputs K] [--seed S] [--structure prefix|factor|both]
//                    [--no-sweep] [--var-limit V] [--mutant] [--verbose]
#include "kerf/network/network.h"
#include "kerf/proof/equivalence.h"
#include "kerf/proof/simulation.h"

#include <algorithm>
#include <bit>
#include <chrono>
#include <ctime>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <map>
#include <set>
#include <string>
#include <vector>

using namespace kerf;
using algebra::Literal;
using algebra::makeLiteral;
using net::Cover;
using net::Cube;
using net::Network;
using net::NodeId;

namespace {

constexpr int kInputs = 48;
constexpr int kFieldBits = 6;
constexpr int kFields = kInputs / kFieldBits;

struct Term {
    std::vector<std::pair<int, bool>> lits;  // (input index, complemented), ascending by input
    std::vector<int> outputs;
};

Cube makeCube(std::vector<Literal> lits) {
    std::sort(lits.begin(), lits.end());
    Cube c;
    c.lits = std::move(lits);
    return c;
}

std::vector<Term> makeTerms(std::size_t count, int outputs, std::uint64_t seed) {
    proof::Random rng(seed);
    // Per opcode, a few favourite values of field 1 so that prefixes repeat.
    std::vector<std::vector<unsigned>> favourite(64);
    for (auto& f : favourite)
        for (int k = 0; k < 6; ++k) f.push_back(static_cast<unsigned>(rng.next() % 64));
    std::set<std::vector<std::pair<int, bool>>> seen;
    std::vector<Term> terms;
    auto addField = [&](Term& t, int field, unsigned value, unsigned dcPercent) {
        for (int b = 0; b < kFieldBits; ++b) {
            if (rng.next() % 100 < dcPercent) continue;
            t.lits.push_back({field * kFieldBits + b, ((value >> b) & 1u) == 0});
        }
    };
    while (terms.size() < count) {
        Term t;
        unsigned opcode = static_cast<unsigned>(rng.next() % 64);
        addField(t, 0, opcode, 0);
        if (rng.next() % 100 < 85) addField(t, 1, favourite[opcode][rng.next() % 6], 15);
        for (int f = 2; f < kFields; ++f)
            if (rng.next() % 100 < 25) addField(t, f, static_cast<unsigned>(rng.next() % 64), 35);
        if (!seen.insert(t.lits).second) continue;
        t.outputs.push_back(static_cast<int>(rng.next() % outputs));
        if (rng.next() % 100 < 30) {
            int o2 = static_cast<int>(rng.next() % outputs);
            if (o2 != t.outputs[0]) t.outputs.push_back(o2);
        }
        terms.push_back(std::move(t));
    }
    return terms;
}

std::vector<NodeId> addInputs(Network& n) {
    std::vector<NodeId> x;
    for (int i = 0; i < kInputs; ++i) x.push_back(n.addInput("x[" + std::to_string(i) + "]"));
    return x;
}

std::string outName(int o) { return "y[" + std::to_string(o) + "]"; }

Network buildFlat(const std::vector<Term>& terms, int outputs) {
    Network n;
    auto x = addInputs(n);
    std::vector<Cover> covers(outputs);
    for (const Term& t : terms) {
        std::vector<Literal> lits;
        for (auto [i, c] : t.lits) lits.push_back(makeLiteral(x[i], c));
        Cube cb = makeCube(lits);
        for (int o : t.outputs) covers[o].cubes.push_back(cb);
    }
    for (int o = 0; o < outputs; ++o) n.addOutput(outName(o), makeLiteral(n.addLogic(covers[o]), false));
    return n;
}

Network buildPrefix(const std::vector<Term>& terms, int outputs) {
    Network n;
    auto x = addInputs(n);
    std::map<std::pair<Literal, Literal>, Literal> trie;  // (prefix literal, next literal) -> node literal
    std::vector<Cover> covers(outputs);
    for (const Term& t : terms) {
        Literal acc = makeLiteral(x[t.lits[0].first], t.lits[0].second);
        for (std::size_t k = 1; k < t.lits.size(); ++k) {
            Literal l = makeLiteral(x[t.lits[k].first], t.lits[k].second);
            auto [it, inserted] = trie.try_emplace({acc, l}, 0);
            if (inserted) it->second = makeLiteral(n.addLogic(Cover{{makeCube({acc, l})}}), false);
            acc = it->second;
        }
        for (int o : t.outputs) covers[o].cubes.push_back(makeCube({acc}));
    }
    for (int o = 0; o < outputs; ++o) n.addOutput(outName(o), makeLiteral(n.addLogic(covers[o]), false));
    return n;
}

Network buildFactor(const std::vector<Term>& terms, int outputs) {
    Network n;
    auto x = addInputs(n);
    // Per output and opcode: the rests of the terms (literals after field 0).
    std::vector<std::map<std::vector<Literal>, Cover>> groups(outputs);
    for (const Term& t : terms) {
        std::vector<Literal> head, rest;
        for (auto [i, c] : t.lits) (i < kFieldBits ? head : rest).push_back(makeLiteral(x[i], c));
        for (int o : t.outputs) groups[o][head].cubes.push_back(makeCube(rest));
    }
    for (int o = 0; o < outputs; ++o) {
        Cover top;
        for (auto& [head, rests] : groups[o]) {
            NodeId r = n.addLogic(rests);
            std::vector<Literal> lits = head;
            lits.push_back(makeLiteral(r, false));
            top.cubes.push_back(makeCube(lits));
        }
        n.addOutput(outName(o), makeLiteral(n.addLogic(top), false));
    }
    return n;
}

/// Add one full minterm (all 48 inputs) to one output of `src`, chosen where
/// the reference `ref` has that output 0: the two then differ on exactly one
/// of 2^48 assignments, out of reach of random simulation.
Network mutate(const Network& src, const Network& ref, std::uint64_t seed) {
    Network n = src;
    proof::Random rng(seed);
    std::size_t o = rng.next() % n.outputs().size();
    std::vector<std::uint64_t> in(kInputs);
    for (;;) {
        for (auto& x : in) x = rng.next();
        std::uint64_t v = net::simulate(ref, in)[o];
        if (~v == 0) continue;
        unsigned bit = static_cast<unsigned>(std::countr_zero(~v));
        std::vector<Literal> lits;
        for (int i = 0; i < kInputs; ++i) lits.push_back(makeLiteral(n.inputs()[i], ((in[i] >> bit) & 1u) == 0));
        NodeId m = n.addLogic(Cover{{makeCube(lits)}});
        Literal old = n.outputs()[o].driver;
        n.outputs()[o].driver = makeLiteral(n.addLogic(Cover{{makeCube({old}), makeCube({makeLiteral(m, false)})}}), false);
        return n;
    }
}

void report(const char* label, const net::Network& a, const net::Network& b, const proof::ProofOptions& opts) {
    auto ma = net::measure(a), mb = net::measure(b);
    auto t0 = std::chrono::steady_clock::now();
    std::clock_t c0 = std::clock();
    proof::ProofResult r = proof::proveEquivalent(a, b, opts);
    double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    double cpu = static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC;
    const auto& s = r.stats;
    double n = static_cast<double>(std::max<std::size_t>(s.outputs, 1));
    std::printf("%s\n", label);
    std::printf("  sides: %zu vs %zu SOP nodes, %zu vs %zu literals; shared graph %zu AND nodes\n", ma.nodes, mb.nodes,
                ma.literals, mb.literals, s.aigNodes);
    std::printf("  verdict: %s in %.2f s wall, %.2f s CPU (simulation %.2f s, SAT %.2f s wall; %zu SAT calls, "
                "%lld conflicts)\n",
                proof::verdictName(r.verdict), secs, cpu, s.simSeconds, s.satSeconds, s.satCalls,
                static_cast<long long>(s.conflicts));
    std::printf("  outputs %zu: structure %.1f%% (hashing alone %.1f%%), simulation %.1f%%, SAT %.1f%%, "
                "undecided %.1f%%\n",
                s.outputs, 100.0 * s.byStructure / n, 100.0 * s.byHashing / n, 100.0 * s.bySimulation / n,
                100.0 * s.bySat / n, 100.0 * s.undecided / n);
    std::printf("  internal points: %zu merged, %zu split (%zu by justified patterns, no SAT), %zu left on budget; "
                "%zu SAT solver instances, %zu pattern words re-simulated\n",
                s.internalMerged, s.internalRefuted, s.internalJustified, s.internalUndecided, s.solvers,
                s.patternFolds);
    if (r.cex) std::printf("  counterexample on %s (replayed on both networks)\n", r.cex->output.c_str());
    std::fflush(stdout);
}

} // namespace

int main(int argc, char** argv) {
    std::size_t terms = 100000;
    int outputs = 128;
    std::uint64_t seed = 1;
    std::string structure = "both";
    bool mutant = false;
    proof::ProofOptions opts;
    for (int i = 1; i < argc; ++i) {
        std::string a = argv[i];
        auto next = [&]() -> const char* {
            if (i + 1 >= argc) {
                std::fprintf(stderr, "missing value after %s\n", a.c_str());
                std::exit(2);
            }
            return argv[++i];
        };
        if (a == "--terms") terms = std::strtoull(next(), nullptr, 10);
        else if (a == "--outputs") outputs = std::atoi(next());
        else if (a == "--seed") seed = std::strtoull(next(), nullptr, 10);
        else if (a == "--structure") structure = next();
        else if (a == "--no-sweep") opts.sweepInternal = false;
        else if (a == "--var-limit") opts.solverVarLimit = std::atoi(next());
        else if (a == "--mutant") mutant = true;
        else if (a == "--verbose") opts.verbose = 2;
        else {
            std::fprintf(stderr, "usage: proof_bench [--terms N] [--outputs K] [--seed S] "
                                 "[--structure prefix|factor|both] [--no-sweep] [--var-limit V] [--mutant] [--verbose]\n");
            return 2;
        }
    }
    auto t0 = std::chrono::steady_clock::now();
    std::vector<Term> ts = makeTerms(terms, outputs, seed);
    Network flat = buildFlat(ts, outputs);
    double build = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    std::size_t lits = 0;
    for (const Term& t : ts) lits += t.lits.size();
    std::printf("decoder: %zu terms over %d inputs (%.1f literals per term), %d outputs; built in %.2f s\n",
                ts.size(), kInputs, static_cast<double>(lits) / ts.size(), outputs, build);
    if (structure == "prefix" || structure == "both") {
        Network b = buildPrefix(ts, outputs);
        report("flat SOP vs shared-prefix trie:", flat, b, opts);
        if (mutant) report("flat SOP vs mutated shared-prefix trie:", flat, mutate(b, flat, seed), opts);
    }
    if (structure == "factor" || structure == "both") {
        Network b = buildFactor(ts, outputs);
        report("flat SOP vs factored by opcode:", flat, b, opts);
        if (mutant) report("flat SOP vs mutated factored form:", flat, mutate(b, flat, seed), opts);
    }
    return 0;
}
