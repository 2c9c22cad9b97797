// kerf/algebra/cover.h — literals, cubes and covers of the algebraic model.
//
// In the algebraic model a sum of products is treated like a polynomial:
// a variable and its complement are two unrelated literals, a cube is a
// set of literals (a product) and a cover is a set of cubes (a sum).
// Literal encoding: 2*variable + (1 if complemented). The same encoding is
// used by the Boolean network, where the variable is a node id.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <limits>
#include <span>
#include <string>
#include <vector>

namespace kerf::algebra {

/// A literal: `2*var + neg`. `var` is a network node id or an expression variable.
using Literal = std::uint32_t;

inline constexpr Literal makeLiteral(std::uint32_t var, bool negated) { return var * 2u + (negated ? 1u : 0u); }
inline constexpr std::uint32_t literalVar(Literal l) { return l >> 1; }
inline constexpr bool literalNegated(Literal l) { return (l & 1u) != 0; }
inline constexpr Literal negateLiteral(Literal l) { return l ^ 1u; }

/// A product of literals, kept sorted ascending and free of duplicates.
/// The empty cube is the constant 1.
struct Cube {
    std::vector<Literal> lits;

    Cube() = default;
    /// Builds a cube from any literal list (sorted and de-duplicated here).
    explicit Cube(std::vector<Literal> literals);

    std::size_t size() const { return lits.size(); }
    bool empty() const { return lits.empty(); }
    bool contains(Literal l) const;
    /// True when every literal of `other` is in this cube (this cube is contained in `other` as a set of minterms).
    bool hasAllOf(const Cube& other) const;
    /// True when the cube holds both a literal and its complement (constant 0 as a function).
    bool isContradictory() const;
    friend bool operator==(const Cube&, const Cube&) = default;
    friend auto operator<=>(const Cube&, const Cube&) = default;
};

struct CubeHash {
    std::size_t operator()(const Cube& c) const noexcept;
};

/// A sum of cubes. The empty cover is constant 0; a cover holding the
/// empty cube is constant 1. Covers are kept in canonical order (sorted,
/// no duplicate cubes) by `normalize`.
struct Cover {
    std::vector<Cube> cubes;

    Cover() = default;
    explicit Cover(std::vector<Cube> cs) : cubes(std::move(cs)) {}
    static Cover zero() { return {}; }
    static Cover one() { return Cover{{Cube{}}}; }
    static Cover literal(Literal l) { return Cover{{Cube{{l}}}}; }

    std::size_t size() const { return cubes.size(); }
    bool isZero() const { return cubes.empty(); }
    bool isOne() const { return cubes.size() == 1 && cubes[0].empty(); }
    /// Number of literal occurrences over all cubes.
    std::size_t literalCount() const;
    /// Sorted list of distinct variables used.
    std::vector<std::uint32_t> support() const;
    /// Sort cubes, drop duplicates and contradictory cubes.
    void normalize();
    friend bool operator==(const Cover&, const Cover&) = default;
};

struct CoverHash {
    std::size_t operator()(const Cover& f) const noexcept;
};

/// Product of two cubes: the union of their literals (may be contradictory).
Cube cubeProduct(const Cube& a, const Cube& b);
/// Literals common to both cubes.
Cube cubeIntersection(const Cube& a, const Cube& b);
/// Literals of `a` not in `b` (the cube quotient a / b when b's literals are all in a).
Cube cubeDifference(const Cube& a, const Cube& b);

/// Remove cubes contained in another cube of the cover (single-cube containment).
void removeContainedCubes(Cover& f);

/// Is sorted `a` disjoint from sorted `b`? Writes their union (sorted) into `out` when so.
bool disjointUnion(std::span<const Literal> a, std::span<const Literal> b, std::vector<Literal>& out);

/// Algebraic product of two covers (callers ensure disjoint support for a strictly algebraic result).
Cover multiply(const Cover& a, const Cover& b);
/// Algebraic sum (union of cube sets, normalised).
Cover add(const Cover& a, const Cover& b);

/// Result of weak (algebraic) division f = d*q + r.
struct Division {
    Cover quotient;
    Cover remainder;
};

/// Weak division of f by d: the largest q with d*q contained in f, and r = f - d*q.
Division divide(const Cover& f, const Cover& d);
/// Division by a single cube (fast path).
Division divideByCube(const Cover& f, const Cube& c);

/// An index over one normalised cover for repeated division of the same f:
/// literal -> ascending indices of the cubes holding it, and cube -> index.
/// The cover must outlive the index and stay unchanged.
class CoverIndex {
public:
    explicit CoverIndex(const Cover& f);
    const Cover& cover() const { return *f_; }
    /// Indices (ascending) of the cubes of f that contain literal l.
    std::span<const std::uint32_t> cubesWith(Literal l) const;
    /// Index of the cube with exactly these literals (sorted ascending), or npos.
    std::size_t find(std::span<const Literal> sortedLits) const;
    static constexpr std::size_t npos = std::numeric_limits<std::size_t>::max();
    /// The distinct literals of f, ascending; a literal's position here is its slot.
    const std::vector<Literal>& literals() const { return lits_; }
    /// Slot of literal l, or npos when l does not occur in f.
    std::size_t slotOf(Literal l) const;
    /// Indices (ascending) of the cubes holding the literal in `slot`.
    std::span<const std::uint32_t> cubesWithSlot(std::size_t slot) const {
        return {occ_.data() + occStart_[slot], occ_.data() + occStart_[slot + 1]};
    }

private:
    const Cover* f_;
    std::vector<Literal> lits_;             // distinct literals of f, ascending
    std::vector<std::uint32_t> slotByLit_;  // literal -> slot + 1 (0: absent), when literals are dense enough
    std::vector<std::uint32_t> occStart_;   // CSR offsets, one per entry of lits_ plus one
    std::vector<std::uint32_t> occ_;        // cube indices grouped by literal
    std::vector<std::uint32_t> table_;      // open addressing: cube index + 1, 0 = empty
    std::size_t mask_ = 0;
};

/// Weak division using a prebuilt index of f (same result as divide(f.cover(), d)).
Division divide(const CoverIndex& f, const Cover& d);

/// f divided by its common cube; the common cube is stored in `common` when given.
Cover makeCubeFree(const Cover& f, Cube* common = nullptr);

/// Largest cube dividing every cube of f (empty cube when f is cube-free or empty).
Cube commonCube(const Cover& f);
/// True when no literal is common to all cubes of f (and f has at least two cubes).
bool isCubeFree(const Cover& f);

/// A kernel of f together with its co-kernel: kernel = f / cokernel, cube-free.
struct KernelPair {
    Cover kernel;
    Cube cokernel;
    int level = 0;   ///< 0 when the kernel has no kernels but itself
};

/// Limits for kernel enumeration.
struct KernelOptions {
    std::size_t maxKernels = 10000;   ///< stop after this many pairs
    std::size_t maxWork = 2000000;    ///< stop after this many elementary steps
    bool levelZeroOnly = false;       ///< report only level-0 kernels
    bool computeLevels = true;        ///< false: `level` is only 0 (level 0) or 1 (higher), which is cheaper
};

/// What a kernel enumeration did.
struct KernelStats {
    std::size_t work = 0;        ///< elementary steps spent (enumeration and levels)
    bool truncated = false;      ///< a bound stopped the enumeration: the list is a prefix
    bool levelsExact = true;     ///< false when the level budget ran out (levels >= 1 are then lower bounds)
};

/// All (kernel, co-kernel) pairs of f without duplicates, up to the bounds.
/// Pairs come in depth-first order from the co-kernel 1 (or the common cube)
/// downwards; the cover itself is the first pair when it is cube-free.
std::vector<KernelPair> kernels(const Cover& f, const KernelOptions& opts = {});
std::vector<KernelPair> kernels(const Cover& f, const KernelOptions& opts, KernelStats* stats);

/// One level-0 kernel of f, reached by dividing by the most frequent literal
/// until no literal repeats. The kernel is empty when f has no kernel (fewer
/// than two cubes after removing the common cube). When f itself is a level-0
/// kernel the result is f with co-kernel 1.
KernelPair levelZeroKernel(const Cover& f);

/// A factored form: a tree of sums and products over literals.
struct Factored {
    enum class Kind { Zero, One, Lit, And, Or };
    Kind kind = Kind::Zero;
    Literal lit = 0;                 ///< valid when kind == Lit
    std::vector<Factored> kids;      ///< valid for And / Or
    std::size_t literalCount() const;
    /// Two-input gates of the form: an AND/OR of k operands is k-1 gates; inversions are free.
    std::size_t gateCount() const;
    /// Arrival of the root when variable x arrives at `at(x)`: each AND/OR is a tree of
    /// two-input gates balanced by arrival (the two earliest merged first, which is optimal
    /// for the latest arrival). Constants arrive at 0.
    std::size_t arrival(const std::function<std::size_t(std::uint32_t)>& at) const;
    /// The same with `at[x]` (0 for a variable past the end).
    std::size_t arrival(const std::vector<std::size_t>& at) const;
    /// Flatten back to a sum of products (for checking).
    Cover toCover() const;
};

enum class FactorMethod {
    Quick,    ///< divide by a level-0 kernel
    Best,     ///< choose the divisor by literal saving (the result is never larger than Quick's)
};

/// Factor f by repeated division. The result is algebraically derived from f
/// (no Boolean simplification): it has the same function and never more literals.
Factored factor(const Cover& f, FactorMethod method = FactorMethod::Best);

/// Best factoring of f given its Quick form (factor(f, Quick)), which Best
/// compares against: callers that hold both forms factor each once.
Factored factorBest(const Cover& f, const Factored& quickForm);

/// The cover as a factored form without factoring (an OR of ANDs).
Factored sumOfProducts(const Cover& f);

/// Render a cover or factored form in Verilog operator syntax using a name per variable.
std::string toString(const Cover& f, const std::vector<std::string>& varNames);
std::string toString(const Factored& f, const std::vector<std::string>& varNames);

} // namespace kerf::algebra
