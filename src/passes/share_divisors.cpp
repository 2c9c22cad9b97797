// share_divisors.cpp — the technique of the `extract-divisors` and `extract-kernels` moves: extract divisors shared by
// several nodes (or repeated inside one) as new nodes.
//
// Background. Multi-level algebraic synthesis treats covers as polynomials
// and looks for common divisors: kernels (cube-free quotients by a cube)
// were introduced by R. K. Brayton and C. T. McMullen, "The decomposition
// and factorization of Boolean expressions", ISCAS 1982, and surveyed in
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 — both from memory. Restricting the divisors to two-cube sums (each pair of cubes
// of a node, with their common part removed) and two-literal cubes gives a
// candidate set that is found in one sweep and can be updated incrementally
// after every extraction: J. Rajski and J. Vasudevamurthy, "The
// testability-preserving concurrent decomposition and factorization of
// Boolean expressions", IEEE TCAD 1992 (from memory).
//
// Method "pairs" (default): every node contributes, for each pair of its
// cubes ci = b·di, cj = b·dj (b their common cube), the divisor di + dj
// with saving |di|+|dj|+|b|−1, and for every pair of literals in a cube the
// single-cube divisor {a,b} with saving 1. A divisor's weight is its total
// saving minus its own literals (nothing when an existing node already
// computes it). The heaviest is extracted, the changed nodes' contributions
// are recomputed, and the loop goes on while some weight is positive.
// Method "kernels": every node's kernels are enumerated (algebra::kernels);
// a kernel is valued by actually dividing every node it was found in; the
// best is extracted, and the round repeats.
#include "kerf/passes/share_divisors.h"

#include "workspace.h"

#include <algorithm>
#include <climits>
#include <queue>
#include <unordered_map>
#include <stdexcept>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalVar;
using algebra::makeLiteral;

namespace {

using detail::Workspace;

// ---- two-cube and two-literal divisors -------------------------------------

// A candidate divisor. Its cover (one or two cubes) lives in the table's
// literal arena and its node list in the table's list pool: on a network of
// wide sums of products nearly every pair of cubes of a node gives a
// divisor of its own (22 million on the 100k `sopwide` network), and a
// Cover and two vectors per divisor held about 300 bytes each (F149).
struct Divisor {
    long saving = 0;
    std::uint32_t at = 0;            // its first literal in the arena
    std::uint32_t first = 0;         // literals of its first cube
    std::uint32_t second = 0;        // literals of its second cube
    std::uint32_t version = 0;
    // Nodes that held the divisor when they were (re-)entered, newest
    // first; entries of nodes since changed are not removed one by one
    // (that costs the list's length per change); duplicates are dropped
    // each time the list has doubled. A stale entry costs one failed division.
    std::uint32_t nodes = UINT32_MAX;   // head of its list in the pool (UINT32_MAX: empty)
    std::uint32_t count = 0;            // entries in the list
    std::uint32_t compactAt = 32;       // list length at which duplicates are next dropped
    std::uint8_t cubes = 0;             // 1 or 2
    bool provided = false;              // some node's cover was d (see PairTable::providers_)
    bool blocked = false;
};

struct Contribution {
    std::vector<std::pair<int, long>> items;   // divisor, saving
    int provides = -1;
    // The cubes the items were counted from (sorted), kept when every pair
    // of them was counted: a later change is then counted by its changed
    // cubes only (see PairTable::compute).
    std::vector<Cube> cubes;
};

class PairTable {
public:
    PairTable(Workspace& ws, const ShareDivisorsOptions& opts)
        : ws_(ws), opts_(opts) {}

    long weight(int id) const {
        const Divisor& dv = divs_[static_cast<std::size_t>(id)];
        // Counted in two-input gates: a new node of L literals costs L-1 gates.
        long cost = liveProvider(id) ? 0 : static_cast<long>(dv.first + dv.second) - 1;
        return dv.saving - cost;
    }

    net::NodeId liveProvider(int id) const {
        if (!divs_[static_cast<std::size_t>(id)].provided) return 0;
        auto it = providers_.find(id);
        if (it == providers_.end()) return 0;
        for (net::NodeId p : it->second)
            if (ws_.live(p) && sameCover(id, ws_.cover(p))) return p;
        return 0;
    }

    /// Divisor id's cover.
    Cover cover(int id) const {
        const Divisor& dv = divs_[static_cast<std::size_t>(id)];
        Cover d;
        d.cubes.resize(dv.cubes);
        const Literal* p = arena_.data() + dv.at;
        d.cubes[0].lits.assign(p, p + dv.first);
        if (dv.cubes == 2) d.cubes[1].lits.assign(p + dv.first, p + dv.first + dv.second);
        return d;
    }

    /// The nodes on divisor id's list (unsorted, possibly repeated or stale).
    std::vector<net::NodeId> nodesOf(int id) const {
        std::vector<net::NodeId> out;
        out.reserve(divs_[static_cast<std::size_t>(id)].count);
        for (std::uint32_t e = divs_[static_cast<std::size_t>(id)].nodes; e != UINT32_MAX; e = pool_[e].next)
            out.push_back(pool_[e].node);
        return out;
    }

    // f's divisors and savings, summed per divisor and sorted by divisor.
    // `old` is f's contribution as last counted. When both covers count
    // every pair of cubes (3..divisors-pair-max-cubes cubes), only the pairs
    // and literal pairs of cubes that left or came are counted, as a
    // difference: an extraction rewrites a few cubes of each target, and
    // recounting all pairs of every target after every extraction grew with
    // the square of the cubes per node (3k decoder: 43 CPU s for one
    // divisor trial). The pairs are visited in the same order as a full
    // count, and pairs of unchanged cubes already have their divisors, so
    // new divisors get the same ids (and ties break the same way).
    Contribution compute(net::NodeId f, const Contribution& old) {
        const Cover& F = ws_.cover(f);
        const std::size_t n = F.cubes.size();
        auto counted = [&](std::size_t k) { return k >= 3 && k <= opts_.maxCubesForPairs; };
        if (!counted(n) || !counted(old.cubes.size())) return compute(f);
        // Both counts must take the same kinds of pairs (see cubePairsOf).
        const bool cubePairs = cubePairsOf(n);
        if (cubePairs != cubePairsOf(old.cubes.size())) return compute(f);
        // Which cubes left (of old) and came (of F): a multiset difference.
        std::vector<std::size_t> order(n);
        for (std::size_t i = 0; i < n; ++i) order[i] = i;
        std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return F.cubes[a] < F.cubes[b]; });
        std::vector<std::uint8_t> came(n, 0), left(old.cubes.size(), 0);
        std::size_t i = 0, j = 0, changes = 0;
        while (i < old.cubes.size() || j < n) {
            if (j == n || (i < old.cubes.size() && old.cubes[i] < F.cubes[order[j]])) left[i++] = 1, ++changes;
            else if (i == old.cubes.size() || F.cubes[order[j]] < old.cubes[i]) came[order[j++]] = 1, ++changes;
            else ++i, ++j;
        }
        Contribution c;
        c.cubes.reserve(n);
        for (std::size_t k : order) c.cubes.push_back(F.cubes[k]);
        if (changes == 0) {
            c.items = old.items;
            return c;
        }
        std::vector<std::pair<int, long>> delta;
        auto pairs = [&](const std::vector<Cube>& cubes, const std::vector<std::uint8_t>& mark, long sign) {
            for (std::size_t a = 0; a < cubes.size(); ++a)
                for (std::size_t b = a + 1; b < cubes.size(); ++b)
                    if (mark[a] || mark[b]) cubePair(cubes[a], cubes[b], delta, sign);
        };
        auto literals = [&](const std::vector<Cube>& cubes, const std::vector<std::uint8_t>& mark, long sign) {
            for (std::size_t a = 0; a < cubes.size(); ++a)
                if (mark[a]) literalPairs(cubes[a], delta, sign);
        };
        // Counted in the order of a full count: cube pairs of F, then literal pairs.
        if (cubePairs) {
            pairs(old.cubes, left, -1);
            pairs(F.cubes, came, 1);
        }
        literals(old.cubes, left, -1);
        literals(F.cubes, came, 1);
        finish(delta);
        // items + delta, dropping divisors no pair gives any more (savings are positive).
        c.items.reserve(old.items.size() + delta.size());
        i = 0, j = 0;
        while (i < old.items.size() || j < delta.size()) {
            if (j == delta.size() || (i < old.items.size() && old.items[i].first < delta[j].first)) {
                c.items.push_back(old.items[i++]);
            } else if (i == old.items.size() || delta[j].first < old.items[i].first) {
                c.items.push_back(delta[j++]);
            } else {
                const long v = old.items[i].second + delta[j].second;
                if (v != 0) c.items.push_back({old.items[i].first, v});
                ++i, ++j;
            }
        }
        return c;
    }

    // The same counted from scratch.
    Contribution compute(net::NodeId f) {
        Contribution c;
        const Cover& F = ws_.cover(f);
        const bool selfDouble = F.cubes.size() == 2 && algebra::commonCube(F).empty();
        const bool selfSingle = F.cubes.size() == 1 && F.cubes[0].lits.size() == 2;
        if (selfDouble || selfSingle) {
            c.provides = idOf(F);
        }
        if (F.cubes.size() >= 2 && F.cubes.size() <= opts_.maxCubesForPairs && cubePairsOf(F.cubes.size())) {
            for (std::size_t i = 0; i < F.cubes.size(); ++i)
                for (std::size_t j = i + 1; j < F.cubes.size(); ++j) {
                    if (selfDouble) continue;   // the node's only pair is itself
                    cubePair(F.cubes[i], F.cubes[j], c.items, 1);
                }
        }
        // Large nodes (their pairs would be recounted after every extraction)
        // leave common cubes to extract-cubes.
        if (F.cubes.size() > opts_.maxCubesForPairs) return finish(c);
        for (const Cube& cube : F.cubes) {
            if (selfSingle) continue;
            literalPairs(cube, c.items, 1);
        }
        if (F.cubes.size() >= 3) {
            c.cubes = F.cubes;
            std::sort(c.cubes.begin(), c.cubes.end());
        }
        return finish(c);
    }

    // Does a node of k cubes give two-cube divisors? Up to
    // divisors-cube-pair-max-cubes (0: up to divisors-pair-max-cubes);
    // larger nodes, up to divisors-pair-max-cubes, give two-literal
    // divisors only. The two-cube divisors of a node grow with the square
    // of its cubes, and a re-entered node recounts every pair of a changed
    // cube: on the 100k `sopwide` network (2,500 nodes of 40 cubes) that
    // was nearly all of the fast effort's time, and no two-cube divisor was
    // extracted there (every divisor taken was a literal pair).
    bool cubePairsOf(std::size_t k) const {
        return opts_.maxCubesForCubePairs == 0 || k <= opts_.maxCubesForCubePairs;
    }

    // The two-cube divisor of cubes a, b (their common cube removed) and its saving, times sign.
    void cubePair(const Cube& ca, const Cube& cb, std::vector<std::pair<int, long>>& items, long sign) {
        const auto& a = ca.lits;
        const auto& b = cb.lits;
        base_.clear();
        std::set_intersection(a.begin(), a.end(), b.begin(), b.end(), std::back_inserter(base_));
        if (base_.size() == a.size() || base_.size() == b.size()) return;   // one side empty
        // The divisor is built in reused storage (no allocation per pair once warm).
        Cover& d = pairCover_;
        d.cubes.resize(2);
        d.cubes[0].lits.clear();
        d.cubes[1].lits.clear();
        std::set_difference(a.begin(), a.end(), base_.begin(), base_.end(), std::back_inserter(d.cubes[0].lits));
        std::set_difference(b.begin(), b.end(), base_.begin(), base_.end(), std::back_inserter(d.cubes[1].lits));
        long s = static_cast<long>(d.cubes[0].lits.size() + d.cubes[1].lits.size() + base_.size()) - 1;
        d.normalize();
        const int id = idOf(d);
        if (id >= 0) items.push_back({id, sign * s});
    }

    // The single-cube divisors of two literals of a cube (saving 1 each), times sign.
    void literalPairs(const Cube& cube, std::vector<std::pair<int, long>>& items, long sign) {
        if (cube.lits.size() < 2 || cube.lits.size() > opts_.maxCubeForLiteralPairs) return;
        for (std::size_t i = 0; i < cube.lits.size(); ++i)
            for (std::size_t j = i + 1; j < cube.lits.size(); ++j)
                if (const int id = pairId(cube.lits[i], cube.lits[j]); id >= 0) items.push_back({id, sign});
    }

    static Contribution finish(Contribution& c) {
        finish(c.items);
        return std::move(c);
    }
    // Sorted by divisor, savings summed per divisor (zero sums dropped).
    static void finish(std::vector<std::pair<int, long>>& items) {
        std::sort(items.begin(), items.end());
        std::size_t k = 0;
        for (std::size_t i = 0; i < items.size(); ++i) {
            if (k && items[k - 1].first == items[i].first) items[k - 1].second += items[i].second;
            else items[k++] = items[i];
        }
        k = static_cast<std::size_t>(std::remove_if(items.begin(), items.begin() + static_cast<std::ptrdiff_t>(k),
                                                    [](const auto& e) { return e.second == 0; }) - items.begin());
        items.resize(k);
    }

    /// Enter f, or re-enter it after it changed: only divisors whose saving
    /// from f changed are touched (a changed node keeps most of its pairs).
    void add(net::NodeId f) {
        if (f >= contrib_.size()) contrib_.resize(ws_.net().nodeCount());
        Contribution& old = contrib_[f];
        Contribution next = compute(f, old);
        std::size_t i = 0, j = 0;
        while (i < old.items.size() || j < next.items.size()) {
            if (j == next.items.size() || (i < old.items.size() && old.items[i].first < next.items[j].first)) {
                Divisor& dv = divs_[static_cast<std::size_t>(old.items[i].first)];
                dv.saving -= old.items[i].second;
                touched_.push_back(old.items[i].first);
                ++i;
            } else if (i == old.items.size() || next.items[j].first < old.items[i].first) {
                note(f, next.items[j].first, next.items[j].second);
                ++j;
            } else {
                if (old.items[i].second != next.items[j].second) {
                    divs_[static_cast<std::size_t>(old.items[i].first)].saving -= old.items[i].second;
                    note(f, next.items[j].first, next.items[j].second);
                }
                ++i;
                ++j;
            }
        }
        if (old.provides != next.provides) {
            if (old.provides >= 0) {
                auto& pv = providers_[old.provides];
                pv.erase(std::remove(pv.begin(), pv.end(), f), pv.end());
                touched_.push_back(old.provides);
            }
            if (next.provides >= 0) {
                providers_[next.provides].push_back(f);
                divs_[static_cast<std::size_t>(next.provides)].provided = true;
                touched_.push_back(next.provides);
            }
        }
        old = std::move(next);
    }

    const std::vector<int>& touchedSoFar() const { return touched_; }

    std::vector<int> takeTouched() {
        std::vector<int> t;
        t.swap(touched_);
        std::sort(t.begin(), t.end());
        t.erase(std::unique(t.begin(), t.end()), t.end());
        return t;
    }

    Divisor& div(int id) { return divs_[static_cast<std::size_t>(id)]; }
    /// Does f's current contribution count divisor id?
    bool holds(net::NodeId f, int id) const {
        if (f >= contrib_.size()) return false;
        const auto& it = contrib_[f].items;
        auto p = std::lower_bound(it.begin(), it.end(), std::pair<int, long>{id, LONG_MIN});
        return p != it.end() && p->first == id;
    }
    std::size_t size() const { return divs_.size(); }
    /// Limit divisors-max-candidates: the table takes no new divisor.
    bool full() const { return opts_.maxCandidates > 0 && divs_.size() >= opts_.maxCandidates; }

private:
    // A new divisor of cover d (one or two cubes: a pair of cubes, a literal
    // pair, or a node's own cover when it is one of these).
    int store(const Cover& d) {
        if (d.cubes.empty() || d.cubes.size() > 2 || arena_.size() + d.literalCount() > UINT32_MAX ||
            divs_.size() >= static_cast<std::size_t>(INT32_MAX))
            throw std::length_error("divisor table: a divisor of more than two cubes, or too many divisors");
        Divisor dv;
        dv.at = static_cast<std::uint32_t>(arena_.size());
        dv.cubes = static_cast<std::uint8_t>(d.cubes.size());
        dv.first = static_cast<std::uint32_t>(d.cubes[0].lits.size());
        dv.second = d.cubes.size() == 2 ? static_cast<std::uint32_t>(d.cubes[1].lits.size()) : 0;
        for (const Cube& c : d.cubes) arena_.insert(arena_.end(), c.lits.begin(), c.lits.end());
        divs_.push_back(dv);
        return static_cast<int>(divs_.size() - 1);
    }
    // Ids of divisors: -1 for a divisor not yet in a full table (it is not
    // counted, wherever it occurs, so counts stay consistent).
    // Literal pairs are looked up in an open-addressing table of their own
    // (linear probing, at most half full): a node-based hash map cost an
    // allocation per pair and a cache miss per lookup, about a twentieth of
    // the 100k decoder's run (engine17). Ids are given in order of first
    // sight, as before.
    int pairId(Literal a, Literal b) {
        const std::uint64_t key = (std::uint64_t{a} << 32) | b;
        if (2 * (pairCount_ + 1) > pairKeys_.size()) growPairs();
        const std::size_t mask = pairKeys_.size() - 1;
        for (std::size_t k = pairSlot(key, mask);; k = (k + 1) & mask) {
            if (pairKeys_[k] == key) return pairIds_[k];
            if (pairKeys_[k] != kNoPair) continue;
            if (full()) return -1;
            const int id = static_cast<int>(divs_.size());
            store(Cover{{Cube({a, b})}});
            pairKeys_[k] = key;
            pairIds_[k] = id;
            ++pairCount_;
            return id;
        }
    }
    static constexpr std::uint64_t kNoPair = ~std::uint64_t{0};
    static std::size_t pairSlot(std::uint64_t key, std::size_t mask) {
        return static_cast<std::size_t>(detail::mix64(key)) & mask;
    }
    void growPairs() {
        std::vector<std::uint64_t> keys(std::max<std::size_t>(64, 2 * pairKeys_.size()), kNoPair);
        std::vector<int> ids(keys.size(), -1);
        const std::size_t mask = keys.size() - 1;
        for (std::size_t i = 0; i < pairKeys_.size(); ++i) {
            if (pairKeys_[i] == kNoPair) continue;
            std::size_t k = pairSlot(pairKeys_[i], mask);
            while (keys[k] != kNoPair) k = (k + 1) & mask;
            keys[k] = pairKeys_[i];
            ids[k] = pairIds_[i];
        }
        pairKeys_.swap(keys);
        pairIds_.swap(ids);
    }
    std::size_t hashOf(int id) const {
        const Divisor& dv = divs_[static_cast<std::size_t>(id)];
        const Literal* p = arena_.data() + dv.at;
        return detail::mixedHash(dv.cubes, [&](std::size_t k) {
            return k == 0 ? std::pair<const Literal*, std::size_t>{p, dv.first}
                          : std::pair<const Literal*, std::size_t>{p + dv.first, dv.second};
        });
    }
    static std::size_t hashOf(const Cover& d) {
        return detail::mixedHash(d.cubes.size(), [&](std::size_t k) {
            return std::pair<const Literal*, std::size_t>{d.cubes[k].lits.data(), d.cubes[k].lits.size()};
        });
    }
    bool sameCover(int id, const Cover& d) const {
        const Divisor& dv = divs_[static_cast<std::size_t>(id)];
        if (d.cubes.size() != dv.cubes || d.cubes[0].lits.size() != dv.first ||
            (dv.cubes == 2 && d.cubes[1].lits.size() != dv.second))
            return false;
        const Literal* p = arena_.data() + dv.at;
        if (!std::equal(d.cubes[0].lits.begin(), d.cubes[0].lits.end(), p)) return false;
        return dv.cubes == 1 || std::equal(d.cubes[1].lits.begin(), d.cubes[1].lits.end(), p + dv.first);
    }
    // Two-cube divisors by their cover: an open-addressing set of ids
    // (linear probing, at most half full), hashed and compared through the
    // arena (F128, F149: no copy of any cover).
    int idOf(const Cover& d) {
        if (d.cubes.size() == 1 && d.cubes[0].lits.size() == 2) return pairId(d.cubes[0].lits[0], d.cubes[0].lits[1]);
        // Looked up by the cover itself (a string key per pair of cubes was
        // the largest cost of this technique on the 10k decoder, F44).
        // Each slot keeps the high half of its divisor's hash: a probe that
        // meets another divisor is told apart without reading that divisor
        // (two cache misses, its record and its literals; on the 30k
        // `sopwide` network these lookups were a third of the fast effort's
        // time, engine21).
        if (2 * (indexed_ + 1) > slots_.size()) grow();
        const std::size_t mask = slots_.size() - 1;
        const std::size_t h = hashOf(d);
        const auto tag = static_cast<std::uint32_t>(static_cast<std::uint64_t>(h) >> 32);
        for (std::size_t k = h & mask;; k = (k + 1) & mask) {
            if (slots_[k] < 0) {
                if (full()) return -1;
                const int id = store(d);
                slots_[k] = id;
                slotTags_[k] = tag;
                ++indexed_;
                return id;
            }
            if (slotTags_[k] == tag && sameCover(slots_[k], d)) return slots_[k];
        }
    }
    void grow() {
        std::vector<int> old(std::max<std::size_t>(64, 2 * slots_.size()), -1);
        old.swap(slots_);
        slotTags_.assign(slots_.size(), 0);
        const std::size_t mask = slots_.size() - 1;
        for (int id : old) {
            if (id < 0) continue;
            const std::size_t h = hashOf(id);
            std::size_t k = h & mask;
            while (slots_[k] >= 0) k = (k + 1) & mask;
            slots_[k] = id;
            slotTags_[k] = static_cast<std::uint32_t>(static_cast<std::uint64_t>(h) >> 32);
        }
    }
    void note(net::NodeId f, int id, long s) {
        Divisor& dv = divs_[static_cast<std::size_t>(id)];
        dv.saving += s;
        if (dv.count >= dv.compactAt) {   // amortised: the threshold doubles
            std::vector<net::NodeId> ns = nodesOf(id);
            std::sort(ns.begin(), ns.end());
            ns.erase(std::unique(ns.begin(), ns.end()), ns.end());
            // Rewritten into the list's first entries; the rest go back to the pool.
            std::uint32_t e = dv.nodes, last = UINT32_MAX;
            for (net::NodeId u : ns) {
                pool_[e].node = u;
                last = e;
                e = pool_[e].next;
            }
            pool_[last].next = UINT32_MAX;
            while (e != UINT32_MAX) {
                const std::uint32_t next = pool_[e].next;
                pool_[e].next = free_;
                free_ = e;
                e = next;
            }
            dv.count = static_cast<std::uint32_t>(ns.size());
            dv.compactAt = static_cast<std::uint32_t>(2 * ns.size() + 32);
        }
        if (dv.nodes == UINT32_MAX || pool_[dv.nodes].node != f) {
            std::uint32_t e = free_;
            if (e != UINT32_MAX) {
                free_ = pool_[e].next;
            } else {
                if (pool_.size() >= UINT32_MAX - 1) throw std::length_error("divisor table: too many node entries");
                e = static_cast<std::uint32_t>(pool_.size());
                pool_.push_back({});
            }
            pool_[e] = {f, dv.nodes};
            dv.nodes = e;
            ++dv.count;
        }
        touched_.push_back(id);
    }

    Workspace& ws_;
    const ShareDivisorsOptions& opts_;
    std::vector<Divisor> divs_;
    std::vector<Literal> arena_;     // the divisors' literals, cube after cube
    struct ListEntry { net::NodeId node; std::uint32_t next; };
    std::vector<ListEntry> pool_;    // the divisors' node lists
    std::uint32_t free_ = UINT32_MAX;   // entries dropped by compaction, for reuse
    std::vector<int> slots_;         // the two-cube divisors' index (-1: empty)
    std::vector<std::uint32_t> slotTags_;   // beside each slot: the high half of its divisor's hash
    std::size_t indexed_ = 0;
    std::unordered_map<int, std::vector<net::NodeId>> providers_;   // divisor -> nodes whose cover was it
    std::vector<std::uint64_t> pairKeys_;   // literal pairs' index (kNoPair: empty slot)
    std::vector<int> pairIds_;
    std::size_t pairCount_ = 0;
    std::vector<Contribution> contrib_;
    std::vector<int> touched_;
    std::vector<Literal> base_;   // scratch of compute()
    Cover pairCover_;             // scratch of compute()
};

void runPairs(Workspace& ws, const ShareDivisorsOptions& opts, PassContext& ctx) {
    PairTable table(ws, opts);
    net::Network& net = ws.net();
    if (!ctx.focus) {
        for (net::NodeId v : net.topoOrder()) table.add(v);
    } else {
        // Changed region: the marked nodes' divisors, then every node that
        // can hold one of them (it reads each of the divisor's variables, so
        // it is a reader of the one with the fewest readers).
        std::vector<std::uint8_t> entered(net.nodeCount(), 0);
        const std::vector<net::NodeId> order = net.topoOrder();
        for (net::NodeId v : order)
            if (ctx.inFocus(v)) { table.add(v); entered[v] = 1; }
        std::vector<std::uint8_t> scan(net.nodeCount(), 0);
        for (int id : table.touchedSoFar()) {
            const Cover d = table.cover(id);
            net::NodeId fewest = 0;
            for (const Cube& c : d.cubes)
                for (Literal l : c.lits)
                    if (!fewest || ws.fanouts(literalVar(l)).size() < ws.fanouts(fewest).size()) fewest = literalVar(l);
            if (fewest) scan[fewest] = 1;
        }
        for (net::NodeId u = 0; u < scan.size(); ++u) {
            if (!scan[u]) continue;
            for (net::NodeId f : ws.fanouts(u)) entered[f] |= 2;
        }
        for (net::NodeId v : order)
            if (entered[v] == 2) table.add(v);
    }
    struct Entry { long w; int id; std::uint32_t version; };
    auto cmp = [](const Entry& a, const Entry& b) { return a.w < b.w || (a.w == b.w && a.id > b.id); };
    std::priority_queue<Entry, std::vector<Entry>, decltype(cmp)> heap(cmp);
    auto push = [&](int id) {
        Divisor& dv = table.div(id);
        ++dv.version;
        long w = table.weight(id);
        if (w > 0 && !dv.blocked) heap.push({w, id, dv.version});
    };
    for (int id : table.takeTouched()) push(id);
    long extracted = 0, reused = 0, saved = 0, singles = 0, failed = 0;
    std::vector<net::NodeId> changed;
    while (!heap.empty() && static_cast<std::size_t>(extracted + reused) < opts.maxExtractions) {
        Entry e = heap.top();
        heap.pop();
        Divisor& dv = table.div(e.id);
        if (e.version != dv.version || dv.blocked) continue;
        std::vector<net::NodeId> targets = table.nodesOf(e.id);
        std::sort(targets.begin(), targets.end());
        targets.erase(std::unique(targets.begin(), targets.end()), targets.end());
        targets.erase(std::remove_if(targets.begin(), targets.end(), [&](net::NodeId f) { return !table.holds(f, e.id); }),
                      targets.end());
        net::NodeId provider = table.liveProvider(e.id);
        Cover d = table.cover(e.id);
        net::NodeId created = 0;
        long gain = detail::extractDivisor(ws, d, targets, provider, changed, created);
        if (gain <= 0) {
            table.div(e.id).blocked = true;
            ++failed;
            continue;
        }
        (provider ? reused : extracted) += 1;
        if (d.cubes.size() == 1) ++singles;
        saved += gain;
        for (net::NodeId f : changed) table.add(f);
        if (created) table.add(created);
        for (int id : table.takeTouched()) push(id);
    }
    ctx.stats.add("extracted", extracted);
    ctx.stats.add("cube-divisors", singles);
    ctx.stats.add("reused-nodes", reused);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("not-applied", failed);
    ctx.stats.add("candidates", static_cast<long long>(table.size()));
    if (table.full()) ctx.stats.add("limit-hit:divisors-max-candidates", 1);
    if (!heap.empty() && static_cast<std::size_t>(extracted + reused) >= opts.maxExtractions)
        ctx.stats.add("limit-hit:divisors-max-extractions", 1);
}

// ---- kernels ---------------------------------------------------------------

void runKernels(Workspace& ws, const ShareDivisorsOptions& opts, PassContext& ctx) {
    net::Network& net = ws.net();
    long extracted = 0, reused = 0, saved = 0, rounds = 0;
    algebra::KernelOptions kopts;
    kopts.maxKernels = opts.maxKernelsPerNode;
    kopts.maxWork = opts.kernelWork;
    for (int round = 0; round < 4; ++round) {
        ++rounds;
        struct Cand { Cover k; std::vector<net::NodeId> nodes; net::NodeId provider = 0; long value = 0; };
        std::unordered_map<std::string, std::size_t> index;
        std::vector<Cand> cands;
        for (net::NodeId f : net.topoOrder()) {
            const Cover& F = ws.cover(f);
            if (F.cubes.size() < 2 || F.cubes.size() > 400) continue;
            for (const algebra::KernelPair& kp : algebra::kernels(F, kopts)) {
                if (kp.kernel.cubes.size() < 2) continue;
                auto [it, fresh] = index.emplace(detail::coverKey(kp.kernel), cands.size());
                if (fresh) cands.push_back(Cand{kp.kernel, {}, 0, 0});
                Cand& c = cands[it->second];
                if (kp.cokernel.empty() && kp.kernel == F) c.provider = f;
                else if (c.nodes.empty() || c.nodes.back() != f) c.nodes.push_back(f);
            }
        }
        auto value = [&](const Cand& c) {
            net::NodeId prov = (c.provider && ws.live(c.provider) && ws.cover(c.provider) == c.k) ? c.provider : 0;
            long v = prov ? 0 : 1 - static_cast<long>(detail::lits(c.k));
            for (net::NodeId f : c.nodes) {
                if (!ws.live(f) || f == prov) continue;
                Cover out;
                if (!detail::rewriteWith(ws.cover(f), c.k, makeLiteral(static_cast<std::uint32_t>(net.nodeCount()), false), out))
                    continue;
                long s = static_cast<long>(detail::lits(ws.cover(f))) - static_cast<long>(detail::lits(out));
                if (s > 0) v += s;
            }
            return v;
        };
        using Item = std::pair<long, std::size_t>;
        std::priority_queue<Item> heap;
        for (std::size_t i = 0; i < cands.size(); ++i) {
            if (cands[i].nodes.empty()) continue;
            long v = value(cands[i]);
            if (v > 0) heap.push({v, i});
        }
        long roundSaved = 0;
        std::vector<net::NodeId> changed;
        while (!heap.empty()) {
            auto [v, i] = heap.top();
            heap.pop();
            long now = value(cands[i]);
            if (now <= 0) continue;
            if (now < v) { heap.push({now, i}); continue; }
            Cand& c = cands[i];
            net::NodeId prov = (c.provider && ws.live(c.provider) && ws.cover(c.provider) == c.k) ? c.provider : 0;
            net::NodeId created = 0;
            long gain = detail::extractDivisor(ws, c.k, c.nodes, prov, changed, created);
            if (gain <= 0) continue;
            (prov ? reused : extracted) += 1;
            saved += gain;
            roundSaved += gain;
        }
        if (roundSaved == 0) break;
    }
    ctx.stats.add("kernel-extracted", extracted);
    ctx.stats.add("kernel-reused", reused);
    ctx.stats.add("kernel-literals-saved", saved);
    ctx.stats.add("kernel-rounds", rounds);
}

} // namespace

void shareDivisors(net::Network& net, const ShareDivisorsOptions& opts, PassContext& ctx) {
    Workspace ws(net, ctx);
    if (opts.method != ShareDivisorsOptions::Method::Pairs) runKernels(ws, opts, ctx);
    if (opts.method != ShareDivisorsOptions::Method::Kernels) runPairs(ws, opts, ctx);
    ctx.stats.add("depth-rejects", static_cast<long long>(ws.depthRejects()));
}

} // namespace kerf::passes
