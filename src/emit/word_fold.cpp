// word_fold.cpp — word operations the engine's result fixes, folded before writing.
//
// The lowering keeps a comparison, shift or arithmetic operation as one word-level operator
// whose operands are outputs of the bit network and whose result is an input of it. When an
// operand is constant as written, the lowering already evaluates it; but an operand may be
// constant only once the engine has simplified its logic (`st1.f1 > w1` where the engine finds
// `st1.f1` always 0), or both operands may read only one or two distinct bits padded with
// constant zeros (`{7'b0000000, a & b} <= {5'b00000, c, d, e}`). Written as it stands, such an
// operation reads as a term that is always 0 or a comparison against padding, and lint reports
// it (Verilator's UNSIGNED and CMPCONST). Here, after the engine and before the writer:
//
// - Operands that read at most WordFoldLimits::maxSupport distinct bits: the operation is
//   evaluated for every value of those bits (IEEE 1800-2017 11.4: comparisons, shifts, +, -, *
//   on the operands extended to a common width, signed when the operation is) and each result
//   bit becomes a minimum sum of products over them (minimize::minimumCover) — when the result
//   is constant, or a comparison's operand is constant as a whole and the gates are no more
//   than the bits read. Any other operation stays a word operation: the statements' figures
//   count it as one, and as gates it would weigh against their rewrite.
// - A comparison with an operand constant as a whole: `B < c` is the OR over the one bits i of
//   c of "b_i = 0 and every higher bit equal to c's" (the usual comparator against a
//   constant, from memory of any logic-design textbook); signed operands compare as unsigned
//   with their sign bits complemented (two's complement order).
// - A shift or product of a constant zero is zero.
//
// The result's input is replaced by the new logic everywhere it is read, and the operation and
// its operand outputs leave the lowering: the writer then writes gates (or nothing) where the
// operation stood. The caller tidies the network (constants folded) and recomputes the forms.
#include "kerf/emit/word_fold.h"

#include "kerf/minimize/twolevel.h"

#include <fmt/format.h>

#include <algorithm>
#include <cstdint>
#include <map>
#include <optional>
#include <set>

namespace kerf::emit {

using algebra::Cover;
using algebra::Cube;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using algebra::negateLiteral;

namespace {

bool isComparison(const std::string& op) {
    return op == "==" || op == "!=" || op == "===" || op == "!==" || op == "<" || op == "<=" || op == ">" ||
           op == ">=";
}
bool isShift(const std::string& op) { return op == "<<" || op == ">>" || op == "<<<" || op == ">>>"; }
bool isArithmetic(const std::string& op) { return op == "+" || op == "-" || op == "*"; }

/// Bits of the operands extended to `width` (sign or zero, as the operation reads them).
std::vector<Literal> extended(std::vector<Literal> bits, std::size_t width, bool sign) {
    const Literal fill = sign && !bits.empty() ? bits.back() : net::kFalse;
    while (bits.size() < width) bits.push_back(fill);
    return bits;
}

std::uint64_t maskOf(std::size_t w) { return w >= 64 ? ~std::uint64_t{0} : (std::uint64_t{1} << w) - 1; }

/// The operation on two values of `width` bits (already extended), bit `bit` of its result.
bool evaluate(const frontend::WordOp& w, std::uint64_t a, std::uint64_t b, std::size_t width, int bit) {
    const std::uint64_t m = maskOf(width);
    a &= m;
    b &= m;
    auto signedOf = [&](std::uint64_t v) {
        if (width >= 64) return static_cast<std::int64_t>(v);
        const std::uint64_t top = std::uint64_t{1} << (width - 1);
        return static_cast<std::int64_t>(v & top ? v | ~m : v);
    };
    const std::string& op = w.op;
    if (isComparison(op)) {
        if (op == "==" || op == "===") return a == b;
        if (op == "!=" || op == "!==") return a != b;
        if (w.isSigned) {
            std::int64_t x = signedOf(a), y = signedOf(b);
            return op == "<" ? x < y : op == "<=" ? x <= y : op == ">" ? x > y : x >= y;
        }
        return op == "<" ? a < b : op == "<=" ? a <= b : op == ">" ? a > b : a >= b;
    }
    std::uint64_t r = 0;
    if (isShift(op)) {
        const bool left = op == "<<" || op == "<<<";
        const bool arith = op == ">>>" && w.isSigned;
        const bool neg = arith && width > 0 && ((a >> (width - 1)) & 1);
        if (b >= width) r = left ? 0 : (neg ? m : 0);
        else if (left) r = a << b;
        else r = (a >> b) | (neg && b > 0 ? (m & ~(m >> b)) : 0);
    } else if (op == "+") {
        r = a + b;
    } else if (op == "-") {
        r = a - b;
    } else {
        r = a * b;
    }
    return ((r & m) >> bit) & 1;
}

/// `B < c` as a cover over B's bit literals (unsigned; B's bits may be constant literals).
/// `greater`: `B > c` instead.
Cover compareWithConstant(const std::vector<Literal>& bv, std::uint64_t c, bool greater) {
    Cover f;
    const std::size_t n = bv.size();
    // "B equals c above bit i": the literals b_j == c_j for j > i; nullopt when a constant bit differs.
    auto above = [&](std::size_t i) -> std::optional<std::vector<Literal>> {
        std::vector<Literal> lits;
        for (std::size_t j = i + 1; j < n; ++j) {
            Literal want = ((c >> j) & 1) ? bv[j] : negateLiteral(bv[j]);
            if (literalVar(want) == 0) {
                if (want == net::kFalse) return std::nullopt;
                continue;
            }
            lits.push_back(want);
        }
        return lits;
    };
    for (std::size_t i = 0; i < n; ++i) {
        const bool ci = (c >> i) & 1;
        // B < c: b_i = 0 where c_i = 1; B > c: b_i = 1 where c_i = 0.
        if (ci == greater) continue;
        Literal here = greater ? bv[i] : negateLiteral(bv[i]);
        if (here == net::kFalse) continue;
        auto lits = above(i);
        if (!lits) continue;
        if (here != net::kTrue) lits->push_back(here);
        f.cubes.push_back(Cube(std::move(*lits)));
    }
    f.normalize();
    return f;
}

} // namespace

WordFoldCounts foldWordOperations(frontend::Lowered& low, const WordFoldLimits& limits) {
    WordFoldCounts counts;
    net::Network& net = low.net;
    // Bits by name: operand outputs (their drivers) and result inputs (their nodes).
    std::map<std::string, std::map<int, std::size_t>> outputOf, inputOf;
    for (std::size_t k = 0; k < low.outputBits.size() && k < net.outputs().size(); ++k)
        outputOf[low.outputBits[k].signal][low.outputBits[k].offset] = k;
    for (std::size_t k = 0; k < low.inputBits.size() && k < net.inputs().size(); ++k)
        inputOf[low.inputBits[k].signal][low.inputBits[k].offset] = k;

    std::map<net::NodeId, Literal> replace;   // result input node -> its value
    std::set<std::string> dropOperands;
    std::vector<std::size_t> dropOps;
    for (std::size_t k = 0; k < low.wordOps.size(); ++k) {
        const frontend::WordOp& w = low.wordOps[k];
        if (w.unary || w.operands.size() != 2) continue;
        if (!isComparison(w.op) && !isShift(w.op) && !isArithmetic(w.op)) continue;
        // The operands' bits as literals of the network.
        std::vector<std::vector<Literal>> ops;
        bool known = true;
        for (const auto& o : w.operands) {
            std::vector<Literal> bits;
            const auto& by = o.generated ? outputOf[o.name] : inputOf[o.name];
            for (int i = 0; known; ++i) {
                auto it = by.find(i);
                if (it == by.end()) break;
                bits.push_back(o.generated ? net.outputs()[it->second].driver
                                           : makeLiteral(net.inputs()[it->second], false));
            }
            known = known && !bits.empty() && bits.size() == by.size() && bits.size() <= 64;
            ops.push_back(std::move(bits));
        }
        if (!known) continue;
        // The result's bits as inputs of the network (a bit nothing reads has none).
        const auto& resultBits = inputOf[w.result];
        if (resultBits.empty()) continue;
        const std::size_t width = std::max(ops[0].size(), ops[1].size());
        const bool sign = w.isSigned && !isShift(w.op);
        std::vector<Literal> a = extended(ops[0], isShift(w.op) ? static_cast<std::size_t>(w.resultWidth) : width,
                                          w.isSigned);
        std::vector<Literal> b = isShift(w.op) ? ops[1] : extended(ops[1], width, sign);
        const std::size_t aw = isShift(w.op) || isArithmetic(w.op)
                                   ? std::max<std::size_t>(a.size(), static_cast<std::size_t>(w.resultWidth))
                                   : a.size();
        if (isArithmetic(w.op)) {
            a = extended(a, aw, sign);
            b = extended(b, aw, sign);
        }
        std::vector<std::uint32_t> support;
        for (const auto* v : {&a, &b})
            for (Literal l : *v)
                if (literalVar(l) != 0) support.push_back(literalVar(l));
        std::sort(support.begin(), support.end());
        support.erase(std::unique(support.begin(), support.end()), support.end());
        auto constantOf = [](const std::vector<Literal>& v) -> std::optional<std::uint64_t> {
            std::uint64_t c = 0;
            for (std::size_t i = 0; i < v.size(); ++i) {
                if (literalVar(v[i]) != 0) return std::nullopt;
                if (v[i] == net::kTrue) c |= std::uint64_t{1} << i;
            }
            return c;
        };
        std::map<int, Cover> covers;   // per result bit read
        std::string why;
        if (static_cast<int>(support.size()) <= limits.maxSupport) {
            const int n = static_cast<int>(support.size());
            std::vector<std::uint64_t> varMask;
            for (int i = 0; i < n; ++i) varMask.push_back(minimize::variableTable(i, n)[0]);
            auto valueOf = [&](const std::vector<Literal>& v, int minterm) {
                std::uint64_t x = 0;
                for (std::size_t i = 0; i < v.size(); ++i) {
                    bool bit;
                    if (literalVar(v[i]) == 0) {
                        bit = v[i] == net::kTrue;
                    } else {
                        auto at = std::lower_bound(support.begin(), support.end(), literalVar(v[i])) - support.begin();
                        bit = ((varMask[static_cast<std::size_t>(at)] >> minterm) & 1) != literalNegated(v[i]);
                    }
                    if (bit) x |= std::uint64_t{1} << i;
                }
                return x;
            };
            for (const auto& [bit, input] : resultBits) {
                std::uint64_t on = 0;
                for (int mt = 0; mt < 64; ++mt) {
                    const std::size_t ew = isShift(w.op) ? a.size() : std::max(a.size(), b.size());
                    if (evaluate(w, valueOf(a, mt), valueOf(b, mt), ew, bit)) on |= std::uint64_t{1} << mt;
                }
                covers[bit] = n == 0 ? (on & 1 ? Cover::one() : Cover::zero()) : minimize::minimumCover({on}, support);
            }
            // A real operation stays a word operation (the statements' figures count it as one;
            // as gates it would weigh against their rewrite) unless it is constant, or compares
            // with an operand constant as a whole at no more gates than the bits it reads.
            std::size_t gates = 0;
            bool constant = true;
            for (const auto& [bit, f] : covers) {
                constant = constant && (f.isZero() || f.isOne());
                if (!f.isZero()) gates += f.size() - 1;
                for (const Cube& c : f.cubes) gates += c.size() > 0 ? c.size() - 1 : 0;
            }
            const bool constantOperand = isComparison(w.op) && (constantOf(a) || constantOf(b));
            if (!constant && !(constantOperand && gates <= support.size())) continue;
            why = constant ? "its value is constant"
                           : fmt::format("its operands read {} distinct bit{} ({} gates)", n, n == 1 ? "" : "s", gates);
        } else if (isComparison(w.op)) {
            auto ca = constantOf(a), cb = constantOf(b);
            if (!ca && !cb) continue;
            std::vector<Literal> x = ca ? b : a;
            std::uint64_t c = ca ? *ca : *cb;
            std::string op = w.op;
            if (ca) {   // c op B  ->  B op' c
                if (op == "<") op = ">";
                else if (op == ">") op = "<";
                else if (op == "<=") op = ">=";
                else if (op == ">=") op = "<=";
            }
            if (w.isSigned && !x.empty()) {
                x.back() = negateLiteral(x.back());
                c ^= std::uint64_t{1} << (x.size() - 1);
            }
            c &= maskOf(x.size());
            Cover f;
            bool complement = false;
            if (op == "==" || op == "===" || op == "!=" || op == "!==") {
                std::vector<Literal> eq;
                bool possible = true;
                for (std::size_t j = 0; j < x.size() && possible; ++j) {
                    Literal want = ((c >> j) & 1) ? x[j] : negateLiteral(x[j]);
                    if (want == net::kFalse) possible = false;
                    else if (want != net::kTrue) eq.push_back(want);
                }
                f = possible ? Cover{{Cube(std::move(eq))}} : Cover::zero();
                complement = op == "!=" || op == "!==";
            } else if (op == "<") {
                f = compareWithConstant(x, c, false);
            } else if (op == ">=") {
                f = compareWithConstant(x, c, false);
                complement = true;
            } else if (op == ">") {
                f = compareWithConstant(x, c, true);
            } else {   // <=
                f = compareWithConstant(x, c, true);
                complement = true;
            }
            f.normalize();
            if (complement) {
                Cover g;
                if (f.isZero()) g = Cover::one();
                else if (f.isOne()) g = Cover::zero();
                else if (!minimize::complementCover(f, g)) continue;
                f = std::move(g);
                f.normalize();
            }
            for (const auto& [bit, input] : resultBits) covers[bit] = bit == 0 ? f : Cover::zero();
            why = "an operand is constant";
        } else if ((isShift(w.op) || w.op == "*") && (constantOf(a) == std::uint64_t{0} ||
                                                    (w.op == "*" && constantOf(b) == std::uint64_t{0}))) {
            for (const auto& [bit, input] : resultBits) covers[bit] = Cover::zero();
            why = "it shifts or multiplies a constant zero";
        } else {
            continue;
        }
        for (auto& [bit, f] : covers) {
            const net::NodeId r = net.inputs()[resultBits.at(bit)];
            const net::NodeId v = net.addLogic(std::move(f));
            replace[r] = makeLiteral(v, false);
        }
        for (const auto& o : w.operands)
            if (o.generated) dropOperands.insert(o.name);
        dropOps.push_back(k);
        counts.texts.push_back(fmt::format("word operation {} ({} {} {}) folded into gates: {}", w.result,
                                           w.operands[0].name, w.op, w.operands[1].name, why));
    }
    if (replace.empty()) return counts;
    // Every reader of a folded result reads its logic instead.
    auto subst = [&](Literal l) {
        auto it = replace.find(literalVar(l));
        if (it == replace.end()) return l;
        return literalNegated(l) ? negateLiteral(it->second) : it->second;
    };
    for (net::NodeId id = 0; id < net.nodeCount(); ++id) {
        if (!net.isLogic(id)) continue;
        net::Node& node = net.node(id);
        bool touched = false;
        for (Cube& c : node.cover.cubes)
            for (Literal l : c.lits)
                touched = touched || replace.count(literalVar(l));
        if (!touched) continue;
        Cover f;
        for (const Cube& c : node.cover.cubes) {
            std::vector<Literal> lits;
            for (Literal l : c.lits) lits.push_back(subst(l));
            f.cubes.push_back(Cube(std::move(lits)));
        }
        f.normalize();
        node.cover = std::move(f);
    }
    for (auto& o : net.outputs()) o.driver = subst(o.driver);
    // The operations and their operand outputs leave the lowering.
    std::vector<net::Output> outs;
    std::vector<frontend::BitRef> bits;
    std::vector<frontend::OutputSource> sources;
    for (std::size_t k = 0; k < net.outputs().size(); ++k) {
        if (k < low.outputBits.size() && dropOperands.count(low.outputBits[k].signal)) continue;
        outs.push_back(net.outputs()[k]);
        if (k < low.outputBits.size()) bits.push_back(low.outputBits[k]);
        if (k < low.outputSources.size()) sources.push_back(low.outputSources[k]);
    }
    net.outputs() = std::move(outs);
    low.outputBits = std::move(bits);
    low.outputSources = std::move(sources);
    for (auto it = dropOps.rbegin(); it != dropOps.rend(); ++it)
        low.wordOps.erase(low.wordOps.begin() + static_cast<std::ptrdiff_t>(*it));
    counts.folded = dropOps.size();
    return counts;
}

} // namespace kerf::emit
