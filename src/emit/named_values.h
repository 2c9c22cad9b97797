// named_values.h — signals the source treats as holding named values (writer-internal).
//
// See named_values.cpp for the idea and the rules.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/emit/writer.h"
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <cstdint>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace kerf::emit {

/// A module signal whose value the source only ever names: it compares the whole signal with
/// named constants (localparams, package constants, enum values), assigns it named constants,
/// or copies it whole; never reads a bit or a slice of it, never compares it with a literal.
struct NamedDomain {
    std::string signal;
    int width = 0;
    struct Value {
        std::string bits;   ///< most significant bit first
        std::string ref;    ///< the name as the source writes it
    };
    std::vector<Value> values;     ///< distinct values, each with its first name
    bool compared = false;         ///< the source compares it with named values
    /// Every assignment to it is a named value, a whole signal of its width, or a `?:` of those.
    bool assignedNamed = false;
};

/// Limits of the naming (named options, docs/guide.md "Named values").
struct NamedValueLimits {
    int maxWidth = 10;      ///< widest signal whose functions are tabulated (2^width rows)
    int maxExcluded = 2;    ///< longest `s != A && s != B` chain written for a function
    int maxSupport = 16;    ///< most inputs a target's bits may read for its choice (2^n rows)
    int maxOrdered = 6;     ///< most values whose order in a choice is searched exhaustively
};

/// A vector target written as one choice among named values:
/// `T = c1 ? V1 : c2 ? V2 : ... : Vk`, each condition a product of the target's bit functions.
struct ValueChoice {
    struct Link {
        std::string ref;                           ///< the value's name
        std::string bits;                          ///< its value, MSB first
        std::vector<std::pair<int, bool>> cube;    ///< (bit offset, value): the condition (empty: the last)
    };
    std::vector<Link> links;
};

/// The choice for a target of domain `d` whose bit k the network computes as `drivers[k]`:
/// only when every value the bits can take together (tabulated over the inputs they read) is
/// one of the domain's names. Link k's condition tells its value apart from the values of the
/// links after it, so given the earlier conditions false it holds exactly when the target has
/// that value; the order is the one with the fewest condition literals.
std::optional<ValueChoice> valueChoice(const NamedDomain& d, const net::Network& net,
                                       const std::vector<algebra::Literal>& drivers,
                                       const NamedValueLimits& lim = {});

/// The named domains of `m` (an empty list when it has none).
std::vector<NamedDomain> namedDomains(const frontend::ModuleDesc& m, const NamedValueLimits& lim = {});

/// Rewrites, in `net` and `forms`, every logic node whose function reads only the bits of one
/// compared named domain (network inputs) and is exactly a set of its named values: its form
/// becomes an OR of whole-signal comparisons (`s == A | s == B`), or an AND of exclusions
/// (`s != A & s != B`, at most maxExcluded) when the values it is false for are the named ones.
/// Returns the number of nodes rewritten. Each rewrite is an item: a node's id, or
/// kOutputItem | i for output i driven by comparisons instead of a bit; items in `unnamed` keep
/// their bits, and `items` (when given) receives those rewritten.
std::size_t nameDomainFunctions(const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                                const frontend::Lowered& low, net::Network& net,
                                std::vector<algebra::Factored>& forms, const NamedValueLimits& lim = {},
                                const std::set<std::uint64_t>* unnamed = nullptr,
                                std::vector<std::uint64_t>* items = nullptr);
inline constexpr std::uint64_t kOutputItem = std::uint64_t{1} << 63;

/// A target written as a choice: the choice, and the network outputs of its bits by offset.
struct PlannedChoice {
    std::string signal;
    ValueChoice choice;
    std::vector<std::size_t> bits;
};

/// The outputs of `net` (indexed as `low.outputBits`) that hold target `signal`'s bits by
/// offset, when every bit is one output and none is a word operand; else empty.
std::vector<std::size_t> targetBits(const frontend::Lowered& low, const std::string& signal, int width);

/// Figures of logic as the writer prints it (naming_cost.cpp): two-input gates of the forms
/// (inverters free) and depth with each AND/OR balanced by arrival, the measure of the written
/// file (passes/factored.cpp counts depth the same way).
struct WrittenFigures {
    std::size_t gates = 0;
    std::size_t depth = 0;
};

/// The figures of every output of `net` written with `forms`, the bits of each choice in
/// `choices` written by it (its conditions and each bit's `?:` chain over them).
WrittenFigures writtenFigures(const net::Network& net, const std::vector<algebra::Factored>& forms,
                              const std::vector<PlannedChoice>& choices);

/// Two-input gates a choice adds on top of the bit functions its conditions read.
std::size_t choiceGates(const ValueChoice& vc, int width);

/// Which named forms the writer uses: domains whose functions are written as comparisons, and
/// targets written as one choice among names.
struct NamingPlan {
    std::set<std::string> compared;
    std::set<std::string> chosen;
    std::set<std::uint64_t> unnamed;   ///< rewrites of nameDomainFunctions left as bits
    bool empty() const { return compared.empty() && chosen.empty(); }
};

/// The bound a named form must keep (naming_cost.cpp): depth at most `depthBound` (or the
/// bitwise form's when larger), gates at most the bitwise form's plus `gateMargin`.
struct NamingBudget {
    std::size_t depthBound = 0;
    double gateMargin = 0;
    int maxTrials = 24;   ///< forms measured; past that, the remaining items are not named
};

/// The network and forms written under a plan, with its choices and figures.
struct NamedResult {
    net::Network net;
    std::vector<algebra::Factored> forms;
    std::vector<PlannedChoice> choices;
    std::vector<std::uint64_t> items;   ///< the rewrites made (nameDomainFunctions)
    WrittenFigures figures;
};

/// `net`/`forms` with the plan's comparisons made (nameDomainFunctions) and its choices planned.
NamedResult applyNaming(const NamingPlan& plan, const std::vector<NamedDomain>& domains,
                        const frontend::ModuleDesc& m, const frontend::Lowered& low, const net::Network& net,
                        const std::vector<algebra::Factored>& forms);

/// The plan that names most within `budget`: domains' comparisons first (by name), then
/// targets' choices, each kept only when the figures with it stay within the budget.
NamingPlan chooseNaming(const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                        const frontend::Lowered& low, const net::Network& net,
                        const std::vector<algebra::Factored>& forms, const NamingBudget& budget,
                        std::string* log = nullptr, NamingRecord* record = nullptr);

} // namespace kerf::emit
