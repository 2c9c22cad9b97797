// resub_boolean.cpp — the technique `resubstitute-boolean`: a node
// re-expressed with nodes the network already has, as far as the
// don't-cares allow.
//
// Idea. Algebraic resubstitution (resubstitute) finds an existing node only
// when it divides a cover as a polynomial. Boolean resubstitution asks the
// functional question instead: is there an existing node d (or its
// complement) equal to node v wherever v matters — or two, d1 and d2, whose
// AND or OR is? "Wherever v matters" brings in both kinds of implied
// don't-cares: input patterns are simulated, so value combinations of the
// divisors that never occur impose nothing (satisfiability don't-cares), and
// a pattern counts only when flipping v changes an output or the edge of v's
// fanout window (observability don't-cares). The divisors are the nodes
// near v (its fanins a few levels back and the other readers of its
// fanins), never in v's fanout cone, so the network stays acyclic. With few
// inputs every input pattern is simulated and the answer is exact; with more,
// the random patterns only propose, and the SAT solver confirms: it looks
// for an input pattern where the new form differs from v and the difference
// reaches a window edge; none exists → the change is kept.
//
// The method is Boolean resubstitution with don't-cares found by
// simulation and confirmed by SAT in windows, as published by A. Mishchenko,
// R. Brayton, J.-H. R. Jiang and S. Jang, "Scalable don't-care-based logic
// optimization and resynthesis", FPGA 2009 (from memory); the idea of
// re-expressing a node with existing ones goes back to resubstitution in the
// multi-level synthesis survey of R. K. Brayton, G. D. Hachtel and
// A. L. Sangiovanni-Vincentelli, Proc. IEEE 78(2), 1990 (from memory). The
// code is our own.
//
// Soundness. v changes only on input patterns where no window edge can
// change (proved by exhaustive simulation or by the SAT query), so nothing
// outside the window changes and every output keeps its function. The proof
// of the whole rewrite re-checks this.
#include "kerf/passes/resub_boolean.h"

#include "cone_logic.h"
#include "window_sim.h"
#include "workspace.h"

#include <algorithm>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using detail::ConflictCounter;
using detail::encodeCover;
using detail::evalCover;
using detail::Words;
using net::NodeId;

namespace {

class ResubRun {
public:
    ResubRun(net::Network& net, const BooleanResubOptions& o, PassContext& ctx)
        : net_(net), o_(o), ctx_(ctx), ws_(net, ctx), sim_(net, ws_) {}

    void run() {
        sim_.renewOrder();
        sim_.start(o_.exhaustiveInputs, static_cast<std::size_t>(o_.simulationWords), 0, 0x72657375ull);
        words_ = sim_.words();
        exhaustive_ = sim_.exhaustive();
        conflictsLeft_ = o_.totalConflicts;
        std::size_t examined = 0;
        const std::vector<NodeId> visit = sim_.order();   // the order itself is renewed when a change reorders nodes
        for (auto it = visit.rbegin(); it != visit.rend(); ++it) {
            if (examined >= o_.maxNodes) { ctx_.stats.add("limit-hit:bresub-max-nodes", 1); break; }
            if (conflictsLeft_ <= 0) { ctx_.stats.add("limit-hit:bresub-total-conflicts", 1); break; }
            if (static_cast<std::size_t>(queries_) >= o_.maxQueries) { ctx_.stats.add("limit-hit:bresub-queries", 1); break; }
            if (!ws_.live(*it) || !ctx_.inFocus(*it)) continue;
            ++examined;
            node(*it);
        }
        ctx_.stats.add("nodes-examined", static_cast<long long>(examined));
        ctx_.stats.add("replaced-by-one", byOne_);
        ctx_.stats.add("replaced-by-two", byTwo_);
        ctx_.stats.add("literals-saved", saved_);
        ctx_.stats.add("sat-queries", queries_);
        ctx_.stats.add("refuted", refuted_);
        ctx_.stats.add("depth-rejects", static_cast<long long>(ws_.depthRejects()));
        if (coneSkips_) ctx_.stats.add("limit-hit:bresub-cone-limit", coneSkips_);
        if (budgetSkips_) ctx_.stats.add("limit-hit:bresub-query-conflicts", budgetSkips_);
    }

private:
    // Nodes near v to try as divisors: fanins a few levels back, then other readers of v's fanins.
    std::vector<NodeId> divisorsNear(NodeId v) {
        std::vector<NodeId> out;
        seen_.resize(net_.nodeCount(), 0);
        auto take = [&](NodeId u) {
            if (u == 0 || seen_[u] || sim_.inCone(u) || out.size() >= o_.divisors) return;
            if (!net_.isLogic(u) && net_.node(u).kind != net::NodeKind::Input) return;
            seen_[u] = 1;
            out.push_back(u);
        };
        const std::vector<std::uint32_t> fanins = net_.node(v).cover.support();
        for (NodeId u : fanins) take(u);
        for (std::size_t i = 0; i < out.size() && out.size() < o_.divisors && i < 4 * o_.divisors; ++i)
            if (net_.isLogic(out[i]))
                for (NodeId u : net_.node(out[i]).cover.support()) take(u);
        for (NodeId f : fanins)
            for (NodeId u : ws_.fanouts(f)) take(u);
        for (NodeId u : out) seen_[u] = 0;
        return out;
    }

    struct Form {
        int kind = -1;   // 0: one literal, 1: AND of two, 2: OR of two
        Literal a = 0, b = 0;
        Cover cover() const {
            if (kind == 0) return Cover::literal(a);
            if (kind == 1) return Cover{{Cube({a, b})}};
            Cover f{{Cube({a}), Cube({b})}};
            f.normalize();
            return f;
        }
    };

    void node(NodeId v) {
        const Cover f = ws_.cover(v);
        const std::size_t lits = f.literalCount();
        if (lits < 2 || f.isOne()) return;
        const std::vector<NodeId> cone = sim_.fanoutCone(v);
        std::vector<NodeId> window(cone.begin(), cone.begin() + static_cast<std::ptrdiff_t>(
                                                               std::min(cone.size(), o_.windowNodes + 1)));
        std::vector<NodeId> divs = divisorsNear(v);
        sim_.unmark(cone);
        if (divs.empty()) return;

        // Window edges: nodes read outside the window or driving an output.
        sim_.setWindow(window);
        std::vector<NodeId> edges;
        for (NodeId u : window)
            if (ws_.outputRefs(u) > 0 || sim_.readOutside(u)) edges.push_back(u);
        if (edges.empty()) return;

        // Where v is observed: flip it and re-simulate the window.
        Words care(words_, 0);
        std::vector<Words> flipped;
        sim_.simulateFlipped(window, flipped);
        for (std::size_t w = 0; w < words_; ++w) {
            for (NodeId e : edges) care[w] |= flipped[sim_.index(e)][w] ^ vals_[e][w];
        }

        // Candidates by simulation, cheapest first: one literal, then two.
        auto lit = [&](std::size_t i, bool neg, std::size_t w) {
            const std::uint64_t x = vals_[divs[i]][w];
            return neg ? ~x : x;
        };
        const Words& t = vals_[v];
        std::vector<Form> tries;
        const std::size_t m = divs.size();
        std::vector<std::pair<std::size_t, bool>> covering, inside;   // literals holding v's onset / inside it
        for (std::size_t i = 0; i < m; ++i)
            for (bool neg : {false, true}) {
                bool equal = true, covers = true, within = true;
                for (std::size_t w = 0; w < words_; ++w) {
                    const std::uint64_t x = lit(i, neg, w);
                    if ((x ^ t[w]) & care[w]) equal = false;
                    if (t[w] & ~x & care[w]) covers = false;
                    if (x & ~t[w] & care[w]) within = false;
                }
                const Literal l = makeLiteral(divs[i], neg);
                if (equal) tries.push_back({0, l, 0});
                if (covers) covering.push_back({i, neg});
                if (within) inside.push_back({i, neg});
            }
        if (lits > 2) {
            auto pairs = [&](const std::vector<std::pair<std::size_t, bool>>& ls, int kind) {
                for (std::size_t p = 0; p < ls.size() && tries.size() < 8; ++p)
                    for (std::size_t q = p + 1; q < ls.size() && tries.size() < 8; ++q) {
                        if (ls[p].first == ls[q].first) continue;
                        bool ok = true;
                        for (std::size_t w = 0; w < words_ && ok; ++w) {
                            const std::uint64_t a = lit(ls[p].first, ls[p].second, w);
                            const std::uint64_t b = lit(ls[q].first, ls[q].second, w);
                            const std::uint64_t g = kind == 1 ? (a & b) : (a | b);
                            ok = ((g ^ t[w]) & care[w]) == 0;
                        }
                        if (ok)
                            tries.push_back({kind, makeLiteral(divs[ls[p].first], ls[p].second),
                                             makeLiteral(divs[ls[q].first], ls[q].second)});
                    }
            };
            pairs(covering, 1);
            pairs(inside, 2);
        }
        if (tries.size() > o_.formsPerNode) tries.resize(o_.formsPerNode);
        for (const Form& form : tries) {
            const Cover next = form.cover();
            if (next.literalCount() >= lits) continue;
            if (!exhaustive_ && !confirm(v, window, edges, form)) continue;
            ws_.begin();
            ws_.setCover(v, next);
            if (!ws_.commit()) continue;
            // v now reads a node that may come after it in order_: renew the
            // order (windows and SAT cones are laid out by it).
            if (sim_.pos(literalVar(form.a)) > sim_.pos(v) ||
                (form.kind > 0 && sim_.pos(literalVar(form.b)) > sim_.pos(v))) {
                sim_.renewOrder();
                window = sim_.fanoutCone(v);   // the cone is unchanged; only its order
                sim_.unmark(window);
                if (window.size() > o_.windowNodes + 1) window.resize(o_.windowNodes + 1);
            }
            (form.kind == 0 ? byOne_ : byTwo_) += 1;
            saved_ += static_cast<long long>(lits - next.literalCount());
            for (NodeId u : window) sim_.simulate(u);   // values change only inside the window
            return;
        }
    }

    // Is there an input pattern where `form` differs from v and the
    // difference reaches a window edge? None (UNSAT) → true.
    bool confirm([[maybe_unused]] NodeId v, const std::vector<NodeId>& window, const std::vector<NodeId>& edges, const Form& form) {
        // The cone the query needs, breadth first from the window and the
        // divisors, up to coneLevels levels; nodes at the last level are
        // free variables (more behaviours than the circuit has: a query can
        // only fail more often, so a confirmation stays sound).
        std::vector<NodeId> seeds{literalVar(form.a)};
        if (form.kind > 0) seeds.push_back(literalVar(form.b));
        const std::vector<NodeId> cone = sim_.satCone(window, seeds, o_.coneLevels, o_.coneLimit);
        if (cone.size() > o_.coneLimit) {
            ++coneSkips_;
            return false;
        }
        detail::WindowSimulation::Query q;   // x: the original logic, y: the window with v's new form
        sim_.encodeCone(q, cone);
        CaDiCaL::Solver& s = q.solver;
        int& nextVar = q.nextVar;
        const int formLit = encodeCover(s, nextVar, form.cover(), [&q](Literal l) { return q.litX(l); });
        sim_.encodeWindowCopy(q, window, formLit);
        const auto& x = q.x;
        const auto& y = q.y;
        const ConflictCounter& counter = q.counter;
        std::vector<int> diffs;
        for (NodeId e : edges) {
            const int a = x.at(e), b = y.at(e), d = ++nextVar;
            s.add(-d), s.add(a), s.add(b), s.add(0);
            s.add(-d), s.add(-a), s.add(-b), s.add(0);
            diffs.push_back(d);
        }
        for (int d : diffs) s.add(d);
        s.add(0);
        const std::int64_t allowance = std::min<std::int64_t>(o_.conflictsPerQuery, conflictsLeft_);
        if (allowance <= 0) return false;
        s.limit("conflicts", static_cast<int>(allowance));
        ++queries_;
        const int r = s.solve();
        conflictsLeft_ -= counter.count;
        if (r == 20) return true;
        if (r == 10) ++refuted_;
        else ++budgetSkips_;
        return false;
    }

    net::Network& net_;
    const BooleanResubOptions& o_;
    PassContext& ctx_;
    detail::Workspace ws_;
    detail::WindowSimulation sim_;
    std::vector<Words>& vals_ = sim_.values();
    std::vector<std::uint8_t> seen_;
    bool exhaustive_ = false;
    std::size_t words_ = 0;
    std::int64_t conflictsLeft_ = 0;
    long long byOne_ = 0, byTwo_ = 0, saved_ = 0, queries_ = 0, refuted_ = 0, coneSkips_ = 0, budgetSkips_ = 0;
};

} // namespace

void resubstituteBoolean(net::Network& net, const BooleanResubOptions& opts, PassContext& ctx) {
    if (net.inputs().empty()) return;
    if (net.logicCount() > opts.maxNetworkNodes) {
        ctx.stats.add("limit-hit:bresub-max-network-nodes", 1);
        return;
    }
    ResubRun run(net, opts, ctx);
    run.run();
}

} // namespace kerf::passes
