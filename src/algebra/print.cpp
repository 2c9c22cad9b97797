// print.cpp — covers and factored forms in Verilog operator syntax.
//
// Sums of products and factored forms are written with the Verilog bitwise
// operators of IEEE 1364/1800: `&` (and), `|` (or), `~` (not), where `~`
// binds tightest and `&` binds tighter than `|`; so a sum of products needs no
// parentheses and a factored form needs them only around an OR that is an
// operand of an AND. The constants are `0` and `1` (an unsized literal in
// Verilog is 32 bits wide, but in a one-bit context it reads the same).
// The factored-form notation itself is the usual one of the algebraic model,
// e.g. G. De Micheli, "Synthesis and Optimization of Digital Circuits",
// McGraw-Hill 1994, ch. 8.
//
// Order is deterministic: literals within a cube ascend by literal number
// (variable id, then polarity), cubes follow the cover's canonical order, and
// factored forms print their children in the order factoring built them.

#include "kerf/algebra/cover.h"

#include <string>

namespace kerf::algebra {

namespace {

void appendLiteral(std::string& out, Literal l, const std::vector<std::string>& names) {
    if (literalNegated(l)) out += '~';
    const std::uint32_t v = literalVar(l);
    if (v < names.size() && !names[v].empty()) out += names[v];
    else out += "v" + std::to_string(v);
}

void appendCube(std::string& out, const Cube& c, const std::vector<std::string>& names) {
    if (c.empty()) {
        out += '1';
        return;
    }
    for (std::size_t i = 0; i < c.lits.size(); ++i) {
        if (i) out += " & ";
        appendLiteral(out, c.lits[i], names);
    }
}

// Is f the sum x & ~y | ~x & y (or x & y | ~x & ~y)? Such a sum prints as
// `x ^ y` (or `~(x ^ y)`): the same two variables, and far easier to read.
bool xorShape(const Factored& f, Literal& x, Literal& y, bool& inverted) {
    if (f.kind != Factored::Kind::Or || f.kids.size() != 2) return false;
    const Factored& p = f.kids[0];
    const Factored& q = f.kids[1];
    auto pairOf = [](const Factored& g, Literal& a, Literal& b) {
        if (g.kind != Factored::Kind::And || g.kids.size() != 2) return false;
        if (g.kids[0].kind != Factored::Kind::Lit || g.kids[1].kind != Factored::Kind::Lit) return false;
        a = g.kids[0].lit;
        b = g.kids[1].lit;
        if (literalVar(a) > literalVar(b)) std::swap(a, b);
        return literalVar(a) != literalVar(b);
    };
    Literal a1, b1, a2, b2;
    if (!pairOf(p, a1, b1) || !pairOf(q, a2, b2)) return false;
    if (a2 != negateLiteral(a1) || b2 != negateLiteral(b1)) return false;
    // x ^ y with x, y the positive literals; each complemented pair flips the sense.
    x = a1 & ~1u;
    y = b1 & ~1u;
    inverted = literalNegated(a1) == literalNegated(b1);
    return true;
}

// Does this node print with a top-level `|` (so needs parentheses under `&`)?
bool printsAsOr(const Factored& f) {
    Literal x, y;
    bool inv;
    if (xorShape(f, x, y, inv)) return !inv;   // `(x ^ y)` needs them, `~(x ^ y)` has them
    if (f.kind != Factored::Kind::Or && f.kind != Factored::Kind::And) return false;
    if (f.kids.size() == 1) return printsAsOr(f.kids[0]);
    return f.kind == Factored::Kind::Or && f.kids.size() > 1;
}

void appendFactored(std::string& out, const Factored& f, const std::vector<std::string>& names) {
    switch (f.kind) {
    case Factored::Kind::Zero: out += '0'; return;
    case Factored::Kind::One: out += '1'; return;
    case Factored::Kind::Lit: appendLiteral(out, f.lit, names); return;
    case Factored::Kind::And:
        if (f.kids.empty()) {
            out += '1';
            return;
        }
        for (std::size_t i = 0; i < f.kids.size(); ++i) {
            if (i) out += " & ";
            const Factored& k = f.kids[i];
            const bool paren = printsAsOr(k);
            if (paren) out += '(';
            appendFactored(out, k, names);
            if (paren) out += ')';
        }
        return;
    case Factored::Kind::Or:
        if (f.kids.empty()) {
            out += '0';
            return;
        }
        {
            Literal x, y;
            bool inv = false;
            if (xorShape(f, x, y, inv)) {
                if (inv) out += "~(";
                appendLiteral(out, x, names);
                out += " ^ ";
                appendLiteral(out, y, names);
                if (inv) out += ')';
                return;
            }
        }
        for (std::size_t i = 0; i < f.kids.size(); ++i) {
            if (i) out += " | ";
            appendFactored(out, f.kids[i], names);
        }
        return;
    }
}

} // namespace

std::string toString(const Cover& f, const std::vector<std::string>& varNames) {
    if (f.isZero()) return "0";
    std::string out;
    for (std::size_t i = 0; i < f.cubes.size(); ++i) {
        if (i) out += " | ";
        appendCube(out, f.cubes[i], varNames);
    }
    return out;
}

std::string toString(const Factored& f, const std::vector<std::string>& varNames) {
    std::string out;
    appendFactored(out, f, varNames);
    return out;
}

} // namespace kerf::algebra
