// workspace.cpp — editing a network with local undo. The idea of keeping a
// bound by checking each local change against arrival times, and undoing
// only the change that breaks it, is common trade practice in timing-driven
// restructuring; the arrival model is net::sopCost (balanced two-input trees
// built by arrival time).
#include "workspace.h"

#include "kerf/passes/factored.h"

#include <algorithm>
#include <cstring>
#include <deque>

namespace kerf::passes::detail {

using algebra::literalNegated;
using algebra::makeLiteral;
using algebra::literalVar;
using algebra::negateLiteral;
using net::Node;

void canonical(Cover& f) {
    bool constant = false;
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits)
            if (literalVar(l) == 0) constant = true;
    if (constant) {
        std::vector<Cube> out;
        for (Cube& c : f.cubes) {
            bool zero = false;
            std::vector<Literal> ls;
            for (Literal l : c.lits) {
                if (l == net::kFalse) { zero = true; break; }
                if (l == net::kTrue) continue;
                ls.push_back(l);
            }
            if (!zero) out.push_back(Cube(std::move(ls)));
        }
        f.cubes = std::move(out);
    }
    f.normalize();
    for (const Cube& c : f.cubes)
        if (c.empty()) { f = Cover::one(); return; }
    if (f.cubes.size() > 1) algebra::removeContainedCubes(f);
}

Cover substituteLiteral(const Cover& f, NodeId v, Literal lit) {
    Cover out;
    out.cubes.reserve(f.cubes.size());
    for (const Cube& c : f.cubes) {
        std::vector<Literal> ls;
        ls.reserve(c.lits.size());
        for (Literal l : c.lits)
            ls.push_back(literalVar(l) == v ? (literalNegated(l) ? negateLiteral(lit) : lit) : l);
        out.cubes.push_back(Cube(std::move(ls)));
    }
    canonical(out);
    return out;
}

Cover collapseInto(const Cover& f, NodeId v, const Cover& g, const Cover* gc) {
    Cover out;
    for (const Cube& c : f.cubes) {
        int pol = -1;
        std::vector<Literal> rest;
        rest.reserve(c.lits.size());
        for (Literal l : c.lits) {
            if (literalVar(l) == v) pol = literalNegated(l) ? 1 : 0;
            else rest.push_back(l);
        }
        if (pol < 0) { out.cubes.push_back(c); continue; }
        const Cover& sub = pol == 0 ? g : *gc;
        for (const Cube& d : sub.cubes) {
            std::vector<Literal> ls = rest;
            ls.insert(ls.end(), d.lits.begin(), d.lits.end());
            Cube nc(std::move(ls));
            if (!nc.isContradictory()) out.cubes.push_back(std::move(nc));
        }
    }
    canonical(out);
    return out;
}

bool usesNegated(const Cover& f, NodeId v) {
    for (const Cube& c : f.cubes)
        for (Literal l : c.lits)
            if (l == algebra::makeLiteral(v, true)) return true;
    return false;
}

Cover flipVar(const Cover& f, NodeId v) {
    Cover out;
    for (const Cube& c : f.cubes) {
        std::vector<Literal> ls = c.lits;
        for (Literal& l : ls)
            if (literalVar(l) == v) l = negateLiteral(l);
        out.cubes.push_back(Cube(std::move(ls)));
    }
    out.normalize();
    return out;
}

std::string coverKey(const Cover& f) {
    std::string key;
    for (const Cube& c : f.cubes) {
        for (Literal l : c.lits) {
            char buf[sizeof(Literal)];
            std::memcpy(buf, &l, sizeof l);
            key.append(buf, sizeof buf);
        }
        key.append(sizeof(Literal), '\xff');
    }
    return key;
}

std::size_t balancedArrival(std::size_t* t, std::size_t k) {
    // Merging the two earliest leaves first: k leaves at the earliest level
    // t leave ceil(k/2) at t+1 (an odd one out pairs later with something at
    // least as late as t+1, so it behaves as if it arrived at t+1).
    if (k == 0) return 0;
    std::sort(t, t + k);
    std::size_t level = t[0], count = 0;
    for (std::size_t i = 0; i < k; ++i) {
        while (level < t[i] && count > 1) { count = (count + 1) / 2; ++level; }
        if (level < t[i]) level = t[i];
        ++count;
    }
    while (count > 1) { count = (count + 1) / 2; ++level; }
    return level;
}

std::size_t balancedArrival(const std::vector<std::uint32_t>& hist) {
    std::size_t first = 0;
    while (first < hist.size() && !hist[first]) ++first;
    if (first == hist.size()) return 0;
    std::size_t last = hist.size() - 1;
    while (!hist[last]) --last;
    std::size_t count = 0, level = first;
    for (std::size_t t = first;; ++t) {
        count += hist[t];
        if (t == last) break;
        count = (count + 1) / 2;   // carried to t+1
        level = t + 1;
    }
    while (count > 1) { count = (count + 1) / 2; ++level; }
    return level;
}

namespace {

template <class ArrivalOf>
std::size_t cubeArrivalBy(const Cube& c, ArrivalOf arrivalOf) {
    const std::size_t k = c.lits.size();
    if (k == 0) return 0;
    if (k == 1) return arrivalOf(literalVar(c.lits[0]));
    constexpr std::size_t kStack = 64;
    std::size_t stack[kStack];
    std::vector<std::size_t> heap;
    std::size_t* t = stack;
    if (k > kStack) { heap.resize(k); t = heap.data(); }
    for (std::size_t i = 0; i < k; ++i) t[i] = arrivalOf(literalVar(c.lits[i]));
    return balancedArrival(t, k);
}

} // namespace

std::size_t cubeArrival(const Cube& c, const std::vector<std::size_t>& at) {
    return cubeArrivalBy(c, [&](NodeId v) { return v < at.size() ? at[v] : std::size_t{0}; });
}

Workspace::Workspace(net::Network& net, PassContext& ctx) : Workspace(net, ctx.depthCap) {
    ctx_ = &ctx;
    if (!ctx.factors || ctx.factorTimingCubes < 2 || cap_ == kNoDepthCap) return;
    // While every node's sum of products is within the bound, the old rule
    // keeps it so, and a factored time (never later) cannot pass the bound
    // either: factored times are needed only when some node is above it.
    bool above = false;
    for (NodeId v = 0; v < net_.nodeCount() && !above; ++v) above = net_.isLogic(v) && at_[v] > cap_;
    if (!above) return;
    factors_ = ctx.factors;
    factorCubes_ = ctx.factorTimingCubes;
    fat_ = at_;
    preFat_.assign(fat_.size(), 0);
    fatMark_.assign(fat_.size(), 0);
    for (NodeId v : net_.topoOrder()) fat_[v] = factoredTime(v, at_[v]);
}

std::size_t Workspace::factoredTime(NodeId v, std::size_t sop) {
    const Cover& c = net_.node(v).cover;
    if (c.cubes.size() > factorCubes_) return sop;   // an upper bound: fanins' factored times are no later
    if (c.cubes.size() == 1) return cubeArrival(c.cubes[0], fat_);
    if (c.cubes.empty()) return 0;
    fatTimes_.clear();
    for (const Cube& q : c.cubes) fatTimes_.push_back(cubeArrival(q, fat_));
    std::size_t a = balancedArrival(fatTimes_.data(), fatTimes_.size());
    a = std::min(a, formCost(factors_->quick(c), fat_).arrival);
    return std::min(a, formCost(factors_->best(c), fat_).arrival);
}

Workspace::~Workspace() {
    if (ctx_) ctx_->edits += kept_;
}

Workspace::Workspace(net::Network& net, std::size_t depthCap) : net_(net), cap_(depthCap) {
    ensureSize();
    std::vector<NodeId> vars;
    for (NodeId v = 0; v < net_.nodeCount(); ++v) {
        if (!net_.isLogic(v)) continue;
        vars.clear();
        for (const Cube& c : net_.node(v).cover.cubes)
            for (Literal l : c.lits) vars.push_back(literalVar(l));
        std::sort(vars.begin(), vars.end());
        auto& r = reads_[v];
        for (NodeId u : vars) {
            if (!r.empty() && r.back().first == u) { ++r.back().second; continue; }
            r.push_back({u, 1});
            fanouts_[u].push_back(v);
        }
    }
    for (const net::Output& o : net_.outputs()) ++outRefs_[literalVar(o.driver)];
    at_ = net::arrivalTimes(net_);
    at_.resize(net_.nodeCount(), 0);
}

void Workspace::ensureSize() {
    std::size_t n = net_.nodeCount();
    if (fanouts_.size() < n) {
        fanouts_.resize(n);
        outRefs_.resize(n, 0);
        at_.resize(n, 0);
        queued_.resize(n, 0);
        hist_.resize(n);
        histValid_.resize(n, 0);
        reads_.resize(n);
        for (auto* m : {&processed_, &changed_, &needFull_, &createdMark_, &firstCoverMark_}) m->resize(n, 0);
        preAt_.resize(n, 0);
        firstCover_.resize(n, 0);
        if (factors_) {
            fat_.resize(n, 0);
            preFat_.resize(n, 0);
            fatMark_.resize(n, 0);
        }
    }
}

void Workspace::countVar(NodeId v, NodeId u, int delta) {
    auto& r = reads_[v];
    auto it = std::lower_bound(r.begin(), r.end(), u, [](const auto& p, NodeId x) { return p.first < x; });
    if (delta > 0) {
        if (it != r.end() && it->first == u) { ++it->second; return; }
        r.insert(it, {u, 1});
        fanouts_[u].push_back(v);
        return;
    }
    if (it == r.end() || it->first != u) return;   // cannot happen: counts mirror the cover
    if (--it->second > 0) return;
    r.erase(it);
    auto& fo = fanouts_[u];
    auto f = std::find(fo.begin(), fo.end(), v);
    if (f != fo.end()) { *f = fo.back(); fo.pop_back(); }
}

void Workspace::reindex(NodeId v, const Cover& before, const Cover& after) {
    // Only cubes that differ touch the counts (covers are sorted; if one is
    // not, equal cubes paired up still cancel, so the counts stay exact).
    const auto& a = before.cubes;
    const auto& b = after.cubes;
    std::size_t i = 0, j = 0;
    auto drop = [&](const Cube& c) { for (Literal l : c.lits) countVar(v, literalVar(l), -1); };
    auto take = [&](const Cube& c) { for (Literal l : c.lits) countVar(v, literalVar(l), +1); };
    while (i < a.size() || j < b.size()) {
        if (j == b.size() || (i < a.size() && a[i] < b[j])) drop(a[i++]);
        else if (i == a.size() || b[j] < a[i]) take(b[j++]);
        else { ++i; ++j; }
    }
}

void Workspace::begin() {
    covers_.clear();
    fatChanges_.clear();
    created_.clear();
    arrivals_.clear();
    outputs_.clear();
    touched_.clear();
    hists_.clear();
    open_ = true;
}

NodeId Workspace::addNode(Cover c) {
    NodeId id = net_.addLogic(Cover{}, {});
    ensureSize();
    reads_[id].clear();
    hist_[id].clear();
    histValid_[id] = 0;
    created_.push_back(id);
    covers_.push_back({id, Cover{}, false});
    setCoverRaw(id, std::move(c));
    touched_.push_back(id);
    return id;
}

void Workspace::setCoverRaw(NodeId v, Cover c) {
    reindex(v, net_.node(v).cover, c);
    net_.node(v).cover = std::move(c);
}

void Workspace::setCover(NodeId v, Cover c) {
    covers_.push_back({v, net_.node(v).cover, net_.node(v).dead});
    setCoverRaw(v, std::move(c));
    touched_.push_back(v);
}

void Workspace::flipNode(NodeId v, Cover comp) {
    std::vector<NodeId> fo = fanouts_[v];
    for (NodeId g : fo) setCover(g, flipVar(net_.node(g).cover, v));
    auto& outs = net_.outputs();
    for (std::size_t i = 0; i < outs.size(); ++i)
        if (literalVar(outs[i].driver) == v) {
            outputs_.push_back({i, outs[i].driver});
            outs[i].driver = negateLiteral(outs[i].driver);
        }
    setCover(v, std::move(comp));
}

void Workspace::kill(NodeId v) {
    covers_.push_back({v, net_.node(v).cover, net_.node(v).dead});
    reindex(v, net_.node(v).cover, Cover{});
    net_.node(v).cover = Cover{};
    net_.node(v).dead = true;
    histValid_[v] = 0;
}

std::size_t Workspace::arrivalBeforeCommit(NodeId u) const {
    if (u >= at_.size()) return 0;
    return changed_[u] == stamp_ ? preAt_[u] : at_[u];
}

std::size_t Workspace::retime(NodeId v, const Cover* before, bool full) {
    auto& h = hist_[v];
    hists_.push_back({v, h, histValid_[v] != 0});
    const Cover& now = net_.node(v).cover;
    auto bump = [&](std::size_t t) {
        if (t >= h.size()) h.resize(t + 1, 0);
        ++h[t];
        ++cubesTimed_;
    };
    bool rebuild = full || !before || !histValid_[v];
    if (!rebuild) {
        const auto& a = before->cubes;
        const auto& b = now.cubes;
        std::size_t i = 0, j = 0;
        auto old = [&](NodeId u) { return arrivalBeforeCommit(u); };
        while (i < a.size() || j < b.size()) {
            if (j == b.size() || (i < a.size() && a[i] < b[j])) {
                const std::size_t t = cubeArrivalBy(a[i++], old);
                ++cubesTimed_;
                if (t >= h.size() || h[t] == 0) { rebuild = true; break; }   // out of step: rebuild
                --h[t];
            } else if (i == a.size() || b[j] < a[i]) {
                bump(cubeArrival(b[j++], at_));
            } else {
                ++i;
                ++j;
            }
        }
        while (!h.empty() && h.back() == 0) h.pop_back();
    }
    if (rebuild) {
        h.clear();
        for (const Cube& c : now.cubes) bump(cubeArrival(c, at_));
    }
    histValid_[v] = 1;
    return balancedArrival(h);
}

bool Workspace::commit() {
    // Propagate arrival changes (FIFO to a fixed point; the network is a DAG).
    // A node edited in this step is re-timed by the cubes that changed, as
    // long as none of the variables its other cubes read changed arrival;
    // otherwise (or when reached only through a fanin) it is re-timed in full.
    ++stamp_;
    for (std::size_t i = 0; i < covers_.size(); ++i) {
        const NodeId id = covers_[i].id;
        if (firstCoverMark_[id] != stamp_) { firstCoverMark_[id] = stamp_; firstCover_[id] = i; }
    }
    std::deque<NodeId> work;
    for (NodeId v : created_) {
        createdMark_[v] = stamp_;
        if (!queued_[v]) { queued_[v] = 1; work.push_back(v); }
    }
    for (NodeId v : touched_)
        if (!queued_[v]) { queued_[v] = 1; work.push_back(v); }
    std::vector<NodeId> grown, fatGrown;
    while (!work.empty()) {
        NodeId v = work.front();
        work.pop_front();
        queued_[v] = 0;
        if (!net_.isLogic(v)) continue;
        const bool edited = firstCoverMark_[v] == stamp_ && !covers_[firstCover_[v]].wasDead;
        const bool full = needFull_[v] == stamp_ || createdMark_[v] == stamp_ || !edited;
        processed_[v] = stamp_;
        std::size_t a = retime(v, full ? nullptr : &covers_[firstCover_[v]].old, full);
        bool fatChanged = false;
        if (factors_) {
            // The factored time: its own journal and its own check below.
            const std::size_t f = factoredTime(v, a);
            if (f != fat_[v]) {
                fatChanged = true;
                if (fatMark_[v] != stamp_) { fatMark_[v] = stamp_; preFat_[v] = fat_[v]; }
                if (f > fat_[v] && f > cap_) fatGrown.push_back(v);
                fatChanges_.push_back({v, fat_[v]});
                fat_[v] = f;
            }
        }
        if (a == at_[v]) {
            if (fatChanged)   // larger covers' factored times are their sums of products'
                for (NodeId g : fanouts_[v])
                    if (!queued_[g] && net_.node(g).cover.cubes.size() <= factorCubes_) {
                        queued_[g] = 1;
                        work.push_back(g);
                    }
            continue;
        }
        if (a > at_[v] && a > cap_) grown.push_back(v);
        if (changed_[v] != stamp_) { changed_[v] = stamp_; preAt_[v] = at_[v]; }
        arrivals_.push_back({v, at_[v]});
        at_[v] = a;
        const bool fresh = createdMark_[v] == stamp_;
        for (NodeId g : fanouts_[v]) {
            // g's recorded cube times used v's old arrival unless v is new
            // here and g has not been timed yet in this commit.
            if (!fresh || processed_[g] == stamp_) needFull_[g] = stamp_;
            if (!queued_[g]) { queued_[g] = 1; work.push_back(g); }
        }
    }
    bool ok = true;
    if (cap_ != kNoDepthCap) {
        // A node counts only while it still matters (fanouts or outputs), and
        // only if its final arrival is above the bound and above its old one.
        for (NodeId v : grown) {
            if (at_[v] <= cap_) continue;
            if (fanouts_[v].empty() && outRefs_[v] == 0) continue;
            if (at_[v] > preAt_[v]) { ok = false; break; }
        }
        // The same for the factored time (nodes of a few cubes; F60).
        for (NodeId v : fatGrown) {
            if (!ok) break;
            if (fat_[v] <= cap_) continue;
            if (fanouts_[v].empty() && outRefs_[v] == 0) continue;
            if (fat_[v] > preFat_[v]) ok = false;
        }
    }
    if (!ok) {
        ++rejects_;
        rollback();
        return false;
    }
    open_ = false;
    ++kept_;
    return true;
}

void Workspace::rollback() {
    for (auto it = arrivals_.rbegin(); it != arrivals_.rend(); ++it) at_[it->id] = it->old;
    for (auto it = fatChanges_.rbegin(); it != fatChanges_.rend(); ++it) fat_[it->id] = it->old;
    for (auto it = hists_.rbegin(); it != hists_.rend(); ++it) {
        hist_[it->id] = std::move(it->old);
        histValid_[it->id] = it->wasValid ? 1 : 0;
    }
    for (auto it = covers_.rbegin(); it != covers_.rend(); ++it) {
        Node& node = net_.node(it->id);
        reindex(it->id, node.dead ? Cover{} : node.cover, it->wasDead ? Cover{} : it->old);
        node.cover = std::move(it->old);
        node.dead = it->wasDead;
    }
    for (NodeId id : created_) {
        reindex(id, net_.node(id).cover, Cover{});
        net_.node(id).cover = Cover{};
        net_.node(id).dead = true;
        at_[id] = 0;
        histValid_[id] = 0;
        hist_[id].clear();
    }
    auto& outs = net_.outputs();
    for (auto it = outputs_.rbegin(); it != outputs_.rend(); ++it) outs[it->index].driver = it->old;
    covers_.clear();
    created_.clear();
    arrivals_.clear();
    fatChanges_.clear();
    outputs_.clear();
    touched_.clear();
    hists_.clear();
    open_ = false;
}

/// f rewritten with divisor d (already a node, literal lit); empty optional when d does not divide f.
bool rewriteWith(const Cover& f, const Cover& d, Literal lit, Cover& out) {
    algebra::Division dv = d.cubes.size() == 1 ? algebra::divideByCube(f, d.cubes[0]) : algebra::divide(f, d);
    if (dv.quotient.isZero()) return false;
    out = algebra::add(algebra::multiply(dv.quotient, Cover::literal(lit)), dv.remainder);
    // No containment can appear: f had none, the q·lit cubes hold the new
    // literal and the remainder cubes are f's own.
    out.normalize();
    return true;
}

/// Apply an extraction of `d` into `targets` (through `provider` when it is a
/// live node computing d). Depth is checked per target. Returns the literal
/// saving (0 when nothing was done) and the changed nodes.
long extractDivisor(Workspace& ws, const Cover& d, const std::vector<net::NodeId>& targets, net::NodeId provider,
             std::vector<net::NodeId>& changed, net::NodeId& created) {
    changed.clear();
    created = 0;
    Literal lit = 0;
    bool fresh = provider == 0;
    std::vector<std::pair<net::NodeId, Cover>> plan;
    long saving = fresh ? 1 - static_cast<long>(detail::lits(d)) : 0;   // gates: L literals are L-1 gates
    for (net::NodeId f : targets) {
        if (f == provider || !ws.live(f)) continue;
        algebra::Division dv = d.cubes.size() == 1 ? algebra::divideByCube(ws.cover(f), d.cubes[0])
                                                   : algebra::divide(ws.cover(f), d);
        if (!dv.quotient.isZero()) plan.push_back({f, Cover{}});
    }
    if (plan.empty()) return 0;
    // All at once first.
    ws.begin();
    if (fresh) created = ws.addNode(d);
    lit = makeLiteral(fresh ? created : provider, false);
    long gain = saving;
    for (auto& [f, nf] : plan) {
        Cover out;
        rewriteWith(ws.cover(f), d, lit, out);
        long s = static_cast<long>(detail::lits(ws.cover(f))) - static_cast<long>(detail::lits(out));
        if (s <= 0) continue;
        gain += s;
        ws.setCover(f, std::move(out));
        changed.push_back(f);
    }
    if (gain <= 0 || changed.empty()) {
        ws.rollback();
        changed.clear();
        created = 0;
        return 0;
    }
    if (ws.commit()) return gain;
    // Depth broke somewhere: add the node, then one target at a time.
    changed.clear();
    created = 0;
    ws.begin();
    if (fresh) created = ws.addNode(d);
    ws.commit();
    lit = makeLiteral(fresh ? created : provider, false);
    gain = saving;
    std::vector<std::pair<net::NodeId, Cover>> undo;
    for (auto& [f, nf] : plan) {
        Cover out;
        rewriteWith(ws.cover(f), d, lit, out);
        long s = static_cast<long>(detail::lits(ws.cover(f))) - static_cast<long>(detail::lits(out));
        if (s <= 0) continue;
        Cover old = ws.cover(f);
        ws.begin();
        ws.setCover(f, std::move(out));
        if (ws.commit()) {
            gain += s;
            changed.push_back(f);
            undo.push_back({f, std::move(old)});
        }
    }
    if (gain <= 0) {
        for (auto& [f, old] : undo) {
            ws.begin();
            ws.setCover(f, std::move(old));
            ws.commit();   // restoring can only shorten
        }
        if (created) {
            ws.begin();
            ws.kill(created);
            ws.commit();
        }
        changed.clear();
        created = 0;
        return 0;
    }
    return gain;
}

} // namespace kerf::passes::detail
