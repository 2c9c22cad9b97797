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
#include <queue>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Factored;
using algebra::literalVar;

struct FactorCache::Impl {
    std::unordered_map<std::string, Factored> best, quick;
};

FactorCache::FactorCache() : impl_(std::make_unique<Impl>()) {}
FactorCache::~FactorCache() = default;

const Factored& FactorCache::best(const Cover& f) {
    std::string key = detail::coverKey(f);
    auto it = impl_->best.find(key);
    if (it != impl_->best.end()) return it->second;
    return impl_->best.emplace(std::move(key), algebra::factor(f, algebra::FactorMethod::Best)).first->second;
}

const Factored& FactorCache::quick(const Cover& f) {
    std::string key = detail::coverKey(f);
    auto it = impl_->quick.find(key);
    if (it != impl_->quick.end()) return it->second;
    return impl_->quick.emplace(std::move(key), algebra::factor(f, algebra::FactorMethod::Quick)).first->second;
}

std::size_t FactorCache::size() const { return impl_->best.size() + impl_->quick.size(); }

namespace {

constexpr std::size_t kMaxFactoredCubes = 1000;

// Merge arrival times two earliest first; depthOut[i] gets how many gates lie
// between item i and the root.
std::size_t balance(const std::vector<std::size_t>& times, std::vector<std::size_t>* depthOut) {
    if (times.empty()) return 0;
    using Item = std::pair<std::size_t, std::size_t>;  // time, group
    std::priority_queue<Item, std::vector<Item>, std::greater<>> q;
    std::vector<std::vector<std::size_t>> groups(times.size());
    if (depthOut) depthOut->assign(times.size(), 0);
    for (std::size_t i = 0; i < times.size(); ++i) {
        q.push({times[i], i});
        groups[i] = {i};
    }
    while (q.size() > 1) {
        auto [ta, ga] = q.top(); q.pop();
        auto [tb, gb] = q.top(); q.pop();
        if (depthOut) {
            for (std::size_t i : groups[ga]) ++(*depthOut)[i];
            for (std::size_t i : groups[gb]) ++(*depthOut)[i];
            groups[ga].insert(groups[ga].end(), groups[gb].begin(), groups[gb].end());
            groups[gb].clear();
        }
        q.push({std::max(ta, tb) + 1, ga});
    }
    return q.top().first;
}

std::size_t arrivalOf(const std::vector<std::size_t>& at, std::uint32_t v) { return v < at.size() ? at[v] : 0; }

// Required time of every leaf variable of `f` given the root's required time.
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
        std::vector<std::size_t> times;
        for (const Factored& k : f.kids) times.push_back(formCost(k, at).arrival);
        std::vector<std::size_t> depth;
        balance(times, &depth);
        for (std::size_t i = 0; i < f.kids.size(); ++i)
            pushRequired(f.kids[i], required - static_cast<long>(depth[i]), at, rt);
    }
    }
}

} // namespace

FormCost formCost(const Factored& f, const std::vector<std::size_t>& at) {
    FormCost c;
    switch (f.kind) {
    case Factored::Kind::Zero:
    case Factored::Kind::One:
        return c;
    case Factored::Kind::Lit:
        c.arrival = arrivalOf(at, literalVar(f.lit));
        return c;
    default: {
        std::vector<std::size_t> times;
        for (const Factored& k : f.kids) {
            FormCost kc = formCost(k, at);
            c.gates += kc.gates;
            times.push_back(kc.arrival);
        }
        if (f.kids.size() > 1) c.gates += f.kids.size() - 1;
        c.arrival = balance(times, nullptr);
        return c;
    }
    }
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

FactoredNetwork factorNetwork(const net::Network& net, int maxDepth, FactorCache* cache) {
    FactorCache local;
    FactorCache& fc = cache ? *cache : local;
    FactoredNetwork out;
    const std::vector<net::NodeId> order = net.topoOrder();
    const std::size_t n = net.nodeCount();
    out.forms.assign(n, Factored{});

    // Candidate forms per node, fewest gates first.
    std::vector<std::vector<const Factored*>> cand(n);
    std::vector<Factored> sops(n);
    for (net::NodeId v : order) {
        const Cover& cv = net.node(v).cover;
        sops[v] = sopForm(cv);
        // Factoring a cover of thousands of cubes costs more than every pass
        // together; such nodes are written as plain sums of products.
        if (cv.cubes.size() > kMaxFactoredCubes) cand[v] = {&sops[v]};
        else cand[v] = {&fc.best(cv), &fc.quick(cv), &sops[v]};
    }
    // Phase 1: earliest-arriving forms.
    std::vector<std::size_t> atMin(n, 0);
    std::vector<const Factored*> minForm(n, nullptr);
    for (net::NodeId v : order) {
        std::size_t bestA = SIZE_MAX, bestG = SIZE_MAX;
        for (const Factored* f : cand[v]) {
            FormCost c = formCost(*f, atMin);
            if (c.arrival < bestA || (c.arrival == bestA && c.gates < bestG)) {
                bestA = c.arrival;
                bestG = c.gates;
                minForm[v] = f;
            }
        }
        atMin[v] = bestA;
    }
    std::size_t dMin = 0;
    for (const net::Output& o : net.outputs()) dMin = std::max(dMin, atMin[literalVar(o.driver)]);
    const long cap = maxDepth < 0 ? static_cast<long>(dMin) : std::max<long>(maxDepth, static_cast<long>(dMin));

    // Required times through the earliest forms.
    std::vector<long> rt(n, LONG_MAX);
    for (const net::Output& o : net.outputs()) {
        auto v = literalVar(o.driver);
        rt[v] = std::min(rt[v], cap);
    }
    for (auto it = order.rbegin(); it != order.rend(); ++it)
        if (rt[*it] != LONG_MAX) pushRequired(*minForm[*it], rt[*it], atMin, rt);

    // Phase 2: fewest gates meeting the required time.
    std::vector<std::size_t> at(n, 0);
    for (net::NodeId v : order) {
        const Factored* pick = nullptr;
        FormCost pc;
        std::size_t bestG = SIZE_MAX;
        for (const Factored* f : cand[v]) {
            FormCost c = formCost(*f, at);
            if (rt[v] != LONG_MAX && static_cast<long>(c.arrival) > rt[v]) continue;
            if (c.gates < bestG || (c.gates == bestG && c.arrival < pc.arrival)) {
                bestG = c.gates;
                pick = f;
                pc = c;
            }
        }
        if (!pick) {  // cannot happen by construction; keep the earliest form
            pick = minForm[v];
            pc = formCost(*pick, at);
        }
        at[v] = pc.arrival;
        out.forms[v] = *pick;
        ++out.metrics.nodes;
        out.metrics.gates += pc.gates;
        out.metrics.literals += pick->literalCount();
    }
    out.metrics.inputs = net.inputs().size();
    out.metrics.outputs = net.outputs().size();
    for (const net::Output& o : net.outputs())
        out.metrics.depth = std::max(out.metrics.depth, at[literalVar(o.driver)]);
    return out;
}

net::Metrics measureFactored(const net::Network& net, int maxDepth, FactorCache* cache) {
    return factorNetwork(net, maxDepth, cache).metrics;
}

} // namespace kerf::passes
