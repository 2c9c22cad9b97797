// lower.cpp — symbolic execution of assignments and combinational blocks into the network.
//
// Each signal bit that restructured code drives is resolved on demand: the
// member driving it is lowered first (a member met again while it is being
// lowered is a combinational loop). Inside a combinational block, blocking
// assignments update an environment of bit values; `if` merges the two
// environments with a multiplexer per differing bit; a `case` whose items
// are distinct constants merges as a parallel sum of products (its item
// conditions are mutually exclusive), overlapping wildcard items as a
// priority chain. A bit assigned on some paths but not all is a latch.
#include "kerf/frontend/lower.h"

#include <fmt/format.h>

#include <algorithm>
#include <functional>
#include <map>
#include <set>
#include <unordered_map>
#include <unordered_set>

namespace kerf::frontend {

using algebra::literalNegated;
using algebra::literalVar;
using algebra::negateLiteral;
using json = nlohmann::json;
using net::kFalse;
using net::kTrue;
using net::Literal;

namespace {

constexpr Literal kUnassigned = 0xFFFFFFFFu;  // never assigned in this block
constexpr Literal kPartial = 0xFFFFFFFEu;     // assigned on some paths only
constexpr Literal kExternal = 0xFFFFFFFDu;    // not written by this block: read from outside
bool isSentinel(Literal l) { return l >= kExternal; }
bool isConst(Literal l) { return l == kFalse || l == kTrue; }

using Bits = std::vector<Literal>;

/// Node construction with constant folding (not structural hashing: that is
/// `tidy`'s job, so the network as read keeps the design's own structure).
class Builder {
public:
    explicit Builder(net::Network& n) : net_(n) {}
    SourceLoc loc;

    Literal andN(Bits in) {
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
    Literal orN(Bits in) {
        for (Literal& l : in) l = negateLiteral(l);
        // a | b = ~(~a & ~b) folds the same way; build the node as a sum.
        std::sort(in.begin(), in.end());
        in.erase(std::unique(in.begin(), in.end()), in.end());
        Bits lits;
        for (Literal nl : in) {
            Literal l = negateLiteral(nl);
            if (l == kTrue) return kTrue;
            if (l == kFalse) continue;
            lits.push_back(l);
        }
        std::sort(lits.begin(), lits.end());
        for (std::size_t i = 1; i < lits.size(); ++i)
            if (lits[i] == negateLiteral(lits[i - 1])) return kTrue;
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
    Literal and2(Literal a, Literal b) { return andN({a, b}); }
    Literal or2(Literal a, Literal b) { return orN({a, b}); }
    Literal xor2(Literal a, Literal b) {
        if (a == kFalse) return b;
        if (b == kFalse) return a;
        if (a == kTrue) return negateLiteral(b);
        if (b == kTrue) return negateLiteral(a);
        if (a == b) return kFalse;
        if (a == negateLiteral(b)) return kTrue;
        return sop({{a, negateLiteral(b)}, {negateLiteral(a), b}});
    }
    Literal mux(Literal s, Literal t, Literal e) {
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
    Literal maj(Literal a, Literal b, Literal c) {
        return or2(and2(a, b), and2(c, or2(a, b)));
    }

private:
    Literal sop(std::vector<Bits> cubes) {
        algebra::Cover cv;
        for (auto& cb : cubes) {
            algebra::Cube c;
            std::sort(cb.begin(), cb.end());
            c.lits = std::move(cb);
            cv.cubes.push_back(std::move(c));
        }
        return algebra::makeLiteral(net_.addLogic(std::move(cv), {}, loc), false);
    }
    net::Network& net_;
};

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

bool refersOnlyTo(const json& e, const std::set<std::string>& locals) {
    if (e.is_array()) {
        for (const auto& x : e)
            if (!refersOnlyTo(x, locals)) return false;
        return true;
    }
    if (!e.is_object()) return true;
    if (e.value("op", "") == "ref") return locals.count(e["name"].get<std::string>()) > 0;
    for (const auto& [k, v] : e.items())
        if (v.is_structured() && !refersOnlyTo(v, locals)) return false;
    return true;
}

/// Left-hand sides the lowering cannot write: a part select whose base
/// depends on a signal, and selects nested under a variable select.
std::string lvalueReason(const json& lv, const std::set<std::string>& locals) {
    std::string op = lv.value("op", "");
    if (op == "concat") {
        for (const auto& p : lv["parts"])
            if (auto r = lvalueReason(p, locals); !r.empty()) return r;
        return {};
    }
    if (op == "index" || op == "range" || op == "indexed") {
        if (lv["value"].value("op", "") != "ref") return "a nested select on the left-hand side is left as written";
        if (op == "indexed" && !refersOnlyTo(lv["base"], locals))
            return "a part select with a variable base on the left-hand side is left as written";
    }
    return {};
}

std::string statementLvalueReason(const json& s, const std::set<std::string>& locals) {
    if (s.is_array()) {
        for (const auto& x : s)
            if (auto r = statementLvalueReason(x, locals); !r.empty()) return r;
        return {};
    }
    if (!s.is_object()) return {};
    if (s.value("stmt", "") == "assign") return lvalueReason(s["lhs"], locals);
    for (const auto& [k, v] : s.items())
        if (v.is_structured() && k != "lhs" && k != "rhs" && k != "cond" && k != "expr")
            if (auto r = statementLvalueReason(v, locals); !r.empty()) return r;
    return {};
}

/// Unsupported constructs make a member "kept": kerf leaves it as written.
std::string unsupportedReason(const json& j) {
    if (j.is_array()) {
        for (const auto& x : j)
            if (auto r = unsupportedReason(x); !r.empty()) return r;
        return {};
    }
    if (!j.is_object()) return {};
    if (j.contains("op")) {
        static const std::set<std::string> ops{"const", "ref", "unary", "binary", "cond", "concat",
                                               "replicate", "index", "range", "indexed", "convert"};
        std::string op = j["op"].get<std::string>();
        if (!ops.count(op)) return fmt::format("expression '{}' is not restructured", op);
        if (op == "binary") {
            std::string o = j.value("operator", "");
            if ((o == "/" || o == "%" || o == "**") && j["rhs"].value("op", "") != "const")
                return fmt::format("operator '{}' with a variable operand is left as written", o);
        }
    }
    if (j.contains("stmt")) {
        static const std::set<std::string> stmts{"block", "assign", "if", "case", "for", "empty"};
        std::string s = j["stmt"].get<std::string>();
        if (!stmts.count(s)) return fmt::format("statement '{}' is not restructured", s);
    }
    for (const auto& [k, v] : j.items())
        if (v.is_structured() && k != "src")
            if (auto r = unsupportedReason(v); !r.empty()) return r;
    return {};
}

class Lowerer {
public:
    Lowerer(const ModuleDesc& m, const LowerOptions& o) : m_(m), opts_(o), b_(out_.net) {}

    Lowered run();

private:
    struct Driver {
        int member = -1;   // -1 none, -2 kept code
    };
    struct Env {
        std::map<std::string, Bits> vars;
    };

    // -- resolution of signal bits
    Literal signalBit(const std::string& name, int off);
    Literal inputBit(const std::string& name, int off);
    void lowerMember(int idx);
    [[noreturn]] void fail(const std::string& msg, const SourceLoc& loc, ExitCode c = ExitCode::InputError) {
        throw Error(msg, loc, c);
    }
    const Signal& signal(const std::string& name, const SourceLoc& loc) {
        auto it = m_.signals.find(name);
        if (it == m_.signals.end()) fail(fmt::format("unknown signal '{}'", name), loc);
        return it->second;
    }

    // -- expressions
    Bits eval(const json& e);
    Bits evalRef(const std::string& name, int width);
    Bits evalAt(const json& value, const std::vector<int>& offs);
    Bits evalUnary(const json& e, int w);
    Bits evalBinary(const json& e, int w);
    Bits wordOp(const json& e, int w, const std::string& op, bool unary);
    Literal reduceOr(const Bits& b) { return b_.orN(b); }
    Literal equal(const Bits& a, const Bits& b);
    Literal lessThan(Bits a, Bits b, bool sign);
    Bits add(const Bits& a, const Bits& b, Literal cin);
    Bits mul(const Bits& a, const Bits& b, int w);
    Bits shift(const Bits& a, const Bits& amount, bool left, bool arith, int w);
    Bits selectElement(const Bits& v, const Bits& idx, int msb, int lsb, int ew);
    static int dimOffset(int index, int msb, int lsb) { return msb >= lsb ? index - lsb : lsb - index; }

    // -- lvalues
    struct LvBits {
        std::string sig;
        std::vector<int> offsets;   // LSB first
        bool local = false;
    };
    void lvalueWriteSet(const json& lv, std::vector<std::pair<std::string, int>>& out);
    void stmtWriteSet(const json& s, std::vector<std::pair<std::string, int>>& out);
    void assignLvalue(const json& lv, const Bits& rhs, const std::function<void(const std::string&, int, Literal)>& set,
                      const std::function<Literal(const std::string&, int)>& get);
    int lvalueWidth(const json& lv);

    // -- statements
    void exec(const json& s);
    void execCase(const json& s);
    void mergeInto(Env& target, const Env& other, Literal cond);  // target = cond ? target : other

    const ModuleDesc& m_;
    LowerOptions opts_;
    Lowered out_;
    Builder b_;
    std::vector<const Member*> members_;
    std::vector<std::uint8_t> restructured_;   // per member index
    std::vector<std::uint8_t> state_;          // 0 new, 1 in progress, 2 done
    // Members being lowered because a signal they drive was read: (member, signal).
    // On a loop the tail of this chain from the repeated member names the loop.
    std::vector<std::pair<int, std::string>> resolving_;
    std::unordered_map<std::string, std::vector<Driver>> drivers_;
    std::unordered_map<std::string, Bits> value_;   // resolved bit values of module signals
    std::map<std::string, Bits> inputLits_;
    std::set<std::string> keptReads_;
    Env* env_ = nullptr;                        // current combinational block
    std::set<std::string> locals_;
    const Member* current_ = nullptr;
    int wordCount_ = 0;
    std::set<std::string> usedNames_;
};

std::string freshName(std::set<std::string>& used, const ModuleDesc& m, const std::string& base) {
    std::string n = base;
    for (int k = 1; m.signals.count(n) || used.count(n); ++k) n = fmt::format("{}_{}", base, k);
    used.insert(n);
    return n;
}

Literal Lowerer::inputBit(const std::string& name, int off) {
    auto& v = inputLits_[name];
    if (v.empty()) {
        auto it = m_.signals.find(name);
        v.assign(it == m_.signals.end() ? 1 : static_cast<std::size_t>(it->second.width), kUnassigned);
    }
    if (off < 0 || off >= static_cast<int>(v.size())) return kFalse;
    if (v[off] == kUnassigned) {
        BitRef br{name, off};
        v[off] = algebra::makeLiteral(out_.net.addInput(bitName(m_, br)), false);
        out_.inputBits.push_back(br);
    }
    return v[off];
}

Literal Lowerer::signalBit(const std::string& name, int off) {
    if (env_) {
        auto it = env_->vars.find(name);
        if (it != env_->vars.end() && off < static_cast<int>(it->second.size())) {
            Literal l = it->second[off];
            if (!isSentinel(l)) return l;
            if (l != kExternal) {
                const char* what = locals_.count(name) ? "is read before it is assigned"
                                                       : "is read before this block assigns it (a combinational loop or a latch)";
                fail(fmt::format("'{}' {}", name, what), current_->src.loc());
            }
        }
    }
    auto dit = drivers_.find(name);
    if (dit == drivers_.end() || off >= static_cast<int>(dit->second.size())) return inputBit(name, off);
    int d = dit->second[off].member;
    if (d < 0) return inputBit(name, off);
    auto vit = value_.find(name);
    if (vit == value_.end() || vit->second[off] == kUnassigned) {
        resolving_.emplace_back(d, name);
        lowerMember(d);
        resolving_.pop_back();
        vit = value_.find(name);
        if (vit == value_.end() || vit->second[off] == kUnassigned)
            fail(fmt::format("'{}' bit {} is not driven by the statement that claims it", name, off),
                 members_[d]->src.loc(), ExitCode::Internal);
    }
    return vit->second[off];
}

Bits Lowerer::evalAt(const json& value, const std::vector<int>& offs) {
    Bits r;
    if (value.value("op", "") == "ref") {
        std::string name = value["name"].get<std::string>();
        bool local = env_ && locals_.count(name);
        int sw = local ? static_cast<int>(env_->vars[name].size()) : signal(name, current_->src.loc()).width;
        for (int o : offs) r.push_back(o >= 0 && o < sw ? signalBit(name, o) : kFalse);
        return r;
    }
    Bits v = eval(value);
    for (int o : offs) r.push_back(o >= 0 && o < static_cast<int>(v.size()) ? v[o] : kFalse);
    return r;
}

Bits Lowerer::evalRef(const std::string& name, int width) {
    if (env_ && locals_.count(name)) {
        const Bits& v = env_->vars[name];
        Bits r;
        for (int i = 0; i < width && i < static_cast<int>(v.size()); ++i) r.push_back(signalBit(name, i));
        return extend(r, width, false);
    }
    const Signal& s = signal(name, current_ ? current_->src.loc() : SourceLoc{});
    Bits r;
    for (int i = 0; i < s.width && i < width; ++i) r.push_back(signalBit(name, i));
    return extend(r, width, s.isSigned);
}

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

Bits Lowerer::wordOp(const json& e, int w, const std::string& op, bool unary) {
    WordOp wop;
    wop.op = op;
    wop.unary = unary;
    int k = wordCount_++;
    std::string base = freshName(usedNames_, m_, fmt::format("{}w{}", opts_.prefix, k));
    wop.result = base;
    wop.resultWidth = w;
    std::vector<const json*> operands;
    if (unary) operands.push_back(&e["operand"]);
    else { operands.push_back(&e["lhs"]); operands.push_back(&e["rhs"]); }
    wop.isSigned = operands[0]->value("signed", false) && (unary || operands[1]->value("signed", false));
    if (op == ">>>" || op == "<<<") wop.isSigned = operands[0]->value("signed", false);
    const char* suffix[] = {"_a", "_b"};
    std::vector<std::pair<std::string, Bits>> pending;
    for (std::size_t i = 0; i < operands.size(); ++i) {
        const json& o = *operands[i];
        int ow = o.value("width", 1);
        WordOp::Operand opd;
        opd.width = ow;
        if (o.value("op", "") == "ref" && !(env_ && locals_.count(o["name"].get<std::string>()))) {
            std::string name = o["name"].get<std::string>();
            auto sit = m_.signals.find(name);
            auto dit = drivers_.find(name);
            bool undriven = dit == drivers_.end() ||
                            std::all_of(dit->second.begin(), dit->second.end(), [](const Driver& d) { return d.member < 0; });
            if (sit != m_.signals.end() && undriven && sit->second.width == ow) {
                opd.name = name;
                opd.generated = false;
                wop.operands.push_back(opd);
                continue;
            }
        }
        opd.name = base + suffix[i];
        usedNames_.insert(opd.name);
        pending.emplace_back(opd.name, eval(o));
        wop.operands.push_back(opd);
    }
    for (auto& [name, bits] : pending)
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            out_.net.addOutput(fmt::format("{}[{}]", name, bit), bits[bit]);
            out_.outputBits.push_back(BitRef{name, static_cast<int>(bit)});
        }
    Bits r;
    for (int bit = 0; bit < w; ++bit) {
        r.push_back(algebra::makeLiteral(out_.net.addInput(fmt::format("{}[{}]", base, bit)), false));
        out_.inputBits.push_back(BitRef{base, bit});
    }
    out_.wordOps.push_back(std::move(wop));
    return r;
}

Bits Lowerer::evalUnary(const json& e, int w) {
    std::string o = e["operator"].get<std::string>();
    const json& operand = e["operand"];
    Bits a = eval(operand);
    bool sign = operand.value("signed", false);
    if (o == "~") {
        a = extend(a, w, sign);
        for (Literal& l : a) l = negateLiteral(l);
        return a;
    }
    if (o == "+") return extend(a, w, sign);
    if (o == "-") {
        a = extend(a, w, sign);
        if (constValue(a) || opts_.bitBlastArithmetic) {
            Bits inv = a;
            for (Literal& l : inv) l = negateLiteral(l);
            return add(inv, Bits(a.size(), kFalse), kTrue);
        }
        return wordOp(e, w, "-", true);
    }
    Literal r;
    if (o == "!") r = negateLiteral(reduceOr(a));
    else if (o == "&") r = b_.andN(a);
    else if (o == "~&") r = negateLiteral(b_.andN(a));
    else if (o == "|") r = reduceOr(a);
    else if (o == "~|") r = negateLiteral(reduceOr(a));
    else if (o == "^" || o == "~^" || o == "^~") {
        r = kFalse;
        for (Literal l : a) r = b_.xor2(r, l);
        if (o != "^") r = negateLiteral(r);
    } else fail(fmt::format("unary operator '{}' is not supported", o), current_->src.loc());
    return extend({r}, w, false);
}

Bits Lowerer::evalBinary(const json& e, int w) {
    std::string o = e["operator"].get<std::string>();
    const json& lj = e["lhs"];
    const json& rj = e["rhs"];
    bool ls = lj.value("signed", false), rs = rj.value("signed", false);
    if (o == "&" || o == "|") {
        // A chain `a | b | c ...` becomes one wide node per bit, not a ladder of
        // two-input nodes: the depth as read is that of a balanced tree.
        std::vector<const json*> operands;
        std::function<void(const json&)> collect = [&](const json& x) {
            if (x.value("op", "") == "binary" && x.value("operator", "") == o && x.value("width", 0) == w) {
                collect(x["lhs"]);
                collect(x["rhs"]);
            } else {
                operands.push_back(&x);
            }
        };
        collect(lj);
        collect(rj);
        std::vector<Bits> vals;
        for (const json* x : operands) vals.push_back(extend(eval(*x), w, x->value("signed", false)));
        Bits r(static_cast<std::size_t>(w));
        for (int i = 0; i < w; ++i) {
            Bits in;
            for (const auto& v : vals) in.push_back(v[i]);
            r[i] = o == "&" ? b_.andN(in) : b_.orN(in);
        }
        return r;
    }
    if (o == "^" || o == "~^" || o == "^~") {
        Bits a = extend(eval(lj), w, ls), b = extend(eval(rj), w, rs);
        Bits r(static_cast<std::size_t>(w));
        for (int i = 0; i < w; ++i) {
            if (o == "&") r[i] = b_.and2(a[i], b[i]);
            else if (o == "|") r[i] = b_.or2(a[i], b[i]);
            else if (o == "^") r[i] = b_.xor2(a[i], b[i]);
            else r[i] = negateLiteral(b_.xor2(a[i], b[i]));
        }
        return r;
    }
    if (o == "&&" || o == "||" || o == "->" || o == "<->") {
        Literal a = reduceOr(eval(lj)), b = reduceOr(eval(rj));
        Literal r = o == "&&" ? b_.and2(a, b)
                  : o == "||" ? b_.or2(a, b)
                  : o == "->" ? b_.or2(negateLiteral(a), b)
                              : negateLiteral(b_.xor2(a, b));
        return extend({r}, w, false);
    }
    if (o == "==" || o == "!=" || o == "===" || o == "!==" || o == "==?" || o == "!=?") {
        Bits a = eval(lj), b = eval(rj);
        bool both = ls && rs;
        std::size_t n = std::max(a.size(), b.size());
        a = extend(a, static_cast<int>(n), both);
        b = extend(b, static_cast<int>(n), both);
        bool wildcard = o == "==?" || o == "!=?";
        if (wildcard && rj.value("op", "") == "const") {
            // x and z bits of the right-hand constant match anything.
            std::string bits = rj["bits"].get<std::string>();
            Bits a2, b2;
            for (std::size_t i = 0; i < n && i < bits.size(); ++i) {
                char c = bits[bits.size() - 1 - i];
                if (c == 'x' || c == 'z' || c == 'X' || c == 'Z' || c == '?') continue;
                a2.push_back(a[i]);
                b2.push_back(b[i]);
            }
            a = a2;
            b = b2;
        }
        if (!constValue(a) && !constValue(b) && !opts_.bitBlastArithmetic)
            return wordOp(e, w, wildcard ? (o == "==?" ? "==" : "!=") : o.substr(0, 2), false);
        Literal eq = equal(a, b);
        return extend({o[0] == '=' ? eq : negateLiteral(eq)}, w, false);
    }
    if (o == "<" || o == "<=" || o == ">" || o == ">=") {
        Bits a = eval(lj), b = eval(rj);
        if (!constValue(a) && !constValue(b) && !opts_.bitBlastArithmetic) return wordOp(e, w, o, false);
        bool sign = ls && rs;
        Literal r = o == "<" ? lessThan(a, b, sign)
                  : o == ">" ? lessThan(b, a, sign)
                  : o == "<=" ? negateLiteral(lessThan(b, a, sign))
                              : negateLiteral(lessThan(a, b, sign));
        return extend({r}, w, false);
    }
    if (o == "+" || o == "-" || o == "*") {
        Bits a = extend(eval(lj), w, ls), b = extend(eval(rj), w, rs);
        bool consts = constValue(a) && constValue(b);
        if (!consts && !opts_.bitBlastArithmetic) return wordOp(e, w, o, false);
        if (o == "+") return add(a, b, kFalse);
        if (o == "-") {
            for (Literal& l : b) l = negateLiteral(l);
            return add(a, b, kTrue);
        }
        return mul(a, b, w);
    }
    if (o == "<<" || o == ">>" || o == "<<<" || o == ">>>") {
        Bits a = extend(eval(lj), w, ls), amount = eval(rj);
        bool left = o[0] == '<';
        bool arith = o == ">>>" && ls;
        if (auto k = constValue(amount)) {
            Bits r(static_cast<std::size_t>(w));
            Literal fill = arith ? a.back() : kFalse;
            for (int i = 0; i < w; ++i) {
                std::int64_t src = left ? static_cast<std::int64_t>(i) - static_cast<std::int64_t>(*k)
                                        : static_cast<std::int64_t>(i) + static_cast<std::int64_t>(*k);
                r[i] = src >= 0 && src < w ? a[src] : fill;
            }
            return r;
        }
        if (!opts_.bitBlastArithmetic) return wordOp(e, w, o, false);
        return shift(a, amount, left, arith, w);
    }
    fail(fmt::format("operator '{}' is not supported here", o), current_->src.loc());
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
        Bits cv;
        for (std::size_t i = 0; i < idx.size(); ++i) cv.push_back(i < 63 && index >= 0 && ((std::uint64_t(index) >> i) & 1) ? kTrue : kFalse);
        if (index < 0) continue;
        if (idx.size() < 63 && (std::uint64_t(index) >> idx.size()) != 0) continue;
        Literal sel = equal(idx, cv);
        for (int i = 0; i < ew; ++i) terms[i].push_back(b_.and2(sel, v[off * ew + i]));
    }
    for (int i = 0; i < ew; ++i) r[i] = b_.orN(terms[i]);
    return r;
}

Bits Lowerer::eval(const json& e) {
    int w = e.value("width", 1);
    std::string op = e.at("op").get<std::string>();
    if (op == "const") {
        std::string bits = e["bits"].get<std::string>();
        Bits r;
        for (auto it = bits.rbegin(); it != bits.rend(); ++it) r.push_back(*it == '1' ? kTrue : kFalse);
        return extend(r, w, false);
    }
    if (op == "ref") return evalRef(e["name"].get<std::string>(), w);
    if (op == "unary") return evalUnary(e, w);
    if (op == "binary") return evalBinary(e, w);
    if (op == "cond") {
        Literal c = reduceOr(eval(e["cond"]));
        Bits t = extend(eval(e["then"]), w, e["then"].value("signed", false));
        Bits f = extend(eval(e["else"]), w, e["else"].value("signed", false));
        if (c == kTrue) return t;
        if (c == kFalse) return f;
        Bits r(static_cast<std::size_t>(w));
        for (int i = 0; i < w; ++i) r[i] = b_.mux(c, t[i], f[i]);
        return r;
    }
    if (op == "concat") {
        Bits r;
        const auto& parts = e["parts"];
        for (auto it = parts.rbegin(); it != parts.rend(); ++it) {
            Bits p = eval(*it);
            r.insert(r.end(), p.begin(), p.end());
        }
        return extend(r, w, false);
    }
    if (op == "replicate") {
        Bits p = eval(e["part"]);
        Bits r;
        for (int k = 0; k < e.value("count", 1); ++k) r.insert(r.end(), p.begin(), p.end());
        return extend(r, w, false);
    }
    if (op == "index") {
        const json& value = e["value"];
        Bits idx = eval(e["index"]);
        int msb = e.value("msb", 0), lsb = e.value("lsb", 0);
        if (auto k = constValue(idx)) {
            // Read only the selected element: earlier bits of a vector may be
            // assigned before later ones are (prefix chains in a loop).
            int off = dimOffset(static_cast<int>(*k), msb, lsb);
            int count = std::abs(msb - lsb) + 1;
            std::vector<int> offs;
            for (int i = 0; i < w; ++i) offs.push_back(off >= 0 && off < count ? off * w + i : -1);
            return evalAt(value, offs);
        }
        return selectElement(eval(value), idx, msb, lsb, w);
    }
    if (op == "range") {
        int msb = e.value("msb", 0), lsb = e.value("lsb", 0);
        int lo = dimOffset(e.value("right", 0), msb, lsb), hi = dimOffset(e.value("left", 0), msb, lsb);
        if (lo > hi) std::swap(lo, hi);
        int elems = hi - lo + 1;
        int ew = std::max(1, w / std::max(elems, 1));
        std::vector<int> offs;
        for (int i = lo * ew; i < (hi + 1) * ew; ++i) offs.push_back(i);
        return extend(evalAt(e["value"], offs), w, false);
    }
    if (op == "indexed") {
        const json& value = e["value"];
        Bits base = eval(e["base"]);
        int msb = e.value("msb", 0), lsb = e.value("lsb", 0);
        bool up = e.value("dir", "+") == "+";
        int lo = std::min(msb, lsb), hi = std::max(msb, lsb);
        int n = hi - lo + 1;
        int ew = std::max(1, value.value("width", n) / n);   // element width of the selected dimension
        int count = std::max(1, w / ew);                      // elements selected
        auto offsetsFrom = [&](int start) {
            int first = start, last = up ? start + count - 1 : start - count + 1;
            std::vector<int> offs;
            if (std::min(first, last) < lo || std::max(first, last) > hi) return offs;
            int offLo = std::min(dimOffset(first, msb, lsb), dimOffset(last, msb, lsb));
            for (int i = 0; i < w; ++i) offs.push_back(offLo * ew + i);
            return offs;
        };
        if (auto k = constValue(base)) {
            auto offs = offsetsFrom(static_cast<int>(*k));
            if (offs.empty()) return Bits(static_cast<std::size_t>(w), kFalse);
            return evalAt(value, offs);
        }
        Bits v = eval(value);
        std::vector<Bits> terms(static_cast<std::size_t>(w));
        for (int start = lo; start <= hi; ++start) {
            auto offs = offsetsFrom(start);
            if (offs.empty()) continue;
            if (start < 0 || (base.size() < 63 && (std::uint64_t(start) >> base.size()) != 0)) continue;
            Bits cv;
            for (std::size_t i = 0; i < base.size(); ++i) cv.push_back(i < 63 && ((std::uint64_t(start) >> i) & 1) ? kTrue : kFalse);
            Literal sel = equal(base, cv);
            for (int i = 0; i < w; ++i) terms[i].push_back(b_.and2(sel, offs[i] < static_cast<int>(v.size()) ? v[offs[i]] : kFalse));
        }
        Bits r(static_cast<std::size_t>(w));
        for (int i = 0; i < w; ++i) r[i] = b_.orN(terms[i]);
        return r;
    }
    if (op == "convert") {
        const json& o = e["operand"];
        return extend(eval(o), w, o.value("signed", false));
    }
    fail(fmt::format("expression '{}' is not supported", op), current_ ? current_->src.loc() : SourceLoc{});
}

// ---- lvalues -------------------------------------------------------------

int Lowerer::lvalueWidth(const json& lv) { return lv.value("width", 1); }

void Lowerer::lvalueWriteSet(const json& lv, std::vector<std::pair<std::string, int>>& out) {
    std::string op = lv.value("op", "");
    if (op == "concat") {
        for (const auto& p : lv["parts"]) lvalueWriteSet(p, out);
        return;
    }
    // Find the base signal and, for constant selects, the exact offsets.
    std::function<std::pair<std::string, std::vector<int>>(const json&)> resolve = [&](const json& x)
        -> std::pair<std::string, std::vector<int>> {
        std::string o = x.value("op", "");
        if (o == "ref") {
            std::string name = x["name"].get<std::string>();
            int width = x.value("width", 1);
            auto it = m_.signals.find(name);
            if (it != m_.signals.end()) width = it->second.width;
            std::vector<int> offs(static_cast<std::size_t>(width));
            for (int i = 0; i < width; ++i) offs[i] = i;
            return {name, offs};
        }
        if (o == "index" || o == "range" || o == "indexed") {
            auto [name, offs] = resolve(x["value"]);
            int w = x.value("width", 1);
            int msb = x.value("msb", 0), lsb = x.value("lsb", 0);
            if (o == "index" && x["index"].value("op", "") == "const") {
                std::string bits = x["index"]["bits"].get<std::string>();
                std::uint64_t k = 0;
                for (char c : bits) k = (k << 1) | (c == '1');
                int off = dimOffset(static_cast<int>(k), msb, lsb);
                std::vector<int> r;
                for (int i = 0; i < w; ++i)
                    if (off >= 0 && static_cast<std::size_t>(off * w + i) < offs.size()) r.push_back(offs[off * w + i]);
                return {name, r};
            }
            if (o == "range") {
                int lo = dimOffset(x.value("right", 0), msb, lsb), hi = dimOffset(x.value("left", 0), msb, lsb);
                if (lo > hi) std::swap(lo, hi);
                int ew = std::max(1, w / (hi - lo + 1));
                std::vector<int> r;
                for (int i = lo * ew; i < (hi + 1) * ew; ++i)
                    if (i >= 0 && static_cast<std::size_t>(i) < offs.size()) r.push_back(offs[i]);
                return {name, r};
            }
            return {name, offs};  // variable select: may write any bit
        }
        return {"", {}};
    };
    auto [name, offs] = resolve(lv);
    if (name.empty() || locals_.count(name)) return;
    for (int o : offs) out.emplace_back(name, o);
}

void Lowerer::stmtWriteSet(const json& s, std::vector<std::pair<std::string, int>>& out) {
    if (!s.is_object()) return;
    std::string k = s.value("stmt", "");
    if (k == "assign") lvalueWriteSet(s["lhs"], out);
    else if (k == "block") for (const auto& i : s["items"]) stmtWriteSet(i, out);
    else if (k == "if") {
        stmtWriteSet(s["then"], out);
        if (s.contains("else")) stmtWriteSet(s["else"], out);
    } else if (k == "case") {
        for (const auto& it : s["items"]) stmtWriteSet(it["body"], out);
        if (s.contains("default")) stmtWriteSet(s["default"], out);
    } else if (k == "for") {
        stmtWriteSet(s["body"], out);
    }
}

void Lowerer::assignLvalue(const json& lv, const Bits& rhs0, const std::function<void(const std::string&, int, Literal)>& set,
                           const std::function<Literal(const std::string&, int)>& get) {
    std::string op = lv.value("op", "");
    int w = lvalueWidth(lv);
    Bits rhs = extend(rhs0, w, false);
    if (op == "concat") {
        // Parts are MSB first: the last part takes the low bits.
        const auto& parts = lv["parts"];
        int pos = 0;
        for (auto it = parts.rbegin(); it != parts.rend(); ++it) {
            int pw = lvalueWidth(*it);
            Bits slice(rhs.begin() + std::min<int>(pos, w), rhs.begin() + std::min<int>(pos + pw, w));
            assignLvalue(*it, slice, set, get);
            pos += pw;
        }
        return;
    }
    if (op == "ref") {
        std::string name = lv["name"].get<std::string>();
        for (int i = 0; i < w; ++i) set(name, i, rhs[i]);
        return;
    }
    if (op == "index" || op == "range" || op == "indexed") {
        // Read-modify-write through the parent: compute the parent's new bits.
        const json& parent = lv["value"];
        int pw = lvalueWidth(parent);
        std::string pop = parent.value("op", "");
        // Current parent value, bit by bit (sentinels pass through).
        std::function<Literal(int)> parentBit;
        std::function<void(int, Literal)> parentSet;
        if (pop == "ref") {
            std::string name = parent["name"].get<std::string>();
            parentBit = [&, name](int i) { return get(name, i); };
            parentSet = [&, name](int i, Literal l) { set(name, i, l); };
        } else {
            fail("nested selects on the left-hand side are not supported", current_->src.loc());
        }
        int msb = lv.value("msb", 0), lsb = lv.value("lsb", 0);
        if (op == "range") {
            int lo = dimOffset(lv.value("right", 0), msb, lsb), hi = dimOffset(lv.value("left", 0), msb, lsb);
            if (lo > hi) std::swap(lo, hi);
            int ew = std::max(1, w / (hi - lo + 1));
            for (int i = lo * ew, k = 0; i < (hi + 1) * ew; ++i, ++k)
                if (i >= 0 && i < pw) parentSet(i, rhs[k]);
            return;
        }
        Bits idx = op == "index" ? eval(lv["index"]) : eval(lv["base"]);
        if (op == "index") {
            if (auto k = constValue(idx)) {
                int off = dimOffset(static_cast<int>(*k), msb, lsb);
                for (int i = 0; i < w; ++i)
                    if (off >= 0 && off * w + i < pw) parentSet(off * w + i, rhs[i]);
                return;
            }
            int count = pw / std::max(w, 1);
            int lo = std::min(msb, lsb), hi = std::max(msb, lsb);
            for (int index = lo; index <= hi; ++index) {
                int off = dimOffset(index, msb, lsb);
                if (off < 0 || off >= count || index < 0) continue;
                Bits cv;
                for (std::size_t i = 0; i < idx.size(); ++i) cv.push_back(i < 63 && ((std::uint64_t(index) >> i) & 1) ? kTrue : kFalse);
                Literal sel = equal(idx, cv);
                for (int i = 0; i < w; ++i) {
                    Literal old = parentBit(off * w + i);
                    if (isSentinel(old)) {
                        if (sel == kTrue) parentSet(off * w + i, rhs[i]);
                        else if (sel != kFalse) parentSet(off * w + i, kPartial);
                        continue;
                    }
                    parentSet(off * w + i, b_.mux(sel, rhs[i], old));
                }
            }
            return;
        }
        bool up = lv.value("dir", "+") == "+";
        if (auto k = constValue(idx)) {
            int n = std::abs(msb - lsb) + 1;
            int ew = std::max(1, pw / n);
            int count = std::max(1, w / ew);
            int first = static_cast<int>(*k), last = up ? first + count - 1 : first - count + 1;
            int a = dimOffset(first, msb, lsb), b = dimOffset(last, msb, lsb);
            int offLo = std::min(a, b) * ew;
            for (int i = 0; i < w; ++i)
                if (offLo + i >= 0 && offLo + i < pw) parentSet(offLo + i, rhs[i]);
            return;
        }
        fail("a variable part select on the left-hand side is not supported", current_->src.loc());
    }
    fail(fmt::format("left-hand side '{}' is not supported", op), current_->src.loc());
}

// ---- statements ------------------------------------------------------------

void Lowerer::mergeInto(Env& target, const Env& other, Literal cond) {
    for (auto& [name, bits] : target.vars) {
        const Bits& ob = other.vars.at(name);
        for (std::size_t i = 0; i < bits.size(); ++i) {
            Literal a = bits[i], b = ob[i];
            if (a == b) continue;
            if (isSentinel(a) || isSentinel(b)) bits[i] = kPartial;
            else bits[i] = b_.mux(cond, a, b);
        }
    }
}

void Lowerer::exec(const json& s) {
    if (!s.is_object()) return;
    std::string k = s.value("stmt", "");
    if (s.contains("src")) {
        SourceRange r;
        const json& sr = s["src"];
        b_.loc = SourceLoc{sr.value("file", ""), sr.value("line", 0), sr.value("col", 0)};
    }
    if (k == "empty") return;
    if (k == "block") {
        for (const auto& item : s["items"]) exec(item);
        return;
    }
    if (k == "assign") {
        Bits rhs = eval(s["rhs"]);
        rhs = extend(rhs, lvalueWidth(s["lhs"]), s["rhs"].value("signed", false));
        auto set = [&](const std::string& name, int off, Literal l) {
            auto it = env_->vars.find(name);
            if (it == env_->vars.end() || off >= static_cast<int>(it->second.size())) return;
            it->second[off] = l;
        };
        auto get = [&](const std::string& name, int off) -> Literal {
            auto it = env_->vars.find(name);
            if (it == env_->vars.end() || off >= static_cast<int>(it->second.size())) return kUnassigned;
            return it->second[off];
        };
        assignLvalue(s["lhs"], rhs, set, get);
        return;
    }
    if (k == "if") {
        Literal c = reduceOr(eval(s["cond"]));
        bool hasElse = s.contains("else") && s["else"].is_object();
        if (c == kTrue) { exec(s["then"]); return; }
        if (c == kFalse) { if (hasElse) exec(s["else"]); return; }
        Env before = *env_;
        exec(s["then"]);
        Env thenEnv = std::move(*env_);
        *env_ = std::move(before);
        if (hasElse) exec(s["else"]);
        mergeInto(thenEnv, *env_, c);
        *env_ = std::move(thenEnv);
        return;
    }
    if (k == "case") { execCase(s); return; }
    if (k == "for") {
        for (const auto& init : s["init"]) {
            std::string name = init["name"].get<std::string>();
            Bits v = eval(init["value"]);
            Bits& slot = env_->vars[name];
            v = extend(v, static_cast<int>(slot.size()), false);
            slot = v;
        }
        for (int iter = 0;; ++iter) {
            if (iter > 65536) fail("a for loop runs more than 65536 iterations", current_->src.loc());
            Literal c = reduceOr(eval(s["cond"]));
            if (c == kFalse) break;
            if (c != kTrue) fail("a for loop's condition is not constant; only loops with constant bounds are unrolled",
                                 current_->src.loc());
            exec(s["body"]);
            for (const auto& st : s["step"]) exec(st);
        }
        return;
    }
    fail(fmt::format("statement '{}' is not supported", k), current_->src.loc());
}

void Lowerer::execCase(const json& s) {
    std::string kind = s.value("kind", "case");
    const json& ej = s["expr"];
    Bits sel = eval(ej);
    struct Item {
        Literal cond;
        const json* body;
        std::string pattern;   // constant pattern, MSB first ('-' = wildcard); empty when not constant
    };
    std::vector<Item> items;
    std::size_t width = sel.size();
    for (const auto& it : s["items"])
        for (const auto& x : it["exprs"]) width = std::max<std::size_t>(width, x.value("width", 1));
    bool selSigned = ej.value("signed", false);
    Bits selW = extend(sel, static_cast<int>(width), selSigned);
    bool allConst = true;
    for (const auto& it : s["items"]) {
        Bits terms;
        for (const auto& x : it["exprs"]) {
            std::string pattern;
            Literal c;
            if (x.value("op", "") == "const") {
                std::string bits = x["bits"].get<std::string>();
                // extend the pattern to the case width
                char fillc = x.value("signed", false) && selSigned && !bits.empty() ? bits[0] : '0';
                while (bits.size() < width) bits.insert(bits.begin(), fillc);
                Bits a, b;
                bool never = false;
                for (std::size_t i = 0; i < width; ++i) {
                    char ch = bits[bits.size() - 1 - i];
                    bool wild = (ch == 'z' || ch == 'Z' || ch == '?') ? (kind != "case")
                              : (ch == 'x' || ch == 'X') ? (kind == "casex" || kind == "inside")
                                                         : false;
                    if (wild) { pattern.insert(pattern.begin(), '-'); continue; }
                    if (ch != '0' && ch != '1') never = true;   // an x/z bit a 2-state value never equals
                    pattern.insert(pattern.begin(), ch);
                    a.push_back(selW[i]);
                    b.push_back(ch == '1' ? kTrue : kFalse);
                }
                c = never ? kFalse : equal(a, b);
                if (never) pattern.clear(), allConst = false;
            } else {
                allConst = false;
                c = equal(selW, extend(eval(x), static_cast<int>(width), x.value("signed", false) && selSigned));
            }
            terms.push_back(c);
            items.push_back(Item{c, &it["body"], pattern});
        }
        (void)terms;
    }
    // Mutually exclusive items (no two patterns can match the same value) merge in parallel.
    bool exclusive = allConst;
    if (exclusive) {
        bool wild = false;
        for (const auto& it : items) wild = wild || it.pattern.find('-') != std::string::npos;
        if (!wild) {
            std::unordered_set<std::string> seen;
            for (const auto& it : items)
                if (!seen.insert(it.pattern).second) exclusive = false;
        } else if (items.size() <= 4000) {
            for (std::size_t i = 0; i < items.size() && exclusive; ++i)
                for (std::size_t j = i + 1; j < items.size() && exclusive; ++j) {
                    const auto& p = items[i].pattern;
                    const auto& q = items[j].pattern;
                    bool overlap = true;
                    for (std::size_t b = 0; b < p.size(); ++b)
                        if (p[b] != '-' && q[b] != '-' && p[b] != q[b]) { overlap = false; break; }
                    if (overlap) exclusive = false;
                }
        } else {
            exclusive = false;
        }
    }
    // Items covering every value make the default unreachable.
    bool full = false;
    if (allConst && width <= 16) {
        std::vector<std::uint8_t> hit(std::size_t{1} << width, 0);
        for (const auto& it : items) {
            std::vector<std::size_t> vals{0};
            for (std::size_t b = 0; b < width; ++b) {
                char ch = it.pattern[width - 1 - b];
                std::size_t n = vals.size();
                for (std::size_t i = 0; i < n; ++i) {
                    if (ch == '1') vals[i] |= std::size_t{1} << b;
                    else if (ch == '-') vals.push_back(vals[i] | (std::size_t{1} << b));
                }
            }
            for (auto v : vals) hit[v] = 1;
        }
        full = std::all_of(hit.begin(), hit.end(), [](std::uint8_t h) { return h != 0; });
    }
    bool hasDefault = s.contains("default") && s["default"].is_object();

    Env before = *env_;
    std::vector<Env> results;
    for (const auto& it : items) {
        *env_ = before;
        if (it.cond != kFalse) exec(*it.body);
        results.push_back(*env_);
    }
    *env_ = before;
    if (hasDefault && !full) exec(s["default"]);
    Env dflt = std::move(*env_);

    Bits conds;
    for (const auto& it : items) conds.push_back(it.cond);
    Literal defaultCond = full ? kFalse : negateLiteral(b_.orN(conds));
    Env merged = dflt;
    for (auto& [name, bits] : merged.vars) {
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            bool same = true, sentinel = isSentinel(dflt.vars[name][bit]) && !full;
            for (std::size_t i = 0; i < results.size(); ++i) {
                Literal v = results[i].vars[name][bit];
                if (items[i].cond == kFalse) continue;
                if (v != dflt.vars[name][bit]) same = false;
                if (isSentinel(v)) sentinel = true;
            }
            if (same && !full) continue;
            if (sentinel) {
                // Equal sentinels everywhere keep their meaning; anything else is a partial assignment.
                Literal first = kPartial;
                bool allEq = true;
                bool init = false;
                for (std::size_t i = 0; i < results.size(); ++i) {
                    if (items[i].cond == kFalse) continue;
                    Literal v = results[i].vars[name][bit];
                    if (!init) { first = v; init = true; } else if (v != first) allEq = false;
                }
                if (!full) { if (!init) first = dflt.vars[name][bit]; else if (dflt.vars[name][bit] != first) allEq = false; }
                bits[bit] = allEq ? first : kPartial;
                continue;
            }
            if (exclusive) {
                // Group items by value: value v contributes (OR of its conditions) & v.
                std::map<Literal, Bits> byValue;
                for (std::size_t i = 0; i < results.size(); ++i)
                    if (items[i].cond != kFalse) byValue[results[i].vars[name][bit]].push_back(items[i].cond);
                if (!full) byValue[dflt.vars[name][bit]].push_back(defaultCond);
                Bits terms;
                for (auto& [v, cs] : byValue) {
                    if (v == kFalse) continue;
                    terms.push_back(b_.and2(b_.orN(cs), v));
                }
                bits[bit] = b_.orN(terms);
            } else {
                Literal acc = dflt.vars[name][bit];
                bool start = full;
                for (std::size_t i = results.size(); i-- > 0;) {
                    if (items[i].cond == kFalse) continue;
                    Literal v = results[i].vars[name][bit];
                    if (start) { acc = v; start = false; continue; }
                    acc = b_.mux(items[i].cond, v, acc);
                }
                bits[bit] = acc;
            }
        }
    }
    *env_ = std::move(merged);
}

void Lowerer::lowerMember(int idx) {
    if (state_[idx] == 2) return;
    const Member& mem = *members_[idx];
    if (state_[idx] == 1) {
        // Name each signal on the loop with the statement that drives it.
        // The last entry is the read that came back to this member; the members
        // resolved since this one started (after its earlier entry, if any) close the loop.
        std::string chain;
        std::size_t last = resolving_.size();
        if (last > 0) {
            std::size_t start = last - 1;
            while (start > 0 && resolving_[start - 1].first != idx) --start;
            const std::string& first = resolving_[last - 1].second;
            chain = fmt::format("'{}' (driven at {})", first, mem.src.loc().str());
            for (std::size_t i = start; i + 1 < last; ++i)
                chain += fmt::format(", which reads '{}' (driven at {})", resolving_[i].second,
                                     members_[resolving_[i].first]->src.loc().str());
            chain += fmt::format(", which reads '{}' again", first);
        }
        fail(fmt::format("combinational loop: this {} depends on its own result{}{}",
                         mem.kind == MemberKind::Assign ? "assignment" : "block", chain.empty() ? "" : ": ", chain),
             mem.src.loc());
    }
    state_[idx] = 1;
    const Member* savedCurrent = current_;
    Env* savedEnv = env_;
    std::set<std::string> savedLocals = std::move(locals_);
    locals_.clear();
    current_ = &mem;
    b_.loc = mem.src.loc();
    auto record = [&](const std::string& name, int off, Literal l) {
        auto& v = value_[name];
        const Signal& s = signal(name, mem.src.loc());
        if (v.empty()) v.assign(static_cast<std::size_t>(s.width), kUnassigned);
        if (off < 0 || off >= s.width) return;
        v[off] = l;
        net::NodeId id = literalVar(l);
        if (out_.net.isLogic(id) && out_.net.node(id).name.empty()) out_.net.node(id).name = bitName(m_, {name, off});
    };
    if (mem.kind == MemberKind::Assign) {
        env_ = nullptr;
        const json& lhs = mem.body["lhs"];
        Bits rhs = eval(mem.body["rhs"]);
        rhs = extend(rhs, lvalueWidth(lhs), mem.body["rhs"].value("signed", false));
        auto get = [&](const std::string&, int) -> Literal { return kUnassigned; };
        assignLvalue(lhs, rhs, record, get);
    } else {
        Env env;
        env_ = &env;
        for (const auto& l : mem.body.value("locals", json::array())) {
            std::string name = l["name"].get<std::string>();
            locals_.insert(name);
            env.vars[name].assign(static_cast<std::size_t>(l.value("width", 1)), kUnassigned);
        }
        std::vector<std::pair<std::string, int>> writes;
        stmtWriteSet(mem.body["body"], writes);
        for (auto& [name, off] : writes) {
            auto& v = env.vars[name];
            if (v.empty()) v.assign(static_cast<std::size_t>(signal(name, mem.src.loc()).width), kExternal);
            v[off] = kUnassigned;
        }
        exec(mem.body["body"]);
        b_.loc = mem.src.loc();
        for (auto& [name, off] : writes) {
            Literal l = env.vars[name][off];
            if (l == kPartial || l == kUnassigned)
                fail(fmt::format("'{}' is not assigned on every path through this combinational block, "
                                 "so it would hold its value (a latch); assign it a default at the top of the block",
                                 bitName(m_, {name, off})), mem.src.loc());
            record(name, off, l);
        }
    }
    current_ = savedCurrent;
    env_ = savedEnv;
    locals_ = std::move(savedLocals);
    state_[idx] = 2;
}

Lowered Lowerer::run() {
    const std::string& moduleFile = m_.src.file;
    for (const Member& mem : m_.members) members_.push_back(&mem);
    restructured_.assign(members_.size(), 0);
    state_.assign(members_.size(), 0);
    for (std::size_t i = 0; i < members_.size(); ++i) {
        const Member& mem = *members_[i];
        if (mem.kind == MemberKind::Kept) continue;
        if (!moduleFile.empty() && mem.src.file != moduleFile) {
            out_.notes.push_back(fmt::format("{}: left as written: it comes from another file", mem.src.loc().str()));
            continue;
        }
        std::set<std::string> localNames;
        for (const auto& l : mem.body.value("locals", json::array())) localNames.insert(l["name"].get<std::string>());
        std::string why = unsupportedReason(mem.body);
        if (why.empty())
            why = mem.kind == MemberKind::Assign ? lvalueReason(mem.body["lhs"], localNames)
                                                 : statementLvalueReason(mem.body["body"], localNames);
        if (!why.empty()) {
            out_.notes.push_back(fmt::format("{}: left as written: {}", mem.src.loc().str(), why));
            continue;
        }
        restructured_[i] = 1;
    }
    // Bit-level drivers; two statements driving one bit is an error.
    for (std::size_t i = 0; i < members_.size(); ++i) {
        const Member& mem = *members_[i];
        std::vector<std::pair<std::string, int>> bits;
        if (restructured_[i]) {
            current_ = &mem;
            locals_.clear();
            for (const auto& l : mem.body.value("locals", json::array())) locals_.insert(l["name"].get<std::string>());
            if (mem.kind == MemberKind::Assign) lvalueWriteSet(mem.body["lhs"], bits);
            else stmtWriteSet(mem.body["body"], bits);
            locals_.clear();
            current_ = nullptr;
        } else {
            for (const auto& name : mem.writes) {
                auto it = m_.signals.find(name);
                if (it == m_.signals.end()) continue;
                for (int b = 0; b < it->second.width; ++b) bits.emplace_back(name, b);
            }
            for (const auto& name : mem.reads) keptReads_.insert(name);
        }
        std::sort(bits.begin(), bits.end());
        bits.erase(std::unique(bits.begin(), bits.end()), bits.end());
        for (auto& [name, off] : bits) {
            auto sit = m_.signals.find(name);
            if (sit == m_.signals.end()) continue;
            auto& d = drivers_[name];
            if (d.empty()) d.resize(static_cast<std::size_t>(sit->second.width));
            int mine = restructured_[i] ? static_cast<int>(i) : -2;
            int prev = d[off].member;
            if (prev != -1 && prev != mine && !(prev == -2 && mine == -2)) {
                const Member& other = prev >= 0 ? *members_[prev] : mem;
                SourceLoc here = (mine >= 0 ? mem : *members_[prev >= 0 ? prev : i]).src.loc();
                fail(fmt::format("'{}' has more than one driver (also driven at {})", bitName(m_, {name, off}),
                                 (prev >= 0 ? other.src.loc() : mem.src.loc()).str()),
                     here);
            }
            d[off].member = mine;
        }
    }
    for (std::size_t i = 0; i < members_.size(); ++i)
        if (restructured_[i]) {
            lowerMember(static_cast<int>(i));
            out_.replaced.push_back(members_[i]->id);
        }
    // Outputs: restructured bits of ports and of signals kept code reads.
    std::vector<std::string> order = m_.portOrder;
    std::set<std::string> inPorts(order.begin(), order.end());
    for (const auto& [name, sig] : m_.signals)
        if (!inPorts.count(name)) order.push_back(name);
    for (const auto& name : order) {
        auto vit = value_.find(name);
        if (vit == value_.end()) continue;
        const Signal& s = m_.signals.at(name);
        bool allMine = true;
        const auto& d = drivers_[name];
        for (int b = 0; b < s.width; ++b)
            if (d[b].member < 0) allMine = false;
        bool needed = s.dir != PortDir::None || keptReads_.count(name) || !allMine;
        if (!needed) {
            if (s.decl) out_.dissolved.push_back(name);
            continue;
        }
        for (int b = 0; b < s.width; ++b) {
            if (vit->second[b] == kUnassigned) continue;
            out_.net.addOutput(bitName(m_, {name, b}), vit->second[b]);
            out_.outputBits.push_back(BitRef{name, b});
        }
    }
    // Module-scope loop variables that the reader made block-local go with their blocks.
    std::set<std::string> keptTouched = keptReads_;
    for (std::size_t i = 0; i < members_.size(); ++i)
        if (!restructured_[i])
            for (const auto& n : members_[i]->writes) keptTouched.insert(n);
    std::set<std::string> loopVars;
    for (std::size_t i = 0; i < members_.size(); ++i)
        if (restructured_[i] && members_[i]->kind == MemberKind::Comb)
            for (const auto& l : members_[i]->body.value("locals", json::array()))
                loopVars.insert(l["name"].get<std::string>());
    for (const auto& name : loopVars) {
        auto it = m_.signals.find(name);
        if (it == m_.signals.end() || !it->second.decl || it->second.dir != PortDir::None) continue;
        if (keptTouched.count(name) || value_.count(name) || inputLits_.count(name)) continue;
        out_.dissolved.push_back(name);
    }
    return std::move(out_);
}

} // namespace

std::string bitName(const ModuleDesc& m, const BitRef& b) {
    auto it = m.signals.find(b.signal);
    if (it == m.signals.end()) return fmt::format("{}[{}]", b.signal, b.offset);
    if (!it->second.vector && it->second.width == 1) return b.signal;
    return fmt::format("{}[{}]", b.signal, it->second.indexOf(b.offset));
}

Lowered lower(const ModuleDesc& m, const LowerOptions& opts) {
    Lowerer l(m, opts);
    return l.run();
}

} // namespace kerf::frontend
