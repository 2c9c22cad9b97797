// factored.cpp — `final-factor`: the factored form of each node as written,
// and the figures counted on it.
//
// Background. A sum of products is written as a factored form, a tree of
// ANDs and ORs found by repeated algebraic division; the literal count of
// the factored form is the classic area estimate of multi-level synthesis
// (R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990, from memory).
// Factoring can make a node deeper than its flat sum of products, so the
// form of each node is chosen under a depth bound: first every node takes
// its earliest-arriving form (Best, Quick or plain SOP), which gives the
// smallest depth reachable with these forms; required times are pushed back
// from the outputs through those trees; then each node, in topological
// order, takes the form with the fewest gates whose arrival meets its
// required time. Trees are balanced by arrival (merge the two earliest
// first), which is optimal for the latest arrival, so a node meeting its
// required time never makes a later one miss it.
#include "kerf/passes/factored.h"

#include "workspace.h"

#include <algorithm>
#include <climits>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Factored;
using algebra::literalVar;

// Every cover the engine meets is factored once: the cache holds, per
// cover, its Best, Quick and plain forms and their gate counts (a form's
// gates do not depend on when its literals arrive). Measuring a network
// then costs one hash lookup and a walk over each node's forms, without
// allocating — it runs once per trial of the engine.
struct FactorCache::Entry {
    Factored best, quick, sop;
    std::size_t bestGates = 0, quickGates = 0, sopGates = 0;
    bool hasBest = false, hasQuick = false, hasSop = false;
    bool bestSkipped = false;   // counted in Impl::bestSkipped
};

struct FactorCache::Impl {
    using Entry = FactorCache::Entry;
    std::unordered_map<Cover, Entry, algebra::CoverHash> entries;
    std::size_t factored = 0;
    std::size_t maxCubes = 1000;   // limit factor-max-cubes
    std::size_t bestMaxCubes = 0;  // limit factor-best-max-cubes (0: no bound)
    std::size_t bestSkipped = 0;   // covers it gave the quick form only
    bool bestAllowed(const Cover& f) const { return bestMaxCubes == 0 || f.cubes.size() <= bestMaxCubes; }
    Entry& entry(const Cover& f) { return entries[f]; }
};

namespace {

// Scratch stack shared by the recursive walks below (reused across calls,
// so the walks allocate nothing once warm).
thread_local std::vector<std::size_t> tScratch;

std::size_t gatesOf(const Factored& f) {
    if (f.kind != Factored::Kind::And && f.kind != Factored::Kind::Or) return 0;
    std::size_t g = f.kids.size() > 1 ? f.kids.size() - 1 : 0;
    for (const Factored& k : f.kids) g += gatesOf(k);
    return g;
}

} // namespace

FactorCache::FactorCache() : impl_(std::make_unique<Impl>()) {}
FactorCache::~FactorCache() = default;

const Factored& FactorCache::best(const Cover& f) { return best(impl_->entry(f), f); }

const Factored& FactorCache::quick(const Cover& f) { return quick(impl_->entry(f), f); }

// The same on an entry already looked up (one hash of the cover, not three).
const Factored& FactorCache::best(Entry& e, const Cover& f) {
    if (!impl_->bestAllowed(f)) {
        if (!e.bestSkipped) e.bestSkipped = true, ++impl_->bestSkipped;
        return quick(e, f);
    }
    if (!e.hasBest) {
        // Best compares against the quick form: take it from the entry
        // rather than letting factor() compute it a second time.
        const Factored& q = quick(e, f);
        e.best = algebra::factorBest(f, q);
        e.bestGates = gatesOf(e.best);
        e.hasBest = true;
        ++impl_->factored;
    }
    return e.best;
}

const Factored& FactorCache::quick(Entry& e, const Cover& f) {
    if (!e.hasQuick) {
        e.quick = algebra::factor(f, algebra::FactorMethod::Quick);
        e.quickGates = gatesOf(e.quick);
        e.hasQuick = true;
        ++impl_->factored;
    }
    return e.quick;
}

std::size_t FactorCache::size() const { return impl_->factored; }

void FactorCache::setMaxCubes(std::size_t cubes) { impl_->maxCubes = cubes; }
std::size_t FactorCache::maxCubes() const { return impl_->maxCubes; }
void FactorCache::setBestMaxCubes(std::size_t cubes) { impl_->bestMaxCubes = cubes; }
std::size_t FactorCache::bestMaxCubes() const { return impl_->bestMaxCubes; }
std::size_t FactorCache::bestSkipped() const { return impl_->bestSkipped; }

namespace {

// Merge arrival times two earliest first (a min-heap over t[0..k)); returns
// the root's arrival. Allocation-free.
std::size_t balanceInPlace(std::size_t* t, std::size_t k) {
    if (k == 0) return 0;
    if (k == 1) return t[0];
    if (k == 2) return std::max(t[0], t[1]) + 1;
    std::make_heap(t, t + k, std::greater<>());
    while (k > 1) {
        std::pop_heap(t, t + k, std::greater<>());
        const std::size_t a = t[--k];
        std::pop_heap(t, t + k, std::greater<>());
        const std::size_t b = t[k - 1];
        t[k - 1] = std::max(a, b) + 1;
        std::push_heap(t, t + k, std::greater<>());
    }
    return t[0];
}

std::size_t arrivalOf(const std::vector<std::size_t>& at, std::uint32_t v) { return v < at.size() ? at[v] : 0; }

// Arrival of a form's root (gates come from the cache). Allocation-free
// once the scratch stack has grown.
std::size_t formArrival(const Factored& f, const std::vector<std::size_t>& at) {
    switch (f.kind) {
    case Factored::Kind::Zero:
    case Factored::Kind::One:
        return 0;
    case Factored::Kind::Lit:
        return arrivalOf(at, literalVar(f.lit));
    default: {
        const std::size_t base = tScratch.size();
        for (const Factored& k : f.kids) {
            const std::size_t a = formArrival(k, at);
            tScratch.push_back(a);
        }
        const std::size_t r = balanceInPlace(tScratch.data() + base, f.kids.size());
        tScratch.resize(base);
        return r;
    }
    }
}

// Required time of every leaf variable of `f` given the root's required time.
// The merge order is balance()'s (two earliest first, ties to the lower
// group), replayed on scratch arrays: this runs for every node on every
// measurement, and allocating per tree node was a large part of measuring a
// network of 700k nodes (F44).
thread_local std::vector<std::size_t> tReqTimes;                    // per level: kids' arrivals, then their depths
thread_local std::vector<std::pair<std::size_t, std::size_t>> tHeap; // (time, group)
thread_local std::vector<std::size_t> tTreeOf, tParent;             // group -> its merge-tree node; tree parents

/// Appends the depth below `f` (an AND or OR) of each of its kids to tReqTimes, from `base`
/// on: the kids merged two at a time, earliest arrivals first, as the form is measured.
void kidDepths(const Factored& f, const std::vector<std::size_t>& at, std::size_t base) {
    const std::size_t k = f.kids.size();
    for (const Factored& kid : f.kids) tReqTimes.push_back(formArrival(kid, at));
    if (k <= 1) {
        if (k == 1) tReqTimes[base] = 0;
        return;
    }
    // Merge tree: leaves 0..k-1, merges k..2k-2 (a parent comes after its children).
    tHeap.clear();
    tTreeOf.resize(k);
    tParent.assign(2 * k - 1, 0);
    for (std::size_t i = 0; i < k; ++i) {
        tHeap.push_back({tReqTimes[base + i], i});
        std::push_heap(tHeap.begin(), tHeap.end(), std::greater<>());
        tTreeOf[i] = i;
    }
    std::size_t next = k;
    while (tHeap.size() > 1) {
        std::pop_heap(tHeap.begin(), tHeap.end(), std::greater<>());
        const auto [ta, ga] = tHeap.back();
        tHeap.pop_back();
        std::pop_heap(tHeap.begin(), tHeap.end(), std::greater<>());
        const auto [tb, gb] = tHeap.back();
        tHeap.pop_back();
        tParent[tTreeOf[ga]] = next;
        tParent[tTreeOf[gb]] = next;
        tTreeOf[ga] = next++;
        tHeap.push_back({std::max(ta, tb) + 1, ga});
        std::push_heap(tHeap.begin(), tHeap.end(), std::greater<>());
    }
    // Depth of every tree node below the root (2k-2), parents first.
    std::vector<std::size_t>& depth = tTreeOf;   // reused: groups are no longer needed
    depth.assign(2 * k - 1, 0);
    for (std::size_t i = 2 * k - 2; i-- > 0;) depth[i] = depth[tParent[i]] + 1;
    for (std::size_t i = 0; i < k; ++i) tReqTimes[base + i] = depth[i];
}

void pushRequired(const Factored& f, long required, const std::vector<std::size_t>& at, std::vector<long>& rt) {
    switch (f.kind) {
    case Factored::Kind::Zero:
    case Factored::Kind::One:
        return;
    case Factored::Kind::Lit: {
        auto v = literalVar(f.lit);
        if (v < rt.size()) rt[v] = std::min(rt[v], required);
        return;
    }
    default: {
        const std::size_t base = tReqTimes.size();
        kidDepths(f, at, base);
        for (std::size_t i = 0; i < f.kids.size(); ++i)
            pushRequired(f.kids[i], required - static_cast<long>(tReqTimes[base + i]), at, rt);
        tReqTimes.resize(base);
    }
    }
}

// The leaves of `f` with their depth below its root (`below` for f itself),
// appended to `out`: the merge order is pushRequired's, so a leaf's required
// time is the root's minus its depth here.
void leafDepths(const Factored& f, std::size_t below, const std::vector<std::size_t>& at,
                std::vector<std::pair<std::uint32_t, std::uint32_t>>& out) {
    switch (f.kind) {
    case Factored::Kind::Zero:
    case Factored::Kind::One:
        return;
    case Factored::Kind::Lit:
        out.push_back({literalVar(f.lit), static_cast<std::uint32_t>(below)});
        return;
    default: {
        const std::size_t base = tReqTimes.size();
        kidDepths(f, at, base);
        for (std::size_t i = 0; i < f.kids.size(); ++i) leafDepths(f.kids[i], below + tReqTimes[base + i], at, out);
        tReqTimes.resize(base);
    }
    }
}

// A node's candidate forms, fewest gates first by construction order (Best,
// Quick, plain); `gates` beside each.
struct Candidates {
    const Factored* form[3] = {nullptr, nullptr, nullptr};
    std::size_t gates[3] = {0, 0, 0};
    int count = 0;
};

} // namespace

FormCost formCost(const Factored& f, const std::vector<std::size_t>& at) {
    FormCost c;
    c.gates = gatesOf(f);
    c.arrival = formArrival(f, at);
    return c;
}

Factored sopForm(const Cover& f) {
    auto cubeForm = [](const Cube& c) {
        Factored t;
        if (c.lits.empty()) { t.kind = Factored::Kind::One; return t; }
        if (c.lits.size() == 1) { t.kind = Factored::Kind::Lit; t.lit = c.lits[0]; return t; }
        t.kind = Factored::Kind::And;
        for (auto l : c.lits) {
            Factored k;
            k.kind = Factored::Kind::Lit;
            k.lit = l;
            t.kids.push_back(k);
        }
        return t;
    };
    Factored out;
    if (f.cubes.empty()) { out.kind = Factored::Kind::Zero; return out; }
    if (f.cubes.size() == 1) return cubeForm(f.cubes[0]);
    out.kind = Factored::Kind::Or;
    for (const Cube& c : f.cubes) out.kids.push_back(cubeForm(c));
    return out;
}

namespace {

// The candidate forms of a cover from its cache entry (factored on first use).
Candidates candidatesOf(FactorCache& fc, FactorCache::Entry& e, const Cover& cv) {
    if (!e.hasSop) {
        e.sop = sopForm(cv);
        e.sopGates = gatesOf(e.sop);
        e.hasSop = true;
    }
    Candidates c;
    // Factoring a cover of thousands of cubes costs more than every pass
    // together; such nodes are written as plain sums of products.
    if (cv.cubes.size() <= fc.maxCubes()) {
        // Best searches kernels under many literals: on the wide covers
        // of a large decoder (about 780 cubes an output at 100k terms)
        // factoring them was most of measuring a trial (F174).
        if (fc.impl().bestAllowed(cv)) {
            fc.best(e, cv);
            c.form[c.count] = &e.best, c.gates[c.count++] = e.bestGates;
        } else {
            fc.best(e, cv);   // the quick form, counted as skipped
        }
        c.form[c.count] = &e.quick, c.gates[c.count++] = e.quickGates;
    }
    c.form[c.count] = &e.sop, c.gates[c.count++] = e.sopGates;
    return c;
}

FactoredNetwork chooseForms(const net::Network& net, int maxDepth, FactorCache& fc, bool keepForms,
                            DepthSlack* slack = nullptr) {
    FactoredNetwork out;
    const std::vector<net::NodeId> order = net.topoOrder();
    const std::size_t n = net.nodeCount();
    if (keepForms) out.forms.assign(n, Factored{});

    // Candidate forms per node (from the cache: every cover is factored once).
    std::vector<Candidates> cand(n);
    for (net::NodeId v : order) {
        const Cover& cv = net.node(v).cover;
        FactorCache::Impl::Entry& e = fc.impl().entry(cv);
        cand[v] = candidatesOf(fc, e, cv);
    }
    // Phase 1: earliest-arriving forms.
    std::vector<std::size_t> atMin(n, 0);
    for (net::NodeId in : net.inputs()) atMin[in] = net.node(in).arrival;
    std::vector<const Factored*> minForm(n, nullptr);
    for (net::NodeId v : order) {
        std::size_t bestA = SIZE_MAX, bestG = SIZE_MAX;
        const Candidates& c = cand[v];
        for (int i = 0; i < c.count; ++i) {
            const std::size_t a = formArrival(*c.form[i], atMin);
            if (a < bestA || (a == bestA && c.gates[i] < bestG)) {
                bestA = a;
                bestG = c.gates[i];
                minForm[v] = c.form[i];
            }
        }
        atMin[v] = bestA;
    }
    std::size_t dMin = 0;
    for (const net::Output& o : net.outputs()) dMin = std::max(dMin, atMin[literalVar(o.driver)] + o.tail);
    const long cap = maxDepth < 0 ? static_cast<long>(dMin) : std::max<long>(maxDepth, static_cast<long>(dMin));

    // Required times through the earliest forms.
    std::vector<long> rt(n, LONG_MAX);
    for (const net::Output& o : net.outputs()) {
        auto v = literalVar(o.driver);
        rt[v] = std::min(rt[v], cap - static_cast<long>(o.tail));
    }
    for (auto it = order.rbegin(); it != order.rend(); ++it)
        if (rt[*it] != LONG_MAX) pushRequired(*minForm[*it], rt[*it], atMin, rt);
    if (slack) {
        slack->earliest = atMin;
        slack->required = rt;
        return out;
    }

    // Phase 2: fewest gates meeting the required time.
    std::vector<std::size_t> at(n, 0);
    for (net::NodeId in : net.inputs()) at[in] = net.node(in).arrival;
    for (net::NodeId v : order) {
        const Candidates& c = cand[v];
        const Factored* pick = nullptr;
        std::size_t pickA = 0, bestG = SIZE_MAX;
        for (int i = 0; i < c.count; ++i) {
            const std::size_t a = formArrival(*c.form[i], at);
            if (rt[v] != LONG_MAX && static_cast<long>(a) > rt[v]) continue;
            if (c.gates[i] < bestG || (c.gates[i] == bestG && a < pickA)) {
                bestG = c.gates[i];
                pick = c.form[i];
                pickA = a;
            }
        }
        if (!pick) {  // cannot happen by construction; keep the earliest form
            pick = minForm[v];
            pickA = formArrival(*pick, at);
            bestG = gatesOf(*pick);
        }
        at[v] = pickA;
        if (keepForms) out.forms[v] = *pick;
        ++out.metrics.nodes;
        out.metrics.gates += bestG;
        out.metrics.literals += pick->literalCount();
    }
    out.metrics.inputs = net.inputs().size();
    out.metrics.outputs = net.outputs().size();
    for (const net::Output& o : net.outputs())
        out.metrics.depth = std::max(out.metrics.depth, at[literalVar(o.driver)] + o.tail);
    return out;
}

} // namespace

FactoredNetwork factorNetwork(const net::Network& net, int maxDepth, FactorCache* cache) {
    FactorCache local;
    return chooseForms(net, maxDepth, cache ? *cache : local, true);
}

net::Metrics measureFactored(const net::Network& net, int maxDepth, FactorCache* cache) {
    FactorCache local;
    return chooseForms(net, maxDepth, cache ? *cache : local, false).metrics;
}

net::Metrics measureFactored(const net::Network& net, int maxDepth, FactorCache& fc, const MeasureBase& base,
                             MeasureMemo* memo) {
    // The same three steps as chooseForms (earliest forms, required times,
    // fewest gates meeting them), each node taken from the base's memo when
    // what it depends on is the base's.
    const std::vector<net::NodeId> order = net.topoOrder();
    const std::size_t n = net.nodeCount();
    const MeasureMemo* bm = base.net && base.memo ? base.memo : nullptr;
    const std::size_t bn = bm ? std::min(base.net->nodeCount(), bm->entry.size()) : 0;
    MeasureMemo local;
    MeasureMemo& m = memo ? *memo : local;
    m.entry.assign(n, nullptr);
    m.minForm.assign(n, nullptr);
    m.pick.assign(n, nullptr);
    m.atMin.assign(n, 0);
    m.at.assign(n, 0);
    m.gates.assign(n, 0);
    m.lits.assign(n, 0);
    m.rt.assign(n, LONG_MAX);
    m.offBegin.assign(n + 1, 0);
    m.off.clear();
    std::vector<Candidates> cand(n);
    std::vector<std::uint8_t> same(n, 0);   // cover equal to the base's at this node
    for (net::NodeId v : order) {
        const Cover& cv = net.node(v).cover;
        FactorCache::Entry* e = nullptr;
        if (v < bn && bm->entry[v] && bm->minForm[v] && base.net->isLogic(v) && base.net->node(v).cover == cv) {
            e = bm->entry[v];
            same[v] = 1;
        } else {
            e = &fc.impl().entry(cv);
        }
        m.entry[v] = e;
        cand[v] = candidatesOf(fc, *e, cv);
    }
    // The fanins of v have the same values in `now` as in the base's `was`.
    auto faninsAsBase = [&](net::NodeId v, const std::vector<std::size_t>& now, const std::vector<std::size_t>& was) {
        for (const Cube& c : net.node(v).cover.cubes)
            for (algebra::Literal l : c.lits) {
                const auto u = literalVar(l);
                if (u >= bn || now[u] != was[u]) return false;
            }
        return true;
    };
    // Phase 1: earliest-arriving forms.
    for (net::NodeId in : net.inputs()) m.atMin[in] = net.node(in).arrival;
    std::vector<std::uint8_t> clean1(n, 0);
    for (net::NodeId v : order) {
        if (same[v] && faninsAsBase(v, m.atMin, bm->atMin)) {
            clean1[v] = 1;
            m.atMin[v] = bm->atMin[v];
            m.minForm[v] = bm->minForm[v];
            continue;
        }
        std::size_t bestA = SIZE_MAX, bestG = SIZE_MAX;
        const Candidates& c = cand[v];
        for (int i = 0; i < c.count; ++i) {
            const std::size_t a = formArrival(*c.form[i], m.atMin);
            if (a < bestA || (a == bestA && c.gates[i] < bestG)) {
                bestA = a;
                bestG = c.gates[i];
                m.minForm[v] = c.form[i];
            }
        }
        m.atMin[v] = bestA;
    }
    std::size_t dMin = 0;
    for (const net::Output& o : net.outputs()) dMin = std::max(dMin, m.atMin[literalVar(o.driver)] + o.tail);
    const long cap = maxDepth < 0 ? static_cast<long>(dMin) : std::max<long>(maxDepth, static_cast<long>(dMin));

    // The leaves of each node's earliest form with their depth below it (the
    // base's where the form and its leaves' arrivals are the base's).
    std::vector<std::pair<std::uint32_t, std::uint32_t>> leaves;
    for (net::NodeId v = 0; v < n; ++v) {
        m.offBegin[v] = m.off.size();
        if (!m.minForm[v]) continue;
        if (clean1[v]) {
            m.off.insert(m.off.end(), bm->off.begin() + static_cast<std::ptrdiff_t>(bm->offBegin[v]),
                         bm->off.begin() + static_cast<std::ptrdiff_t>(bm->offBegin[v + 1]));
        } else {
            leafDepths(*m.minForm[v], 0, m.atMin, m.off);
        }
    }
    m.offBegin[n] = m.off.size();
    // Required times through the earliest forms.
    for (const net::Output& o : net.outputs()) {
        auto v = literalVar(o.driver);
        m.rt[v] = std::min(m.rt[v], cap - static_cast<long>(o.tail));
    }
    for (auto it = order.rbegin(); it != order.rend(); ++it) {
        const long r = m.rt[*it];
        if (r == LONG_MAX) continue;
        for (std::size_t k = m.offBegin[*it]; k < m.offBegin[*it + 1]; ++k) {
            const auto [u, d] = m.off[k];
            if (u < n) m.rt[u] = std::min(m.rt[u], r - static_cast<long>(d));
        }
    }

    // Phase 2: fewest gates meeting the required time.
    net::Metrics out;
    for (net::NodeId in : net.inputs()) m.at[in] = net.node(in).arrival;
    for (net::NodeId v : order) {
        if (same[v] && m.rt[v] == bm->rt[v] && faninsAsBase(v, m.at, bm->at)) {
            m.at[v] = bm->at[v];
            m.pick[v] = bm->pick[v];
            m.gates[v] = bm->gates[v];
            m.lits[v] = bm->lits[v];
        } else {
            const Candidates& c = cand[v];
            const Factored* pick = nullptr;
            std::size_t pickA = 0, bestG = SIZE_MAX;
            for (int i = 0; i < c.count; ++i) {
                const std::size_t a = formArrival(*c.form[i], m.at);
                if (m.rt[v] != LONG_MAX && static_cast<long>(a) > m.rt[v]) continue;
                if (c.gates[i] < bestG || (c.gates[i] == bestG && a < pickA)) {
                    bestG = c.gates[i];
                    pick = c.form[i];
                    pickA = a;
                }
            }
            if (!pick) {   // cannot happen by construction; keep the earliest form
                pick = m.minForm[v];
                pickA = formArrival(*pick, m.at);
                bestG = gatesOf(*pick);
            }
            m.at[v] = pickA;
            m.pick[v] = pick;
            m.gates[v] = bestG;
            m.lits[v] = pick->literalCount();
        }
        ++out.nodes;
        out.gates += m.gates[v];
        out.literals += m.lits[v];
    }
    out.inputs = net.inputs().size();
    out.outputs = net.outputs().size();
    for (const net::Output& o : net.outputs())
        out.depth = std::max(out.depth, m.at[literalVar(o.driver)] + o.tail);
    return out;
}

DepthSlack depthSlack(const net::Network& net, int maxDepth, FactorCache* cache) {
    FactorCache local;
    DepthSlack s;
    chooseForms(net, maxDepth, cache ? *cache : local, false, &s);
    return s;
}

} // namespace kerf::passes
