// kerf/passes/factored.h — `final-factor`: the factored form of every node,
// as the writer prints it, and the figures counted on those forms.
//
// Each node gets algebra::factor(cover, Best) unless that would push the
// network deeper than the bound, in which case the node keeps the form with
// the earliest arrival among {Best, Quick, the plain sum of products}.
// Covers of more cubes than the cache's maxCubes() (the engine's limit
// factor-max-cubes) are not factored (plain sum of products), and covers of
// more than bestMaxCubes() (limit factor-best-max-cubes) get only the quick
// form, not Best. The
// writer prints exactly these forms, so the summary and the targets count
// exactly what is written.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/network/network.h"

#include <memory>
#include <vector>

namespace kerf::passes {

/// Caches factored forms by cover across calls (passes change few nodes).
class FactorCache {
public:
    FactorCache();
    ~FactorCache();
    FactorCache(const FactorCache&) = delete;
    FactorCache& operator=(const FactorCache&) = delete;
    const algebra::Factored& best(const algebra::Cover& f);
    const algebra::Factored& quick(const algebra::Cover& f);
    /// Number of factorings done (each cover and method at most once).
    std::size_t size() const;
    /// Covers of more cubes are written as plain sums of products (default 1000).
    void setMaxCubes(std::size_t cubes);
    std::size_t maxCubes() const;
    /// Covers of more cubes get the quick form only, not the best one
    /// (limit factor-best-max-cubes; 0: no bound). best() returns the quick form there.
    void setBestMaxCubes(std::size_t cubes);
    std::size_t bestMaxCubes() const;
    /// Covers given the quick form only because of setBestMaxCubes, so far.
    std::size_t bestSkipped() const;

    struct Impl;
    Impl& impl() { return *impl_; }
    struct Entry;
    /// best()/quick() on an entry already looked up (factored.cpp).
    const algebra::Factored& best(Entry& e, const algebra::Cover& f);
    const algebra::Factored& quick(Entry& e, const algebra::Cover& f);

private:
    std::unique_ptr<Impl> impl_;
};

/// The factored form of every node (indexed by node id; Zero for inputs,
/// dead nodes and the constant).
struct FactoredNetwork {
    std::vector<algebra::Factored> forms;
    net::Metrics metrics;     ///< counted on `forms`: gates, literals, depth, nodes
};

/// Choose and count each node's factored form. maxDepth < 0: the depth
/// reachable with the earliest-arriving forms (factoring never deepens the
/// network); otherwise Best is used wherever it keeps the depth within
/// max(maxDepth, that earliest depth).
FactoredNetwork factorNetwork(const net::Network& net, int maxDepth = -1, FactorCache* cache = nullptr);

/// Figures counted on the factored forms: a k-input AND/OR in the tree is
/// k-1 two-input gates, inverters are free, depth balanced by arrival time.
net::Metrics measureFactored(const net::Network& net, int maxDepth = -1, FactorCache* cache = nullptr);

/// What one measurement found per node (indexed by node id), kept so that
/// the measurement of a network derived from it (nodes only added or marked
/// dead, as every technique keeps them) redoes only the nodes that differ:
/// a node whose cover equals the base's takes the base's cache entry (no
/// hash lookup), and when its fanins' arrivals (and its required time) are
/// the base's too, its earliest form, the depths of that form's leaves, and
/// its chosen form with its gates and arrival. Each node then costs a pass
/// over its cover's literals instead of walks over its forms' trees (on the
/// 100k decoder, measuring every trial was a quarter of the engine).
struct MeasureMemo {
    std::vector<FactorCache::Entry*> entry;
    std::vector<const algebra::Factored*> minForm, pick;
    std::vector<std::size_t> atMin, at, gates, lits;
    std::vector<long> rt;
    /// The leaves of minForm[v] with their depth below its root: off[offBegin[v] .. offBegin[v+1]).
    std::vector<std::size_t> offBegin;
    std::vector<std::pair<std::uint32_t, std::uint32_t>> off;
};

/// A network measured before and its memo (either null: none).
struct MeasureBase {
    const net::Network* net = nullptr;
    const MeasureMemo* memo = nullptr;
};

/// measureFactored with a base whose unchanged nodes are not measured again;
/// fills `memo` (when given) for this network, to be the base of later
/// measurements. The figures are measureFactored's, always.
net::Metrics measureFactored(const net::Network& net, int maxDepth, FactorCache& cache, const MeasureBase& base,
                             MeasureMemo* memo);

/// Per node, the earliest arrival reachable with the forms that arrive
/// first, and the latest arrival that keeps every output within
/// max(maxDepth, the earliest depth) through those forms (LONG_MAX where no
/// output is reached). A region cut from the network gets its inputs'
/// arrivals and its outputs' tails from these.
struct DepthSlack {
    std::vector<std::size_t> earliest;
    std::vector<long> required;
};
DepthSlack depthSlack(const net::Network& net, int maxDepth, FactorCache* cache = nullptr);

/// Gates and arrival of one factored form whose literals arrive at `arrival`.
struct FormCost {
    std::size_t gates = 0;
    std::size_t arrival = 0;
};
FormCost formCost(const algebra::Factored& f, const std::vector<std::size_t>& arrival);

/// A sum of products written as a factored form (OR of ANDs).
algebra::Factored sopForm(const algebra::Cover& f);

} // namespace kerf::passes
