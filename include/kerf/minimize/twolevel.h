// kerf/minimize/twolevel.h — two-level (sum-of-products) minimisation of one
// cover: truth tables, irredundant prime covers, exact minimum covers for
// small supports, an expand/irredundant heuristic for larger ones,
// complements and tautology, and minimisation within an interval
// [lower, upper] (on-set plus don't-care minterms). A library used by the
// restructuring techniques; covers are Boolean functions here (not
// algebraic expressions): a variable and its complement are related.
#pragma once

#include "kerf/algebra/cover.h"

#include <cstddef>
#include <cstdint>
#include <vector>

namespace kerf::minimize {

/// Limits of the minimiser. Every bound is a named field; past a bound the
/// minimiser returns a correct but possibly larger cover (or, for complement
/// and tautology, the safe "not shown" answer).
struct MinimizeOptions {
    int exactVars = 8;                 ///< exact minimum cover up to this many support variables
    int tableVars = 14;                ///< truth-table methods up to this many
    std::size_t maxHeuristicCubes = 200;   ///< larger covers only get single-cube containment
    long coverSearchLimit = 20000;     ///< branch-and-bound nodes of the exact covering search
    long implicationSteps = 2000;      ///< recursion steps of one cube-implies-cover check (expand/irredundant)
    long heuristicSteps = 200000;      ///< recursion steps of one whole expand/irredundant run
    long complementSteps = 50000;      ///< recursion steps of one complementation without truth tables
};

/// Default step bound of isTautology and cubeImplies.
inline constexpr long kDefaultCheckSteps = 1000000;

/// Truth table of `f` over `support` (support[i] is table variable i). At most
/// 16 variables; for fewer than 6 the 2^n-bit pattern repeats across the word.
std::vector<std::uint64_t> truthTable(const algebra::Cover& f, const std::vector<std::uint32_t>& support);

/// Truth table of variable i among n (same layout as truthTable).
std::vector<std::uint64_t> variableTable(int i, int n);

/// An irredundant sum of prime implicants of the function with on-set `on`
/// (Minato–Morreale), as a cover over `support`.
algebra::Cover irredundantPrimeCover(const std::vector<std::uint64_t>& on, const std::vector<std::uint32_t>& support);

/// An irredundant sum of primes of some function between `lower` and `upper`
/// (lower ⊆ upper; upper minus lower are the don't-care minterms).
algebra::Cover irredundantPrimeCover(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                                     const std::vector<std::uint32_t>& support);

/// A minimum-literal sum of products of `on` over `support` (at most 10
/// variables): all primes, then an exact covering search bounded by
/// `searchLimit` (best found so far when the bound is hit).
algebra::Cover minimumCover(const std::vector<std::uint64_t>& on, const std::vector<std::uint32_t>& support,
                            long searchLimit = 20000);

/// The same for an interval: primes of `upper` covering every minterm of `lower`.
algebra::Cover minimumCover(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                            const std::vector<std::uint32_t>& support, long searchLimit = 20000);

/// A small cover of some function in [lower, upper]: exact up to
/// opts.exactVars variables, an irredundant sum of primes above.
algebra::Cover minimizeInterval(const std::vector<std::uint64_t>& lower, const std::vector<std::uint64_t>& upper,
                                const std::vector<std::uint32_t>& support, const MinimizeOptions& opts = {});

/// A cover of the same function with no more literals: exact minimum for
/// small supports, irredundant primes up to `tableVars`, expand and
/// irredundant above that.
algebra::Cover minimizeCover(const algebra::Cover& f, const MinimizeOptions& opts = {});

/// The complement of `f`, minimised like minimizeCover. Returns false (and
/// leaves `out` unspecified) when it would exceed `cubeCap` cubes.
bool complementCover(const algebra::Cover& f, algebra::Cover& out, std::size_t cubeCap = 64,
                     const MinimizeOptions& opts = {});

/// True when `f` is the constant 1 (unate recursive paradigm). Past `steps`
/// recursion steps the answer is false ("not shown"), never a wrong true.
bool isTautology(const algebra::Cover& f, long steps = kDefaultCheckSteps);

/// True when the cube implies the cover (c ⊆ f as sets of minterms); false
/// past `steps` recursion steps.
bool cubeImplies(const algebra::Cube& c, const algebra::Cover& f, long steps = kDefaultCheckSteps);

} // namespace kerf::minimize
