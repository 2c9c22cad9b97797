// share_cubes.cpp — the technique of the `extract-cubes` move: extract cubes common to several
// cubes of the network.
//
// Background. A cube that divides many cubes (in one node or across nodes)
// is computed once as a new node: with the cube I found in k cubes, the
// network saves k·(|I|−1) − |I| literals. Finding common cubes is the
// rectangle-covering view of the cube–literal matrix of the survey
// R. K. Brayton, G. D. Hachtel, A. L. Sangiovanni-Vincentelli, "Multilevel logic synthesis", Proc. IEEE 78(2), 1990 (from memory). Here the
// candidate cubes are the intersections of pairs of cubes that share at
// least two literals (every prime rectangle's row set starts from such a
// pair); each candidate is valued against the current network when it is
// taken (lazy greedy), so earlier extractions are accounted for.
#include "kerf/passes/share_cubes.h"

#include "regions.h"
#include "workspace.h"

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <memory>
#include <queue>
#include <unordered_map>

namespace kerf::passes {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalVar;

namespace {

/// A cube's sorted literals where they are stored (a table's arena, a cover).
struct LitView {
    const Literal* p = nullptr;
    std::uint32_t n = 0;
    const Literal* begin() const { return p; }
    const Literal* end() const { return p + n; }
    std::size_t size() const { return n; }
    Literal operator[](std::size_t i) const { return p[i]; }
    Literal back() const { return p[n - 1]; }
};

/// Partners of cube i in one sorted occurrence list: the cubes after i (each
/// pair once, from its first cube), and with a changed region also the cubes
/// before i that lie outside it (a pair of which only the later cube is in
/// the region is seen from that one). At most `cap` entries over all lists.
/// `start`: where the cubes after i begin in o (o.size() + 1: not known, found here).
template <class InRegion, class Take>
void scanPartners(const std::vector<std::uint32_t>& o, std::uint32_t i, bool region, std::size_t cap,
                  std::size_t& scanned, InRegion inRegion, Take take, std::size_t start = SIZE_MAX) {
    const auto from = start <= o.size() ? o.begin() + static_cast<std::ptrdiff_t>(start)
                                        : std::upper_bound(o.begin(), o.end(), i);
    for (auto it = from; it != o.end(); ++it) {
        take(*it);
        if (++scanned > cap) return;
    }
    if (!region) return;
    for (auto it = o.begin(); it != from; ++it) {
        if (*it == i || inRegion(*it)) {
            if (++scanned > cap) return;
            continue;
        }
        take(*it);
        if (++scanned > cap) return;
    }
}

/// The first position at or after `lo` in sorted o whose entry is at least
/// x: a galloping search from lo.
std::size_t gallopAtLeast(const std::vector<std::uint32_t>& o, std::size_t lo, std::uint32_t x) {
    const std::size_t n = o.size();
    if (lo >= n || o[lo] >= x) return lo;
    std::size_t below = lo, step = 1, hi = lo + 1;   // o[below] < x
    while (hi < n && o[hi] < x) {
        below = hi;
        step *= 2;
        hi = lo + step;
    }
    if (hi > n) hi = n;
    return static_cast<std::size_t>(std::lower_bound(o.begin() + static_cast<std::ptrdiff_t>(below) + 1,
                                                     o.begin() + static_cast<std::ptrdiff_t>(hi), x) -
                                    o.begin());
}

/// The first position at or after `lo` in sorted o whose entry is above i,
/// when every entry before lo is at most i: a galloping search from lo. The
/// candidate loop meets the cubes in increasing order, so each literal's
/// position only moves forward (a binary search over the whole list per
/// cube and literal was a quarter of the in-place extraction's time on the
/// 100k decoder, engine17).
std::size_t gallopAbove(const std::vector<std::uint32_t>& o, std::size_t lo, std::uint32_t i) {
    return gallopAtLeast(o, lo, i + 1);   // i is a cube index, below the number of cubes
}

/// A candidate cube held by `holders` cubes: the literals its extraction saves at most.
long candidateBound(const Cube& c, long holders) { return holders * static_cast<long>(c.lits.size() - 1); }

/// Keeps the `limit` candidates with the largest bounds (in no particular order); true when
/// some were dropped.
bool keepBest(std::vector<std::pair<long, Cube>>& ranked, std::size_t limit) {
    if (ranked.size() <= limit) return false;
    std::nth_element(ranked.begin(), ranked.begin() + static_cast<std::ptrdiff_t>(limit), ranked.end(),
                     [](const auto& a, const auto& b) { return a.first > b.first; });
    ranked.resize(limit);
    return true;
}

// Saving of extracting cube I now (in two-input gates), the nodes it applies
// to, and a provider (a node whose cover is exactly I). `work` counts cubes looked at.
long valueOf(detail::Workspace& ws, const Cube& I, const std::vector<net::NodeId>* nodes,
             std::vector<net::NodeId>& targets, net::NodeId& provider, long& work) {
    targets.clear();
    provider = 0;
    // Scan the given nodes, or the fanouts of the variable with the fewest.
    const std::vector<net::NodeId>* fewest = nodes;
    for (Literal l : I.lits) {
        if (nodes) break;
        const auto& fo = ws.fanouts(literalVar(l));
        if (!fewest || fo.size() < fewest->size()) fewest = &fo;
    }
    long count = 0;
    for (net::NodeId f : *fewest) {
        if (!ws.live(f)) continue;
        const Cover& F = ws.cover(f);
        work += static_cast<long>(F.cubes.size());
        if (F.cubes.size() == 1 && F.cubes[0] == I) { provider = f; continue; }
        long k = 0;
        for (const Cube& c : F.cubes)
            if (c.hasAllOf(I)) ++k;
        if (k) { count += k; targets.push_back(f); }
    }
    long w = static_cast<long>(I.lits.size()) - 1;
    return count * w - (provider ? 0 : static_cast<long>(I.lits.size()) - 1);
}

/// The entries common to every sorted list of `lists` (F256). The shortest
/// list is taken first, and a list much longer than what is left is searched
/// by galloping from the previous hit rather than walked: on a network
/// lowered from a wide case statement, the literals of a two-literal
/// candidate are each read by thousands of cubes while the candidate is held
/// by a few, and walking both lists per candidate was a quarter of the
/// 100k decoder's region-by-region restructuring (scale_bench.py's
/// decoder, `--effort fast`). The same set as intersecting in any order.
std::vector<std::uint32_t> intersectLists(std::vector<const std::vector<std::uint32_t>*>& lists) {
    if (lists.empty()) return {};
    std::sort(lists.begin(), lists.end(), [](const auto* a, const auto* b) { return a->size() < b->size(); });
    std::vector<std::uint32_t> acc = *lists[0], next;
    for (std::size_t k = 1; k < lists.size() && !acc.empty(); ++k) {
        const auto& o = *lists[k];
        next.clear();
        if (acc.size() * 8 < o.size()) {
            std::size_t pos = 0;
            for (std::uint32_t x : acc) {
                pos = gallopAtLeast(o, pos, x);
                if (pos == o.size()) break;
                if (o[pos] == x) next.push_back(x);
            }
        } else {
            std::set_intersection(acc.begin(), acc.end(), o.begin(), o.end(), std::back_inserter(next));
        }
        acc.swap(next);
    }
    return acc;
}

// Indexed cubes holding every literal of I (sorted occurrence lists).
std::vector<std::uint32_t> indexedCubes(const Cube& I, const std::unordered_map<Literal, std::vector<std::uint32_t>>& occ) {
    std::vector<const std::vector<std::uint32_t>*> lists;
    for (Literal l : I.lits) {
        const auto it = occ.find(l);
        if (it == occ.end()) return {};
        lists.push_back(&it->second);
    }
    return intersectLists(lists);
}


// ---- in place, through a cube-literal index (large networks) -------------------
//
// On a network of a few hundred covers of hundreds of cubes each (a large
// decoder), rewriting each target's whole cover per extraction and valuing
// candidates by scanning covers made one move cost the extractions times the
// cover width (F44). Here every cube of the network sits once in a table
// with an index from literal to the cubes holding it; a candidate keeps the
// cubes that held it when indexed (cubes only lose literals, so no other
// old cube can come to hold it), is valued by checking those, and an
// extraction edits exactly those cubes in place. Covers are written back
// once, at the end. The depth bound is kept per target node on the sums of
// products: a node may get later only up to the bound and only when no
// other node reads it (its readers' times are not re-propagated), which is
// stricter than the workspace's check, never looser.
//
// The cubes' literals live in blocks of one arena, in the table's order, not
// in a heap vector per cube (F326): the table of the 100k decoder's input
// holds 100,000 cubes, and the candidate search reads a partner's literals
// for every pair it meets. An extraction only shortens a cube (|I| literals
// become one), so it rewrites the cube's literals where they are.
class CubeTable {
public:
    struct Rec {
        net::NodeId node;
        Literal* at;                 // n sorted literals in the arena
        std::uint32_t n;
        std::uint32_t arrival;       // as last timed (an upper bound once fanins got earlier)
        bool live;
        LitView lits() const { return {at, n}; }
    };

    CubeTable(net::Network& net, std::size_t cap) : net_(net), cap_(cap) {
        // The times of net::arrivalTimes, on the one topological order.
        const std::vector<net::NodeId> order = net.topoOrder();
        at_.assign(net.nodeCount(), 0);
        for (net::NodeId in : net.inputs()) at_[in] = net.node(in).arrival;
        std::size_t literals = 0, count = 0;
        for (net::NodeId v : order) {
            const net::SopCost sc = net::sopCost(net.node(v).cover, at_);
            at_[v] = sc.arrival;
            for (const Cube& c : net.node(v).cover.cubes) literals += c.lits.size();
            count += net.node(v).cover.cubes.size();
        }
        reserveArena(literals);
        cubes_.reserve(count);
        grow();
        for (net::NodeId v : order) {
            for (const Cube& c : net.node(v).cover.cubes) {
                for (Literal l : c.lits) read_[literalVar(l)] = 1;
                addCube(v, c.lits);
            }
            nodes_.push_back(v);
        }
        reindex();
    }

    std::vector<Rec>& cubes() { return cubes_; }
    const std::vector<Rec>& cubes() const { return cubes_; }
    const std::vector<std::uint32_t>& holding(Literal l) const { return l < occ_.size() ? occ_[l] : none_; }
    std::size_t cubeCount(net::NodeId v) const { return byNode_[v].size(); }

    /// Rebuild the index from the live cubes (drops cubes that lost a literal).
    void reindex() {
        for (auto& o : occ_) o.clear();
        for (std::uint32_t id = 0; id < cubes_.size(); ++id) {
            const Rec& r = cubes_[id];
            if (!r.live || r.n < 2) continue;
            for (Literal l : r.lits()) occ_[l].push_back(id);
        }
    }

    /// Extract I from the holder cubes still holding it (provider: a node
    /// whose only cube is I, or 0). Returns the literal saving (0: nothing done).
    long extract(const Cube& I, const std::vector<std::uint32_t>& holders, net::NodeId provider, long& rejects) {
        const std::size_t w = I.lits.size() - 1;
        std::size_t ax = 0;
        if (provider) ax = at_[provider];
        else for (Literal l : I.lits) tmp_.push_back(at_[literalVar(l)]), void();
        if (!provider) {
            ax = detail::balancedArrival(tmp_.data(), tmp_.size());
            tmp_.clear();
        }
        // Holder cubes by node (holders are sorted by id, not by node).
        plan_.clear();
        for (std::uint32_t id : holders) {
            const Rec& r = cubes_[id];
            if (!r.live || r.node == provider || !std::includes(r.at, r.at + r.n, I.lits.begin(), I.lits.end()))
                continue;
            plan_.push_back({r.node, id});
        }
        std::sort(plan_.begin(), plan_.end());
        long gain = provider ? 0 : -static_cast<long>(w);
        accepted_.clear();
        for (std::size_t i = 0; i < plan_.size();) {
            const net::NodeId v = plan_[i].first;
            std::size_t j = i;
            while (j < plan_.size() && plan_[j].first == v) ++j;
            // The node's time with its holder cubes re-timed.
            std::vector<std::uint32_t> h = hist_[v];
            for (std::size_t k = i; k < j; ++k) {
                const Rec& r = cubes_[plan_[k].second];
                --h[r.arrival];
                const std::size_t t = arrivalWithout(r.lits(), I, ax);
                if (t >= h.size()) h.resize(t + 1, 0);
                ++h[t];
            }
            const std::size_t a = detail::balancedArrival(h);
            if (a <= at_[v] || (a <= cap_ && !read_[v])) {
                for (std::size_t k = i; k < j; ++k) accepted_.push_back(plan_[k].second);
                gain += static_cast<long>((j - i) * w);
            } else {
                ++rejects;
            }
            i = j;
        }
        if (accepted_.empty() || gain <= 0) return 0;
        net::NodeId x = provider;
        if (!x) {
            x = net_.addLogic(Cover{}, {});
            grow();
            at_[x] = ax;
            addCube(x, I.lits);
            nodes_.push_back(x);
            touched_[x] = 1;
            const std::uint32_t id = static_cast<std::uint32_t>(cubes_.size() - 1);
            for (Literal l : I.lits) occ_[l].push_back(id);   // ids grow: lists stay sorted
        }
        read_[x] = 1;
        const Literal xl = algebra::makeLiteral(x, false);
        std::sort(accepted_.begin(), accepted_.end());
        for (std::uint32_t id : accepted_) {
            Rec& r = cubes_[id];
            --hist_[r.node][r.arrival];
            rest_.clear();
            std::set_difference(r.at, r.at + r.n, I.lits.begin(), I.lits.end(), std::back_inserter(rest_));
            rest_.insert(std::upper_bound(rest_.begin(), rest_.end(), xl), xl);
            std::copy(rest_.begin(), rest_.end(), r.at);   // shorter: |I| >= 2 literals became one
            r.n = static_cast<std::uint32_t>(rest_.size());
            r.arrival = static_cast<std::uint32_t>(cubeTime(r.lits()));
            bump(r.node, r.arrival);
            if (r.n >= 2) occ_[xl].push_back(id);   // stale entries of I's literals are filtered on use
            touched_[r.node] = 1;
        }
        for (std::size_t i = 0; i < accepted_.size(); ++i) {
            const net::NodeId v = cubes_[accepted_[i]].node;
            at_[v] = detail::balancedArrival(hist_[v]);
        }
        return gain;
    }

    /// Write the edited covers back into the network.
    void writeBack() {
        for (net::NodeId v : nodes_) {
            if (!touched_[v]) continue;
            Cover f;
            for (std::uint32_t id : byNode_[v])
                if (cubes_[id].live) f.cubes.push_back(Cube(std::vector<Literal>(cubes_[id].at, cubes_[id].at + cubes_[id].n)));
            f.normalize();
            net_.node(v).cover = std::move(f);
        }
    }

private:
    void grow() {
        const std::size_t n = net_.nodeCount();
        at_.resize(n, 0);
        read_.resize(n, 0);
        hist_.resize(n);
        byNode_.resize(n);
        touched_.resize(n, 0);
        occ_.resize(2 * n);
    }
    std::size_t cubeTime(LitView lits) {
        if (lits.size() == 1) return at_[literalVar(lits[0])];
        tmp_.clear();
        for (Literal l : lits) tmp_.push_back(at_[literalVar(l)]);
        const std::size_t t = detail::balancedArrival(tmp_.data(), tmp_.size());
        tmp_.clear();
        return t;
    }
    // Time of cube `lits` with I's literals replaced by one arriving at ax.
    std::size_t arrivalWithout(LitView lits, const Cube& I, std::size_t ax) {
        tmp_.clear();
        tmp_.push_back(ax);
        for (Literal l : lits)
            if (!std::binary_search(I.lits.begin(), I.lits.end(), l)) tmp_.push_back(at_[literalVar(l)]);
        const std::size_t t = tmp_.size() == 1 ? tmp_[0] : detail::balancedArrival(tmp_.data(), tmp_.size());
        tmp_.clear();
        return t;
    }
    void bump(net::NodeId v, std::size_t t) {
        auto& h = hist_[v];
        if (t >= h.size()) h.resize(t + 1, 0);
        ++h[t];
    }
    // Room for n literals in the arena (blocks never move, so a cube's
    // pointer stays valid as the table grows).
    Literal* allocate(std::size_t n) {
        if (blockUsed_ + n > blockCap_) reserveArena(std::max<std::size_t>(n, 1 << 16));
        Literal* p = blocks_.back().get() + blockUsed_;
        blockUsed_ += n;
        return p;
    }
    void reserveArena(std::size_t n) {
        blocks_.push_back(std::make_unique<Literal[]>(std::max<std::size_t>(n, 1)));
        blockUsed_ = 0;
        blockCap_ = std::max<std::size_t>(n, 1);
    }
    void addCube(net::NodeId v, const std::vector<Literal>& lits) {
        Rec r{v, allocate(lits.size()), static_cast<std::uint32_t>(lits.size()), 0, true};
        std::copy(lits.begin(), lits.end(), r.at);
        r.arrival = static_cast<std::uint32_t>(cubeTime(r.lits()));
        bump(v, r.arrival);
        byNode_[v].push_back(static_cast<std::uint32_t>(cubes_.size()));
        cubes_.push_back(std::move(r));
    }

    net::Network& net_;
    std::size_t cap_;
    std::vector<Rec> cubes_;
    std::vector<std::vector<std::uint32_t>> occ_, byNode_, hist_;
    std::vector<std::size_t> at_, tmp_;
    std::vector<std::uint8_t> read_, touched_;   // read_: some node reads it (outputs need no re-timing)
    std::vector<net::NodeId> nodes_;
    std::vector<std::pair<net::NodeId, std::uint32_t>> plan_;
    std::vector<std::uint32_t> accepted_;
    std::vector<Literal> rest_;
    std::vector<std::unique_ptr<Literal[]>> blocks_;   // the arena
    std::size_t blockUsed_ = 0, blockCap_ = 0;
    const std::vector<std::uint32_t> none_;
};

struct LiteralsHash {
    std::size_t operator()(const std::vector<Literal>& v) const noexcept {
        std::size_t h = 1469598103934665603ull;
        for (Literal l : v) h = (h ^ l) * 1099511628211ull;
        return h;
    }
};

/// The candidates of one round by their literals: an open-addressing table
/// (linear probing, at most half full) of positions in the candidate list,
/// with each entry's hash beside it. A node-based hash map keyed by a vector
/// per candidate cost an allocation per candidate and a pointer chase per
/// lookup; this loop meets every cube pair (F294).
class CandidateIndex {
public:
    /// The position of `lits` in `cand`, or cand.size() when it is not there.
    std::size_t find(const std::vector<Literal>& lits, const std::vector<std::pair<Cube, long>>& cand) const {
        if (slots_.empty()) return cand.size();
        const std::uint64_t h = hashOf(lits);
        for (std::size_t s = detail::mix64(h) & mask_; slots_[s] != 0; s = (s + 1) & mask_) {
            const std::uint32_t k = slots_[s] - 1;
            if (hash_[s] == h && cand[k].first.lits == lits) return k;
        }
        return cand.size();
    }
    void add(const std::vector<Literal>& lits, std::size_t pos) {
        if (2 * (count_ + 1) > slots_.size()) grow();
        place(hashOf(lits), static_cast<std::uint32_t>(pos + 1));
        ++count_;
    }

private:
    static std::uint64_t hashOf(const std::vector<Literal>& lits) { return LiteralsHash{}(lits); }
    void place(std::uint64_t h, std::uint32_t entry) {
        std::size_t s = detail::mix64(h) & mask_;
        while (slots_[s] != 0) s = (s + 1) & mask_;
        slots_[s] = entry;
        hash_[s] = h;
    }
    void grow() {
        std::vector<std::uint32_t> oldSlots = std::move(slots_);
        std::vector<std::uint64_t> oldHash = std::move(hash_);
        const std::size_t n = oldSlots.empty() ? 1024 : 2 * oldSlots.size();
        slots_.assign(n, 0);
        hash_.assign(n, 0);
        mask_ = n - 1;
        for (std::size_t s = 0; s < oldSlots.size(); ++s)
            if (oldSlots[s] != 0) place(oldHash[s], oldSlots[s]);
    }
    std::vector<std::uint32_t> slots_;   // position + 1; 0: empty
    std::vector<std::uint64_t> hash_;
    std::size_t mask_ = 0, count_ = 0;
};

// The holders of every candidate at once, when that is cheaper than
// intersecting index lists per candidate: each candidate is filed under its
// first two literals, and every indexed cube (live, at least two literals)
// meets the candidates filed under each pair of its literals and holds those
// it contains. The same sets, sorted by id, as the intersections. Most
// candidates of a decoder's opening are two or three input literals, each
// held by about a tenth of all cubes, so intersecting cost every candidate
// two long lists: (20000 candidates) x (lists growing with the network)
// was half of the 100k decoder's first cube extraction (F173). False (and
// nothing done) when the intersections cost less (a few candidates, as in
// a changed region's trial).
//
// Generic over where the cubes live (F256: the in-place table, or the
// indexed cubes of the other path): `count` cubes by id, litsOf(id) the
// sorted literals of an indexed cube (empty: not indexed), holdingSize(l)
// the length of literal l's index list.
template <class LitsOf, class HoldingSize>
bool holdersByPairs(std::size_t count, LitsOf litsOf, HoldingSize holdingSize,
                    const std::vector<std::pair<long, Cube>>& ranked, std::vector<std::vector<std::uint32_t>>& holders) {
    double merge = 0, pairs = 0;
    for (const auto& e : ranked)
        merge += static_cast<double>(holdingSize(e.second.lits[0]) + holdingSize(e.second.lits[1]));
    for (std::uint32_t id = 0; id < count; ++id) {
        const LitView l = litsOf(id);
        if (l.size() >= 2) pairs += 0.5 * static_cast<double>(l.size() * (l.size() - 1));
    }
    if (pairs * 4 >= merge) return false;   // a hash lookup costs a few merge steps
    auto key = [](Literal a, Literal b) { return (std::uint64_t{a} << 32) | b; };
    // The candidates filed by their first two literals: an open-addressing
    // table of the pairs (linear probing, at most half full), each slot
    // naming its candidates' run in `members` (in candidate order). A
    // node-based hash map looked up once per literal pair of every cube was
    // half of this sweep (engine17).
    constexpr std::uint64_t kEmpty = ~std::uint64_t{0};
    std::size_t slots = 64;
    while (slots < 2 * ranked.size()) slots *= 2;
    const std::size_t mask = slots - 1;
    auto slotOf = [&](std::uint64_t k) { return static_cast<std::size_t>(detail::mix64(k)) & mask; };
    std::vector<std::uint64_t> slotKey(slots, kEmpty);
    std::vector<std::uint32_t> slotBegin(slots + 1, 0), candSlot(ranked.size());
    for (std::uint32_t k = 0; k < ranked.size(); ++k) {
        const std::uint64_t kk = key(ranked[k].second.lits[0], ranked[k].second.lits[1]);
        std::size_t s = slotOf(kk);
        while (slotKey[s] != kEmpty && slotKey[s] != kk) s = (s + 1) & mask;
        slotKey[s] = kk;
        candSlot[k] = static_cast<std::uint32_t>(s);
        ++slotBegin[s + 1];
    }
    for (std::size_t s = 0; s < slots; ++s) slotBegin[s + 1] += slotBegin[s];
    std::vector<std::uint32_t> members(ranked.size()), fill(slotBegin.begin(), slotBegin.end() - 1);
    for (std::uint32_t k = 0; k < ranked.size(); ++k) members[fill[candSlot[k]]++] = k;
    holders.assign(ranked.size(), {});
    // The cube's literals are marked (stamp = its id + 1), so a candidate
    // filed under one of its pairs is checked on its other literals only.
    std::vector<std::uint32_t> mark;
    for (std::uint32_t id = 0; id < count; ++id) {
        const LitView lits = litsOf(id);
        if (lits.size() < 2) continue;
        if (lits.back() >= mark.size()) mark.resize(static_cast<std::size_t>(lits.back()) + 1, 0);
        for (Literal l : lits) mark[l] = id + 1;
        for (std::size_t a = 0; a + 1 < lits.size(); ++a)
            for (std::size_t b = a + 1; b < lits.size(); ++b) {
                const std::uint64_t kk = key(lits[a], lits[b]);
                std::size_t s = slotOf(kk);
                while (slotKey[s] != kEmpty && slotKey[s] != kk) s = (s + 1) & mask;
                if (slotKey[s] == kEmpty) continue;
                for (std::uint32_t m = slotBegin[s]; m < slotBegin[s + 1]; ++m) {
                    const std::uint32_t k = members[m];
                    const auto& I = ranked[k].second.lits;
                    bool all = true;
                    for (std::size_t j = 2; j < I.size() && all; ++j) all = I[j] < mark.size() && mark[I[j]] == id + 1;
                    if (all) holders[k].push_back(id);
                }
            }
    }
    return true;
}

void shareCubesInPlace(net::Network& net, const ShareCubesOptions& opts, PassContext& ctx) {
    const double tStart = ctx.verbose >= 2 ? detail::cpuNow() : 0;
    auto tablePtr = std::make_unique<CubeTable>(net, ctx.depthCap);
    std::vector<std::uint32_t> sharedCount, seen;
    std::vector<std::size_t> cursor;   // per literal: where the cubes after the current one begin
    std::vector<Literal> common;
    long extracted = 0, reused = 0, saved = 0, candidates = 0, work = 0, rejects = 0, pairRounds = 0;
    bool exhausted = false, cut = false, anyExhausted = false;
    long tableLits = 0;
    for (const auto& r : tablePtr->cubes()) tableLits += static_cast<long>(r.n);
    int passesMade = 0;
    // CPU s per phase of the pass (-v -v): laying out the table, the
    // candidate search, the holders, the extractions.
    double tTable = ctx.verbose >= 2 ? detail::cpuNow() - tStart : 0, tCand = 0, tHold = 0, tExtract = 0;
    for (int pass = 0; pass < std::max(1, opts.passes); ++pass) {
        ++passesMade;
        double tMark = ctx.verbose >= 2 ? detail::cpuNow() : 0;
        auto lap = [&](double& into) {
            if (ctx.verbose < 2) return;
            const double now = detail::cpuNow();
            into += now - tMark;
            tMark = now;
        };
        if (pass > 0) {
            // The covers as the last pass left them, laid out again in
            // topological order and re-timed, as a separate move would see
            // them (the table's order decides which partners each cube meets).
            tablePtr->writeBack();
            tablePtr.reset();
            tablePtr = std::make_unique<CubeTable>(net, ctx.depthCap);
            work = 0;
            exhausted = false;
        }
        lap(tTable);
        CubeTable& table = *tablePtr;
        auto& cubes = table.cubes();
        const long savedBefore = saved;
        for (int round = 0; round < opts.rounds; ++round) {
            if (round > 0) table.reindex();
            // Candidate cubes: intersections of cube pairs sharing >= minLiterals
            // literals (partners counted in a dense array, candidates found by
            // their literals without building a key: this loop meets every cube).
            CandidateIndex candIndex;
            std::vector<std::pair<Cube, long>> cand;   // cube, pairs giving it
            sharedCount.assign(cubes.size(), 0);
            cursor.assign(2 * net.nodeCount(), 0);
            for (std::uint32_t i = 0; i < cubes.size(); ++i) {
                const auto& c = cubes[i];
                if (!c.live || c.n < opts.minLiterals || !ctx.inFocus(c.node)) continue;
                seen.clear();
                std::size_t scanned = 0;
                for (Literal l : c.lits()) {
                    const auto& o = table.holding(l);
                    std::size_t start = SIZE_MAX;
                    if (l < cursor.size()) start = cursor[l] = gallopAbove(o, cursor[l], i);
                    scanPartners(o, i, ctx.focus != nullptr, 4 * opts.partnersPerCube, scanned,
                                 [&](std::uint32_t j) { return ctx.inFocus(cubes[j].node); },
                                 [&](std::uint32_t j) { if (sharedCount[j]++ == 0) seen.push_back(j); }, start);
                }
                work += static_cast<long>(scanned);
                std::size_t partners = 0;
                for (std::uint32_t j : seen) {
                    const std::uint32_t n = sharedCount[j];
                    sharedCount[j] = 0;
                    if (n < opts.minLiterals || partners >= opts.partnersPerCube) continue;
                    ++partners;
                    const auto& d = cubes[j];
                    common.clear();
                    std::set_intersection(c.at, c.at + c.n, d.at, d.at + d.n, std::back_inserter(common));
                    const std::size_t at = candIndex.find(common, cand);
                    if (at < cand.size()) { ++cand[at].second; continue; }
                    candIndex.add(common, cand.size());
                    cand.push_back({Cube(common), 1});
                }
            }
            candIndex = CandidateIndex{};
            lap(tCand);
            candidates += static_cast<long>(cand.size());
            std::vector<std::pair<long, Cube>> ranked;
            ranked.reserve(cand.size());
            for (auto& e : cand) ranked.push_back({candidateBound(e.first, e.second), std::move(e.first)});
            cand.clear();
            if (keepBest(ranked, opts.maxCandidates)) cut = true;
            // Each candidate keeps the cubes holding it now.
            using Item = std::pair<long, std::size_t>;
            std::vector<Cube> list;
            std::vector<std::vector<std::uint32_t>> holders;
            std::priority_queue<Item> heap;
            const bool byPairs =
                opts.holdersByPairs &&
                holdersByPairs(
                    cubes.size(),
                    [&](std::uint32_t id) { return cubes[id].live ? cubes[id].lits() : LitView{}; },
                    [&](Literal l) { return table.holding(l).size(); }, ranked, holders);
            pairRounds += byPairs;
            for (std::size_t k = 0; k < ranked.size(); ++k) {
                Cube& I = ranked[k].second;
                std::vector<std::uint32_t> acc;
                if (byPairs) {
                    acc = std::move(holders[k]);
                } else {   // index intersection
                    std::vector<const std::vector<std::uint32_t>*> lists;
                    for (Literal l : I.lits) lists.push_back(&table.holding(l));
                    acc = intersectLists(lists);
                }
                work += static_cast<long>(acc.size());
                heap.push({static_cast<long>(acc.size()) * static_cast<long>(I.lits.size() - 1) + 1, list.size()});
                list.push_back(std::move(I));
                if (byPairs) holders[k] = std::move(acc);
                else holders.push_back(std::move(acc));
            }
            lap(tHold);
            long roundSaved = 0;
            std::vector<std::uint8_t> requeued(list.size(), 0);
            while (!heap.empty()) {
                auto [v, i] = heap.top();
                heap.pop();
                if (work > opts.workBudget) { exhausted = true; break; }
                // Value from the index: holder cubes still holding I, and a provider.
                const Cube& I = list[i];
                long count = 0;
                net::NodeId prov = 0;
                for (std::uint32_t id : holders[i]) {
                    const auto& r = cubes[id];
                    ++work;
                    if (!r.live || !std::includes(r.at, r.at + r.n, I.lits.begin(), I.lits.end())) continue;
                    if (r.n == I.lits.size() && table.cubeCount(r.node) == 1) { prov = r.node; continue; }
                    ++count;
                }
                const long w = static_cast<long>(I.lits.size()) - 1;
                const long now = count * w - (prov ? 0 : w);
                if (now <= 0) continue;
                if (!heap.empty() && now < heap.top().first / 2 && !requeued[i]) {
                    requeued[i] = 1;
                    heap.push({now, i});
                    continue;
                }
                const long gain = table.extract(I, holders[i], prov, rejects);
                if (gain <= 0) continue;
                (prov ? reused : extracted) += 1;
                saved += gain;
                roundSaved += gain;
            }
            lap(tExtract);
            if (roundSaved == 0 || exhausted) break;
        }
        anyExhausted = anyExhausted || exhausted;
        const long passSaved = saved - savedBefore;
        const bool pays = passSaved > 0 && passSaved * 1000 >= static_cast<long>(opts.passMinPermille) * tableLits;
        if (ctx.verbose >= 2)
            std::fprintf(stderr,
                         "kerf:   cube extraction pass %d saved %ld of %ld literals%s; cpu s so far: table %.2f, "
                         "candidates %.2f, holders %.2f, extracting %.2f\n",
                         pass + 1, passSaved, tableLits, exhausted ? " (cubes-work reached)" : "", tTable, tCand,
                         tHold, tExtract);
        tableLits -= passSaved;
        if (!pays) break;
    }
    exhausted = anyExhausted;
    tablePtr->writeBack();
    if (opts.passes > 1) ctx.stats.add("passes", passesMade);
    ctx.edits += static_cast<std::size_t>(extracted + reused);
    ctx.stats.add("extracted", extracted);
    ctx.stats.add("reused-nodes", reused);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("candidates", candidates);
    ctx.stats.add("in-place", 1);
    if (pairRounds) ctx.stats.add("holders-by-pairs", pairRounds);
    if (exhausted) ctx.stats.add("limit-hit:cubes-work", 1);
    if (cut) ctx.stats.add("limit-hit:cubes-candidates", 1);
    ctx.stats.add("depth-rejects", rejects);
}

} // namespace

void shareCubes(net::Network& net, const ShareCubesOptions& opts, PassContext& ctx) {
    if (opts.inPlaceCubes > 0) {
        std::size_t total = 0;
        for (net::NodeId v = 0; v < net.nodeCount(); ++v)
            if (net.isLogic(v)) total += net.node(v).cover.cubes.size();
        if (total >= opts.inPlaceCubes) return shareCubesInPlace(net, opts, ctx);
    }
    detail::Workspace ws(net, ctx);
    long extracted = 0, reused = 0, saved = 0, candidates = 0, work = 0, pairRounds = 0;
    bool exhausted = false;
    for (int round = 0; round < opts.rounds; ++round) {
        // Every cube of the network with an index by literal.
        struct Ref { net::NodeId node; std::size_t cube; };
        std::vector<Ref> refs;
        std::unordered_map<Literal, std::vector<std::uint32_t>> occ;
        for (net::NodeId f : net.topoOrder()) {
            const Cover& F = ws.cover(f);
            for (std::size_t i = 0; i < F.cubes.size(); ++i) {
                if (F.cubes[i].lits.size() < opts.minLiterals) continue;
                auto id = static_cast<std::uint32_t>(refs.size());
                refs.push_back({f, i});
                for (Literal l : F.cubes[i].lits) occ[l].push_back(id);
            }
        }
        // Candidate cubes: intersections of cube pairs sharing ≥ minLiterals literals.
        std::unordered_map<std::string, std::pair<Cube, long>> cand;   // cube, pairs giving it
        std::unordered_map<std::uint32_t, std::uint32_t> shared;
        for (std::uint32_t i = 0; i < refs.size(); ++i) {
            if (!ctx.inFocus(refs[i].node)) continue;
            const Cube& c = ws.cover(refs[i].node).cubes[refs[i].cube];
            shared.clear();
            std::size_t scanned = 0;
            for (Literal l : c.lits) {
                // Occurrence lists are sorted: start past i (skipping the
                // earlier cubes one by one made this quadratic in the cubes).
                scanPartners(occ[l], i, ctx.focus != nullptr, 4 * opts.partnersPerCube, scanned,
                             [&](std::uint32_t j) { return ctx.inFocus(refs[j].node); },
                             [&](std::uint32_t j) { ++shared[j]; });
            }
            std::size_t partners = 0;
            for (auto [j, n] : shared) {
                if (n < opts.minLiterals) continue;
                if (++partners > opts.partnersPerCube) break;
                const Cube& d = ws.cover(refs[j].node).cubes[refs[j].cube];
                std::vector<Literal> common;
                std::set_intersection(c.lits.begin(), c.lits.end(), d.lits.begin(), d.lits.end(),
                                      std::back_inserter(common));
                Cube I(std::move(common));
                auto [it, fresh] = cand.try_emplace(detail::coverKey(Cover{{I}}), I, 0);
                ++it->second.second;
            }
        }
        candidates += static_cast<long>(cand.size());
        // Upper bounds from the index (cubes only lose literals as extraction
        // goes on, so a bound stays a bound); the most promising candidates
        // first, at most maxCandidates of them.
        std::vector<std::pair<long, Cube>> ranked;
        ranked.reserve(cand.size());
        for (auto& [key, e] : cand) ranked.push_back({candidateBound(e.first, e.second), std::move(e.first)});
        cand.clear();
        keepBest(ranked, opts.maxCandidates);
        using Item = std::pair<long, std::size_t>;
        // Each candidate keeps the nodes that held it when indexed: extraction
        // rewrites a cube holding I into one that still holds I, in the same
        // node, so only those nodes need looking at later.
        std::vector<Cube> list;
        std::vector<std::vector<net::NodeId>> where;
        std::priority_queue<Item> heap;
        std::vector<net::NodeId> targets;
        // The indexed cubes holding each candidate: in one sweep over the
        // cubes' literal pairs when that costs less than intersecting index
        // lists per candidate (as in place; F256).
        std::vector<std::vector<std::uint32_t>> byPairs;
        const bool pairs =
            opts.holdersByPairs &&
            holdersByPairs(
                refs.size(),
                [&](std::uint32_t id) {
                    const std::vector<Literal>& l = ws.cover(refs[id].node).cubes[refs[id].cube].lits;
                    return LitView{l.data(), static_cast<std::uint32_t>(l.size())};
                },
                [&](Literal l) {
                    const auto it = occ.find(l);
                    return it == occ.end() ? std::size_t{0} : it->second.size();
                },
                ranked, byPairs);
        pairRounds += pairs;
        for (std::size_t k = 0; k < ranked.size(); ++k) {
            Cube& I = ranked[k].second;
            std::vector<std::uint32_t> cubes = pairs ? std::move(byPairs[k]) : indexedCubes(I, occ);
            long bound = static_cast<long>(cubes.size()) * static_cast<long>(I.lits.size() - 1) + 1;
            std::vector<net::NodeId> nodes;
            for (std::uint32_t id : cubes)
                if (nodes.empty() || nodes.back() != refs[id].node) nodes.push_back(refs[id].node);
            std::sort(nodes.begin(), nodes.end());
            nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
            heap.push({bound, list.size()});
            list.push_back(std::move(I));
            where.push_back(std::move(nodes));
        }
        long roundSaved = 0;
        std::vector<net::NodeId> changed;
        std::vector<std::uint8_t> requeued(list.size(), 0);
        while (!heap.empty()) {
            auto [v, i] = heap.top();
            heap.pop();
            if (work > opts.workBudget) { exhausted = true; break; }
            net::NodeId prov = 0;
            long now = valueOf(ws, list[i], &where[i], targets, prov, work);
            if (now <= 0) continue;
            // Near-greedy: take it unless it fell well below the next bound
            // (then look at it once more later). Exact lazy greedy would
            // re-value the same candidates over and over on large covers.
            if (!heap.empty() && now < heap.top().first / 2 && !requeued[i]) {
                requeued[i] = 1;
                heap.push({now, i});
                continue;
            }
            net::NodeId created = 0;
            long gain = detail::extractDivisor(ws, Cover{{list[i]}}, targets, prov, changed, created);
            if (gain <= 0) continue;
            (prov ? reused : extracted) += 1;
            saved += gain;
            roundSaved += gain;
        }
        if (roundSaved == 0 || exhausted) break;
    }
    ctx.stats.add("extracted", extracted);
    ctx.stats.add("reused-nodes", reused);
    ctx.stats.add("literals-saved", saved);
    ctx.stats.add("candidates", candidates);
    if (pairRounds) ctx.stats.add("holders-by-pairs", pairRounds);
    if (exhausted) ctx.stats.add("limit-hit:cubes-work", 1);
    ctx.stats.add("depth-rejects", static_cast<long long>(ws.depthRejects()));
}

} // namespace kerf::passes
