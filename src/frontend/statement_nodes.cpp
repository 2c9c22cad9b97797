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
// `maxCubes` cubes, or more two-input gates than the two nodes apart, or a later arrival than
// both the two apart and the network's depth allow (F85), is not made (the node stays): the
// figures then count it apart. Factoring is what those figures cost, and a
// long sum `t1 | ... | tN` merges one operand at a time into one growing node (F76). A merge
// that multiplies nothing out (the two nodes' factored forms put together are then a form of
// the merged node with the gates of the two apart) is made without factoring above
// `factorCubes` cubes, the growing node taking its operands' cubes in place, tidied (sorted,
// contained cubes dropped) once when finished; a merge that multiplies out is not made above
// `multiplyCubes` cubes.
#include "kerf/frontend/lower.h"

#include <algorithm>
#include <climits>

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

/// Two-input gates of the smallest of the forms the figures choose from (passes/factored.cpp:
/// the sum of products, and the two factored forms up to a thousand cubes).
std::size_t coverGates(const Cover& f) {
    std::size_t g = algebra::sumOfProducts(f).gateCount();
    if (f.cubes.size() <= 1000) {
        algebra::Factored q = algebra::factor(f, algebra::FactorMethod::Quick);
        g = std::min({g, q.gateCount(), algebra::factorBest(f, q).gateCount()});
    }
    return g;
}

/// Figures of a cover as the figures count it (passes/factored.cpp): the two-input gates of
/// the smallest of its forms (the sum of products, and the two factored forms up to a
/// thousand cubes), and the earliest arrival among those forms.
struct CoverFigures {
    std::size_t gates = 0;
    std::size_t arrival = 0;
};
CoverFigures coverFigures(const Cover& f, const std::vector<std::size_t>& at) {
    algebra::Factored sop = algebra::sumOfProducts(f);
    CoverFigures r{sop.gateCount(), sop.arrival(at)};
    if (f.cubes.size() <= 1000) {
        algebra::Factored q = algebra::factor(f, algebra::FactorMethod::Quick);
        algebra::Factored b = algebra::factorBest(f, q);
        r.gates = std::min({r.gates, q.gateCount(), b.gateCount()});
        r.arrival = std::min({r.arrival, q.arrival(at), b.arrival(at)});
    }
    return r;
}

} // namespace

ExpressionMergeCounts collapseExpressionNodes(net::Network& net, const ExpressionMergeLimits& limits) {
    const std::size_t maxCubes = limits.maxCubes;
    const std::size_t n = net.nodeCount();
    // Occurrences of each node's literals in logic nodes, the last reader seen and the index of
    // the cube of that reader holding it (a hint: checked before use).
    std::vector<std::uint32_t> uses(n, 0);
    std::vector<net::NodeId> reader(n, 0);
    std::vector<std::uint32_t> readerCube(n, 0);
    for (net::NodeId u = 0; u < n; ++u) {
        if (!net.isLogic(u)) continue;
        const auto& cubes = net.node(u).cover.cubes;
        for (std::size_t i = 0; i < cubes.size(); ++i)
            for (Literal l : cubes[i].lits)
                ++uses[literalVar(l)], reader[literalVar(l)] = u, readerCube[literalVar(l)] = static_cast<std::uint32_t>(i);
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
    // Arrival of each node, by the same counting, and the latest arrival that keeps the
    // network's depth: a merge may make its node arrive later than the two apart only within
    // that slack (F85). Arrivals are counted on the sums of products to start with (no
    // factoring; the nodes are one operator each), and on the factored forms for the nodes a
    // factored merge looks at. A fanin's required time is its reader's less the depth of a
    // balanced AND of the cube's literals under a balanced OR of the cubes (log2 of each).
    std::vector<std::size_t> arrivalOf = net::arrivalTimes(net);
    arrivalOf.resize(n, 0);
    std::vector<long> required(n, LONG_MAX);
    {
        long depth = 0;
        for (const net::Output& o : net.outputs())
            depth = std::max(depth, static_cast<long>(arrivalOf[literalVar(o.driver)] + o.tail));
        for (const net::Output& o : net.outputs()) {
            const auto u = literalVar(o.driver);
            required[u] = std::min(required[u], depth - static_cast<long>(o.tail));
        }
        auto log2up = [](std::size_t k) {
            long d = 0;
            while ((std::size_t{1} << d) < k) ++d;
            return d;
        };
        const std::vector<net::NodeId> order = net.topoOrder();
        for (auto it = order.rbegin(); it != order.rend(); ++it) {
            if (required[*it] == LONG_MAX) continue;
            const auto& cubes = net.node(*it).cover.cubes;
            const long orDepth = log2up(cubes.size());
            for (const Cube& c : cubes)
                for (Literal l : c.lits) {
                    long& r = required[literalVar(l)];
                    r = std::min(r, required[*it] - orDepth - log2up(c.lits.size()));
                }
        }
    }
    // Nodes that took merges decided without factoring: cubes appended, not yet sorted and
    // free of contained cubes. Each is tidied once, when finished (visited as a fanin, or at
    // the end), so a long sum costs one sort, not one per operand.
    std::vector<char> loose(n, 0);
    auto tidy = [&](net::NodeId u) {
        if (!loose[u]) return;
        algebra::removeContainedCubes(net.node(u).cover);
        loose[u] = 0;
    };
    ExpressionMergeCounts counts;
    Cover sub, part, rebuilt;
    // Fanins first: a node carries its own substituted fanins into its reader.
    for (net::NodeId v : net.topoOrder()) {
        tidy(v);   // every merge into v came from its fanins, visited before it
        if (uses[v] != 1 || outRefs[v] != 0) continue;
        net::NodeId p = reader[v];
        Cover& pc = net.node(p).cover;
        auto holds = [&](const Cube& c) {
            return std::any_of(c.lits.begin(), c.lits.end(), [&](Literal l) { return literalVar(l) == v; });
        };
        // The cube of p reading v: the first one in a tidy cover; a loose cover keeps its cubes
        // in place, so the hint is used when it still holds v.
        std::size_t atIndex = readerCube[v];
        if (!loose[p] || atIndex >= pc.cubes.size() || !holds(pc.cubes[atIndex])) {
            auto it = std::find_if(pc.cubes.begin(), pc.cubes.end(), holds);
            if (it == pc.cubes.end()) continue;
            atIndex = static_cast<std::size_t>(it - pc.cubes.begin());
        }
        Literal l = *std::find_if(pc.cubes[atIndex].lits.begin(), pc.cubes[atIndex].lits.end(),
                                  [&](Literal x) { return literalVar(x) == v; });
        const Cover& vc = net.node(v).cover;
        const std::size_t restLits = pc.cubes[atIndex].lits.size() - 1;
        // Cubes of what replaces the literal (v, or its complement). `plain`: no multiplying out
        // there — v's own cubes, the complement of one cube (a sum of single literals) or of a
        // sum of single literals (one cube); otherwise the complement is multiplied out here.
        std::size_t subCubes = vc.cubes.size();
        bool plain = true;
        if (literalNegated(l)) {
            if (vc.cubes.size() == 1) {
                subCubes = vc.cubes[0].lits.size();
            } else if (std::all_of(vc.cubes.begin(), vc.cubes.end(), [](const Cube& c) { return c.lits.size() == 1; })) {
                subCubes = 1;
            } else {
                // The complement multiplied out (bounded by maxCubes, as the merge itself is).
                if (!complement(vc, maxCubes, sub)) continue;
                plain = false;
                subCubes = sub.cubes.size();
            }
        }
        // The merged node's cubes before contained ones are dropped (an upper bound).
        const std::size_t estimate = pc.cubes.size() - 1 + subCubes;
        // Nothing multiplied out: the merged node's literals are those of the two apart, so their
        // factored forms put together are a form of it with the gates of the two.
        const bool literalsKept = plain && (restLits == 0 || subCubes == 1);
        if (!literalsKept && estimate > limits.multiplyCubes) {
            ++counts.keptApart;
            continue;
        }
        if (literalsKept && estimate > limits.factorCubes) {
            // Decided from the counts alone.
            if (estimate > std::max(maxCubes, pc.cubes.size())) continue;
            if (literalNegated(l)) {
                sub.cubes.clear();
                if (vc.cubes.size() == 1) {
                    for (Literal x : vc.cubes[0].lits) sub.cubes.push_back(Cube(std::vector<Literal>{negateLiteral(x)}));
                } else {
                    std::vector<Literal> one;
                    for (const Cube& c : vc.cubes) one.push_back(negateLiteral(c.lits[0]));
                    sub.cubes.push_back(Cube(std::move(one)));
                }
            } else {
                sub = vc;   // a copy: a merge multiplied out before may have left v read elsewhere too
            }
            std::vector<Literal> rest;
            for (Literal x : pc.cubes[atIndex].lits)
                if (x != l) rest.push_back(x);
            // In place: the first cube where v's literal was, the others appended, so that the
            // cube hints of p's other fanins stay right; v's fanins are now read by p.
            if (sub.cubes.empty()) {   // v is constant 0 there: the cube is false (tidying drops it)
                pc.cubes[atIndex] = Cube(std::vector<Literal>{l, negateLiteral(l)});
            }
            for (std::size_t k = 0; k < sub.cubes.size(); ++k) {
                Cube& c = sub.cubes[k];
                const std::size_t at = k == 0 ? atIndex : pc.cubes.size();
                for (Literal x : c.lits) {
                    reader[literalVar(x)] = p;
                    readerCube[literalVar(x)] = static_cast<std::uint32_t>(at);
                }
                Cube merged;
                if (rest.empty()) {
                    merged = std::move(c);
                } else {
                    std::set_union(rest.begin(), rest.end(), c.lits.begin(), c.lits.end(), std::back_inserter(merged.lits));
                }
                if (k == 0) pc.cubes[at] = std::move(merged);
                else pc.cubes.push_back(std::move(merged));
            }
            loose[p] = 1;
            gatesOf[p] = kUnknown;
            uses[v] = 0;
            ++counts.merged;
            ++counts.unfactored;
            continue;
        }
        // At or below the limit: the figures decide, factored.
        const bool wasLoose = loose[p];
        if (wasLoose) {
            tidy(p);
            auto it = std::find_if(pc.cubes.begin(), pc.cubes.end(), holds);
            if (it == pc.cubes.end()) continue;
            atIndex = static_cast<std::size_t>(it - pc.cubes.begin());
            l = *std::find_if(it->lits.begin(), it->lits.end(), [&](Literal x) { return literalVar(x) == v; });
        }
        auto at = pc.cubes.begin() + static_cast<std::ptrdiff_t>(atIndex);
        if (wasLoose || plain) {   // else `sub` holds the complement already
            if (literalNegated(l)) {
                if (!complement(vc, maxCubes, sub)) continue;
            } else {
                sub = vc;
            }
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
        // Nor later than the network's depth allows: the two apart are a form of the merged
        // node too, while the factoring of a multiplied-out product of sums can arrive later
        // (F85: the writer's De Morgan text of a node read inverted, merged back at equal
        // gates, read one level deeper than the engine's result). v's fanins were all
        // visited; p's arrival apart is counted now, with v's.
        arrivalOf[v] = coverFigures(vc, arrivalOf).arrival;
        const CoverFigures merged = coverFigures(rebuilt, arrivalOf);
        const std::size_t rebuiltGates = merged.gates;
        if (rebuiltGates > gates(p) + gates(v)) continue;
        if (static_cast<long>(merged.arrival) > required[p] &&
            merged.arrival > coverFigures(pc, arrivalOf).arrival)
            continue;
        // v's fanins are now read by p.
        for (const Cube& c : vc.cubes)
            for (Literal x : c.lits) reader[literalVar(x)] = p;
        pc = rebuilt;
        for (std::size_t i = 0; i < pc.cubes.size(); ++i)
            for (Literal x : pc.cubes[i].lits)
                if (reader[literalVar(x)] == p) readerCube[literalVar(x)] = static_cast<std::uint32_t>(i);
        gatesOf[p] = rebuiltGates;
        arrivalOf[p] = merged.arrival;
        uses[v] = 0;
        ++counts.merged;
    }
    for (net::NodeId u = 0; u < n; ++u) tidy(u);
    if (counts.merged) net.removeUnreachable();
    return counts;
}

} // namespace kerf::frontend
