// kerf/passes/pass.h — what every restructuring technique shares: the
// context it runs in (depth bound, verbosity, statistics).
//
// A pass is a function that rewrites a network in place. Every pass keeps
// these invariants: outputs keep their names, order and functions; inputs are
// untouched; nodes are only added (with empty hints) or marked dead, never
// renumbered. Each pass states in its header what it needs and preserves.
#pragma once

#include "kerf/network/network.h"

#include <cstddef>
#include <cstdint>
#include <limits>
#include <string>
#include <utility>
#include <vector>

namespace kerf::passes {

class FactorCache;

/// Named counters a pass reports (kept in the order they were first touched).
class PassStats {
public:
    void add(const std::string& name, long long amount = 1);
    long long get(const std::string& name) const;
    const std::vector<std::pair<std::string, long long>>& items() const { return items_; }
    void clear() { items_.clear(); }
    /// "name=value name=value ..."
    std::string str() const;

private:
    std::vector<std::pair<std::string, long long>> items_;
};

inline constexpr std::size_t kNoDepthCap = std::numeric_limits<std::size_t>::max();

/// The context a pass runs in.
struct PassContext {
    /// Bound on the depth of the network (net::arrivalTimes: sums of products;
    /// see `factors` below). A pass never raises a node's arrival above it (a node already above it
    /// may not get later). kNoDepthCap: unbounded.
    std::size_t depthCap = kNoDepthCap;
    int verbose = 0;
    PassStats stats;
    /// Edits the passes run in this context kept (0: the network is as it was).
    std::size_t edits = 0;
    /// When set, the depth bound times each node of 2 to `factorTimingCubes`
    /// cubes by the earliest of its sum of products and its factored forms
    /// (as the written network is measured), not by the sum of products alone.
    FactorCache* factors = nullptr;
    std::size_t factorTimingCubes = 0;
    /// The changed region (set by the engine after its opening, see
    /// engine.cpp): when set, a technique takes its candidates only from the
    /// nodes marked here (each technique's header says how), and values them
    /// against the whole network. Nodes added since (ids past the end) count
    /// as marked. Null: every node is a candidate.
    const std::vector<std::uint8_t>* focus = nullptr;
    bool inFocus(net::NodeId v) const { return !focus || v >= focus->size() || (*focus)[v] != 0; }
};

} // namespace kerf::passes
