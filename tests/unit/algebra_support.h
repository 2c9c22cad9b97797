// algebra_support.h — helpers shared by the algebra unit tests: expression
// shorthands, seeded random covers and truth tables for functional checks.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/algebra/expr.h"

#include <cstdint>
#include <random>
#include <string>
#include <vector>

namespace kerf::algebra::testing {

/// Parses expressions over one shared variable table (ids by first appearance).
struct Vars {
    VarTable table;
    Cover operator()(const std::string& text) { return parseExpression(text, table); }
    std::string str(const Cover& f) const { return toString(f, table.names()); }
    std::string str(const Factored& f) const { return toString(f, table.names()); }
    std::string str(const Cube& c) const { return toString(Cover{{c}}, table.names()); }
    Cube cube(const std::string& text) {
        Cover f = (*this)(text);
        return f.cubes.at(0);
    }
};

/// A random normalised cover: `cubes` cubes over `vars` variables, each cube
/// with 1..maxLits literals of random polarity (no contradictions).
inline Cover randomCover(std::mt19937& rng, std::uint32_t vars, std::size_t cubes, std::size_t maxLits,
                         double negProb = 0.3) {
    std::uniform_int_distribution<std::uint32_t> var(0, vars - 1);
    std::uniform_int_distribution<std::size_t> len(1, std::min<std::size_t>(maxLits, vars));
    std::bernoulli_distribution neg(negProb);
    Cover f;
    for (std::size_t i = 0; i < cubes; ++i) {
        std::vector<Literal> lits;
        std::size_t k = len(rng);
        std::vector<char> used(vars, 0);
        while (lits.size() < k) {
            std::uint32_t v = var(rng);
            if (used[v]) continue;
            used[v] = 1;
            lits.push_back(makeLiteral(v, neg(rng)));
        }
        f.cubes.emplace_back(std::move(lits));
    }
    f.normalize();
    return f;
}

/// Truth table over n <= 16 variables: bit m of the table is the value at minterm m.
using Table = std::vector<std::uint64_t>;

inline std::size_t tableWords(unsigned n) { return n <= 6 ? 1 : (std::size_t{1} << (n - 6)); }

inline Table varTable(unsigned n, std::uint32_t v, bool negated) {
    static const std::uint64_t masks[6] = {0xAAAAAAAAAAAAAAAAull, 0xCCCCCCCCCCCCCCCCull, 0xF0F0F0F0F0F0F0F0ull,
                                           0xFF00FF00FF00FF00ull, 0xFFFF0000FFFF0000ull, 0xFFFFFFFF00000000ull};
    Table t(tableWords(n));
    for (std::size_t w = 0; w < t.size(); ++w)
        t[w] = v < 6 ? masks[v] : (((w >> (v - 6)) & 1) ? ~0ull : 0ull);
    if (negated)
        for (auto& x : t) x = ~x;
    if (n < 6) t[0] &= (1ull << (1u << n)) - 1;   // only the 2^n meaningful bits
    return t;
}

inline Table constTable(unsigned n, bool one) {
    Table t(tableWords(n), one ? ~0ull : 0ull);
    if (n < 6 && one) t[0] = (1ull << (1u << n)) - 1;
    return t;
}

inline Table evalCover(const Cover& f, unsigned n) {
    Table out = constTable(n, false);
    for (const Cube& c : f.cubes) {
        Table t = constTable(n, true);
        for (Literal l : c.lits) {
            Table lt = varTable(n, literalVar(l), literalNegated(l));
            for (std::size_t w = 0; w < t.size(); ++w) t[w] &= lt[w];
        }
        for (std::size_t w = 0; w < t.size(); ++w) out[w] |= t[w];
    }
    return out;
}

/// Evaluates the tree itself (not its flattening), for an independent check.
inline Table evalFactored(const Factored& g, unsigned n) {
    switch (g.kind) {
    case Factored::Kind::Zero: return constTable(n, false);
    case Factored::Kind::One: return constTable(n, true);
    case Factored::Kind::Lit: return varTable(n, literalVar(g.lit), literalNegated(g.lit));
    case Factored::Kind::And: {
        Table t = constTable(n, true);
        for (const Factored& k : g.kids) {
            Table kt = evalFactored(k, n);
            for (std::size_t w = 0; w < t.size(); ++w) t[w] &= kt[w];
        }
        return t;
    }
    case Factored::Kind::Or: {
        Table t = constTable(n, false);
        for (const Factored& k : g.kids) {
            Table kt = evalFactored(k, n);
            for (std::size_t w = 0; w < t.size(); ++w) t[w] |= kt[w];
        }
        return t;
    }
    }
    return {};
}

} // namespace kerf::algebra::testing
