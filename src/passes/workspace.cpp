// workspace.cpp — editing a network with local undo. The idea of keeping a
// bound by checking each local change against arrival times, and undoing
// only the change that breaks it, is common trade practice in timing-driven
// restructuring; the arrival model is net::sopCost (balanced two-input trees
// built by arrival time).
#include "workspace.h"

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

Workspace::Workspace(net::Network& net, std::size_t depthCap) : net_(net), cap_(depthCap) {
    ensureSize();
    for (NodeId v = 0; v < net_.nodeCount(); ++v)
        if (net_.isLogic(v)) indexCover(v, net_.node(v).cover, true);
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
    }
}

namespace {
std::vector<NodeId> coverVars(const Cover& c) {
    std::vector<NodeId> vs;
    for (const Cube& cube : c.cubes)
        for (Literal l : cube.lits) vs.push_back(literalVar(l));
    std::sort(vs.begin(), vs.end());
    vs.erase(std::unique(vs.begin(), vs.end()), vs.end());
    return vs;
}
} // namespace

void Workspace::indexCover(NodeId v, const Cover& c, bool add) {
    for (NodeId u : coverVars(c)) {
        auto& fo = fanouts_[u];
        auto it = std::find(fo.begin(), fo.end(), v);
        if (add) {
            if (it == fo.end()) fo.push_back(v);
        } else if (it != fo.end()) {
            *it = fo.back();
            fo.pop_back();
        }
    }
}

void Workspace::reindex(NodeId v, const Cover& before, const Cover& after) {
    // Only variables that appear or disappear touch the fanout lists.
    std::vector<NodeId> a = coverVars(before), b = coverVars(after), gone, come;
    std::set_difference(a.begin(), a.end(), b.begin(), b.end(), std::back_inserter(gone));
    std::set_difference(b.begin(), b.end(), a.begin(), a.end(), std::back_inserter(come));
    for (NodeId u : gone) {
        auto& fo = fanouts_[u];
        auto it = std::find(fo.begin(), fo.end(), v);
        if (it != fo.end()) { *it = fo.back(); fo.pop_back(); }
    }
    for (NodeId u : come) {
        auto& fo = fanouts_[u];
        if (std::find(fo.begin(), fo.end(), v) == fo.end()) fo.push_back(v);
    }
}

void Workspace::begin() {
    covers_.clear();
    created_.clear();
    arrivals_.clear();
    outputs_.clear();
    touched_.clear();
    open_ = true;
}

NodeId Workspace::addNode(Cover c) {
    NodeId id = net_.addLogic(Cover{}, {});
    ensureSize();
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
    indexCover(v, net_.node(v).cover, false);
    net_.node(v).cover = Cover{};
    net_.node(v).dead = true;
}

bool Workspace::commit() {
    // Propagate arrival changes (FIFO to a fixed point; the network is a DAG).
    std::deque<NodeId> work;
    for (NodeId v : touched_)
        if (!queued_[v]) { queued_[v] = 1; work.push_back(v); }
    std::vector<NodeId> grown;
    std::size_t steps = 0;
    while (!work.empty()) {
        NodeId v = work.front();
        work.pop_front();
        queued_[v] = 0;
        ++steps;
        if (!net_.isLogic(v)) continue;
        std::size_t a = net::sopCost(net_.node(v).cover, at_).arrival;
        if (a == at_[v]) continue;
        if (a > at_[v] && a > cap_) grown.push_back(v);
        arrivals_.push_back({v, at_[v]});
        at_[v] = a;
        for (NodeId g : fanouts_[v])
            if (!queued_[g]) { queued_[g] = 1; work.push_back(g); }
    }
    bool ok = true;
    if (cap_ != kNoDepthCap) {
        // A node counts only while it still matters (fanouts or outputs), and
        // only if its final arrival is above the bound and above its old one.
        for (NodeId v : grown) {
            if (at_[v] <= cap_) continue;
            if (fanouts_[v].empty() && outRefs_[v] == 0) continue;
            std::size_t old = at_[v];
            for (const ArrivalChange& ch : arrivals_)
                if (ch.id == v) { old = ch.old; break; }
            if (at_[v] > old) { ok = false; break; }
        }
    }
    if (!ok) {
        ++rejects_;
        rollback();
        return false;
    }
    open_ = false;
    return true;
}

void Workspace::rollback() {
    for (auto it = arrivals_.rbegin(); it != arrivals_.rend(); ++it) at_[it->id] = it->old;
    for (auto it = covers_.rbegin(); it != covers_.rend(); ++it) {
        Node& node = net_.node(it->id);
        if (node.dead == it->wasDead && !node.dead) {
            reindex(it->id, node.cover, it->old);
        } else {
            if (!node.dead) indexCover(it->id, node.cover, false);
            if (!it->wasDead) indexCover(it->id, it->old, true);
        }
        node.cover = std::move(it->old);
        node.dead = it->wasDead;
    }
    for (NodeId id : created_) {
        indexCover(id, net_.node(id).cover, false);
        net_.node(id).cover = Cover{};
        net_.node(id).dead = true;
        at_[id] = 0;
    }
    auto& outs = net_.outputs();
    for (auto it = outputs_.rbegin(); it != outputs_.rend(); ++it) outs[it->index].driver = it->old;
    covers_.clear();
    created_.clear();
    arrivals_.clear();
    outputs_.clear();
    touched_.clear();
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
