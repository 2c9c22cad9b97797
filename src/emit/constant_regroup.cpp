// constant_regroup.cpp — comparisons with named constants rebuilt as one product each (F346).
//
// A decoder over named constants (`case (op) OP_ADD: ...`, `unique case (csr_addr)` over a
// package's addresses) comes out of the engine with each value test spread over shared
// two-bit pieces (`nop3_nop0 & op_2_1_is_00`), which no printing can name: the constants then
// survive only in the unused-signal wire, and the group is kept as written (flows.cpp). This
// step, run only for such a module, finds each node whose function is one product (seen through
// the products it reads, and sums of single literals read inverted) containing a comparison the
// printer writes by a constant's name — the bits of one vector the source compared with the
// constant, all as in the constant: the whole constant (`op == OP_ADD`), or a leading slice of
// at least 4 bits of one of at least 6 (`csr_addr[11:4] == CSR_MSTATUS[11:4]`, expression.cpp
// `constantName`). A node that is exactly such a comparison becomes one product of those bits,
// built on a smaller such comparison it reads (`is_CSR_MSTATUS_11_4 & (csr_addr[3:2] == 2'b00)`);
// a node with more in its product reads the comparison as a node of its own (one per distinct
// comparison) beside the rest of its literals. Pieces no longer read are removed by the tidy.
// When no node that is one product holds such a comparison, a node of which only some literals
// are products is taken too (F357: a choice beside `csr_addr[11:7] == CSR_MTVEC[11:7]`): the
// others stand beside the comparison. When the comparisons found are nodes of their own
// already, the network stands as it is.
// The network is kept when its gates stay at most the caller's bound (below the logic as
// written by the --min-gain margin: otherwise keeping the statements as written is as good)
// and its depth within the bound; otherwise the engine's network stays.
#include "kerf/emit/constant_regroup.h"

#include "kerf/passes/tidy.h"

#include <fmt/format.h>

#include <algorithm>
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

/// Shortest leading slice named by the constant (expression.cpp `constantName`), and the
/// shortest constant whose leading slices are named.
constexpr int kMinSliceBits = 4;
constexpr int kMinSlicedWidth = 6;
/// Leaves followed under one node (a comparison is at most this wide).
constexpr std::size_t kMaxLeaves = 64;

} // namespace

ConstantRegroupResult regroupNamedConstants(frontend::Lowered& low, const frontend::ModuleDesc& desc,
                                            passes::FactoredNetwork& forms, int depthCap, std::size_t depthBound,
                                            passes::FactorCache* cache, double maxGates) {
    ConstantRegroupResult res;
    net::Network& net = low.net;
    res.gatesBefore = forms.metrics.gates;
    // Network inputs that are bits of a signal some constant was compared with.
    std::set<std::string> compared;
    for (const auto& c : desc.constants)
        for (const auto& k : c.compared) compared.insert(k.signal);
    std::map<net::NodeId, frontend::BitRef> bitOf;
    for (std::size_t k = 0; k < low.inputBits.size() && k < net.inputs().size(); ++k)
        if (compared.count(low.inputBits[k].signal)) bitOf[net.inputs()[k]] = low.inputBits[k];
    if (bitOf.empty()) return res;

    // The function of literal l as one product of input bits (input node -> positive), through
    // products and, under an inversion, sums of single literals. False when it is none.
    std::function<bool(Literal, std::map<net::NodeId, bool>&)> product = [&](Literal l,
                                                                              std::map<net::NodeId, bool>& leaves) {
        const net::NodeId v = literalVar(l);
        const bool neg = literalNegated(l);
        if (!net.isLogic(v)) {
            if (v == 0 || net.node(v).kind != net::NodeKind::Input) return false;
            auto [it, fresh] = leaves.emplace(v, !neg);
            return (fresh || it->second == !neg) && leaves.size() <= kMaxLeaves;
        }
        const Cover& c = net.node(v).cover;
        if (c.cubes.empty()) return false;
        if (!neg) {
            if (c.size() != 1) return false;
            for (Literal x : c.cubes[0].lits)
                if (!product(x, leaves)) return false;
            return !c.cubes[0].lits.empty();
        }
        for (const auto& cube : c.cubes)
            if (cube.lits.size() != 1 || !product(algebra::negateLiteral(cube.lits[0]), leaves)) return false;
        return true;
    };
    // The comparison the printer names that the product `leaves` contains (the constant's index,
    // and the leaves it takes: the bits of one vector the source compared with the constant, the
    // whole constant or a leading slice); the rest of the product is other literals.
    auto namedIn = [&](const std::map<net::NodeId, bool>& leaves, std::map<net::NodeId, bool>& part) -> int {
        std::map<std::string, std::map<int, std::pair<net::NodeId, bool>>> bySignal;   // offset -> leaf
        for (const auto& [v, pos] : leaves)
            if (auto it = bitOf.find(v); it != bitOf.end()) bySignal[it->second.signal][it->second.offset] = {v, pos};
        int best = -1;
        for (std::size_t ci = 0; ci < desc.constants.size(); ++ci) {
            const auto& c = desc.constants[ci];
            for (const auto& k : c.compared) {
                auto sig = bySignal.find(k.signal);
                if (sig == bySignal.end() || k.constLo != 0 || k.hi - k.lo + 1 != c.width()) continue;
                // The longest run of bits from k.hi down that the product has, all as in the constant.
                int lo = k.hi + 1;
                while (lo - 1 >= k.lo) {
                    auto b = sig->second.find(lo - 1);
                    if (b == sig->second.end() || b->second.second != c.bit(lo - 1 - k.lo)) break;
                    --lo;
                }
                const int len = k.hi - lo + 1;
                const bool whole = lo == k.lo && len >= 2;
                const bool slice = c.sliceable && c.width() >= kMinSlicedWidth && len >= kMinSliceBits;
                if (!whole && !slice) continue;
                if (best >= 0 && static_cast<int>(part.size()) >= len) continue;
                part.clear();
                for (int o = lo; o <= k.hi; ++o) part.emplace(sig->second.at(o).first, sig->second.at(o).second);
                best = static_cast<int>(ci);
            }
        }
        return best;
    };

    const net::Network saved = net;
    std::map<net::NodeId, std::map<net::NodeId, bool>> matched;   // node -> its comparison's leaves
    std::map<std::map<net::NodeId, bool>, net::NodeId> nodeOf;      // a comparison's leaves -> its node
    std::set<int> named;
    auto productOf = [&](const std::map<net::NodeId, bool>& leaves) {
        std::vector<Literal> lits;
        for (const auto& [v, pos] : leaves) lits.push_back(makeLiteral(v, !pos));
        std::sort(lits.begin(), lits.end());
        return lits;
    };
    // One pass over the network. A node qualifies when its function is one product of input
    // bits; with `besideOthers`, also when only some of its literals are (F357: `sel &
    // (csr_addr[11:7] == CSR_MTVEC[11:7]) & ...`, where `sel` is a choice): those give the
    // leaves, and the others stand beside the comparison unchanged.
    auto rebuild = [&](bool besideOthers) {
        for (net::NodeId n : net.topoOrder()) {
            if (n >= saved.nodeCount()) continue;   // made here
            const Cover c = net.node(n).cover;   // a copy: addLogic below may move the nodes
            if (c.size() != 1) continue;
            std::map<net::NodeId, bool> leaves, part;
            std::vector<Literal> opaque;
            if (!besideOthers) {
                if (!product(makeLiteral(n, false), leaves)) continue;
            } else {
                for (Literal x : c.cubes[0].lits) {
                    std::map<net::NodeId, bool> more = leaves;
                    if (product(x, more)) leaves = std::move(more);
                    else opaque.push_back(x);
                }
                if (leaves.empty()) continue;
            }
            const int ci = namedIn(leaves, part);
            if (ci < 0) continue;
            named.insert(ci);
            std::vector<Literal> lits = opaque;
            if (part.size() == leaves.size() && opaque.empty()) {
                // The node is the comparison: built on the largest comparison already made that it
                // reads directly.
                net::NodeId base = 0;
                for (Literal x : c.cubes[0].lits) {
                    auto it = matched.find(literalVar(x));
                    if (literalNegated(x) || it == matched.end()) continue;
                    if (base == 0 || it->second.size() > matched.at(base).size()) base = literalVar(x);
                }
                if (base != 0) lits.push_back(makeLiteral(base, false));
                for (const auto& [v, pos] : leaves)
                    if (base == 0 || !matched.at(base).count(v)) lits.push_back(makeLiteral(v, !pos));
                matched[n] = leaves;
                nodeOf.emplace(leaves, n);
            } else {
                // The comparison and the product's other literals.
                net::NodeId cmp = 0;
                if (auto it = nodeOf.find(part); it != nodeOf.end()) cmp = it->second;
                else {
                    cmp = net.addLogic(Cover{{Cube(productOf(part))}});
                    nodeOf.emplace(part, cmp);
                    matched[cmp] = part;
                }
                lits.push_back(makeLiteral(cmp, false));
                for (const auto& [v, pos] : leaves)
                    if (!part.count(v)) lits.push_back(makeLiteral(v, !pos));
            }
            std::sort(lits.begin(), lits.end());
            std::vector<Literal> now = c.cubes[0].lits;
            std::sort(now.begin(), now.end());
            if (now == lits) continue;
            net.node(n).cover = Cover{{Cube(std::move(lits))}};
            ++res.nodes;
        }
    };
    // Nodes that are one product first, as F346 made them; when that names no constant, the
    // products with other literals beside (the result of the first pass kept where it names one:
    // rv_csr_decode's comparisons stay as they were).
    rebuild(false);
    if (named.empty()) {
        net = saved;
        matched.clear();
        nodeOf.clear();
        res.nodes = 0;
        rebuild(true);
    }
    for (std::size_t ci = 0; ci < desc.constants.size(); ++ci)
        if (named.count(static_cast<int>(ci))) res.constants.push_back(desc.constants[ci].name);
    if (res.nodes == 0) {
        net = saved;
        // The comparisons found are products of their own already (the slice regroup wrote
        // `csr_addr[11:7] == CSR_MTVEC[11:7]` into an output's product): the caller keeps this
        // network rather than the engine's, which names none of them (F357).
        const std::size_t depthMax = std::max(depthBound, static_cast<std::size_t>(forms.metrics.depth));
        res.gatesAfter = forms.metrics.gates;
        res.depthAfter = forms.metrics.depth;
        res.namedAsIs = !res.constants.empty() && forms.metrics.depth <= depthMax &&
                        static_cast<double>(forms.metrics.gates) <= maxGates;
        std::string list;
        for (const std::string& c : res.constants) list += (list.empty() ? "" : ", ") + c;
        if (!res.constants.empty())
            res.text = fmt::format("named constants: the network's products already hold the comparisons with {}: "
                                   "{} gates, depth {} (bounds {:.0f} gates, depth {}): {}",
                                   list, res.gatesAfter, res.depthAfter, maxGates, depthMax,
                                   res.namedAsIs ? "kept" : "the engine's network stays");
        return res;
    }
    passes::tidy(net);
    passes::FactoredNetwork f = passes::factorNetwork(net, depthCap, cache);
    const std::size_t depthMax = std::max(depthBound, static_cast<std::size_t>(forms.metrics.depth));
    res.gatesAfter = f.metrics.gates;
    res.depthAfter = f.metrics.depth;
    res.kept = f.metrics.depth <= depthMax && static_cast<double>(f.metrics.gates) <= maxGates;
    res.text = fmt::format("named constants: {} comparison{} rebuilt by the constants' bits: {} -> {} gates, depth {} "
                           "(bounds {:.0f} gates, depth {}): {}",
                           res.nodes, res.nodes == 1 ? "" : "s", res.gatesBefore, res.gatesAfter, res.depthAfter,
                           maxGates, depthMax, res.kept ? "kept" : "the engine's network stays");
    if (res.kept) forms = std::move(f);
    else net = saved;
    return res;
}

} // namespace kerf::emit
