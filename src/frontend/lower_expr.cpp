// lower_expr.cpp — expressions of the typed IR into network literals.
//
// Evaluation is iterative: an explicit stack of frames walks the expression
// (a `^` chain of tens of thousands of terms is as deep as it is long), and
// each frame combines its operands' bit values once they are on the value
// stack. Selects with a constant position read only the bits they select.
// Arithmetic with two variable operands stays a word-level operation unless
// the proof asks for gates (IEEE 1800-2017 11.4 operators, 11.6 widths).
#include "lower_internal.h"

#include <algorithm>

namespace kerf::frontend::detail {

using algebra::literalVar;

// ---- Builder ----------------------------------------------------------------

Literal Builder::andN(Bits in) {
    std::sort(in.begin(), in.end());
    in.erase(std::unique(in.begin(), in.end()), in.end());
    Bits lits;
    for (Literal l : in) {
        if (l == kFalse) return kFalse;
        if (l == kTrue) continue;
        if (!lits.empty() && lits.back() == negateLiteral(l)) return kFalse;
        lits.push_back(l);
    }
    if (lits.empty()) return kTrue;
    if (lits.size() == 1) return lits[0];
    algebra::Cube c;
    c.lits = std::move(lits);
    algebra::Cover cv;
    cv.cubes.push_back(std::move(c));
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

Literal Builder::orN(Bits in) {
    std::sort(in.begin(), in.end());
    in.erase(std::unique(in.begin(), in.end()), in.end());
    Bits lits;
    for (Literal l : in) {
        if (l == kTrue) return kTrue;
        if (l == kFalse) continue;
        if (!lits.empty() && lits.back() == negateLiteral(l)) return kTrue;
        lits.push_back(l);
    }
    if (lits.empty()) return kFalse;
    if (lits.size() == 1) return lits[0];
    algebra::Cover cv;
    for (Literal l : lits) {
        algebra::Cube c;
        c.lits = {l};
        cv.cubes.push_back(std::move(c));
    }
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

Literal Builder::xor2(Literal a, Literal b) {
    if (a == kFalse) return b;
    if (b == kFalse) return a;
    if (a == kTrue) return negateLiteral(b);
    if (b == kTrue) return negateLiteral(a);
    if (a == b) return kFalse;
    if (a == negateLiteral(b)) return kTrue;
    return sop({{a, negateLiteral(b)}, {negateLiteral(a), b}});
}

Literal Builder::mux(Literal s, Literal t, Literal e) {
    if (s == kTrue || t == e) return t;
    if (s == kFalse) return e;
    if (t == kTrue && e == kFalse) return s;
    if (t == kFalse && e == kTrue) return negateLiteral(s);
    if (t == kFalse) return and2(negateLiteral(s), e);
    if (t == kTrue) return or2(s, e);
    if (e == kFalse) return and2(s, t);
    if (e == kTrue) return or2(negateLiteral(s), t);
    return sop({{s, t}, {negateLiteral(s), e}});
}

Literal Builder::sop(std::vector<Bits> cubes) {
    algebra::Cover cv;
    for (auto& cb : cubes) {
        algebra::Cube c;
        std::sort(cb.begin(), cb.end());
        c.lits = std::move(cb);
        cv.cubes.push_back(std::move(c));
    }
    return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
}

std::optional<std::uint64_t> constValue(const Bits& b) {
    std::uint64_t v = 0;
    for (std::size_t i = 0; i < b.size(); ++i) {
        if (!isConst(b[i])) return std::nullopt;
        if (b[i] == kTrue) {
            if (i >= 64) return std::nullopt;
            v |= std::uint64_t{1} << i;
        }
    }
    return v;
}

Bits extend(Bits b, int width, bool sign) {
    Literal fill = sign && !b.empty() ? b.back() : kFalse;
    b.resize(static_cast<std::size_t>(width), fill);
    return b;
}

// ---- arithmetic and comparison ------------------------------------------------

Literal Lowerer::equal(const Bits& a0, const Bits& b0) {
    std::size_t n = std::max(a0.size(), b0.size());
    Bits a = extend(a0, static_cast<int>(n), false), b = extend(b0, static_cast<int>(n), false);
    Bits terms;
    for (std::size_t i = 0; i < n; ++i) terms.push_back(negateLiteral(b_.xor2(a[i], b[i])));
    return b_.andN(terms);
}

Literal Lowerer::lessThan(Bits a, Bits b, bool sign) {
    std::size_t n = std::max(a.size(), b.size());
    a = extend(a, static_cast<int>(n), sign);
    b = extend(b, static_cast<int>(n), sign);
    if (sign && n) {
        a[n - 1] = negateLiteral(a[n - 1]);
        b[n - 1] = negateLiteral(b[n - 1]);
    }
    Literal lt = kFalse;
    for (std::size_t i = 0; i < n; ++i) {
        Literal bitLess = b_.and2(negateLiteral(a[i]), b[i]);
        Literal same = negateLiteral(b_.xor2(a[i], b[i]));
        lt = b_.or2(bitLess, b_.and2(same, lt));
    }
    return lt;
}

Bits Lowerer::add(const Bits& a, const Bits& b, Literal cin) {
    Bits s(a.size());
    Literal c = cin;
    for (std::size_t i = 0; i < a.size(); ++i) {
        Literal x = b_.xor2(a[i], b[i]);
        s[i] = b_.xor2(x, c);
        c = b_.or2(b_.and2(a[i], b[i]), b_.and2(c, x));
    }
    return s;
}

Bits Lowerer::mul(const Bits& a, const Bits& b, int w) {
    Bits acc(static_cast<std::size_t>(w), kFalse);
    for (int i = 0; i < w; ++i) {
        Bits partial(static_cast<std::size_t>(w), kFalse);
        for (int j = 0; j + i < w; ++j) partial[i + j] = b_.and2(a[j], b[i]);
        acc = add(acc, partial, kFalse);
    }
    return acc;
}

Bits Lowerer::shift(const Bits& a, const Bits& amount, bool left, bool arith, int w) {
    Bits cur = a;
    Literal fill = arith && !left && !a.empty() ? a.back() : kFalse;
    Literal overflow = kFalse;
    for (std::size_t k = 0; k < amount.size(); ++k) {
        if (k >= 31 || (std::size_t{1} << k) >= static_cast<std::size_t>(w)) {
            overflow = b_.or2(overflow, amount[k]);
            continue;
        }
        int sh = 1 << k;
        Bits next(cur.size());
        for (int i = 0; i < w; ++i) {
            int src = left ? i - sh : i + sh;
            Literal moved = src >= 0 && src < w ? cur[src] : fill;
            next[i] = b_.mux(amount[k], moved, cur[i]);
        }
        cur = next;
    }
    for (int i = 0; i < w; ++i) cur[i] = b_.mux(overflow, fill, cur[i]);
    return cur;
}

Bits Lowerer::selectElement(const Bits& v, const Bits& idx, int msb, int lsb, int ew) {
    int count = static_cast<int>(v.size()) / std::max(ew, 1);
    if (auto k = constValue(idx)) {
        int off = dimOffset(static_cast<int>(*k), msb, lsb);
        Bits r(static_cast<std::size_t>(ew), kFalse);
        if (off >= 0 && off < count)
            for (int i = 0; i < ew; ++i) r[i] = v[off * ew + i];
        return r;
    }
    // Variable select: a parallel sum over the elements (the index values are exclusive).
    Bits r(static_cast<std::size_t>(ew), kFalse);
    std::vector<Bits> terms(static_cast<std::size_t>(ew));
    int lo = std::min(msb, lsb), hi = std::max(msb, lsb);
    for (int index = lo; index <= hi; ++index) {
        int off = dimOffset(index, msb, lsb);
        if (off < 0 || off >= count) continue;
        if (index < 0) continue;
        if (idx.size() < 63 && (std::uint64_t(index) >> idx.size()) != 0) continue;
        Bits cv;
        for (std::size_t i = 0; i < idx.size(); ++i) cv.push_back(i < 63 && ((std::uint64_t(index) >> i) & 1) ? kTrue : kFalse);
        Literal sel = equal(idx, cv);
        for (int i = 0; i < ew; ++i) terms[i].push_back(b_.and2(sel, v[off * ew + i]));
    }
    for (int i = 0; i < ew; ++i) r[i] = b_.orN(terms[i]);
    return r;
}

// ---- references ---------------------------------------------------------------

Bits Lowerer::readBits(SymbolId s, const std::vector<int>& offs) {
    int sw = ir_.symbols[s].width;
    if (isLocal(s) && env_) {
        auto it = env_->vars.find(s);
        sw = it == env_->vars.end() ? 0 : static_cast<int>(it->second.size());
    }
    Bits r;
    r.reserve(offs.size());
    for (int o : offs) r.push_back(o >= 0 && o < sw ? signalBit(s, o) : kFalse);
    return r;
}

Bits Lowerer::evalRef(SymbolId s, int width) {
    const Symbol& y = ir_.symbols[s];
    int sw = y.width;
    if (y.local && env_) {
        auto it = env_->vars.find(s);
        sw = it == env_->vars.end() ? 0 : static_cast<int>(it->second.size());
    }
    Bits r;
    for (int i = 0; i < sw && i < width; ++i) r.push_back(signalBit(s, i));
    return extend(r, width, !y.local && y.isSigned);
}

bool Lowerer::operandUndriven(ExprId id) const {
    const Expr& o = ir_.exprs[id];
    if (o.kind != ExprKind::Ref || isLocal(o.a)) return false;
    const Symbol& y = ir_.symbols[o.a];
    if (y.width != static_cast<int>(o.width)) return false;
    if (cut_[o.a]) return true;   // a cut point is read by its name
    const auto& d = drivers_[o.a];
    return std::all_of(d.begin(), d.end(), [&](int mem) { return mem < 0 || !restructured_[mem]; });
}

Bits Lowerer::wordOp(ExprId id, int w, std::string_view op, bool unary) {
    const Expr& e = ir_.exprs[id];
    WordOp wop;
    wop.op = std::string(op);
    wop.unary = unary;
    int k = wordCount_++;
    std::string base = fmt::format("{}w{}", opts_.prefix, k);
    for (int n = 1; m_.signals.count(base) || usedNames_.count(base); ++n) base = fmt::format("{}w{}_{}", opts_.prefix, k, n);
    usedNames_.insert(base);
    wop.result = base;
    wop.resultWidth = w;
    std::vector<ExprId> operands;
    if (unary) operands.push_back(e.a);
    else { operands.push_back(e.a); operands.push_back(e.b); }
    const Expr& first = ir_.exprs[operands[0]];
    wop.isSigned = first.isSigned && (unary || ir_.exprs[operands[1]].isSigned);
    if (op == ">>>" || op == "<<<") wop.isSigned = first.isSigned;
    const char* suffix[] = {"_a", "_b"};
    std::vector<std::pair<std::string, Bits>> pending;
    for (std::size_t i = 0; i < operands.size(); ++i) {
        const Expr& o = ir_.exprs[operands[i]];
        WordOp::Operand opd;
        opd.width = static_cast<int>(o.width);
        if (operandUndriven(operands[i])) {
            opd.name = ir_.symbols[o.a].name;
            opd.generated = false;
            wop.operands.push_back(opd);
            continue;
        }
        opd.name = base + suffix[i];
        usedNames_.insert(opd.name);
        pending.emplace_back(opd.name, eval(operands[i]));
        wop.operands.push_back(opd);
    }
    int member = current_ ? current_->id : -1;
    for (auto& [name, bits] : pending)
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            out_.net.addOutput(fmt::format("{}[{}]", name, bit), bits[bit]);
            out_.outputBits.push_back(BitRef{name, static_cast<int>(bit)});
            out_.outputSources.push_back(OutputSource{OutputKind::WordOperand, member});
        }
    Bits r;
    for (int bit = 0; bit < w; ++bit) {
        r.push_back(algebra::makeLiteral(out_.net.addInput(fmt::format("{}[{}]", base, bit)), false));
        out_.inputBits.push_back(BitRef{base, bit});
    }
    out_.wordOps.push_back(std::move(wop));
    return r;
}

// ---- the evaluator ----------------------------------------------------------------

namespace {

/// Offsets (from the LSB of `value`) of the elements [first..last] of a dimension.
std::vector<int> elementOffsets(int first, int last, int msb, int lsb, int ew, int w) {
    std::vector<int> offs;
    int lo = std::min(msb, lsb), hi = std::max(msb, lsb);
    if (std::min(first, last) < lo || std::max(first, last) > hi) return offs;
    int offLo = std::min(dimOffset(first, msb, lsb), dimOffset(last, msb, lsb));
    for (int i = 0; i < w; ++i) offs.push_back(offLo * ew + i);
    return offs;
}

Bits pick(const Bits& v, const std::vector<int>& offs) {
    Bits r;
    r.reserve(offs.size());
    for (int o : offs) r.push_back(o >= 0 && o < static_cast<int>(v.size()) ? v[o] : kFalse);
    return r;
}

} // namespace

Bits Lowerer::eval(ExprId root) {
    struct Frame {
        ExprId id;
        std::uint8_t stage;
        std::size_t vals;    // value-stack height when the frame started
        std::uint32_t aux;   // And/Or: offset of its operands in `chain`; Cond: the branch taken
    };
    std::vector<Frame> stack;
    std::vector<Bits> vals;
    std::vector<ExprId> chain;   // operands of flattened And/Or chains, per frame
    // A frame's value-stack height is taken when it starts running (several
    // operand frames are pushed at once and run one after the other).
    constexpr std::size_t kNotStarted = ~std::size_t{0};
    stack.push_back({root, 0, kNotStarted, 0});
    auto push = [&](ExprId id) { stack.push_back({id, 0, kNotStarted, 0}); };
    // Finish the top frame with `r` as its value.
    auto done = [&](Bits r) {
        std::size_t base = stack.back().vals;
        vals.resize(base);
        vals.push_back(std::move(r));
        stack.pop_back();
    };
    while (!stack.empty()) {
        Frame& f = stack.back();
        if (f.vals == kNotStarted) f.vals = vals.size();
        const ExprId id = f.id;
        const Expr& e = ir_.exprs[id];
        const int w = static_cast<int>(e.width);
        const std::size_t base = f.vals;
        switch (e.kind) {
        case ExprKind::Const: {
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) r[i] = ir_.constBit(e, static_cast<std::uint32_t>(i)) == '1' ? kTrue : kFalse;
            done(std::move(r));
            break;
        }
        case ExprKind::Ref:
            done(evalRef(e.a, w));
            break;
        case ExprKind::Convert:
            if (f.stage++ == 0) { push(e.a); break; }
            done(extend(std::move(vals[base]), w, ir_.exprs[e.a].isSigned));
            break;
        case ExprKind::Unary: {
            if (f.stage++ == 0) { push(e.a); break; }
            const Expr& opnd = ir_.exprs[e.a];
            bool sign = opnd.isSigned;
            Bits a = std::move(vals[base]);
            UnaryOp o = e.unaryOp();
            if (o == UnaryOp::BitNot) {
                a = extend(std::move(a), w, sign);
                for (Literal& l : a) l = negateLiteral(l);
                done(std::move(a));
                break;
            }
            if (o == UnaryOp::Plus) { done(extend(std::move(a), w, sign)); break; }
            if (o == UnaryOp::Minus) {
                a = extend(std::move(a), w, sign);
                if (constValue(a) || opts_.bitBlastArithmetic) {
                    Bits inv = a;
                    for (Literal& l : inv) l = negateLiteral(l);
                    done(add(inv, Bits(a.size(), kFalse), kTrue));
                } else {
                    done(wordOp(id, w, "-", true));
                }
                break;
            }
            Literal r = kFalse;
            switch (o) {
            case UnaryOp::LogicNot: r = negateLiteral(reduceOr(a)); break;
            case UnaryOp::RedAnd: r = b_.andN(a); break;
            case UnaryOp::RedNand: r = negateLiteral(b_.andN(a)); break;
            case UnaryOp::RedOr: r = reduceOr(a); break;
            case UnaryOp::RedNor: r = negateLiteral(reduceOr(a)); break;
            case UnaryOp::RedXor:
            case UnaryOp::RedXnor:
                for (Literal l : a) r = b_.xor2(r, l);
                if (o == UnaryOp::RedXnor) r = negateLiteral(r);
                break;
            default: break;
            }
            done(extend({r}, w, false));
            break;
        }
        case ExprKind::Binary: {
            BinaryOp o = e.binaryOp();
            if (o == BinaryOp::And || o == BinaryOp::Or) {
                // A chain `a | b | c ...` becomes one wide node per bit, not a ladder of
                // two-input nodes: the depth as read is that of a balanced tree.
                if (f.stage == 0) {
                    f.stage = 1;
                    f.aux = static_cast<std::uint32_t>(chain.size());
                    std::size_t first = chain.size();
                    std::vector<ExprId> work{e.b, e.a};
                    while (!work.empty()) {
                        ExprId x = work.back();
                        work.pop_back();
                        const Expr& xe = ir_.exprs[x];
                        if (xe.kind == ExprKind::Binary && xe.binaryOp() == o && xe.width == e.width) {
                            work.push_back(xe.b);
                            work.push_back(xe.a);
                        } else {
                            chain.push_back(x);
                        }
                    }
                    // push in reverse: the first operand is evaluated first
                    for (std::size_t k = chain.size(); k-- > first;) push(chain[k]);
                    break;
                }
                std::size_t n = vals.size() - base;
                Bits r(static_cast<std::size_t>(w));
                std::vector<Bits> ext(n);
                for (std::size_t k = 0; k < n; ++k)
                    ext[k] = extend(std::move(vals[base + k]), w, ir_.exprs[chain[f.aux + k]].isSigned);
                for (int i = 0; i < w; ++i) {
                    Bits in(n);
                    for (std::size_t k = 0; k < n; ++k) in[k] = ext[k][i];
                    r[i] = o == BinaryOp::And ? b_.andN(std::move(in)) : b_.orN(std::move(in));
                }
                done(std::move(r));
                break;
            }
            if (f.stage++ == 0) {
                push(e.b);
                push(e.a);
                break;
            }
            const Expr& lj = ir_.exprs[e.a];
            const Expr& rj = ir_.exprs[e.b];
            bool ls = lj.isSigned, rs = rj.isSigned;
            Bits a = std::move(vals[base]), b = std::move(vals[base + 1]);
            switch (o) {
            case BinaryOp::Xor:
            case BinaryOp::Xnor: {
                a = extend(std::move(a), w, ls);
                b = extend(std::move(b), w, rs);
                Bits r(static_cast<std::size_t>(w));
                for (int i = 0; i < w; ++i) {
                    Literal x = b_.xor2(a[i], b[i]);
                    r[i] = o == BinaryOp::Xor ? x : negateLiteral(x);
                }
                done(std::move(r));
                break;
            }
            case BinaryOp::LogicAnd:
            case BinaryOp::LogicOr:
            case BinaryOp::Implies:
            case BinaryOp::Equiv: {
                Literal x = reduceOr(a), y = reduceOr(b);
                Literal r = o == BinaryOp::LogicAnd ? b_.and2(x, y)
                          : o == BinaryOp::LogicOr ? b_.or2(x, y)
                          : o == BinaryOp::Implies ? b_.or2(negateLiteral(x), y)
                                                   : negateLiteral(b_.xor2(x, y));
                done(extend({r}, w, false));
                break;
            }
            case BinaryOp::Eq: case BinaryOp::Ne: case BinaryOp::CaseEq:
            case BinaryOp::CaseNe: case BinaryOp::WildEq: case BinaryOp::WildNe: {
                bool both = ls && rs;
                std::size_t n = std::max(a.size(), b.size());
                a = extend(std::move(a), static_cast<int>(n), both);
                b = extend(std::move(b), static_cast<int>(n), both);
                bool wildcard = o == BinaryOp::WildEq || o == BinaryOp::WildNe;
                if (wildcard && rj.kind == ExprKind::Const) {
                    // x and z bits of the right-hand constant match anything.
                    Bits a2, b2;
                    for (std::size_t i = 0; i < n && i < rj.width; ++i) {
                        char c = ir_.constBit(rj, static_cast<std::uint32_t>(i));
                        if (c == 'x' || c == 'z') continue;
                        a2.push_back(a[i]);
                        b2.push_back(b[i]);
                    }
                    a = std::move(a2);
                    b = std::move(b2);
                }
                bool positive = o == BinaryOp::Eq || o == BinaryOp::CaseEq || o == BinaryOp::WildEq;
                if (!constValue(a) && !constValue(b) && !opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, positive ? "==" : "!=", false));
                    break;
                }
                Literal eq = equal(a, b);
                done(extend({positive ? eq : negateLiteral(eq)}, w, false));
                break;
            }
            case BinaryOp::Lt: case BinaryOp::Le: case BinaryOp::Gt: case BinaryOp::Ge: {
                if (!constValue(a) && !constValue(b) && !opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, opText(o), false));
                    break;
                }
                bool sign = ls && rs;
                Literal r = o == BinaryOp::Lt ? lessThan(a, b, sign)
                          : o == BinaryOp::Gt ? lessThan(b, a, sign)
                          : o == BinaryOp::Le ? negateLiteral(lessThan(b, a, sign))
                                              : negateLiteral(lessThan(a, b, sign));
                done(extend({r}, w, false));
                break;
            }
            case BinaryOp::Add: case BinaryOp::Sub: case BinaryOp::Mul: {
                a = extend(std::move(a), w, ls);
                b = extend(std::move(b), w, rs);
                bool consts = constValue(a) && constValue(b);
                if (!consts && !opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, opText(o), false));
                    break;
                }
                if (o == BinaryOp::Add) done(add(a, b, kFalse));
                else if (o == BinaryOp::Sub) {
                    for (Literal& l : b) l = negateLiteral(l);
                    done(add(a, b, kTrue));
                } else {
                    done(mul(a, b, w));
                }
                break;
            }
            case BinaryOp::Shl: case BinaryOp::Shr: case BinaryOp::AShl: case BinaryOp::AShr: {
                a = extend(std::move(a), w, ls);
                bool left = o == BinaryOp::Shl || o == BinaryOp::AShl;
                bool arith = o == BinaryOp::AShr && ls;
                if (auto k = constValue(b)) {
                    Bits r(static_cast<std::size_t>(w));
                    Literal fill = arith ? a.back() : kFalse;
                    for (int i = 0; i < w; ++i) {
                        std::int64_t src = left ? static_cast<std::int64_t>(i) - static_cast<std::int64_t>(*k)
                                                : static_cast<std::int64_t>(i) + static_cast<std::int64_t>(*k);
                        r[i] = src >= 0 && src < w ? a[src] : fill;
                    }
                    done(std::move(r));
                    break;
                }
                if (!opts_.bitBlastArithmetic) {
                    done(wordOp(id, w, opText(o), false));
                    break;
                }
                done(shift(a, b, left, arith, w));
                break;
            }
            default:
                fail(fmt::format("operator '{}' is not supported here", opText(o)), here(e.start));
            }
            break;
        }
        case ExprKind::Cond: {
            if (f.stage == 0) {
                f.stage = 1;
                push(e.a);
                break;
            }
            if (f.stage == 1) {
                Literal c = reduceOr(vals[base]);
                vals.resize(base);
                if (c == kTrue || c == kFalse) {
                    f.stage = 3;
                    f.aux = c == kTrue ? e.b : e.c;
                    push(f.aux);
                } else {
                    f.stage = 2;
                    vals.push_back({c});
                    push(e.c);
                    push(e.b);
                }
                break;
            }
            if (f.stage == 3) {   // the condition was constant: the branch taken is the value
                bool sign = ir_.exprs[f.aux].isSigned;
                done(extend(std::move(vals[base]), w, sign));
                break;
            }
            Literal c = vals[base][0];
            Bits t = extend(std::move(vals[base + 1]), w, ir_.exprs[e.b].isSigned);
            Bits el = extend(std::move(vals[base + 2]), w, ir_.exprs[e.c].isSigned);
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) r[i] = b_.mux(c, t[i], el[i]);
            done(std::move(r));
            break;
        }
        case ExprKind::Concat: {
            const std::uint32_t* parts = ir_.list(e.a);
            if (f.stage++ == 0) {
                // Least significant part first, as the parts fill the value from bit 0 up.
                for (std::uint32_t k = 0; k < e.b; ++k) push(parts[k]);
                break;
            }
            Bits r;
            r.reserve(static_cast<std::size_t>(w));
            for (std::size_t k = base; k < vals.size(); ++k) r.insert(r.end(), vals[k].begin(), vals[k].end());
            done(extend(std::move(r), w, false));
            break;
        }
        case ExprKind::Replicate: {
            if (f.stage++ == 0) { push(e.a); break; }
            Bits p = std::move(vals[base]);
            Bits r;
            r.reserve(static_cast<std::size_t>(w));
            for (std::uint32_t k = 0; k < e.b; ++k) r.insert(r.end(), p.begin(), p.end());
            done(extend(std::move(r), w, false));
            break;
        }
        case ExprKind::Index: {
            const Expr& value = ir_.exprs[e.a];
            if (f.stage == 0) {
                f.stage = 1;
                push(e.b);
                break;
            }
            if (f.stage == 1) {
                auto k = constValue(vals[base]);
                if (k && value.kind == ExprKind::Ref) {
                    // Read only the selected element: earlier bits of a vector may be
                    // assigned before later ones are (prefix chains in a loop).
                    int off = dimOffset(static_cast<int>(*k), e.msb, e.lsb);
                    int count = std::abs(e.msb - e.lsb) + 1;
                    std::vector<int> offs;
                    for (int i = 0; i < w; ++i) offs.push_back(off >= 0 && off < count ? off * w + i : -1);
                    done(readBits(value.a, offs));
                    break;
                }
                f.stage = 2;
                push(e.a);
                break;
            }
            done(selectElement(vals[base + 1], vals[base], e.msb, e.lsb, w));
            break;
        }
        case ExprKind::Range: {
            const Expr& value = ir_.exprs[e.a];
            int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
            if (lo > hi) std::swap(lo, hi);
            int elems = hi - lo + 1;
            int ew = std::max(1, w / std::max(elems, 1));
            std::vector<int> offs;
            for (int i = lo * ew; i < (hi + 1) * ew; ++i) offs.push_back(i);
            if (value.kind == ExprKind::Ref) {
                done(extend(readBits(value.a, offs), w, false));
                break;
            }
            if (f.stage++ == 0) { push(e.a); break; }
            done(extend(pick(vals[base], offs), w, false));
            break;
        }
        case ExprKind::Indexed: {
            const Expr& value = ir_.exprs[e.a];
            int lo = std::min(e.msb, e.lsb), hi = std::max(e.msb, e.lsb);
            int n = hi - lo + 1;
            int ew = std::max(1, static_cast<int>(value.width) / n);   // element width of the selected dimension
            int count = std::max(1, w / ew);                           // elements selected
            auto offsetsFrom = [&](int start) {
                int last = e.up ? start + count - 1 : start - count + 1;
                return elementOffsets(start, last, e.msb, e.lsb, ew, w);
            };
            if (f.stage == 0) {
                f.stage = 1;
                push(e.b);
                break;
            }
            if (f.stage == 1) {
                auto k = constValue(vals[base]);
                if (k) {
                    auto offs = offsetsFrom(static_cast<int>(*k));
                    if (offs.empty()) { done(Bits(static_cast<std::size_t>(w), kFalse)); break; }
                    if (value.kind == ExprKind::Ref) { done(readBits(value.a, offs)); break; }
                }
                f.stage = 2;
                push(e.a);
                break;
            }
            const Bits& baseBits = vals[base];
            const Bits& v = vals[base + 1];
            if (auto k = constValue(baseBits)) {
                auto offs = offsetsFrom(static_cast<int>(*k));
                done(offs.empty() ? Bits(static_cast<std::size_t>(w), kFalse) : pick(v, offs));
                break;
            }
            std::vector<Bits> terms(static_cast<std::size_t>(w));
            for (int start = lo; start <= hi; ++start) {
                auto offs = offsetsFrom(start);
                if (offs.empty()) continue;
                if (start < 0 || (baseBits.size() < 63 && (std::uint64_t(start) >> baseBits.size()) != 0)) continue;
                Bits cv;
                for (std::size_t i = 0; i < baseBits.size(); ++i)
                    cv.push_back(i < 63 && ((std::uint64_t(start) >> i) & 1) ? kTrue : kFalse);
                Literal sel = equal(baseBits, cv);
                for (int i = 0; i < w; ++i)
                    terms[i].push_back(b_.and2(sel, offs[i] < static_cast<int>(v.size()) ? v[offs[i]] : kFalse));
            }
            Bits r(static_cast<std::size_t>(w));
            for (int i = 0; i < w; ++i) r[i] = b_.orN(terms[i]);
            done(std::move(r));
            break;
        }
        }
    }
    return std::move(vals.back());
}

} // namespace kerf::frontend::detail
