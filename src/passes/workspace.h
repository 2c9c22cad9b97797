// workspace.h — internal to the passes: a network being edited, with fanout
// lists, arrival times and a journal so that an edit breaking the depth
// bound is undone locally (only that edit, not the whole pass).
//
// Usage: begin(); addNode/setCover/flipNode...; commit() → true when kept.
// Arrival times follow net::sopCost (the sum-of-products depth); commit
// propagates changed arrivals to the fanouts and rejects the edit when a
// node's arrival grows above the bound.
#pragma once

#include "kerf/network/network.h"
#include "kerf/passes/pass.h"

#include <cstdint>
#include <string>
#include <vector>

namespace kerf::passes::detail {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using net::NodeId;

/// Literal count of a cover.
inline std::size_t lits(const Cover& f) { return f.literalCount(); }

/// Normalise and drop contained cubes; constants simplified (literal 1 is
/// removed from cubes, cubes holding literal 0 vanish).
void canonical(Cover& f);

/// Replace every literal of var v by `lit` (negated occurrences by its complement).
Cover substituteLiteral(const Cover& f, NodeId v, Literal lit);

/// f with variable v replaced by the function g (gc: complement of g, used
/// where v appears complemented; may be null when it does not).
Cover collapseInto(const Cover& f, NodeId v, const Cover& g, const Cover* gc);

/// True when f uses var v complemented / positive.
bool usesNegated(const Cover& f, NodeId v);

/// f with the polarity of every literal of v flipped.
Cover flipVar(const Cover& f, NodeId v);

/// A byte string identifying a cover (for hash tables).
std::string coverKey(const Cover& f);

class Workspace {
public:
    Workspace(net::Network& net, std::size_t depthCap);

    net::Network& net() { return net_; }
    const Cover& cover(NodeId v) const { return net_.node(v).cover; }
    const std::vector<NodeId>& fanouts(NodeId v) const { return fanouts_[v]; }
    std::uint32_t outputRefs(NodeId v) const { return outRefs_[v]; }
    std::size_t arrival(NodeId v) const { return at_[v]; }
    bool live(NodeId v) const { return net_.isLogic(v); }
    std::size_t depthCap() const { return cap_; }

    void begin();
    NodeId addNode(Cover c);
    void setCover(NodeId v, Cover c);
    /// Replace v's cover by `complementCover` (a cover of ¬v) and flip every
    /// literal of v in fanouts and output drivers.
    void flipNode(NodeId v, Cover complementCover);
    /// Mark v dead (it must have no fanouts and drive no output).
    void kill(NodeId v);
    /// Keep the edit when no arrival grew above the bound; otherwise undo it.
    bool commit();
    void rollback();

    /// Number of edits rejected for depth so far.
    std::size_t depthRejects() const { return rejects_; }

private:
    void ensureSize();
    void indexCover(NodeId v, const Cover& c, bool add);
    void reindex(NodeId v, const Cover& before, const Cover& after);
    void setCoverRaw(NodeId v, Cover c);

    struct CoverChange { NodeId id; Cover old; bool wasDead; };
    struct ArrivalChange { NodeId id; std::size_t old; };
    struct OutputChange { std::size_t index; Literal old; };

    net::Network& net_;
    std::size_t cap_;
    std::vector<std::vector<NodeId>> fanouts_;
    std::vector<std::uint32_t> outRefs_;
    std::vector<std::size_t> at_;
    bool open_ = false;
    std::vector<CoverChange> covers_;
    std::vector<NodeId> created_;
    std::vector<ArrivalChange> arrivals_;
    std::vector<OutputChange> outputs_;
    std::vector<NodeId> touched_;
    std::vector<std::uint8_t> queued_;
    std::size_t rejects_ = 0;
};

/// f rewritten as q·lit + r with the weak division of f by d (by the single
/// cube when d has one). False when d does not divide f.
bool rewriteWith(const Cover& f, const Cover& d, Literal lit, Cover& out);

/// Extract divisor d into `targets`: a new node computing d (or `provider`
/// when non-zero: a live node whose cover is d) replaces the divided cubes.
/// The depth bound is checked for all targets at once, then target by target
/// when that fails. Returns the literal saving (≤ 0: nothing was changed),
/// with the rewritten nodes in `changed` and the new node in `created`.
long extractDivisor(Workspace& ws, const Cover& d, const std::vector<NodeId>& targets, NodeId provider,
                    std::vector<NodeId>& changed, NodeId& created);

} // namespace kerf::passes::detail
