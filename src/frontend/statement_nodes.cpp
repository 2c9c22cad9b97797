// statement_nodes.cpp — one network node per written expression.
//
// The lowering makes a node for every operator (`(a | b) & c` is an OR node read by an
// AND node), but a written expression is one piece of logic: its figures are those of
// one node whose sum of products is the expression multiplied out, measured on its
// factored form — which is exactly how the engine counts the node the writer printed
// that expression from (the writer prints a node's factored form inline, with its slice
// comparisons, `?:` and `^` shapes; F42). So a node that nothing but one place of one
// other node reads, and that names no signal (every signal bit is an output of the
// network unless internal signals are dissolved), is substituted into its reader:
// the cube reading it is multiplied by its cover, or by the complement of its cover
// when read inverted (De Morgan, the complement multiplied out as a product of sums).
// This is node elimination, the collapsing step of multi-level synthesis (R. K. Brayton,
// R. Rudell, A. Sangiovanni-Vincentelli, A. R. Wang, "MIS: A Multiple-Level Logic
// Optimization System", IEEE Trans. CAD 6(6), 1987, from memory), applied only where the
// text had no node boundary. A substitution that would give its reader more than
// `maxCubes` cubes, or more two-input gates than the two nodes apart, is not made (the
// node stays): the figures then count it apart.
#include "kerf/frontend/lower.h"

#include <algorithm>

namespace kerf::frontend {

namespace {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::negateLiteral;

/// The cubes of `a × b` (contradictory products dropped); false when more than `limit`.
bool product(const Cover& a, const Cover& b, std::size_t limit, Cover& out) {
    out.cubes.clear();
    std::vector<Literal> lits;
    for (const Cube& x : a.cubes)
        for (const Cube& y : b.cubes) {
            lits.clear();
            std::set_union(x.lits.begin(), x.lits.end(), y.lits.begin(), y.lits.end(), std::back_inserter(lits));
            bool contradictory = false;
            for (std::size_t i = 1; i < lits.size() && !contradictory; ++i)
                contradictory = lits[i] == negateLiteral(lits[i - 1]);
            if (contradictory) continue;
            Cube c;
            c.lits = lits;
            out.cubes.push_back(std::move(c));
            if (out.cubes.size() > limit * 4) return false;
        }
    out.normalize();
    algebra::removeContainedCubes(out);
    return out.cubes.size() <= limit;
}

/// The complement of `f` as a product of sums multiplied out: Π over cubes of (Σ ~literal).
bool complement(const Cover& f, std::size_t limit, Cover& out) {
    out.cubes.assign(1, Cube{});   // the constant 1
    Cover next, sum;
    for (const Cube& c : f.cubes) {
        sum.cubes.clear();
        for (Literal l : c.lits) {
            Cube one;
            one.lits = {negateLiteral(l)};
            sum.cubes.push_back(std::move(one));
        }
        if (!product(out, sum, limit, next)) return false;
        std::swap(out, next);
    }
    return true;
}

std::size_t formGates(const algebra::Factored& f) {
    using K = algebra::Factored::Kind;
    if (f.kind != K::And && f.kind != K::Or) return 0;
    std::size_t g = f.kids.size() > 1 ? f.kids.size() - 1 : 0;
    for (const auto& k : f.kids) g += formGates(k);
    return g;
}

/// Two-input gates of the smallest of the forms the figures choose from (passes/factored.cpp:
/// the sum of products, and the two factored forms up to a thousand cubes).
std::size_t coverGates(const Cover& f) {
    std::size_t g = formGates(algebra::sumOfProducts(f));
    if (f.cubes.size() <= 1000) {
        algebra::Factored q = algebra::factor(f, algebra::FactorMethod::Quick);
        g = std::min({g, formGates(q), formGates(algebra::factorBest(f, q))});
    }
    return g;
}

} // namespace

std::size_t collapseExpressionNodes(net::Network& net, std::size_t maxCubes) {
    const std::size_t n = net.nodeCount();
    // Occurrences of each node's literals in logic nodes, and the last reader seen.
    std::vector<std::uint32_t> uses(n, 0);
    std::vector<net::NodeId> reader(n, 0);
    for (net::NodeId u = 0; u < n; ++u) {
        if (!net.isLogic(u)) continue;
        for (const Cube& c : net.node(u).cover.cubes)
            for (Literal l : c.lits) ++uses[literalVar(l)], reader[literalVar(l)] = u;
    }
    const std::vector<std::uint32_t> outRefs = net.outputRefs();
    // coverGates of each node's cover, once known: a chain `t1 | t2 | ... | tN` merges into
    // one growing node, whose gates the next step would otherwise factor again (quadratic
    // in N; on a generated 390-product sum this was most of the lowering's time).
    constexpr std::size_t kUnknown = static_cast<std::size_t>(-1);
    std::vector<std::size_t> gatesOf(n, kUnknown);
    auto gates = [&](net::NodeId u) {
        if (gatesOf[u] == kUnknown) gatesOf[u] = coverGates(net.node(u).cover);
        return gatesOf[u];
    };
    std::size_t merged = 0;
    Cover sub, part, rebuilt;
    // Fanins first: a node carries its own substituted fanins into its reader.
    for (net::NodeId v : net.topoOrder()) {
        if (uses[v] != 1 || outRefs[v] != 0) continue;
        net::NodeId p = reader[v];
        Cover& pc = net.node(p).cover;
        auto at = std::find_if(pc.cubes.begin(), pc.cubes.end(), [&](const Cube& c) {
            return std::any_of(c.lits.begin(), c.lits.end(), [&](Literal l) { return literalVar(l) == v; });
        });
        if (at == pc.cubes.end()) continue;
        Literal l = *std::find_if(at->lits.begin(), at->lits.end(), [&](Literal x) { return literalVar(x) == v; });
        const Cover& vc = net.node(v).cover;
        if (literalNegated(l)) {
            if (!complement(vc, maxCubes, sub)) continue;
        } else {
            sub = vc;
        }
        Cover rest;
        Cube restCube;
        for (Literal x : at->lits)
            if (x != l) restCube.lits.push_back(x);
        rest.cubes.push_back(std::move(restCube));
        if (!product(rest, sub, maxCubes, part)) continue;
        rebuilt.cubes.clear();
        for (auto it = pc.cubes.begin(); it != pc.cubes.end(); ++it)
            if (it != at) rebuilt.cubes.push_back(*it);
        for (const Cube& c : part.cubes) rebuilt.cubes.push_back(c);
        rebuilt.normalize();
        algebra::removeContainedCubes(rebuilt);
        if (rebuilt.cubes.size() > std::max(maxCubes, pc.cubes.size())) continue;
        // Only where one node is no larger than the two: written text the engine printed from
        // one node always is (its form multiplied out factors back at least as small), while an
        // author's nesting can be smaller than any factoring of its product.
        const std::size_t rebuiltGates = coverGates(rebuilt);
        if (rebuiltGates > gates(p) + gates(v)) continue;
        // v's fanins are now read by p.
        for (const Cube& c : vc.cubes)
            for (Literal x : c.lits) reader[literalVar(x)] = p;
        pc = rebuilt;
        gatesOf[p] = rebuiltGates;
        uses[v] = 0;
        ++merged;
    }
    if (merged) net.removeUnreachable();
    return merged;
}

} // namespace kerf::frontend
