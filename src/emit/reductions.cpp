// reductions.cpp — a reduction the source wrote stays a reduction.
//
// `assign irq_out = |live;` says in one operator what the logic is: any bit of `live`. The
// engine treats it as an OR of six bits like any other and may cut it into fragments it
// shares with other outputs; written back, the statement then reads
// `irq_out = ~(irq_out_t0 & src_id[2])` — the same function, spread over another output's
// logic, which a reviewer has to prove to themselves. Two rules keep the source's reading:
//
// - Printing (expression.cpp, groupSlices): an OR (AND) of all bits of a slice of a signal the
//   source reduces somewhere is written as the reduction `|v[7:4]` (`&v`), its complement as
//   `~|v` (`~&v`), rather than as a comparison with zero (`v[7:4] != 4'h0`).
// - Keeping whole (here): an output a statement assigns a whole reduction is driven by that
//   reduction — one node, the OR (AND) of the bits it reduces, or a chain of two-input
//   exclusive ors for `^v` — unless its fragments make the module smaller by at least the
//   `--min-gain` margin and by more than a share of the module's gates (ReductionBudget::share,
//   10%: a reviewer reads `|live` at once, its fragments spread over other outputs' logic
//   have to be proved by hand), or the whole reduction would break the goal's depth bound. Figures are those of the written forms
//   (naming_cost.cpp's writtenFigures: two-input gates, depth balanced by arrival), and every
//   decision is recorded for `--report` and `-v`.
//
// The choice between alternative implementations of one function by a cost model is the
// usual one (common trade practice); a reduction operator is IEEE 1800-2017 11.4.9.
#include "reductions.h"

#include "expression.h"
#include "named_values.h"
#include "kerf/io/files.h"

#include <algorithm>
#include <map>
#include <set>

namespace kerf::emit {

using algebra::Cover;
using algebra::Cube;
using algebra::Factored;
using algebra::Literal;
using algebra::literalNegated;
using algebra::literalVar;
using algebra::makeLiteral;
using frontend::ExprKind;
using frontend::UnaryOp;

namespace {

/// The slice a reduction reads: a whole module vector, or a constant part select of one whose
/// range is the vector's own (one dimension).
bool reducedSlice(const frontend::ModuleDesc& m, const frontend::Expr& operand, std::string& signal, int& lo,
                  int& hi) {
    const auto& ir = m.ir;
    const frontend::Expr* ref = &operand;
    bool ranged = false;
    if (operand.kind == ExprKind::Range) {
        if (operand.a >= ir.exprs.size()) return false;
        ref = &ir.expr(operand.a);
        ranged = true;
    }
    if (ref->kind != ExprKind::Ref) return false;
    const frontend::Signal* s = m.signalOf(ref->a);
    if (!s || !s->packed || s->width < 2) return false;
    if (!ranged) {
        signal = s->name, lo = 0, hi = s->width - 1;
        return true;
    }
    if (operand.msb != s->msb || operand.lsb != s->lsb) return false;
    int a = s->offsetOf(operand.left()), b = s->offsetOf(operand.right());
    if (a < 0 || b < 0) return false;
    signal = s->name, lo = std::min(a, b), hi = std::max(a, b);
    return hi > lo;
}

bool isReduction(UnaryOp op) {
    return op == UnaryOp::RedOr || op == UnaryOp::RedNor || op == UnaryOp::RedAnd || op == UnaryOp::RedNand ||
           op == UnaryOp::RedXor || op == UnaryOp::RedXnor;
}

Factored litForm(Literal l) {
    Factored k;
    k.kind = Factored::Kind::Lit;
    k.lit = l;
    return k;
}

/// A new node: the OR (AND) of `lits`, one cover and one form.
net::NodeId addAndOr(net::Network& net, std::vector<Factored>& forms, const std::vector<Literal>& lits, bool isOr,
                     const std::string& name) {
    Cover whole;
    if (isOr)
        for (Literal l : lits) whole.cubes.push_back(Cube({l}));
    else
        whole.cubes.push_back(Cube(lits));
    whole.normalize();
    net::NodeId w = net.addLogic(whole, name);
    Factored f;
    f.kind = isOr ? Factored::Kind::Or : Factored::Kind::And;
    for (Literal l : lits) f.kids.push_back(litForm(l));
    forms.resize(net.nodeCount());
    forms[w] = std::move(f);
    return w;
}

/// The exclusive or of `lits` as a chain of two-input exclusive ors, `((l0 ^ l1) ^ l2) ^ ...`
/// (a cover of the whole parity has 2^(n-1) cubes), each node `x & ~y | ~x & y`: the shape in
/// which the reader lowers `^v`, so the figures weighed are those the written file reads back
/// with; the printer writes the chain over the bits of a reduced vector as `^v` (expression.cpp).
net::NodeId addXorTree(net::Network& net, std::vector<Factored>& forms, const std::vector<Literal>& lits,
                       const std::string& name) {
    Literal acc = lits[0];
    for (std::size_t i = 1; i < lits.size(); ++i) {
        Literal x = acc, y = lits[i];
        if (literalVar(x) > literalVar(y)) std::swap(x, y);
        Cover c;
        c.cubes.push_back(Cube({x, algebra::negateLiteral(y)}));
        c.cubes.push_back(Cube({algebra::negateLiteral(x), y}));
        c.normalize();
        net::NodeId u = net.addLogic(c, i + 1 == lits.size() ? name : std::string());
        Factored f;
        f.kind = Factored::Kind::Or;
        for (auto [a, b] : {std::pair{x, algebra::negateLiteral(y)}, std::pair{algebra::negateLiteral(x), y}}) {
            Factored p;
            p.kind = Factored::Kind::And;
            p.kids = {litForm(a), litForm(b)};
            f.kids.push_back(std::move(p));
        }
        forms.resize(net.nodeCount());
        forms[u] = std::move(f);
        acc = makeLiteral(u, false);
    }
    return literalVar(acc);
}

/// Is node v an exclusive-or tree (through logic nodes of xor form that drive no output: an
/// output is written by its name) whose leaves are exactly `lits`, each once, with no
/// inversion left over?
bool xorTreeOf(const net::Network& net, const std::vector<Factored>& forms, net::NodeId v,
               const std::vector<Literal>& lits) {
    std::set<net::NodeId> named;
    for (const auto& o : net.outputs()) named.insert(literalVar(o.driver));
    std::map<Literal, int> want;
    for (Literal l : lits) ++want[l];
    bool parity = false;
    std::vector<Literal> work{makeLiteral(v, false)};
    std::size_t steps = 0;
    while (!work.empty() && ++steps < 4 * lits.size() + 8) {
        Literal l = work.back();
        work.pop_back();
        if (auto it = want.find(l); it != want.end() && it->second > 0) {
            --it->second;
            continue;
        }
        if (auto it = want.find(algebra::negateLiteral(l)); it != want.end() && it->second > 0) {
            --it->second;
            parity = !parity;
            continue;
        }
        net::NodeId x = literalVar(l);
        Literal a, b;
        bool inv = false;
        if (x == 0 || !net.isLogic(x) || x >= forms.size() || (x != v && named.count(x)) ||
            !xorForm(forms[x], a, b, inv))
            return false;
        parity = parity != (literalNegated(l) != inv);
        work.push_back(a);
        work.push_back(b);
    }
    if (!work.empty() || parity) return false;
    for (const auto& [l, n] : want)
        if (n != 0) return false;
    return true;
}

} // namespace

std::set<std::string> reducedSignals(const frontend::ModuleDesc& m) {
    std::set<std::string> out;
    for (const auto& e : m.ir.exprs) {
        if (e.kind != ExprKind::Unary || !isReduction(e.unaryOp()) || e.a >= m.ir.exprs.size()) continue;
        std::string s;
        int lo = 0, hi = 0;
        if (reducedSlice(m, m.ir.expr(e.a), s, lo, hi)) out.insert(s);
    }
    return out;
}

std::vector<SourceReduction> sourceReductions(const frontend::ModuleDesc& m) {
    const auto& ir = m.ir;
    std::vector<SourceReduction> out;
    // `target = <reduction>` with a one-bit module signal as the whole target.
    auto consider = [&](frontend::ExprId lhs, frontend::ExprId rhs, std::uint32_t start, std::uint32_t end,
                        const std::string& fileText) {
        if (lhs >= ir.exprs.size() || rhs >= ir.exprs.size()) return;
        const auto& l = ir.expr(lhs);
        const auto& r = ir.expr(rhs);
        if (l.kind != ExprKind::Ref || r.kind != ExprKind::Unary || r.a >= ir.exprs.size()) return;
        const frontend::Signal* t = m.signalOf(l.a);
        if (!t || t->width != 1) return;
        const UnaryOp op = r.unaryOp();
        if (!isReduction(op)) return;
        SourceReduction red;
        if (!reducedSlice(m, ir.expr(r.a), red.signal, red.lo, red.hi)) return;
        red.target = t->name;
        red.op = (op == UnaryOp::RedOr || op == UnaryOp::RedNor)   ? '|'
                 : (op == UnaryOp::RedAnd || op == UnaryOp::RedNand) ? '&'
                                                                      : '^';
        red.negated = op == UnaryOp::RedNor || op == UnaryOp::RedNand || op == UnaryOp::RedXnor;
        if (r.start != frontend::kNoId && r.end != frontend::kNoId && r.end <= fileText.size() && r.start < r.end)
            red.text = fileText.substr(r.start, r.end - r.start);
        (void)start, (void)end;
        out.push_back(std::move(red));
    };
    std::map<std::string, std::string> files;
    auto textOf = [&](const std::string& f) -> const std::string& {
        auto it = files.find(f);
        if (it == files.end()) {
            std::string t;
            try {
                t = io::readFile(f);
            } catch (const std::exception&) {
            }
            it = files.emplace(f, std::move(t)).first;
        }
        return it->second;
    };
    for (const auto& mem : m.members) {
        if (mem.kind == frontend::MemberKind::Assign) {
            consider(mem.lhs, mem.rhs, mem.src.start, mem.src.end, textOf(mem.src.file));
        } else if (mem.kind == frontend::MemberKind::Comb && mem.body < ir.stmts.size()) {
            // Top-level assignments of the block; a target assigned anywhere else in it is left.
            std::map<std::string, int> assigned;
            frontend::forEachStmt(ir, {mem.body}, frontend::LoopSteps::Visit, [&](const frontend::Stmt& s) {
                if (s.kind != frontend::StmtKind::Assign || s.a >= ir.exprs.size()) return;
                const auto& l = ir.expr(s.a);
                if (l.kind == ExprKind::Ref)
                    if (const frontend::Signal* t = m.signalOf(l.a)) ++assigned[t->name];
            });
            const auto& body = ir.stmt(mem.body);
            if (body.kind != frontend::StmtKind::Block) continue;
            for (std::uint32_t k = 0; k < body.b; ++k) {
                const auto& s = ir.stmt(ir.list(body.a)[k]);
                if (s.kind != frontend::StmtKind::Assign || s.a >= ir.exprs.size()) continue;
                const auto& l = ir.expr(s.a);
                const frontend::Signal* t = l.kind == ExprKind::Ref ? m.signalOf(l.a) : nullptr;
                if (!t || assigned[t->name] != 1) continue;
                consider(s.a, s.b, s.start, s.end, textOf(mem.src.file));
            }
        }
    }
    return out;
}

std::size_t keepReductionsWhole(const std::vector<SourceReduction>& reductions, const frontend::Lowered& low,
                                net::Network& net, std::vector<Factored>& forms, const ReductionBudget& budget,
                                NamingRecord& record, std::string* log) {
    if (reductions.empty()) return 0;
    std::map<std::pair<std::string, int>, std::size_t> inputOf, outputOf;
    for (std::size_t k = 0; k < low.inputBits.size() && k < net.inputs().size(); ++k)
        inputOf.emplace(std::make_pair(low.inputBits[k].signal, low.inputBits[k].offset), k);
    for (std::size_t i = 0; i < low.outputBits.size() && i < net.outputs().size(); ++i)
        outputOf.emplace(std::make_pair(low.outputBits[i].signal, low.outputBits[i].offset), i);
    WrittenFigures current = writtenFigures(net, forms, {});
    const std::size_t depthLimit = std::max(budget.depthBound, current.depth);
    if (!record.weighed) {
        record.bitwiseGates = current.gates;
        record.bitwiseDepth = current.depth;
        record.depthBound = depthLimit;
        record.gateLimit = static_cast<double>(current.gates) + budget.gateMargin;
    }
    std::size_t made = 0;
    for (const auto& red : reductions) {
        auto target = outputOf.find({red.target, 0});
        if (target == outputOf.end()) continue;   // not restructured (kept as written)
        // The bits as the network has them: inputs, or the drivers of the outputs naming them.
        std::vector<Literal> lits;
        bool ok = true;
        for (int off = red.lo; off <= red.hi && ok; ++off) {
            if (auto in = inputOf.find({red.signal, off}); in != inputOf.end()) {
                lits.push_back(makeLiteral(net.inputs()[in->second], false));
            } else if (auto o = outputOf.find({red.signal, off}); o != outputOf.end()) {
                Literal d = net.outputs()[o->second].driver;
                ok = literalVar(d) != 0;   // a constant bit: the reduction folds, nothing to keep
                lits.push_back(d);
            } else {
                ok = false;
            }
        }
        if (!ok) continue;
        const Literal driver = net.outputs()[target->second].driver;
        const net::NodeId v = literalVar(driver);
        if (red.op == '^') {
            if (literalNegated(driver) == red.negated && xorTreeOf(net, forms, v, lits)) continue;
        } else {
            Cover whole;
            if (red.op == '|')
                for (Literal l : lits) whole.cubes.push_back(Cube({l}));
            else
                whole.cubes.push_back(Cube(lits));
            whole.normalize();
            if (net.isLogic(v) && literalNegated(driver) == red.negated && net.node(v).cover == whole) continue;
        }
        NamingDecision d;
        d.form = "whole reduction";
        d.signal = red.target;
        // The module with the reduction whole, on copies.
        net::Network trial = net;
        std::vector<Factored> trialForms = forms;
        const net::NodeId w = red.op == '^' ? addXorTree(trial, trialForms, lits, red.target)
                                            : addAndOr(trial, trialForms, lits, red.op == '|', red.target);
        trial.outputs()[target->second].driver = makeLiteral(w, red.negated);
        WrittenFigures with = writtenFigures(trial, trialForms, {});
        const double saved = static_cast<double>(with.gates) - static_cast<double>(current.gates);
        d.gates = with.gates;
        d.depth = with.depth;
        const std::string what = red.text.empty() ? "the reduction" : "`" + red.text + "`";
        if (with.depth > depthLimit) {
            d.reason = "written whole, " + what + " would reach depth " + std::to_string(with.depth) +
                       ", over the bound " + std::to_string(depthLimit) + ": its fragments stay";
        } else if (saved >= budget.gateMargin && saved > budget.share * static_cast<double>(with.gates) && saved > 0) {
            d.reason = "its fragments save " + std::to_string(static_cast<long long>(saved)) +
                       (saved == 1 ? " gate (" : " gates (") +
                       std::to_string(current.gates) + " against " + std::to_string(with.gates) +
                       " with " + what + " whole), at least the --min-gain margin and more than " +
                       std::to_string(static_cast<int>(budget.share * 100 + 0.5)) + "% of the module: they stay";
        } else {
            d.kept = true;
            const auto s = static_cast<long long>(std::max(saved, 0.0));
            const bool underMargin = saved < budget.gateMargin || saved <= 0;
            d.reason = "written whole as the source writes it: its fragments would save " + std::to_string(s) +
                       (s == 1 ? " gate" : " gates") +
                       (underMargin ? std::string(", less than the --min-gain margin")
                                    : ", not more than " + std::to_string(static_cast<int>(budget.share * 100 + 0.5)) +
                                          "% of the module's " + std::to_string(with.gates) + " gates") +
                       ", within the depth bound " + std::to_string(depthLimit);
        }
        if (log)
            *log += "reduction: " + red.target + " = " + (red.text.empty() ? "(reduction)" : red.text) + ": " +
                    std::to_string(with.gates) + " gates, depth " + std::to_string(with.depth) + " whole against " +
                    std::to_string(current.gates) + (d.kept ? ", written whole\n" : ", fragments kept\n");
        record.decisions.push_back(d);
        record.weighed = true;
        if (!d.kept) continue;
        net = std::move(trial);
        forms = std::move(trialForms);
        current = with;
        ++made;
    }
    return made;
}

} // namespace kerf::emit
