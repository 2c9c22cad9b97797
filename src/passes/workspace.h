// workspace.h — internal to the passes: a network being edited, with fanout
// lists, arrival times and a journal so that an edit breaking the depth
// bound is undone locally (only that edit, not the whole pass).
//
// Usage: begin(); addNode/setCover/flipNode...; commit() → true when kept.
// Arrival times follow net::sopCost (the sum-of-products depth). With a
// factor cache in the context, each node also has a factored time (the
// earliest of its sum of products and its factored forms, for covers of a
// few cubes: the forms the network is measured and written with), and an
// edit is also rejected when it makes a factored time grow above the bound:
// a sum of products can be deeper than its factored form, and a node
// already above the bound in sum-of-products terms let through edits that
// deepened the written network (F60). commit
// propagates changed arrivals to the fanouts and rejects the edit when a
// node's arrival grows above the bound.
//
// Updates are incremental: each node keeps how many of its cubes arrive at
// each time (a histogram) and how many cubes read each variable, so an edit
// that swaps a few cubes of a large cover costs the cubes it swapped, not
// the cover (see commit()).
#pragma once

#include "kerf/network/network.h"
#include "kerf/passes/pass.h"

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

namespace kerf::passes {
class FactorCache;
}

namespace kerf::passes::detail {

/// A 64-bit key mixed so that every bit of it moves the low bits of the
/// result (the finaliser of splitmix64, S. Vigna, from memory): slots of
/// open-addressing tables are taken from the low bits.
inline std::uint64_t mix64(std::uint64_t k) {
    k ^= k >> 30;
    k *= 0xBF58476D1CE4E5B9ull;
    k ^= k >> 27;
    k *= 0x94D049BB133111EBull;
    k ^= k >> 31;
    return k;
}

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

/// A well-mixed hash of a cover given cube by cube: `cubeAt(k)` gives the
/// k-th cube's literals as a (pointer, length) pair. Hashes a Cover and the
/// divisor table's packed covers alike (the same cover gives the same hash).
template <class CubeAt>
std::size_t mixedHash(std::size_t cubes, CubeAt cubeAt) {
    std::uint64_t h = 0x243f6a8885a308d3ull ^ cubes;
    for (std::size_t k = 0; k < cubes; ++k) {
        const auto [p, n] = cubeAt(k);
        for (std::size_t i = 0; i < n; ++i) {
            h = (h ^ p[i]) * 0x9e3779b97f4a7c15ull;
            h ^= h >> 29;
        }
        h = (h ^ 0xffffffffull) * 0xbf58476d1ce4e5b9ull;   // cube boundary
        h ^= h >> 31;
    }
    h ^= h >> 33;
    h *= 0xff51afd7ed558ccdull;
    h ^= h >> 33;
    return static_cast<std::size_t>(h);
}

/// mixedHash of a Cover, for the passes' large hash tables (hundreds of
/// thousands of small covers whose literals are small numbers: a plain
/// combining step gave long bucket chains there, F44).
struct MixedCoverHash {
    std::size_t operator()(const Cover& f) const noexcept {
        return mixedHash(f.cubes.size(), [&f](std::size_t k) {
            const auto& lits = f.cubes[k].lits;
            return std::pair{lits.data(), lits.size()};
        });
    }
};

/// Arrival of the root of a balanced two-input tree over leaves arriving at
/// `times` (merged two earliest first, as net::sopCost does). The times are
/// sorted in place. Empty: 0.
std::size_t balancedArrival(std::size_t* times, std::size_t count);

/// The same for leaves given as a histogram: count[t] leaves arrive at t.
std::size_t balancedArrival(const std::vector<std::uint32_t>& count);

/// Arrival of a cube's AND tree (its literals' arrivals from `at`).
std::size_t cubeArrival(const Cube& c, const std::vector<std::size_t>& at);

class Workspace {
public:
    Workspace(net::Network& net, std::size_t depthCap);
    /// The same with the context's depth bound; the edits kept are added to ctx.edits when it ends.
    Workspace(net::Network& net, PassContext& ctx);
    ~Workspace();
    Workspace(const Workspace&) = delete;
    Workspace& operator=(const Workspace&) = delete;

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
    /// Cubes whose arrival was computed by commits so far (a measure of work).
    std::size_t cubesTimed() const { return cubesTimed_; }
    /// Edits kept so far.
    std::size_t keptEdits() const { return kept_; }

private:
    void ensureSize();
    void reindex(NodeId v, const Cover& before, const Cover& after);
    void countVar(NodeId v, NodeId u, int delta);
    void setCoverRaw(NodeId v, Cover c);
    /// New arrival of v: its histogram rebuilt (full) or updated by the
    /// cubes that differ between `before` and its cover (before: null → full).
    std::size_t retime(NodeId v, const Cover* before, bool full);
    std::size_t arrivalBeforeCommit(NodeId u) const;
    /// v's factored time: the earliest of its sum of products and its
    /// factored forms over the fanins' factored times (covers of up to
    /// factorCubes_ cubes; larger ones: `sop`, its sum-of-products time).
    std::size_t factoredTime(NodeId v, std::size_t sop);

    struct CoverChange { NodeId id; Cover old; bool wasDead; };
    struct ArrivalChange { NodeId id; std::size_t old; };
    struct OutputChange { std::size_t index; Literal old; };
    struct HistChange { NodeId id; std::vector<std::uint32_t> old; bool wasValid; };

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
    std::size_t kept_ = 0;
    PassContext* ctx_ = nullptr;
    // Factored times (with a factor cache only): per node, journal, and the
    // time before this commit (preFat_, valid where fatMark_ == stamp_).
    FactorCache* factors_ = nullptr;
    std::size_t factorCubes_ = 0;
    std::vector<std::size_t> fat_, preFat_, fatTimes_;
    std::vector<std::uint32_t> fatMark_;
    std::vector<ArrivalChange> fatChanges_;
    std::size_t cubesTimed_ = 0;
    // Incremental timing: per node, cubes per arrival time (valid when
    // histValid_), and per node the (variable, cubes reading it) pairs sorted by variable.
    std::vector<std::vector<std::uint32_t>> hist_;
    std::vector<std::uint8_t> histValid_;
    std::vector<std::vector<std::pair<NodeId, std::uint32_t>>> reads_;
    std::vector<HistChange> hists_;
    // Per-commit marks (compared with stamp_): processed, arrival changed (preAt_ holds the old one),
    // must be rebuilt in full; per-edit: created, first journal entry (firstCover_).
    std::uint32_t stamp_ = 0;
    std::vector<std::uint32_t> processed_, changed_, needFull_, createdMark_, firstCoverMark_;
    std::vector<std::size_t> preAt_, firstCover_;
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
