// named_values.h — signals the source treats as holding named values (writer-internal).
//
// See named_values.cpp for the idea and the rules.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <optional>
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
/// Returns the number of nodes rewritten.
std::size_t nameDomainFunctions(const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                                const frontend::Lowered& low, net::Network& net,
                                std::vector<algebra::Factored>& forms, const NamedValueLimits& lim = {});

} // namespace kerf::emit
