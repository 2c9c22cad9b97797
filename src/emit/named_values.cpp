// named_values.cpp — logic over a state register written with the source's names.
//
// A controller's author compares the state register with named values (`state_q == ARB`,
// a `case (state_q)` with localparam or enum labels) and never looks at its bits. The engine
// works on bits, so its forms read `~state_q[2] & state_q[0]`, which a reviewer must decode.
// The idea is the classic one of symbolic (multiple-valued) inputs in two-level logic
// minimisation: a function of the register alone is a set of its values (Brayton et al.,
// "Logic Minimization Algorithms for VLSI Synthesis", 1984, and the multiple-valued
// minimisation literature, from memory). Here it is used in reverse: a node whose function
// reads only the bits of such a register is tabulated over the register's values (2^width
// rows); when the values it is true for are all named, its form becomes the OR of the whole
// comparisons (`state_q == ARB | state_q == DONE`); when the values it is false for are a few
// named ones, the AND of exclusions (`state_q != IDLE`). A value no name covers (3'd5 of a
// five-state register) keeps the bits: the honest text there is the bits. The comparisons cost
// gates the bit form may not (each is a w-input AND); the written file is measured and proved
// as always, and the summary's figures include that cost.
//
// Which signals count (namedDomains) is read from the statements kerf reads as logic: every
// read of the signal is a whole comparison with a named constant (a constant's text in the
// source is its name), a case label that is one, or a whole copy into a signal of its width;
// a bit or slice select, a comparison with a literal or any arithmetic on it disqualifies it.
// Enum-typed signals take their type's values. Statements kept as written (a clocked
// `state_q <= state_d`) are not looked at: they stay byte for byte anyway.
#include "named_values.h"

#include "kerf/io/files.h"

#include <algorithm>
#include <cctype>
#include <cstdint>
#include <map>
#include <optional>
#include <set>
#include <tuple>

namespace kerf::emit {

using algebra::Cover;
using algebra::Cube;
using algebra::Factored;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using frontend::ExprId;
using frontend::ExprKind;
using frontend::kNoId;
using frontend::StmtId;
using frontend::StmtKind;

namespace {

struct SignalUse {
    bool raw = false;                            ///< read other than by name (disqualifies)
    bool assigned = false, assignRaw = false;    ///< assigned at all / other than by name
    std::map<std::string, std::string> values;   ///< bits (MSB first) -> first name, compared or assigned
    bool compared = false;
};

class Scan {
public:
    explicit Scan(const frontend::ModuleDesc& m) : m_(m), ir_(m.ir) {}

    std::map<std::string, SignalUse> run() {
        for (const auto& mem : m_.members) {
            if (mem.kind == frontend::MemberKind::Kept) continue;
            file_ = &text(mem.src.file);
            if (mem.kind == frontend::MemberKind::Assign) {
                if (mem.lhs != kNoId && mem.rhs != kNoId) assign(mem.lhs, mem.rhs);
            } else if (mem.body != kNoId) {
                stmt(mem.body);
            }
        }
        return std::move(use_);
    }

private:
    const std::string& text(const std::string& path) {
        auto it = files_.find(path);
        if (it == files_.end()) {
            std::string t;
            try {
                t = io::readFile(path);
            } catch (...) {
                // No text: no constant can be told from a literal, so none counts as named.
            }
            it = files_.emplace(path, std::move(t)).first;
        }
        return it->second;
    }

    /// The module signal a whole-signal reference names (at least two bits), or null.
    const frontend::Signal* whole(ExprId id) const {
        const auto& e = ir_.expr(id);
        if (e.kind != ExprKind::Ref) return nullptr;
        const frontend::Signal* s = m_.signalOf(e.a);
        if (!s || s->width < 2 || !s->packed || static_cast<int>(e.width) != s->width) return nullptr;
        return s;
    }

    std::string bitsOf(const frontend::Expr& e) const {
        std::string b;
        for (std::uint32_t i = e.width; i-- > 0;) b += ir_.constBit(e, i);
        return b;
    }

    /// The name `id` gives a value of `s` when it is a constant written as a name the module
    /// knows with that value (a localparam or package constant, an enum value of s's type).
    std::optional<std::string> named(ExprId id, const frontend::Signal& s) const {
        const auto& e = ir_.expr(id);
        if (e.kind != ExprKind::Const || static_cast<int>(e.width) != s.width || e.start == kNoId ||
            e.end == kNoId || e.end > file_->size() || e.start >= e.end)
            return std::nullopt;
        std::string bits = bitsOf(e);
        if (bits.find_first_not_of("01") != std::string::npos) return std::nullopt;
        std::string t = file_->substr(e.start, e.end - e.start);
        if (t.empty() || !(std::isalpha(static_cast<unsigned char>(t[0])) || t[0] == '_')) return std::nullopt;
        for (char c : t)
            if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == ':' || c == '$')) return std::nullopt;
        if (s.type != kNoId && s.type < ir_.types.size() && ir_.types[s.type].kind == frontend::TypeKind::Enum)
            for (const auto& v : ir_.types[s.type].values)
                if (v.bits == bits && !v.ref.empty() && (v.ref == t || v.name == t)) return v.ref;
        for (const auto& c : m_.constants)
            if (c.bits == bits && (c.ref == t || c.name == t)) return c.ref;
        return std::nullopt;
    }

    void note(const frontend::Signal& s, const std::string& bits, const std::string& ref) {
        use_[s.name].values.emplace(bits, ref);
    }

    void expr(ExprId id) {
        if (id == kNoId) return;
        const auto& e = ir_.expr(id);
        switch (e.kind) {
        case ExprKind::Const: return;
        case ExprKind::Ref:
            if (const frontend::Signal* s = m_.signalOf(e.a); s && s->width >= 2) use_[s->name].raw = true;
            return;
        case ExprKind::Binary: {
            auto op = e.binaryOp();
            bool eq = op == frontend::BinaryOp::Eq || op == frontend::BinaryOp::Ne ||
                      op == frontend::BinaryOp::CaseEq || op == frontend::BinaryOp::CaseNe;
            if (eq) {
                for (auto [x, y] : {std::pair{e.a, e.b}, std::pair{e.b, e.a}}) {
                    const frontend::Signal* s = whole(x);
                    if (!s) continue;
                    if (auto n = named(y, *s)) {
                        note(*s, bitsOf(ir_.expr(y)), *n);
                        use_[s->name].compared = true;
                        return;
                    }
                }
            }
            expr(e.a);
            expr(e.b);
            return;
        }
        case ExprKind::Unary:
        case ExprKind::Convert: expr(e.a); return;
        case ExprKind::Cond: expr(e.a); expr(e.b); expr(e.c); return;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) expr(ir_.lists[e.a + k]);
            return;
        case ExprKind::Replicate: expr(e.a); return;
        case ExprKind::Index:
        case ExprKind::Indexed: expr(e.a); expr(e.b); return;
        case ExprKind::Range: expr(e.a); return;
        case ExprKind::Call:
            for (std::uint32_t k = 0; k < e.c; ++k) expr(ir_.lists[e.b + k]);
            return;
        }
    }

    /// Every signal a target expression writes is assigned other than by name (a bit, a
    /// slice, a concatenation); its index expressions are reads.
    void rawTarget(ExprId id) {
        if (id == kNoId) return;
        const auto& e = ir_.expr(id);
        switch (e.kind) {
        case ExprKind::Ref:
            if (const frontend::Signal* s = m_.signalOf(e.a)) use_[s->name].assigned = use_[s->name].assignRaw = true;
            return;
        case ExprKind::Index:
        case ExprKind::Indexed: rawTarget(e.a); expr(e.b); return;
        case ExprKind::Range: rawTarget(e.a); return;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) rawTarget(ir_.lists[e.a + k]);
            return;
        default: expr(id); return;
        }
    }

    void value(const frontend::Signal& t, ExprId v) {
        const auto& e = ir_.expr(v);
        if (auto n = named(v, t)) return note(t, bitsOf(e), *n);
        if (const frontend::Signal* w = whole(v); w && w->width == t.width) return;   // a whole copy
        if (e.kind == ExprKind::Cond) {
            expr(e.a);
            value(t, e.b);
            value(t, e.c);
            return;
        }
        use_[t.name].assignRaw = true;
        expr(v);
    }

    void assign(ExprId target, ExprId v) {
        if (const frontend::Signal* t = whole(target)) {
            use_[t->name].assigned = true;
            value(*t, v);
            return;
        }
        rawTarget(target);
        expr(v);
    }

    void stmt(StmtId id) {
        if (id == kNoId) return;
        const auto& s = ir_.stmt(id);
        switch (s.kind) {
        case StmtKind::Assign: assign(s.a, s.b); break;
        case StmtKind::If: expr(s.a); break;
        case StmtKind::Case: {
            const frontend::Signal* sel = whole(s.a);
            if (!sel) expr(s.a);
            for (std::uint32_t k = 0; k < s.c; ++k) {
                const auto& item = ir_.caseItems[s.b + k];
                for (std::uint32_t j = 0; j < item.count; ++j) {
                    ExprId x = ir_.lists[item.exprs + j];
                    bool cond = item.conditions != kNoId && ir_.itemIsCondition[item.conditions + j];
                    std::optional<std::string> n;
                    if (sel && !cond && s.caseKind != frontend::CaseKind::Inside) n = named(x, *sel);
                    if (n) {
                        note(*sel, bitsOf(ir_.expr(x)), *n);
                        use_[sel->name].compared = true;
                    } else {
                        if (sel) use_[sel->name].raw = true;
                        expr(x);
                    }
                }
            }
            break;
        }
        case StmtKind::CaseTable: {
            // Labels are held as bits only: a selector of a case table is not taken as named.
            expr(s.a);
            const auto& t = ir_.caseTables[s.b];
            for (ExprId x : t.targets) rawTarget(x);
            break;
        }
        case StmtKind::For: {
            for (std::uint32_t k = 0; k < s.b; ++k) expr(ir_.forInits[s.a + k].value);
            expr(s.c);
            break;
        }
        case StmtKind::Block:
        case StmtKind::Empty: break;
        }
        frontend::forEachChild(ir_, s, frontend::LoopSteps::Visit, [&](StmtId c) { stmt(c); });
    }

    const frontend::ModuleDesc& m_;
    const frontend::Ir& ir_;
    std::map<std::string, std::string> files_;
    const std::string* file_ = nullptr;
    std::map<std::string, SignalUse> use_;
};

} // namespace

std::vector<NamedDomain> namedDomains(const frontend::ModuleDesc& m, const NamedValueLimits& lim) {
    std::vector<NamedDomain> out;
    if (m.constants.empty()) {
        // Without a named constant only enum-typed signals can be named; skip the scan when none is.
        bool anyEnum = false;
        for (const auto& [n, s] : m.signals)
            if (s.type != kNoId && s.type < m.ir.types.size() && m.ir.types[s.type].kind == frontend::TypeKind::Enum)
                anyEnum = true;
        if (!anyEnum) return out;
    }
    auto uses = Scan(m).run();
    for (const auto& [name, u] : uses) {
        auto it = m.signals.find(name);
        if (it == m.signals.end() || u.raw) continue;
        const frontend::Signal& s = it->second;
        if (s.width < 2 || s.width > lim.maxWidth) continue;
        NamedDomain d;
        d.signal = name;
        d.width = s.width;
        std::map<std::string, std::string> values = u.values;
        bool isEnum = s.type != kNoId && s.type < m.ir.types.size() && m.ir.types[s.type].kind == frontend::TypeKind::Enum;
        if (isEnum)
            for (const auto& v : m.ir.types[s.type].values)
                if (!v.ref.empty() && v.bits.size() == static_cast<std::size_t>(s.width) &&
                    v.bits.find_first_not_of("01") == std::string::npos)
                    values.emplace(v.bits, v.ref);
        for (const auto& [bits, ref] : values) d.values.push_back({bits, ref});
        d.compared = u.compared;
        d.assignedNamed = u.assigned && !u.assignRaw && !u.values.empty();
        if (d.values.empty() || !(d.compared || d.assignedNamed)) continue;
        out.push_back(std::move(d));
    }
    return out;
}

std::size_t nameDomainFunctions(const std::vector<NamedDomain>& domains, const frontend::ModuleDesc& m,
                                const frontend::Lowered& low, net::Network& net, std::vector<Factored>& forms,
                                const NamedValueLimits& lim, const std::set<std::uint64_t>* unnamed,
                                std::vector<std::uint64_t>* items) {
    auto allowed = [&](std::uint64_t key) {
        if (unnamed && unnamed->count(key)) return false;
        if (items) items->push_back(key);
        return true;
    };
    // Network input of each bit of each compared domain; a domain with a bit the network does
    // not read cannot be compared whole.
    std::map<std::string, std::size_t> domainOf;
    for (std::size_t d = 0; d < domains.size(); ++d)
        if (domains[d].compared && domains[d].width <= lim.maxWidth) domainOf[domains[d].signal] = d;
    if (domainOf.empty()) return 0;
    std::vector<std::vector<net::NodeId>> bitVar(domains.size());
    for (auto& [name, d] : domainOf) bitVar[d].assign(static_cast<std::size_t>(domains[d].width), 0);
    const std::size_t n = net.nodeCount();
    std::vector<int> dom(n, -1);     // per node: the domain it reads only (-1: none or several)
    std::vector<int> bitOf(n, -1);   // per input: its bit offset in its domain
    for (std::size_t k = 0; k < net.inputs().size() && k < low.inputBits.size(); ++k) {
        auto it = domainOf.find(low.inputBits[k].signal);
        if (it == domainOf.end()) continue;
        int off = low.inputBits[k].offset;
        if (off < 0 || off >= domains[it->second].width) continue;
        net::NodeId v = net.inputs()[k];
        bitVar[it->second][static_cast<std::size_t>(off)] = v;
        dom[v] = static_cast<int>(it->second);
        bitOf[v] = off;
    }
    auto complete = [&](std::size_t d) {
        for (net::NodeId v : bitVar[d])
            if (v == 0) return false;
        return true;
    };
    auto words = [&](std::size_t d) { return ((std::size_t{1} << domains[d].width) + 63) / 64; };
    std::vector<std::vector<std::uint64_t>> tt(n);
    for (net::NodeId v = 0; v < n; ++v)
        if (dom[v] >= 0) {
            std::size_t d = static_cast<std::size_t>(dom[v]);
            if (!complete(d)) {
                dom[v] = -1;
                continue;
            }
            std::size_t rows = std::size_t{1} << domains[d].width;
            tt[v].assign(words(d), 0);
            for (std::size_t r = 0; r < rows; ++r)
                if ((r >> bitOf[v]) & 1) tt[v][r / 64] |= std::uint64_t{1} << (r % 64);
        }
    using Table = std::vector<std::uint64_t>;
    auto rowsOf = [&](std::size_t d) { return std::size_t{1} << domains[d].width; };
    auto bit = [](const Table& t, std::size_t r) { return ((t[r / 64] >> (r % 64)) & 1) != 0; };
    // The table of a product of literals of one domain's variables.
    auto product = [&](std::size_t D, const std::vector<Literal>& lits) {
        const std::size_t W = words(D), rows = rowsOf(D);
        Table p(W, ~std::uint64_t{0});
        for (Literal l : lits) {
            net::NodeId x = literalVar(l);
            for (std::size_t w = 0; w < W; ++w) p[w] &= x == 0 ? 0 : (literalNegated(l) ? ~tt[x][w] : tt[x][w]);
        }
        if (rows < 64) p[0] &= (std::uint64_t{1} << rows) - 1;
        return p;
    };
    // The named form of table f of domain D (and its on-set cover), when the values it is
    // true for are named, or the few it is false for are.
    auto namedForm = [&](std::size_t D, const Table& f) -> std::optional<std::pair<Factored, Cover>> {
        const NamedDomain& nd = domains[D];
        const std::size_t rows = rowsOf(D);
        Table namedSet(words(D), 0);
        for (const auto& val : nd.values) {
            std::size_t r = std::stoull(val.bits, nullptr, 2);
            namedSet[r / 64] |= std::uint64_t{1} << (r % 64);
        }
        int on = 0, off = 0;
        bool onNamed = true, offNamed = true;
        for (std::size_t r = 0; r < rows; ++r) {
            bool b = bit(f, r), nm = bit(namedSet, r);
            (b ? on : off)++;
            if (b && !nm) onNamed = false;
            if (!b && !nm) offNamed = false;
        }
        if (on == 0 || off == 0) return std::nullopt;
        bool useOn = onNamed && (!offNamed || on <= off);
        if (!useOn && !(offNamed && off <= lim.maxExcluded)) return std::nullopt;
        // Per value, the whole-signal minterm (printed `s == V`), or its complement as a sum
        // of differing bits (printed `s != V`).
        Factored form;
        form.kind = useOn ? Factored::Kind::Or : Factored::Kind::And;
        const int w = nd.width;
        for (std::size_t r = 0; r < rows; ++r) {
            if (bit(f, r) != useOn) continue;
            Factored term;
            term.kind = useOn ? Factored::Kind::And : Factored::Kind::Or;
            for (int k = w; k-- > 0;) {
                bool one = (r >> k) & 1;
                Factored lit;
                lit.kind = Factored::Kind::Lit;
                // In a sum of exclusions a bit literal is true where the bit differs from V's.
                lit.lit = makeLiteral(bitVar[D][static_cast<std::size_t>(k)], useOn ? !one : one);
                term.kids.push_back(std::move(lit));
            }
            form.kids.push_back(std::move(term));
        }
        if (form.kids.size() == 1) {
            Factored only = form.kids[0];
            form = std::move(only);
        }
        // The cover is the on-set whichever side is written: it says what the node computes
        // and which variables it reads; the form says how it is written.
        Cover cover;
        for (std::size_t r = 0; r < rows; ++r) {
            if (!bit(f, r)) continue;
            std::vector<Literal> lits;
            for (int k = 0; k < w; ++k)
                lits.push_back(makeLiteral(bitVar[D][static_cast<std::size_t>(k)], !((r >> k) & 1)));
            cover.cubes.push_back(Cube(lits));
        }
        cover.normalize();
        return std::pair{std::move(form), std::move(cover)};
    };
    std::map<std::pair<std::size_t, Table>, net::NodeId> named;   // (domain, table) -> node written by names
    std::size_t rewritten = 0;
    const std::vector<net::NodeId> order = net.topoOrder();
    // 1. Nodes that read one domain only.
    for (net::NodeId v : order) {
        if (!net.isLogic(v)) continue;
        const Cover& cv = net.node(v).cover;
        int d = -2;   // -2: no variable yet
        bool pure = true;
        for (const auto& c : cv.cubes)
            for (Literal l : c.lits) {
                net::NodeId x = literalVar(l);
                if (x == 0) continue;
                if (dom[x] < 0 || (d != -2 && dom[x] != d)) pure = false;
                else d = dom[x];
            }
        if (!pure || d < 0) continue;
        std::size_t D = static_cast<std::size_t>(d);
        Table f(words(D), 0);
        for (const auto& c : cv.cubes) {
            Table p = product(D, c.lits);
            for (std::size_t w = 0; w < f.size(); ++w) f[w] |= p[w];
        }
        dom[v] = d;
        tt[v] = f;
        auto nf = namedForm(D, f);
        if (!nf || !allowed(v)) continue;
        net.node(v).cover = std::move(nf->second);
        forms[v] = std::move(nf->first);
        named.emplace(std::pair{D, f}, v);
        ++rewritten;
    }
    // 2. Nodes that read a domain and other signals: in each product, the literals of one
    // domain are one set of its values (`~state_q[2] & state_q[0]` is ARB or DONE); where that
    // set is named, the product reads a node written by names instead. The node is then
    // factored again from its new sum of products (the domain's part is one literal, so the
    // factoring cannot split it into bits again).
    for (net::NodeId v : order) {
        if (!net.isLogic(v) || dom[v] >= 0 || (unnamed && unnamed->count(v))) continue;
        Cover cv = net.node(v).cover;
        bool changed = false;
        for (auto& c : cv.cubes) {
            std::map<int, std::vector<Literal>> byDomain;
            for (Literal l : c.lits)
                if (literalVar(l) != 0 && dom[literalVar(l)] >= 0) byDomain[dom[literalVar(l)]].push_back(l);
            if (byDomain.empty()) continue;
            std::vector<Literal> lits;
            for (Literal l : c.lits)
                if (literalVar(l) == 0 || dom[literalVar(l)] < 0) lits.push_back(l);
            for (auto& [d, part] : byDomain) {
                std::size_t D = static_cast<std::size_t>(d);
                Table p = product(D, part);
                auto it = named.find({D, p});
                if (it == named.end()) {
                    auto nf = namedForm(D, p);
                    if (nf) {
                        net::NodeId u = net.addLogic(std::move(nf->second));
                        forms.push_back(std::move(nf->first));
                        dom.push_back(d);
                        tt.push_back(p);
                        it = named.emplace(std::pair{D, p}, u).first;
                    }
                }
                if (it == named.end() || (part.size() == 1 && literalVar(part[0]) == it->second &&
                                          !literalNegated(part[0]))) {
                    lits.insert(lits.end(), part.begin(), part.end());
                    continue;
                }
                lits.push_back(makeLiteral(it->second, false));
                changed = true;
            }
            c = Cube(lits);
        }
        if (!changed) continue;
        allowed(v);
        cv.normalize();
        forms[v] = algebra::factor(cv);
        net.node(v).cover = std::move(cv);
        ++rewritten;
    }
    // A one-bit output the engine drives with a bit of the domain itself (`door_busy =
    // st_q[0]`, true for OPENING and CLOSING) is driven by the comparisons instead; a bit of a
    // vector output is left alone (`assign st_copy = st_q;` stays a copy).
    for (std::size_t i = 0; i < net.outputs().size(); ++i) {
        auto& o = net.outputs()[i];
        if (i >= low.outputBits.size()) break;
        auto sig = m.signals.find(low.outputBits[i].signal);
        if (sig == m.signals.end() || sig->second.width != 1) continue;
        net::NodeId x = literalVar(o.driver);
        if (x == 0 || net.isLogic(x) || x >= dom.size() || dom[x] < 0 || (unnamed && unnamed->count(kOutputItem | i)))
            continue;
        std::size_t D = static_cast<std::size_t>(dom[x]);
        Table p = product(D, {o.driver});
        auto it = named.find({D, p});
        if (it == named.end()) {
            auto nf = namedForm(D, p);
            if (!nf) continue;
            net::NodeId u = net.addLogic(std::move(nf->second));
            forms.push_back(std::move(nf->first));
            dom.push_back(static_cast<int>(D));
            tt.push_back(p);
            it = named.emplace(std::pair{D, p}, u).first;
        }
        o.driver = makeLiteral(it->second, false);
        allowed(kOutputItem | i);
        ++rewritten;
    }
    // 3. A value's comparison already has a node: an OR of comparisons reads that node
    // (`busy = state_q_is_ARB | state_q_is_XFER`) instead of comparing again.
    std::map<std::pair<std::size_t, std::size_t>, net::NodeId> single;   // (domain, value row) -> node
    for (const auto& [key, u] : named) {
        std::size_t on = 0, row = 0;
        for (std::size_t r = 0; r < rowsOf(key.first); ++r)
            if (bit(key.second, r)) ++on, row = r;
        if (on == 1) single.emplace(std::pair{key.first, row}, u);
    }
    auto isValueTerm = [&](const Factored& term, std::size_t D, std::size_t r) {
        const int w = domains[D].width;
        if (term.kind != Factored::Kind::And || term.kids.size() != static_cast<std::size_t>(w)) return false;
        for (int k = w; k-- > 0;) {
            const Factored& l = term.kids[static_cast<std::size_t>(w - 1 - k)];
            if (l.kind != Factored::Kind::Lit ||
                l.lit != makeLiteral(bitVar[D][static_cast<std::size_t>(k)], !((r >> k) & 1)))
                return false;
        }
        return true;
    };
    for (const auto& [key, v] : named) {
        Factored& form = forms[v];
        if (form.kind != Factored::Kind::Or) continue;
        std::size_t D = key.first;
        Cover cover;
        bool changed = false;
        for (std::size_t r = 0; r < rowsOf(D); ++r) {
            if (!bit(key.second, r)) continue;
            auto it = single.find({D, r});
            if (it != single.end() && it->second != v) {
                cover.cubes.push_back(Cube({makeLiteral(it->second, false)}));
                changed = true;
                continue;
            }
            std::vector<Literal> lits;
            for (int k = 0; k < domains[D].width; ++k)
                lits.push_back(makeLiteral(bitVar[D][static_cast<std::size_t>(k)], !((r >> k) & 1)));
            cover.cubes.push_back(Cube(lits));
        }
        if (!changed) continue;
        // Terms in value order, as namedForm built a sum of values: one whole-signal minterm per
        // value. A form of another shape (a single exclusion `s != V` is an OR of bits) is left
        // as it is.
        std::size_t t = 0;
        bool perValue = true;
        for (std::size_t r = 0; r < rowsOf(D) && perValue; ++r) {
            if (!bit(key.second, r)) continue;
            perValue = t < form.kids.size() && isValueTerm(form.kids[t], D, r);
            ++t;
        }
        if (!perValue || t != form.kids.size()) continue;
        Factored f;
        f.kind = Factored::Kind::Or;
        t = 0;
        for (std::size_t r = 0; r < rowsOf(D); ++r) {
            if (!bit(key.second, r)) continue;
            auto it = single.find({D, r});
            if (it != single.end() && it->second != v) {
                Factored lit;
                lit.kind = Factored::Kind::Lit;
                lit.lit = makeLiteral(it->second, false);
                f.kids.push_back(std::move(lit));
            } else {
                f.kids.push_back(form.kids[t]);
            }
            ++t;
        }
        cover.normalize();
        form = std::move(f);
        net.node(v).cover = std::move(cover);
    }
    if (rewritten) net.removeUnreachable();
    return rewritten;
}

std::optional<ValueChoice> valueChoice(const NamedDomain& d, const net::Network& net, const std::vector<Literal>& drivers,
                                       const NamedValueLimits& lim) {
    const int w = d.width;
    if (static_cast<int>(drivers.size()) != w || w < 2 || w > lim.maxWidth) return std::nullopt;
    // The inputs the bits read, and their cone in order.
    std::vector<net::NodeId> roots;
    for (Literal l : drivers) roots.push_back(literalVar(l));
    std::vector<net::NodeId> cone = net.postOrderFrom(roots);   // logic nodes only
    std::set<net::NodeId> inputs;
    for (net::NodeId v : roots)
        if (v != 0 && !net.isLogic(v)) inputs.insert(v);
    for (net::NodeId v : cone)
        for (const auto& c : net.node(v).cover.cubes)
            for (Literal l : c.lits)
                if (literalVar(l) != 0 && !net.isLogic(literalVar(l))) inputs.insert(literalVar(l));
    if (static_cast<int>(inputs.size()) > lim.maxSupport) return std::nullopt;
    std::map<net::NodeId, std::size_t> inputIx;
    for (net::NodeId v : inputs) inputIx.emplace(v, inputIx.size());
    const std::size_t n = inputIx.size(), rows = std::size_t{1} << n, W = (rows + 63) / 64;
    std::map<net::NodeId, std::vector<std::uint64_t>> tab;
    tab[0] = std::vector<std::uint64_t>(W, 0);
    for (auto [v, k] : inputIx) {
        std::vector<std::uint64_t> t(W, 0);
        for (std::size_t r = 0; r < rows; ++r)
            if ((r >> k) & 1) t[r / 64] |= std::uint64_t{1} << (r % 64);
        tab[v] = std::move(t);
    }
    for (net::NodeId v : cone) {
        if (!net.isLogic(v)) continue;
        std::vector<std::uint64_t> f(W, 0);
        for (const auto& c : net.node(v).cover.cubes) {
            std::vector<std::uint64_t> p(W, ~std::uint64_t{0});
            for (Literal l : c.lits) {
                const auto& x = tab.at(literalVar(l));
                for (std::size_t i = 0; i < W; ++i) p[i] &= literalNegated(l) ? ~x[i] : x[i];
            }
            for (std::size_t i = 0; i < W; ++i) f[i] |= p[i];
        }
        tab[v] = std::move(f);
    }
    // The values the target takes together.
    std::set<std::size_t> reach;
    for (std::size_t r = 0; r < rows; ++r) {
        std::size_t val = 0;
        for (int k = 0; k < w; ++k) {
            Literal l = drivers[static_cast<std::size_t>(k)];
            bool b = (tab.at(literalVar(l))[r / 64] >> (r % 64)) & 1;
            if (b != literalNegated(l)) val |= std::size_t{1} << k;
        }
        reach.insert(val);
    }
    std::map<std::size_t, const NamedDomain::Value*> names;
    for (const auto& v : d.values) names.emplace(std::stoull(v.bits, nullptr, 2), &v);
    for (std::size_t v : reach)
        if (!names.count(v)) return std::nullopt;   // a value no name covers: the bits stay
    if (reach.size() < 2) return std::nullopt;
    std::vector<std::size_t> vals(reach.begin(), reach.end());
    // The fewest bits telling value v apart from the others of `rest` (a mask of offsets).
    auto cubeFor = [&](std::size_t v, const std::vector<std::size_t>& rest) {
        std::size_t best = (std::size_t{1} << w) - 1;
        int bestCount = w + 1;
        for (std::size_t P = 0; P < (std::size_t{1} << w); ++P) {
            int c = __builtin_popcountll(P);
            if (c >= bestCount) continue;
            bool ok = true;
            for (std::size_t u : rest)
                if (u != v && ((u ^ v) & P) == 0) ok = false;
            if (ok) best = P, bestCount = c;
        }
        return best;
    };
    auto cost = [&](const std::vector<std::size_t>& order, std::vector<std::size_t>* cubes) {
        int total = 0;
        for (std::size_t i = 0; i + 1 < order.size(); ++i) {
            std::vector<std::size_t> rest(order.begin() + static_cast<long>(i), order.end());
            std::size_t P = cubeFor(order[i], rest);
            total += __builtin_popcountll(P);
            if (cubes) cubes->push_back(P);
        }
        return total;
    };
    std::vector<std::size_t> order;
    if (static_cast<int>(vals.size()) <= lim.maxOrdered) {
        // Fewest condition literals; among those, the lowest code last (the reset or idle
        // value by the usual convention, so it reads as the default), then fewest inversions.
        std::vector<std::size_t> perm = vals;   // sorted: permutations in a fixed order
        std::tuple<int, int, int> best{-1, 0, 0};
        do {
            std::vector<std::size_t> cubes;
            int c = cost(perm, &cubes);
            int inv = 0;
            for (std::size_t i = 0; i < cubes.size(); ++i)
                inv += __builtin_popcountll(cubes[i] & ~perm[i]);
            std::tuple<int, int, int> key{c, perm.back() == vals.front() ? 0 : 1, inv};
            if (std::get<0>(best) < 0 || key < best) best = key, order = perm;
        } while (std::next_permutation(perm.begin(), perm.end()));
    } else {
        // Greedy: next the value with the smallest condition among those left.
        std::vector<std::size_t> rest = vals;
        while (rest.size() > 1) {
            std::size_t pick = 0;
            int bc = w + 1;
            for (std::size_t i = 0; i < rest.size(); ++i) {
                int c = __builtin_popcountll(cubeFor(rest[i], rest));
                if (c < bc) bc = c, pick = i;
            }
            order.push_back(rest[pick]);
            rest.erase(rest.begin() + static_cast<long>(pick));
        }
        order.push_back(rest[0]);
    }
    std::vector<std::size_t> cubes;
    cost(order, &cubes);
    ValueChoice vc;
    for (std::size_t i = 0; i < order.size(); ++i) {
        ValueChoice::Link link;
        link.ref = names.at(order[i])->ref;
        link.bits = names.at(order[i])->bits;
        if (i < cubes.size())
            for (int k = w; k-- > 0;)
                if ((cubes[i] >> k) & 1) link.cube.push_back({k, ((order[i] >> k) & 1) != 0});
        vc.links.push_back(std::move(link));
    }
    return vc;
}

} // namespace kerf::emit
