// kerf/algebra/expr.h — the small expression syntax of `kerf algebra`.
//
// Expressions use Verilog's bitwise operators: `|` (or), `&` (and), `~` (not),
// parentheses, names (`a`, `req_1`, `a[3]`) and the constants `0`, `1`,
// `1'b0`, `1'b1`. `~` applies to a name or a constant (or a parenthesised
// single name); a complemented sum or product is not a sum of products and is
// rejected. Products of sums are multiplied out algebraically.
#pragma once

#include "kerf/algebra/cover.h"

#include <cstddef>
#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace kerf::algebra {

/// Variable names and their ids; ids are given in first-appearance order.
class VarTable {
public:
    /// The id of `name`, adding it when new.
    std::uint32_t intern(const std::string& name);
    std::optional<std::uint32_t> find(const std::string& name) const;
    const std::vector<std::string>& names() const { return names_; }
    std::size_t size() const { return names_.size(); }

private:
    std::vector<std::string> names_;
    std::unordered_map<std::string, std::uint32_t> ids_;
};

/// A syntax error at a byte offset of the expression text.
class ExprError : public std::runtime_error {
public:
    ExprError(std::string message, std::size_t offset) : std::runtime_error(std::move(message)), offset_(offset) {}
    /// 0-based byte offset of the offending character (== text size at the end).
    std::size_t offset() const { return offset_; }

private:
    std::size_t offset_;
};

/// Parse an expression into a normalised cover (contradictory cubes such as
/// `a & ~a` vanish, repeated cubes merge; no other simplification). Throws
/// ExprError. `maxCubes` bounds the size of any multiplied-out product.
Cover parseExpression(std::string_view text, VarTable& vars, std::size_t maxCubes = 100000);

/// A message for a parse error: "error: LABEL, column N: MESSAGE" followed by
/// the expression and a caret line under the offending character.
std::string describeExprError(std::string_view text, const ExprError& e, std::string_view label = {});

} // namespace kerf::algebra
