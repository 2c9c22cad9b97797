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

// Does this node print with a top-level `|` (so needs parentheses under `&`)?
bool printsAsOr(const Factored& f) {
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
