// proof_support.h — helpers shared by the proof_* unit tests: small network
// builders, random sum-of-products networks, function-preserving rewrites
// taken from Boolean-algebra identities, mutants, and the exhaustive
// truth-table reference every verdict is checked against.
#pragma once

#include "kerf/network/network.h"
#include "kerf/proof/simulation.h"

#include <algorithm>
#include <cstdint>
#include <initializer_list>
#include <string>
#include <vector>

namespace kerf::prooftest {

using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;
using net::Cover;
using net::Cube;
using net::Network;
using net::NodeId;

/// A cube from literals (sorted, de-duplicated), built without relying on
/// any algebra function.
inline Cube cube(std::vector<Literal> lits) {
    std::sort(lits.begin(), lits.end());
    lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
    Cube c;
    c.lits = std::move(lits);
    return c;
}
inline Cover cover(std::vector<std::vector<Literal>> cubes) {
    Cover f;
    for (auto& c : cubes) f.cubes.push_back(cube(std::move(c)));
    return f;
}
inline Literal pos(NodeId n) { return makeLiteral(n, false); }
inline Literal neg(NodeId n) { return makeLiteral(n, true); }

inline Literal and2(Network& n, Literal a, Literal b) { return pos(n.addLogic(cover({{a, b}}))); }
inline Literal or2(Network& n, Literal a, Literal b) { return pos(n.addLogic(cover({{a}, {b}}))); }
inline Literal xor2(Network& n, Literal a, Literal b) {
    return pos(n.addLogic(cover({{a, negateLiteral(b)}, {negateLiteral(a), b}})));
}
/// Full adder as two sums of products: sum = a^b^c (four minterms), carry = majority.
inline std::pair<Literal, Literal> fullAdder(Network& n, Literal a, Literal b, Literal c) {
    auto na = negateLiteral(a), nb = negateLiteral(b), nc = negateLiteral(c);
    Literal s = pos(n.addLogic(cover({{a, nb, nc}, {na, b, nc}, {na, nb, c}, {a, b, c}})));
    Literal co = pos(n.addLogic(cover({{a, b}, {a, c}, {b, c}})));
    return {s, co};
}

inline std::vector<NodeId> addInputs(Network& n, const std::string& base, int count) {
    std::vector<NodeId> v;
    for (int i = 0; i < count; ++i) v.push_back(n.addInput(base + "[" + std::to_string(i) + "]"));
    return v;
}

/// Array multiplier p = x * y (`width` bits each); with `swapOperands` the
/// partial-product rows are summed in the other operand's order, a
/// different structure of the same function (commutativity).
inline Network multiplier(int width, bool swapOperands) {
    Network n;
    auto a = addInputs(n, "a", width);
    auto b = addInputs(n, "b", width);
    const auto& x = swapOperands ? b : a;
    const auto& y = swapOperands ? a : b;
    std::vector<Literal> acc(2 * width, net::kFalse);
    for (int i = 0; i < width; ++i) {
        Literal carry = net::kFalse;
        for (int j = 0; j < width; ++j) {
            Literal pp = and2(n, pos(x[j]), pos(y[i]));
            if (i == 0) {
                acc[j] = pp;
                continue;
            }
            auto [s, c] = fullAdder(n, acc[i + j], pp, carry);
            acc[i + j] = s;
            carry = c;
        }
        if (i > 0) acc[i + width] = carry;
    }
    for (int k = 0; k < 2 * width; ++k) n.addOutput("p[" + std::to_string(k) + "]", acc[k]);
    return n;
}

/// A random multi-level SOP network: `nodes` logic nodes over the inputs and
/// earlier nodes, each with up to `maxCubes` cubes of up to `maxLits` literals;
/// the last `outputs` nodes (and sometimes an input or a complemented node) are outputs.
inline Network randomNetwork(std::uint64_t seed, int inputs, int nodes, int outputs, int maxCubes = 4,
                             int maxLits = 3) {
    proof::Random rng(seed);
    Network n;
    std::vector<NodeId> pool = addInputs(n, "x", inputs);
    for (int k = 0; k < nodes; ++k) {
        Cover f;
        int cubes = 1 + static_cast<int>(rng.next() % maxCubes);
        for (int c = 0; c < cubes; ++c) {
            std::vector<Literal> lits;
            int len = 1 + static_cast<int>(rng.next() % maxLits);
            for (int l = 0; l < len; ++l) {
                // Prefer recent nodes so the network gets depth.
                std::size_t span = std::min<std::size_t>(pool.size(), 12);
                std::size_t pick = rng.next() % 3 == 0 ? rng.next() % pool.size()
                                                       : pool.size() - 1 - rng.next() % span;
                lits.push_back(makeLiteral(pool[pick], rng.next() & 1));
            }
            Cube cb = cube(lits);
            bool contradictory = false;
            for (std::size_t i = 1; i < cb.lits.size(); ++i)
                if (literalVar(cb.lits[i]) == literalVar(cb.lits[i - 1])) contradictory = true;
            if (!contradictory) f.cubes.push_back(cb);
        }
        if (f.cubes.empty()) f.cubes.push_back(cube({pos(pool.back())}));
        pool.push_back(n.addLogic(f));
    }
    for (int o = 0; o < outputs; ++o) {
        NodeId d = pool[pool.size() - 1 - static_cast<std::size_t>(o) % pool.size()];
        n.addOutput("y" + std::to_string(o), makeLiteral(d, (o % 5) == 3));
    }
    return n;
}

/// Copy of a network (node ids preserved).
inline Network copyNetwork(const Network& src) { return src; }

/// Exhaustive truth tables of every output: bit m of word (m / 64) of
/// output o is the value under input assignment m (input k = bit k of m).
/// The reference every verdict is compared with; `inputs` must be <= 20.
inline std::vector<std::vector<std::uint64_t>> truthTables(const Network& n) {
    const std::size_t k = n.inputs().size();
    const std::uint64_t minterms = std::uint64_t{1} << k;
    const std::uint64_t words = (minterms + 63) / 64;
    std::vector<std::vector<std::uint64_t>> tt(n.outputs().size(), std::vector<std::uint64_t>(words, 0));
    for (std::uint64_t w = 0; w < words; ++w) {
        std::vector<std::uint64_t> in(k, 0);
        for (std::size_t i = 0; i < k; ++i)
            for (unsigned b = 0; b < 64; ++b) {
                std::uint64_t m = w * 64 + b;
                if (m < minterms && ((m >> i) & 1)) in[i] |= std::uint64_t{1} << b;
            }
        auto out = net::simulate(n, in);
        std::uint64_t valid = minterms - w * 64 >= 64 ? ~std::uint64_t{0}
                                                      : ((std::uint64_t{1} << (minterms - w * 64)) - 1);
        for (std::size_t o = 0; o < out.size(); ++o) tt[o][w] = out[o] & valid;
    }
    return tt;
}

/// True when two networks with identical input order and output order compute the same functions.
inline bool sameByExhaustion(const Network& a, const Network& b) { return truthTables(a) == truthTables(b); }

/// Evaluate output `name` of a network under a named input assignment.
inline bool evalOutput(const Network& n, const std::string& name,
                       const std::vector<std::pair<std::string, bool>>& assignment) {
    std::vector<std::uint64_t> in(n.inputs().size(), 0);
    for (std::size_t i = 0; i < n.inputs().size(); ++i) {
        const std::string& nm = n.node(n.inputs()[i]).name;
        for (const auto& [k, v] : assignment)
            if (k == nm) in[i] = v ? ~std::uint64_t{0} : 0;
    }
    auto out = net::simulate(n, in);
    for (std::size_t o = 0; o < n.outputs().size(); ++o)
        if (n.outputs()[o].name == name) return out[o] & 1u;
    return false;
}

} // namespace kerf::prooftest

namespace kerf::prooftest {

// ---- function-preserving rewrites (each names its Boolean-algebra identity) ----

/// De Morgan's laws (common textbook identity): f = sum_i c_i = !(prod_i !c_i),
/// and !c_i is the OR of the complemented literals. Node `id` becomes a
/// buffer of the complement of a new AND node over new OR nodes.
inline bool rewriteDeMorgan(Network& n, NodeId id) {
    Cover f = n.node(id).cover;
    if (f.cubes.empty()) return false;
    std::vector<Literal> andLits;
    for (const Cube& c : f.cubes) {
        if (c.lits.empty()) return false;
        Cover orNode;
        for (Literal l : c.lits) orNode.cubes.push_back(cube({negateLiteral(l)}));
        andLits.push_back(pos(n.addLogic(orNode)));
    }
    NodeId m = n.addLogic(cover({andLits}));
    n.node(id).cover = cover({{neg(m)}});
    return true;
}

/// Distributive law (common textbook identity): l*X + l*Y + R = l*(X + Y) + R.
inline bool rewriteDistribute(Network& n, NodeId id) {
    Cover f = n.node(id).cover;
    std::vector<Literal> all;
    for (const Cube& c : f.cubes) all.insert(all.end(), c.lits.begin(), c.lits.end());
    std::sort(all.begin(), all.end());
    Literal best = 0;
    std::size_t bestCount = 0;
    for (std::size_t i = 0; i < all.size();) {
        std::size_t j = i;
        while (j < all.size() && all[j] == all[i]) ++j;
        if (j - i > bestCount) bestCount = j - i, best = all[i];
        i = j;
    }
    if (bestCount < 2) return false;
    Cover q, rest;
    for (const Cube& c : f.cubes) {
        if (std::find(c.lits.begin(), c.lits.end(), best) == c.lits.end()) {
            rest.cubes.push_back(c);
            continue;
        }
        std::vector<Literal> lits;
        for (Literal l : c.lits)
            if (l != best) lits.push_back(l);
        q.cubes.push_back(cube(lits));
    }
    NodeId qn = n.addLogic(q);
    rest.cubes.push_back(cube({best, pos(qn)}));
    n.node(id).cover = rest;
    return true;
}

/// Consensus theorem (common textbook identity): x*A + !x*B = x*A + !x*B + A*B.
/// Adds every non-contradictory consensus term of one pair of cubes.
inline bool rewriteConsensus(Network& n, NodeId id) {
    Cover& f = n.node(id).cover;
    for (std::size_t i = 0; i < f.cubes.size(); ++i)
        for (std::size_t j = 0; j < f.cubes.size(); ++j) {
            if (i == j) continue;
            for (Literal l : f.cubes[i].lits) {
                const auto& other = f.cubes[j].lits;
                if (std::find(other.begin(), other.end(), negateLiteral(l)) == other.end()) continue;
                std::vector<Literal> lits;
                for (Literal a : f.cubes[i].lits)
                    if (a != l) lits.push_back(a);
                for (Literal b : other)
                    if (b != negateLiteral(l)) lits.push_back(b);
                Cube c = cube(lits);
                bool contradictory = false;
                for (std::size_t k = 1; k < c.lits.size(); ++k)
                    if (literalVar(c.lits[k]) == literalVar(c.lits[k - 1])) contradictory = true;
                if (contradictory) continue;
                f.cubes.push_back(c);
                return true;
            }
        }
    return false;
}

/// Absorption (common textbook identity): X = X + X*y. Adds a redundant cube.
inline bool rewriteAbsorb(Network& n, NodeId id, Literal y) {
    Cover& f = n.node(id).cover;
    if (f.cubes.empty()) return false;
    std::vector<Literal> lits = f.cubes[0].lits;
    lits.push_back(y);
    f.cubes.push_back(cube(lits));
    return true;
}

/// Apply a random mix of the rewrites above to a copy of `src`.
inline Network restructure(const Network& src, std::uint64_t seed, int rewrites) {
    Network n = src;
    proof::Random rng(seed);
    std::vector<NodeId> logic = n.topoOrder();
    if (logic.empty()) return n;
    for (int k = 0; k < rewrites; ++k) {
        NodeId id = logic[rng.next() % logic.size()];
        if (!n.isLogic(id)) continue;
        switch (rng.next() % 4) {
        case 0: rewriteDeMorgan(n, id); break;
        case 1: rewriteDistribute(n, id); break;
        case 2: rewriteConsensus(n, id); break;
        default: rewriteAbsorb(n, id, pos(n.inputs()[rng.next() % n.inputs().size()])); break;
        }
    }
    return n;
}

// ---- mutants: each may or may not change the function; the exhaustive reference decides ----

inline std::vector<NodeId> logicNodes(const Network& n) { return n.topoOrder(); }

/// Complement one literal of one cube.
inline Network mutateFlipLiteral(const Network& src, std::uint64_t seed) {
    Network n = src;
    proof::Random rng(seed);
    auto logic = logicNodes(n);
    for (int tries = 0; tries < 100; ++tries) {
        Cover& f = n.node(logic[rng.next() % logic.size()]).cover;
        if (f.cubes.empty()) continue;
        Cube& c = f.cubes[rng.next() % f.cubes.size()];
        if (c.lits.empty()) continue;
        Literal& l = c.lits[rng.next() % c.lits.size()];
        l = negateLiteral(l);
        c = cube(c.lits);
        return n;
    }
    return n;
}

/// Remove one cube from a node of at least two cubes.
inline Network mutateDropCube(const Network& src, std::uint64_t seed) {
    Network n = src;
    proof::Random rng(seed);
    auto logic = logicNodes(n);
    for (int tries = 0; tries < 100; ++tries) {
        Cover& f = n.node(logic[rng.next() % logic.size()]).cover;
        if (f.cubes.size() < 2) continue;
        f.cubes.erase(f.cubes.begin() + static_cast<std::ptrdiff_t>(rng.next() % f.cubes.size()));
        return n;
    }
    return n;
}

/// Exchange two inputs everywhere they are used (a wiring swap).
inline Network mutateSwapInputs(const Network& src, std::uint64_t seed) {
    Network n = src;
    proof::Random rng(seed);
    NodeId a = n.inputs()[rng.next() % n.inputs().size()];
    NodeId b = n.inputs()[rng.next() % n.inputs().size()];
    if (a == b) b = n.inputs()[(std::find(n.inputs().begin(), n.inputs().end(), a) - n.inputs().begin() + 1) %
                               n.inputs().size()];
    auto swapLit = [&](Literal l) {
        if (literalVar(l) == a) return makeLiteral(b, literalNegated(l));
        if (literalVar(l) == b) return makeLiteral(a, literalNegated(l));
        return l;
    };
    for (NodeId id : logicNodes(n))
        for (Cube& c : n.node(id).cover.cubes) {
            for (Literal& l : c.lits) l = swapLit(l);
            c = cube(c.lits);
        }
    for (auto& o : n.outputs()) o.driver = swapLit(o.driver);
    return n;
}

} // namespace kerf::prooftest
