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
