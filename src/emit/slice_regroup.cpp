// slice_regroup.cpp — one vector's bits in an output's product, read as one comparison.
//
// A generator-style decoder ANDs a command's opcode bits with a few control signals
// (`erase = cmd_ok & op[7] & op[6] & ~op[5] & ...`). The engine shares those bits in whatever
// pairs save most gates, so the written product spreads one opcode value over several wires
// in scrambled order (`cmd_ok_nop5_nop2 & nop3_nop0 & (op[7:6] == 2'b11) & op[4] & ~op[1]`),
// where a reviewer reads `cmd_ok & (op == 8'hD0)` at once. After the engine, each output whose
// logic is one product (seen through the products it reads that name no signal of their own)
// and reads at least SliceRegroupLimits::minBits bits of one vector is rebuilt as the product
// of its other signals and one product of that vector's bits, which the writer prints as a
// comparison (`op == 8'hD0`, bits in index order). Sharing between outputs is kept where it
// reads as well: a vector product containing another's bits is built on it (`rd_fast` on
// `rd`'s opcode test, and one more bit), and a contiguous slice common to several
// (`op[7:4] == 4'h0`) is one product of its own, chosen greedily by the gates it saves
// (common-cube extraction restricted to contiguous slices of one vector; cube extraction is
// textbook multi-level synthesis, from memory). The network is kept only when it costs at most
// SliceRegroupLimits::extraGates two-input gates, or extraShare of the engine's gates, more
// than the engine's result, within the depth bound; otherwise the engine's network stays.
// A kept regroup must also survive kerf's run on its own written file (idempotence, F195):
// flows.cpp runs kerf once more on the written text and writes the engine's network when that
// run would rewrite anything (on networks above SliceRegroupLimits::checkGates, where that costs
// too much, the margin stays below --min-gain instead).
#include "kerf/emit/slice_regroup.h"

#include "kerf/passes/tidy.h"

#include <fmt/format.h>

#include <algorithm>
#include <functional>
#include <map>
#include <set>
#include <vector>

namespace kerf::emit {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;

namespace {

struct VecBit {
    std::string signal;
    int offset = 0;
};

/// One vector's bits a product reads: offset -> literal (sorted by offset).
using BitCube = std::map<int, Literal>;

Literal andOf(net::Network& net, std::vector<Literal> lits) {
    std::sort(lits.begin(), lits.end());
    lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
    if (lits.size() == 1) return lits[0];
    return makeLiteral(net.addLogic(Cover{{Cube(std::move(lits))}}), false);
}

bool contains(const BitCube& big, const BitCube& small) {
    for (const auto& [o, l] : small) {
        auto it = big.find(o);
        if (it == big.end() || it->second != l) return false;
    }
    return true;
}

} // namespace

SliceRegroupResult regroupSlices(frontend::Lowered& low, passes::FactoredNetwork& forms, int depthCap,
                                 std::size_t depthBound, passes::FactorCache* cache, const SliceRegroupLimits& limits,
                                 double maxExtra) {
    SliceRegroupResult res;
    net::Network& net = low.net;
    res.gatesBefore = forms.metrics.gates;
    // Inputs that are bits of a vector of the module (word results excluded: they are kerf's).
    std::set<std::string> results;
    for (const auto& w : low.wordOps) results.insert(w.result);
    std::map<std::string, int> bitsOf;
    for (std::size_t k = 0; k < low.inputBits.size() && k < net.inputs().size(); ++k)
        ++bitsOf[low.inputBits[k].signal];
    std::map<net::NodeId, VecBit> vecBit;
    for (std::size_t k = 0; k < low.inputBits.size() && k < net.inputs().size(); ++k) {
        const auto& b = low.inputBits[k];
        if (bitsOf[b.signal] >= 2 && !results.count(b.signal)) vecBit[net.inputs()[k]] = {b.signal, b.offset};
    }
    if (vecBit.empty()) return res;
    std::vector<std::uint8_t> drives(net.nodeCount(), 0);
    for (const auto& o : net.outputs()) drives[literalVar(o.driver)] = 1;

    auto expandable = [&](Literal l) {
        const net::NodeId v = literalVar(l);
        return !literalNegated(l) && net.isLogic(v) && !drives[v] && net.node(v).cover.size() == 1;
    };
    // The bits of vector `sig` under node v's product, expanded as the flattening below does.
    std::function<void(net::NodeId, const std::string&, std::set<int>&, std::size_t&)> under =
        [&](net::NodeId v, const std::string& sig, std::set<int>& out, std::size_t& budget) {
            if (budget == 0) return;
            --budget;
            for (Literal x : net.node(v).cover.cubes[0].lits) {
                if (expandable(x)) under(literalVar(x), sig, out, budget);
                else if (auto it = vecBit.find(literalVar(x)); it != vecBit.end() && it->second.signal == sig)
                    out.insert(it->second.offset);
            }
        };
    // Whether the `total` bits of `sig` under `root` are the literals of one product (the lowest
    // product holding all of them has them as its own literals): nothing to regroup.
    auto together = [&](net::NodeId root, const std::string& sig, std::size_t total) {
        net::NodeId at = root;
        for (int level = 0; level < 64; ++level) {
            bool direct = false;
            std::vector<std::pair<net::NodeId, std::size_t>> kids;
            for (Literal x : net.node(at).cover.cubes[0].lits) {
                if (expandable(x)) {
                    std::set<int> bits;
                    std::size_t budget = 4096;
                    under(literalVar(x), sig, bits, budget);
                    if (!bits.empty()) kids.emplace_back(literalVar(x), bits.size());
                } else if (auto it = vecBit.find(literalVar(x)); it != vecBit.end() && it->second.signal == sig) {
                    direct = true;
                }
            }
            if (!direct && kids.size() == 1 && kids[0].second == total) {
                at = kids[0].first;
                continue;
            }
            return kids.empty();
        }
        return false;
    };
    // Per output node that is one product: its leaves, the vector bits split off.
    struct Plan {
        net::NodeId node = 0;
        std::vector<Literal> rest;
        std::map<std::string, BitCube> vectors;
    };
    std::vector<Plan> plans;
    std::set<net::NodeId> planned;
    for (std::size_t k = 0; k < net.outputs().size(); ++k) {
        if (k < low.outputSources.size() && low.outputSources[k].kind == frontend::OutputKind::WordOperand) continue;
        const net::NodeId n = literalVar(net.outputs()[k].driver);
        if (!net.isLogic(n) || net.node(n).cover.size() != 1 || planned.count(n)) continue;
        std::set<Literal> leaves;
        std::vector<Literal> work(net.node(n).cover.cubes[0].lits);
        bool ok = true;
        std::size_t steps = 0;
        while (!work.empty() && ok) {
            Literal l = work.back();
            work.pop_back();
            if (++steps > 4096) ok = false;
            const net::NodeId v = literalVar(l);
            if (!literalNegated(l) && net.isLogic(v) && !drives[v] && net.node(v).cover.size() == 1) {
                for (Literal x : net.node(v).cover.cubes[0].lits) work.push_back(x);
                continue;
            }
            if (leaves.count(algebra::negateLiteral(l))) ok = false;   // constant 0: the tidy's business
            leaves.insert(l);
        }
        if (!ok) continue;
        Plan p;
        p.node = n;
        std::map<std::string, BitCube> vecs;
        for (Literal l : leaves) {
            auto it = vecBit.find(literalVar(l));
            if (it == vecBit.end()) p.rest.push_back(l);
            else vecs[it->second.signal][it->second.offset] = l;
        }
        bool scattered = false;
        for (auto& [sig, bits] : vecs) {
            if (static_cast<int>(bits.size()) >= limits.minBits) {
                scattered = scattered || !together(n, sig, bits.size());
                p.vectors[sig] = std::move(bits);
            } else {
                for (const auto& [o, l] : bits) p.rest.push_back(l);
            }
        }
        // An output whose vector bits the engine already keeps in one product of their own
        // (`sel & (addr == 4'h3)`, shared with another output) reads well as it is.
        if (p.vectors.empty() || !scattered) continue;
        planned.insert(n);
        plans.push_back(std::move(p));
    }
    if (plans.empty()) return res;

    const net::Network saved = net;
    // Built with or without products built on smaller ones (those chain, and may deepen the
    // logic past the bound); the smaller network within the bounds is kept.
    auto build = [&](bool subsets) {
        // Per vector: its distinct products, built with the sharing that reads well.
        std::map<std::string, std::map<BitCube, Literal>> built;
        std::map<std::string, std::vector<BitCube>> cubesOf;
        for (const auto& p : plans)
            for (const auto& [sig, bits] : p.vectors) cubesOf[sig].push_back(bits);
        for (auto& [sig, cubes] : cubesOf) {
            std::sort(cubes.begin(), cubes.end(),
                      [](const BitCube& a, const BitCube& b) { return a.size() != b.size() ? a.size() < b.size() : a < b; });
            cubes.erase(std::unique(cubes.begin(), cubes.end()), cubes.end());
            // A product containing a smaller one's bits is built on it (the largest such).
            std::map<BitCube, const BitCube*> base;
            std::vector<BitCube> roots;
            for (std::size_t i = 0; i < cubes.size(); ++i) {
                const BitCube* best = nullptr;
                for (std::size_t j = 0; j < i; ++j)
                    if (cubes[j].size() < cubes[i].size() && contains(cubes[i], cubes[j]) &&
                        (!best || cubes[j].size() > best->size()))
                        best = &cubes[j];
                if (best && subsets) base[cubes[i]] = best;
                else roots.push_back(cubes[i]);
            }
            // Contiguous slices common to several roots: one product each, greedily by gates saved.
            std::vector<BitCube> left = roots;            // bits not yet in a slice
            std::vector<std::vector<Literal>> parts(roots.size());   // slices taken, per root
            for (int round = 0; round < 64; ++round) {
                BitCube bestRun;
                long bestScore = 0;
                for (std::size_t i = 0; i < left.size(); ++i)
                    for (std::size_t j = i + 1; j < left.size(); ++j) {
                        BitCube run;
                        auto flush = [&]() {
                            if (run.size() >= 2) {
                                long count = 0;
                                for (const auto& c : left) count += contains(c, run) ? 1 : 0;
                                long score = static_cast<long>(run.size() - 1) * (count - 1);
                                if (score > bestScore) bestScore = score, bestRun = run;
                            }
                            run.clear();
                        };
                        int prev = -2;
                        for (const auto& [o, l] : left[i]) {
                            auto it = left[j].find(o);
                            if (it == left[j].end() || it->second != l) {
                                flush();
                                prev = -2;
                                continue;
                            }
                            if (o != prev + 1) flush();
                            run[o] = l;
                            prev = o;
                        }
                        flush();
                    }
                if (bestScore < limits.minSliceGain) break;
                std::vector<Literal> lits;
                for (const auto& [o, l] : bestRun) lits.push_back(l);
                const Literal slice = andOf(net, lits);
                for (std::size_t i = 0; i < left.size(); ++i)
                    if (contains(left[i], bestRun)) {
                        for (const auto& [o, l] : bestRun) left[i].erase(o);
                        parts[i].push_back(slice);
                    }
            }
            auto& made = built[sig];
            for (std::size_t i = 0; i < roots.size(); ++i) {
                std::vector<Literal> lits = parts[i];
                for (const auto& [o, l] : left[i]) lits.push_back(l);
                made[roots[i]] = andOf(net, lits);
            }
            for (const auto& c : cubes) {
                auto b = base.find(c);
                if (b == base.end()) continue;
                std::vector<Literal> lits{made.at(*b->second)};
                for (const auto& [o, l] : c)
                    if (!b->second->count(o)) lits.push_back(l);
                made[c] = andOf(net, lits);
            }
        }
        // A vector product one output alone reads is part of that output's product (one AND,
        // balanced by arrival: no level of its own); the printer writes its bits as comparisons.
        std::map<net::NodeId, int> uses;
        for (const auto& p : plans)
            for (const auto& [sig, bits] : p.vectors) ++uses[literalVar(built.at(sig).at(bits))];
        for (const auto& [sig, made] : built)
            for (const auto& [bits, l] : made)
                if (net.isLogic(literalVar(l)) && literalVar(l) >= saved.nodeCount())
                    for (Literal x : net.node(literalVar(l)).cover.cubes[0].lits) ++uses[literalVar(x)];
        for (const auto& p : plans) {
            std::vector<Literal> lits = p.rest;
            for (const auto& [sig, bits] : p.vectors) {
                const Literal l = built.at(sig).at(bits);
                const net::NodeId v = literalVar(l);
                if (v >= saved.nodeCount() && net.isLogic(v) && uses[v] == 1)
                    for (Literal x : net.node(v).cover.cubes[0].lits) lits.push_back(x);
                else
                    lits.push_back(l);
            }
            std::sort(lits.begin(), lits.end());
            lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
            net.node(p.node).cover = Cover{{Cube(std::move(lits))}};
        }
        passes::tidy(net);
        return passes::factorNetwork(net, depthCap, cache);
    };
    double margin = std::max(static_cast<double>(limits.extraGates),
                             limits.extraShare * static_cast<double>(res.gatesBefore));
    if (maxExtra >= 0) margin = std::min(margin, maxExtra);
    const std::size_t depthMax = std::max(depthBound, static_cast<std::size_t>(forms.metrics.depth));
    auto within = [&](const passes::FactoredNetwork& f) {
        return f.metrics.depth <= depthMax &&
               static_cast<double>(f.metrics.gates) <= static_cast<double>(res.gatesBefore) + margin;
    };
    passes::FactoredNetwork f = build(true);
    net::Network chained = net;
    net = saved;
    passes::FactoredNetwork g = build(false);
    const bool useF = within(f) && (!within(g) || f.metrics.gates < g.metrics.gates ||
                                    (f.metrics.gates == g.metrics.gates && f.metrics.depth <= g.metrics.depth));
    if (useF) {
        net = std::move(chained);
        g = std::move(f);
    }
    f = std::move(g);
    res.outputs = plans.size();
    res.gatesAfter = f.metrics.gates;
    res.depthAfter = f.metrics.depth;
    res.kept = within(f);
    res.text = fmt::format("slices: {} output product{} with one vector's bits regrouped: {} -> {} gates, depth {} "
                           "(margin {:.0f} gates, depth bound {}): {}",
                           plans.size(), plans.size() == 1 ? "" : "s", res.gatesBefore, res.gatesAfter,
                           res.depthAfter, margin, depthBound, res.kept ? "kept" : "the engine's network stays");
    if (res.kept) forms = std::move(f);
    else net = saved;
    return res;
}

} // namespace kerf::emit
