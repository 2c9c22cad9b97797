// aig.cpp — and-inverter graph: structural hashing and construction from a
// sum-of-products network.
//
// Each sum of products becomes ANDs and ORs, an OR being an AND with
// complemented inputs and output (De Morgan's law). Structural hashing with
// constant and trivial folding is the standard AIG technique (Kuehlmann and
// Krohm, DAC 1997, from memory); the code is our own.
#include "kerf/proof/aig.h"

#include "kerf/diagnostics.h"

#include <algorithm>

namespace kerf::proof {

namespace {
std::size_t strashSlot(std::uint64_t k, std::size_t mask) {
    k ^= k >> 33;
    k *= 0xFF51AFD7ED558CCDull;
    k ^= k >> 33;
    return static_cast<std::size_t>(k) & mask;
}
} // namespace

using algebra::literalNegated;
using algebra::literalVar;

Aig::Aig() {
    fanin0_.push_back(0);
    fanin1_.push_back(0);
    isInput_.push_back(0);
    inputIndex_.push_back(0);
}

AigLit Aig::input(std::string_view name) {
    std::string key(name);
    if (auto it = inputByName_.find(key); it != inputByName_.end()) return aigLit(it->second);
    AigNode n = static_cast<AigNode>(fanin0_.size());
    fanin0_.push_back(0);
    fanin1_.push_back(0);
    isInput_.push_back(1);
    inputIndex_.push_back(static_cast<std::uint32_t>(inputs_.size()));
    inputs_.push_back(n);
    inputNames_.push_back(key);
    inputByName_.emplace(std::move(key), n);
    return aigLit(n);
}

std::optional<AigLit> Aig::findInput(std::string_view name) const {
    if (auto it = inputByName_.find(std::string(name)); it != inputByName_.end()) return aigLit(it->second);
    return std::nullopt;
}

AigLit Aig::newNode(AigLit f0, AigLit f1) {
    AigNode n = static_cast<AigNode>(fanin0_.size());
    fanin0_.push_back(f0);
    fanin1_.push_back(f1);
    isInput_.push_back(0);
    inputIndex_.push_back(0);
    return aigLit(n);
}

AigLit Aig::andOf(AigLit a, AigLit b) {
    if (a > b) std::swap(a, b);
    if (a == kAigFalse) return kAigFalse;
    if (a == kAigTrue) return b;
    if (a == b) return a;
    if (a == aigNot(b)) return kAigFalse;
    const std::uint64_t key = (std::uint64_t{a} << 32) | b;
    if ((strashSize_ + 1) * 2 > strashKeys_.size()) growStrash();
    const std::size_t mask = strashKeys_.size() - 1;
    for (std::size_t i = strashSlot(key, mask);; i = (i + 1) & mask) {
        if (strashKeys_[i] == key) return aigLit(strashNodes_[i]);
        if (strashKeys_[i] == 0) {
            AigLit l = newNode(a, b);
            strashKeys_[i] = key;
            strashNodes_[i] = aigNode(l);
            ++strashSize_;
            return l;
        }
    }
}

void Aig::growStrash() {
    std::vector<std::uint64_t> keys = std::move(strashKeys_);
    std::vector<AigNode> nodes = std::move(strashNodes_);
    const std::size_t cap = std::max<std::size_t>(1024, keys.size() * 2);
    strashKeys_.assign(cap, 0);
    strashNodes_.assign(cap, 0);
    const std::size_t mask = cap - 1;
    for (std::size_t j = 0; j < keys.size(); ++j) {
        if (keys[j] == 0) continue;
        std::size_t i = strashSlot(keys[j], mask);
        while (strashKeys_[i] != 0) i = (i + 1) & mask;
        strashKeys_[i] = keys[j];
        strashNodes_[i] = nodes[j];
    }
}

AigLit Aig::xorOf(AigLit a, AigLit b) {
    // a ^ b = !( !(a & !b) & !(!a & b) )
    return orOf(andOf(a, aigNot(b)), andOf(aigNot(a), b));
}

AigLit Aig::andOfMany(std::vector<AigLit> lits) {
    // An input that is itself a plain AND (not complemented) stands for its own inputs: the
    // conjunction is taken over the leaves, down to inputs and complemented nodes, and built
    // anew from them. The same product written two ways (a cube of literals, or a shared
    // two-literal factor ANDed with the rest) then becomes the same node, found by hashing
    // instead of by a SAT call (F370). Associativity and commutativity of AND only: the
    // function is unchanged. A list stops growing at kFlattenLeaves (wide shared logic is
    // not copied into every reader).
    if (lits.size() > 1) {
        constexpr std::size_t kFlattenLeaves = 64;
        std::size_t count = lits.size();
        bool any = false;
        for (AigLit l : lits)
            if (!aigNegated(l) && isAnd(aigNode(l))) any = true;
        if (any) {
            std::vector<AigLit> leaves, stack(lits.rbegin(), lits.rend());
            leaves.reserve(count * 2);
            while (!stack.empty()) {
                AigLit l = stack.back();
                stack.pop_back();
                const AigNode n = aigNode(l);
                if (!aigNegated(l) && isAnd(n) && count < kFlattenLeaves) {
                    ++count;   // one literal becomes two
                    stack.push_back(fanin1_[n]);
                    stack.push_back(fanin0_[n]);
                } else {
                    leaves.push_back(l);
                }
            }
            lits = std::move(leaves);
        }
    }
    std::sort(lits.begin(), lits.end());
    lits.erase(std::unique(lits.begin(), lits.end()), lits.end());
    std::size_t k = 0;
    for (std::size_t i = 0; i < lits.size(); ++i) {
        if (lits[i] == kAigFalse) return kAigFalse;
        if (lits[i] == kAigTrue) continue;
        if (i + 1 < lits.size() && lits[i + 1] == aigNot(lits[i])) return kAigFalse;
        lits[k++] = lits[i];
    }
    lits.resize(k);
    if (lits.empty()) return kAigTrue;
    // Pair neighbours level by level: a balanced tree.
    while (lits.size() > 1) {
        std::size_t m = 0;
        for (std::size_t i = 0; i + 1 < lits.size(); i += 2) lits[m++] = andOf(lits[i], lits[i + 1]);
        if (lits.size() % 2) lits[m++] = lits.back();
        lits.resize(m);
    }
    return lits[0];
}

AigLit Aig::orOfMany(std::vector<AigLit> lits) {
    for (AigLit& l : lits) l = aigNot(l);
    return aigNot(andOfMany(std::move(lits)));
}

std::vector<AigLit> Aig::addNetwork(const net::Network& net) {
    const std::size_t n = net.nodeCount();
    // Fanin cone of the outputs.
    std::vector<std::uint8_t> needed(n, 0);
    std::vector<net::NodeId> work;
    auto checkVar = [&](std::uint32_t v) {
        if (v >= n || net.node(v).dead)
            throw Error("proof: network refers to a missing or removed node " + std::to_string(v), {},
                        ExitCode::Internal);
    };
    for (const net::Output& o : net.outputs()) {
        checkVar(literalVar(o.driver));
        work.push_back(literalVar(o.driver));
    }
    while (!work.empty()) {
        net::NodeId id = work.back();
        work.pop_back();
        if (needed[id]) continue;
        needed[id] = 1;
        if (!net.isLogic(id)) continue;
        for (const net::Cube& c : net.node(id).cover.cubes)
            for (net::Literal l : c.lits) {
                checkVar(literalVar(l));
                if (!needed[literalVar(l)]) work.push_back(literalVar(l));
            }
    }

    std::vector<AigLit> map(n, kAigFalse);
    for (net::NodeId id : net.inputs())
        if (needed[id]) map[id] = input(net.node(id).name);
    auto litOf = [&](net::Literal l) { return map[literalVar(l)] ^ (literalNegated(l) ? 1u : 0u); };
    std::vector<AigLit> cubeLits, terms;
    for (net::NodeId id : net.topoOrder()) {
        if (!needed[id]) continue;
        terms.clear();
        for (const net::Cube& c : net.node(id).cover.cubes) {
            cubeLits.clear();
            for (net::Literal l : c.lits) cubeLits.push_back(litOf(l));
            terms.push_back(andOfMany(cubeLits));
        }
        map[id] = orOfMany(terms);
    }
    std::vector<AigLit> outs;
    outs.reserve(net.outputs().size());
    for (const net::Output& o : net.outputs()) outs.push_back(litOf(o.driver));
    return outs;
}

} // namespace kerf::proof
