// kerf/proof/aig.h — and-inverter graph with structural hashing, the form the
// equivalence checker works on.
//
// An and-inverter graph represents every function with two-input ANDs and
// complemented edges; with structural hashing (each AND of the same two
// fanin literals exists once) two networks built into one graph share all
// the structure they have in common. This is the representation of
// Kuehlmann and Krohm's combinational equivalence work (DAC 1997, from
// memory) and of its SAT-based successors (Kuehlmann et al., IEEE TCAD
// 2002, from memory); the code here is our own.
//
// Literal encoding follows the Boolean network: 2*node + complemented.
// Node 0 is the constant 0, so literal 0 is false and literal 1 is true.
// Nodes are created after their fanins, so node ids are a topological order.
#pragma once

#include "kerf/network/network.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace kerf::proof {

using AigLit = std::uint32_t;
using AigNode = std::uint32_t;

inline constexpr AigLit kAigFalse = 0;
inline constexpr AigLit kAigTrue = 1;
inline constexpr AigNode aigNode(AigLit l) { return l >> 1; }
inline constexpr bool aigNegated(AigLit l) { return (l & 1u) != 0; }
inline constexpr AigLit aigNot(AigLit l) { return l ^ 1u; }
inline constexpr AigLit aigLit(AigNode n, bool neg = false) { return n * 2u + (neg ? 1u : 0u); }

class Aig {
public:
    Aig();

    /// The input with this name, created on first use (inputs are shared by name).
    AigLit input(std::string_view name);
    /// The input with this name, if one was created.
    std::optional<AigLit> findInput(std::string_view name) const;

    /// AND of two literals: folds constants, a&a, a&!a, and returns the
    /// existing node when the same (ordered) fanin pair was built before.
    AigLit andOf(AigLit a, AigLit b);
    AigLit orOf(AigLit a, AigLit b) { return aigNot(andOf(aigNot(a), aigNot(b))); }
    AigLit xorOf(AigLit a, AigLit b);
    /// Balanced AND / OR trees. Literals are sorted first so that the same
    /// set of literals always gives the same structure.
    AigLit andOfMany(std::vector<AigLit> lits);
    AigLit orOfMany(std::vector<AigLit> lits);

    /// Build a Boolean network into this graph (inputs shared by name) and
    /// return the literal of each output, in `net.outputs()` order. Only the
    /// logic in the fanin cone of the outputs is built.
    std::vector<AigLit> addNetwork(const net::Network& net);

    std::size_t size() const { return fanin0_.size(); }          ///< nodes including the constant
    std::size_t andCount() const { return size() - 1 - inputs_.size(); }
    bool isAnd(AigNode n) const { return n != 0 && !isInput_[n]; }
    bool isInput(AigNode n) const { return isInput_[n] != 0; }
    AigLit fanin0(AigNode n) const { return fanin0_[n]; }
    AigLit fanin1(AigNode n) const { return fanin1_[n]; }
    /// Input nodes in creation order.
    const std::vector<AigNode>& inputs() const { return inputs_; }
    /// Position of an input node in `inputs()`.
    std::uint32_t inputIndex(AigNode n) const { return inputIndex_[n]; }
    const std::string& inputName(AigNode n) const { return inputNames_[inputIndex_[n]]; }

private:
    AigLit newNode(AigLit f0, AigLit f1);

    std::vector<AigLit> fanin0_, fanin1_;
    std::vector<std::uint8_t> isInput_;
    std::vector<std::uint32_t> inputIndex_;
    std::vector<AigNode> inputs_;
    std::vector<std::string> inputNames_;
    std::unordered_map<std::string, AigNode> inputByName_;
    // Structural hashing: ordered fanin pair (a << 32 | b, never 0: a is no constant) -> node,
    // open addressing with linear probing (key 0 marks a free slot).
    std::vector<std::uint64_t> strashKeys_;
    std::vector<AigNode> strashNodes_;
    std::size_t strashSize_ = 0;
    void growStrash();
};

} // namespace kerf::proof
