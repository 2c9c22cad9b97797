// dont_cares.cpp — the technique `dont-care-minimise`: each node minimised
// against the don't-cares its surroundings imply and the source declares.
//
// Idea. A node's cover only has to be right for the values of its fanins
// that occur (the others are satisfiability don't-cares) and, among those,
// for the input patterns where some output observes the node (the rest are
// observability don't-cares); where the source declares an output free (x),
// that output observes nothing. Both sets are found together, per node, by
// asking which fanin values are ever observed: the network is simulated
// bit-parallel, the node is flipped, its fanout window is re-simulated, and
// every pattern on which a window edge (an output, or a node read from
// outside the window) changes marks its fanin value as "care". With few
// inputs every input pattern is simulated and the answer is exact. With
// more, the fanin values never marked are only candidates: a SAT query on
// the window (the original cone and a copy with the node flipped) asks for
// an input pattern that gives a candidate value and changes an edge; each
// answer is marked care and the query repeated until it is unsatisfiable
// (all candidates confirmed) or a limit is reached (the node is left alone).
// The node is then minimised over its fanins within the interval the
// don't-cares allow (minimize::minimizeInterval), in either polarity.
//
// The method is the don't-care based node simplification of multi-level
// synthesis (satisfiability and observability don't-cares: K. A. Bartlett
// et al., "Multilevel logic minimization using implicit don't cares", IEEE
// TCAD 1988; H. Savoj and R. K. Brayton, "The use of observability and
// external don't cares for the simplification of multi-level networks", DAC
// 1990), computed in windows by simulation and SAT as in A. Mishchenko et
// al., "SAT-based complete don't-care computation for network
// optimization", DATE 2005 — all from memory. The code is our own.
//
// Soundness. A node changes only on fanin values where, for every input
// pattern producing them, no window edge can change; so nothing outside the
// window changes and every output keeps its value wherever its declared
// condition is 0. The proof of the whole rewrite re-checks this.
#include "kerf/passes/dont_cares.h"

#include "cone_logic.h"
#include "window_sim.h"
#include "workspace.h"

#include <cadical.hpp>

#include <algorithm>
#include <bit>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using net::NodeId;

namespace {

using Words = std::vector<std::uint64_t>;

using detail::ConflictCounter;
using detail::encodeCover;
using detail::evalCover;

class DontCareRun {
public:
    DontCareRun(net::Network& net, const DontCareOptions& o, const net::Network* declared, PassContext& ctx,
                DontCareMemo* memo)
        : net_(net), o_(o), declared_(declared), ctx_(ctx), ws_(net, ctx), sim_(net, ws_), memo_(memo) {}

    void run() {
        sim_.renewOrder();
        // The last word of random patterns collects counterexamples.
        sim_.start(o_.exhaustiveInputs, static_cast<std::size_t>(o_.simulationWords), 1, 0x6b657266ull);
        pendingBits_ = 0;
        words_ = sim_.words();
        exhaustive_ = sim_.exhaustive();
        outputCare();
        std::size_t examined = 0;
        const std::vector<NodeId>& order = sim_.order();
        for (auto it = order.rbegin(); it != order.rend(); ++it) {
            if (examined >= o_.maxNodes) { ctx_.stats.add("limit-hit:dc-max-nodes", 1); break; }
            if (conflictsLeft_ <= 0) { ctx_.stats.add("limit-hit:dc-total-conflicts", 1); break; }
            if (work_ > workLimit_) { ctx_.stats.add("limit-hit:dc-work-per-node", 1); break; }
            NodeId v = *it;
            if (!ws_.live(v) || !ctx_.inFocus(v)) continue;
            std::uint64_t key = 0;
            if (memo_) {
                key = fingerprint(v);
                if (memo_->fruitless.count(key)) { ++memoSkips_; continue; }
            }
            ++examined;
            const long long before = simplified_;
            node(v);
            if (memo_ && simplified_ == before) memo_->fruitless.insert(key);
            if (pendingBits_ > 0 && pendingDirty_) flushPending();
        }
        ctx_.stats.add("nodes-examined", static_cast<long long>(examined));
        if (memoSkips_) ctx_.stats.add("nodes-unchanged", memoSkips_);
        ctx_.stats.add("nodes-simplified", simplified_);
        ctx_.stats.add("complemented", complemented_);
        ctx_.stats.add("literals-saved", saved_);
        ctx_.stats.add("sat-queries", queries_);
        ctx_.stats.add("counterexamples", cexes_);
        ctx_.stats.add("depth-rejects", static_cast<long long>(ws_.depthRejects()));
        if (coneSkips_) ctx_.stats.add("limit-hit:dc-cone-limit", coneSkips_);
        if (budgetSkips_) ctx_.stats.add("limit-hit:dc-query-conflicts", budgetSkips_);
        if (refineSkips_) ctx_.stats.add("limit-hit:dc-refinements", refineSkips_);
    }

private:
    // ---- patterns and simulation ----------------------------------------------

    // The last word holds counterexample patterns; re-simulate it when it changed.
    void flushPending() {
        const std::size_t w = words_ - 1;
        for (NodeId v : sim_.order())
            if (ws_.live(v)) vals_[v][w] = evalCover(net_.node(v).cover, vals_, w);
        pendingDirty_ = false;
        recomputeCare();
    }

    // Per output: where its value matters (declared condition 0), per word.
    void outputCare() {
        const auto& outs = net_.outputs();
        care_.assign(outs.size(), Words(words_, ~0ull));
        dcIndex_.assign(outs.size(), -1);
        if (!declared_ || declared_->outputs().empty()) return;
        std::unordered_map<std::string, std::size_t> inputByName;
        for (std::size_t i = 0; i < net_.inputs().size(); ++i) inputByName[net_.node(net_.inputs()[i]).name] = i;
        std::unordered_map<std::string, int> dcByName;
        for (std::size_t k = 0; k < declared_->outputs().size(); ++k)
            dcByName[declared_->outputs()[k].name] = static_cast<int>(k);
        for (std::size_t k = 0; k < outs.size(); ++k) {
            auto it = dcByName.find(outs[k].name);
            if (it != dcByName.end()) dcIndex_[k] = it->second;
        }
        dcInputs_.clear();
        for (NodeId in : declared_->inputs()) {
            auto it = inputByName.find(declared_->node(in).name);
            dcInputs_.push_back(it == inputByName.end() ? -1 : static_cast<int>(it->second));
        }
        recomputeCare();
    }

    void recomputeCare() {
        if (!declared_ || declared_->outputs().empty()) return;
        std::vector<std::uint64_t> in(declared_->inputs().size());
        for (std::size_t w = 0; w < words_; ++w) {
            for (std::size_t i = 0; i < in.size(); ++i)
                in[i] = dcInputs_[i] < 0 ? 0 : vals_[net_.inputs()[static_cast<std::size_t>(dcInputs_[i])]][w];
            std::vector<std::uint64_t> dc = net::simulate(*declared_, in);
            for (std::size_t k = 0; k < care_.size(); ++k)
                if (dcIndex_[k] >= 0) {
                    // An input the condition reads but the network lacks: no freedom (care everywhere).
                    bool unmatched = std::find(dcInputs_.begin(), dcInputs_.end(), -1) != dcInputs_.end();
                    care_[k][w] = unmatched ? ~0ull : ~dc[static_cast<std::size_t>(dcIndex_[k])];
                }
        }
    }

    // The node's cover, its fanins' and its fanouts' covers, and whether it drives an output.
    std::uint64_t fingerprint(NodeId v) const {
        algebra::CoverHash h;
        auto mix = [](std::uint64_t a, std::uint64_t b) {
            return a ^ (b + 0x9e3779b97f4a7c15ull + (a << 6) + (a >> 2));
        };
        const Cover& f = net_.node(v).cover;
        std::uint64_t k = mix(h(f), ws_.outputRefs(v));
        for (const Cube& c : f.cubes)
            for (Literal l : c.lits) {
                const NodeId u = literalVar(l);
                if (net_.isLogic(u)) k = mix(k, h(net_.node(u).cover));
            }
        std::uint64_t fo = 0;   // fanout order is not canonical: combine commutatively
        for (NodeId g : ws_.fanouts(v)) fo += mix(g, h(net_.node(g).cover));
        return mix(k, fo);
    }

    // ---- one node -------------------------------------------------------------

    void node(NodeId v) {
        const Cover f = ws_.cover(v);
        if (f.isZero() || f.isOne()) return;
        std::vector<std::uint32_t> fanins = f.support();
        if (!fanins.empty() && fanins.front() == 0) fanins.erase(fanins.begin());
        const int k = static_cast<int>(fanins.size());
        if (k == 0 || k > std::min(o_.maxFanins, 16)) return;
        if (f.literalCount() <= 1) return;

        // The fanout window, in topological order, and its edges.
        std::vector<NodeId> window = sim_.fanoutCone(v);
        sim_.unmark(window);
        if (window.size() > o_.windowNodes + 1) window.resize(o_.windowNodes + 1);
        sim_.setWindow(window);
        struct Edge { NodeId node; std::vector<std::size_t> outputs; bool free; };
        std::vector<Edge> edges;
        for (NodeId u : window) {
            Edge e{u, {}, sim_.readOutside(u)};
            if (ws_.outputRefs(u) > 0)
                for (std::size_t q = 0; q < net_.outputs().size(); ++q)
                    if (literalVar(net_.outputs()[q].driver) == u) e.outputs.push_back(q);
            if (e.free || !e.outputs.empty()) edges.push_back(std::move(e));
        }
        if (edges.empty()) return;   // nothing observes the node (dead logic: tidy removes it)

        work_ += static_cast<std::int64_t>(window.size() * words_);
        // Which fanin values are observed, by simulation.
        const std::size_t tableBits = std::size_t{1} << k;
        std::vector<std::uint8_t> care(tableBits, 0);
        std::vector<Words> flipped;
        sim_.simulateFlipped(window, flipped);
        for (std::size_t w = 0; w < words_; ++w) {
            std::uint64_t obs = 0;
            for (const Edge& e : edges) {
                std::uint64_t d = flipped[sim_.index(e.node)][w] ^ vals_[e.node][w];
                if (e.free) { obs |= d; continue; }
                std::uint64_t c = 0;
                for (std::size_t q : e.outputs) c |= care_[q][w];
                obs |= d & c;
            }
            if (!exhaustive_ && w + 1 == words_) obs &= pendingMask();
            while (obs) {
                const int b = std::countr_zero(obs);
                obs &= obs - 1;
                std::size_t m = 0;
                for (int i = 0; i < k; ++i)
                    if ((vals_[fanins[static_cast<std::size_t>(i)]][w] >> b) & 1) m |= std::size_t{1} << i;
                care[m] = 1;
            }
        }
        if (std::all_of(care.begin(), care.end(), [](std::uint8_t c) { return c != 0; })) return;
        if (!exhaustive_ && !confirm(v, fanins, window, edges.size(), care)) return;

        // Minimise within the interval, in either polarity.
        std::vector<std::uint64_t> on = minimize::truthTable(f, fanins);
        std::vector<std::uint64_t> careT(on.size(), 0);
        for (std::size_t m = 0; m < tableBits; ++m)
            if (care[m]) careT[m >> 6] |= 1ull << (m & 63);
        if (k < 6)
            for (unsigned s = 1u << k; s < 64; s <<= 1) careT[0] |= careT[0] << s;
        std::vector<std::uint64_t> lo(on.size()), up(on.size()), nlo(on.size()), nup(on.size());
        for (std::size_t w = 0; w < on.size(); ++w) {
            lo[w] = on[w] & careT[w];
            up[w] = on[w] | ~careT[w];
            nlo[w] = ~up[w];
            nup[w] = ~lo[w];
        }
        Cover pos = minimize::minimizeInterval(lo, up, fanins, o_.minimize);
        Cover neg = minimize::minimizeInterval(nlo, nup, fanins, o_.minimize);
        const std::size_t before = f.literalCount();
        const bool useNeg = neg.literalCount() < pos.literalCount() &&
                            (!ws_.fanouts(v).empty() || ws_.outputRefs(v) > 0);
        Cover& chosen = useNeg ? neg : pos;
        if (chosen.literalCount() >= before) return;
        ws_.begin();
        if (useNeg) ws_.flipNode(v, chosen);
        else ws_.setCover(v, chosen);
        if (!ws_.commit()) return;
        if (useNeg) net_.node(v).name.clear();
        ++simplified_;
        complemented_ += useNeg;
        saved_ += static_cast<long long>(before) - static_cast<long long>(net_.node(v).cover.literalCount());
        // Only the window can change (see Soundness above).
        for (NodeId u : window) sim_.simulate(u);
    }

    std::uint64_t pendingMask() const { return pendingBits_ >= 64 ? ~0ull : (1ull << pendingBits_) - 1; }

    // ---- SAT confirmation -------------------------------------------------------

    bool confirm(NodeId v, const std::vector<std::uint32_t>& fanins, const std::vector<NodeId>& window,
                 std::size_t, std::vector<std::uint8_t>& care) {
        // The cone: the nodes the window and the fanins read, up to
        // coneLevels levels back (breadth first). Nodes at the last level are
        // free variables: they may then take values no input pattern gives,
        // which can only mark more values as care — never fewer — so the
        // don't-cares found stay sound, and a query costs the window's
        // neighbourhood instead of the whole cone.
        const std::vector<NodeId> seeds(fanins.begin(), fanins.end());
        const std::vector<NodeId> cone = sim_.satCone(window, seeds, o_.coneLevels, o_.coneLimit);
        work_ += static_cast<std::int64_t>(cone.size());
        if (cone.size() > o_.coneLimit) {
            ++coneSkips_;
            return false;
        }
        detail::WindowSimulation::Query q;   // x: the original logic, y: the window with v flipped
        sim_.encodeCone(q, cone);
        sim_.encodeWindowCopy(q, window, -q.x.at(v));
        CaDiCaL::Solver& s = q.solver;
        ConflictCounter& counter = q.counter;
        int& nextVar = q.nextVar;
        std::unordered_map<NodeId, int>& x = q.x;
        const std::unordered_map<NodeId, int>& y = q.y;
        // Declared conditions of the outputs the window drives, over the same inputs.
        std::unordered_map<std::size_t, int> careLit;
        std::vector<int> goal;
        for (NodeId u : window) {
            const bool free = sim_.readOutside(u);
            std::vector<std::size_t> outs;
            if (ws_.outputRefs(u) > 0)
                for (std::size_t q = 0; q < net_.outputs().size(); ++q)
                    if (literalVar(net_.outputs()[q].driver) == u) outs.push_back(q);
            if (!free && outs.empty()) continue;
            const int a = x.at(u), b = y.at(u);
            int d = ++nextVar;   // d -> a xor b
            s.add(-d), s.add(a), s.add(b), s.add(0);
            s.add(-d), s.add(-a), s.add(-b), s.add(0);
            if (!free) {
                // d -> some driven output cares. The care literals are made first: making one
                // adds the clauses of its condition, which must not land inside this clause (F31).
                std::vector<int> cares;
                for (std::size_t q : outs) cares.push_back(outputCareLit(s, nextVar, q, x, careLit));
                s.add(-d);
                for (int c : cares) s.add(c);
                s.add(0);
            }
            goal.push_back(d);
        }
        for (int d : goal) s.add(d);
        s.add(0);
        auto block = [&](std::size_t m) {
            for (std::size_t i = 0; i < fanins.size(); ++i) {
                int b = x.at(fanins[i]);
                s.add(((m >> i) & 1) ? -b : b);
            }
            s.add(0);
        };
        for (std::size_t m = 0; m < care.size(); ++m)
            if (care[m]) block(m);
        for (int round = 0;; ++round) {
            if (round >= o_.refinementsPerNode) { ++refineSkips_; return false; }
            const std::int64_t allowance = std::min<std::int64_t>(o_.conflictsPerQuery, conflictsLeft_);
            if (allowance <= 0) return false;
            s.limit("conflicts", static_cast<int>(allowance));
            const std::int64_t startCount = counter.count;
            ++queries_;
            const int r = s.solve();
            conflictsLeft_ -= counter.count - startCount;
            if (r == 20) return true;          // every remaining candidate is a don't-care
            if (r != 10) { ++budgetSkips_; return false; }
            ++cexes_;
            std::size_t m = 0;
            for (std::size_t i = 0; i < fanins.size(); ++i)
                if (s.val(x.at(fanins[i])) > 0) m |= std::size_t{1} << i;
            if (care[m]) return false;   // cannot happen; stay safe
            addPendingPattern(s, x);   // read the model before adding clauses
            care[m] = 1;
            block(m);
        }
    }

    // A solver literal true where output q's value matters.
    int outputCareLit(CaDiCaL::Solver& s, int& nextVar, std::size_t q, std::unordered_map<NodeId, int>& x,
                      std::unordered_map<std::size_t, int>& careLit) {
        auto it = careLit.find(q);
        if (it != careLit.end()) return it->second;
        int lit;
        if (dcIndex_.empty() || dcIndex_[q] < 0 ||
            std::find(dcInputs_.begin(), dcInputs_.end(), -1) != dcInputs_.end()) {
            lit = ++nextVar;
            s.add(lit), s.add(0);   // always cares
        } else {
            // Encode the declared condition's cone over the main network's input variables.
            std::unordered_map<NodeId, int> dv;
            int f = ++nextVar;
            s.add(-f), s.add(0);
            dv[0] = f;
            for (std::size_t i = 0; i < declared_->inputs().size(); ++i) {
                NodeId mainIn = net_.inputs()[static_cast<std::size_t>(dcInputs_[i])];
                auto xi = x.find(mainIn);
                if (xi == x.end()) xi = x.emplace(mainIn, ++nextVar).first;
                dv[declared_->inputs()[i]] = xi->second;
            }
            auto litD = [&](Literal l) {
                int b = dv.at(literalVar(l));
                return literalNegated(l) ? -b : b;
            };
            for (NodeId u : declared_->topoOrder()) dv[u] = encodeCover(s, nextVar, declared_->node(u).cover, litD);
            lit = -litD(declared_->outputs()[static_cast<std::size_t>(dcIndex_[q])].driver);
        }
        careLit[q] = lit;
        return lit;
    }

    void addPendingPattern(CaDiCaL::Solver& s, const std::unordered_map<NodeId, int>& x) {
        if (pendingBits_ >= 64) return;   // the word is full; later counterexamples still refine the node
        const std::size_t w = words_ - 1;
        for (NodeId in : net_.inputs()) {
            auto it = x.find(in);
            if (it != x.end() && s.val(it->second) > 0) vals_[in][w] |= 1ull << pendingBits_;
        }
        ++pendingBits_;
        pendingDirty_ = true;
    }

    net::Network& net_;
    const DontCareOptions& o_;
    const net::Network* declared_;
    PassContext& ctx_;
    detail::Workspace ws_;
    detail::WindowSimulation sim_;
    std::vector<Words>& vals_ = sim_.values();
    bool exhaustive_ = false;
    std::size_t words_ = 0;
    std::vector<Words> care_;
    std::vector<int> dcIndex_, dcInputs_;
    int pendingBits_ = 0;
    bool pendingDirty_ = false;
    std::int64_t conflictsLeft_ = 0;
    std::int64_t work_ = 0, workLimit_ = 0;   // window simulations and encoded cone nodes
    long long simplified_ = 0, complemented_ = 0, saved_ = 0, queries_ = 0, cexes_ = 0;
    long long coneSkips_ = 0, budgetSkips_ = 0, refineSkips_ = 0, memoSkips_ = 0;
    DontCareMemo* memo_ = nullptr;

public:
    void setBudget(std::int64_t c, std::int64_t work) {
        conflictsLeft_ = c;
        workLimit_ = work;
    }
};

} // namespace

void minimiseWithDontCares(net::Network& net, const DontCareOptions& opts, const net::Network* declared,
                           PassContext& ctx, DontCareMemo* memo) {
    if (net.inputs().empty()) return;
    if (net.logicCount() > opts.maxNetworkNodes) {
        ctx.stats.add("limit-hit:dc-max-network-nodes", 1);
        return;
    }
    DontCareRun run(net, opts, declared, ctx, memo);
    run.setBudget(opts.totalConflicts,
                  opts.workPerNode * static_cast<std::int64_t>(std::max<std::size_t>(net.logicCount(), 64)));
    run.run();
}

} // namespace kerf::passes
