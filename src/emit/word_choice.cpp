// word_choice.cpp — see word_choice.h.
#include "word_choice.h"

#include <map>

namespace kerf::emit {
namespace {

using frontend::ExprKind;
using frontend::Ir;
using frontend::StmtKind;

constexpr std::size_t kArms = 3;       // a choice: three values or more
constexpr std::size_t kWordArms = 3;   // of which this many are bitwise operations (an ALU)

/// The symbol a target expression writes (a whole name, or a select of one).
frontend::SymbolId targetSymbol(const Ir& ir, frontend::ExprId t) {
    while (t != frontend::kNoId) {
        const auto& e = ir.expr(t);
        if (e.kind == ExprKind::Ref) return e.a;
        if (e.kind == ExprKind::Index || e.kind == ExprKind::Range || e.kind == ExprKind::Indexed) t = e.a;
        else return frontend::kNoId;
    }
    return frontend::kNoId;
}

/// A bitwise operation on vectors of at least two bits (through conversions): `a & b`,
/// `a | b`, `a ^ b`, `~a`. Such an arm is gates, which the engine merges with the other
/// bitwise arms over the same operands (F191: `a[7:1] & ({7{op_3_1_is_001}} & b[7:1] | ...)`);
/// an arithmetic or shift arm stays one word operation, one term of the rewrite
/// (`d_shl_sh & {16{mode_is_00}}`), and a name, a constant or a concatenation (a decoder
/// table's `{f7_alt, funct3}`) is no operation.
bool wordValue(const Ir& ir, frontend::ExprId v) {
    const frontend::Expr* e = &ir.expr(v);
    while (e->kind == ExprKind::Convert) e = &ir.expr(e->a);
    if (e->width < 2) return false;
    if (e->kind == ExprKind::Unary) return e->unaryOp() == frontend::UnaryOp::BitNot;
    if (e->kind != ExprKind::Binary) return false;
    using B = frontend::BinaryOp;
    const B op = e->binaryOp();
    return op == B::And || op == B::Or || op == B::Xor || op == B::Xnor;
}

/// Per symbol, the values an arm's statement assigns it (the last assignment of a block).
void armAssigns(const Ir& ir, frontend::StmtId s, std::map<frontend::SymbolId, frontend::ExprId>& out) {
    if (s == frontend::kNoId) return;
    const auto& st = ir.stmt(s);
    if (st.kind == StmtKind::Assign) {
        frontend::SymbolId t = targetSymbol(ir, st.a);
        if (t != frontend::kNoId) out[t] = st.b;
        return;
    }
    if (st.kind == StmtKind::Block)
        for (std::uint32_t k = 0; k < st.b; ++k) armAssigns(ir, ir.lists[st.a + k], out);
}

/// The arms of a choice statement: case items and default, or an if / else-if chain's branches.
std::vector<frontend::StmtId> arms(const Ir& ir, const frontend::Stmt& st) {
    std::vector<frontend::StmtId> out;
    if (st.kind == StmtKind::Case) {
        for (std::uint32_t k = 0; k < st.c; ++k) out.push_back(ir.caseItems[st.b + k].body);
        if (st.d != frontend::kNoId) out.push_back(st.d);
    } else if (st.kind == StmtKind::If) {
        const frontend::Stmt* at = &st;
        while (true) {
            out.push_back(at->b);
            if (at->c == frontend::kNoId) break;
            const auto& e = ir.stmt(at->c);
            if (e.kind != StmtKind::If) {
                out.push_back(at->c);
                break;
            }
            at = &e;
        }
    }
    return out;
}

/// The arms of a `?:` chain (`c0 ? v0 : c1 ? v1 : v2`, either branch nested).
void condArms(const Ir& ir, frontend::ExprId v, std::vector<frontend::ExprId>& out) {
    const auto& e = ir.expr(v);
    if (e.kind == ExprKind::Cond) {
        condArms(ir, e.b, out);
        condArms(ir, e.c, out);
    } else {
        out.push_back(v);
    }
}

bool choice(const Ir& ir, const std::vector<frontend::ExprId>& values, int width) {
    if (values.size() < kArms || width < 2) return false;
    std::size_t words = 0;
    for (frontend::ExprId v : values) words += wordValue(ir, v) ? 1 : 0;
    return words >= kWordArms;
}

std::string chosen(const Ir& ir, const std::vector<frontend::ExprId>& values, frontend::SymbolId t) {
    if (t == frontend::kNoId || !choice(ir, values, ir.symbols[t].width)) return "";
    return ir.symbols[t].name;
}

} // namespace

std::string wordChoiceTarget(const frontend::ModuleDesc& m, const frontend::Member& mem) {
    const Ir& ir = m.ir;
    if (mem.kind == frontend::MemberKind::Assign) {
        if (mem.rhs == frontend::kNoId) return "";
        std::vector<frontend::ExprId> values;
        condArms(ir, mem.rhs, values);
        if (mem.lhs != frontend::kNoId) return chosen(ir, values, targetSymbol(ir, mem.lhs));
        // `wire [7:0] x = c ? ... ;`: the declared net.
        if (mem.writes.size() != 1) return "";
        auto sig = m.signals.find(mem.writes[0]);
        if (sig == m.signals.end() || !choice(ir, values, sig->second.width)) return "";
        return mem.writes[0];
    }
    if (mem.kind != frontend::MemberKind::Comb || mem.body == frontend::kNoId) return "";
    std::string found;
    frontend::forEachStmt(ir, {mem.body}, frontend::LoopSteps::Skip, [&](const frontend::Stmt& st) {
        if (!found.empty()) return;
        std::vector<frontend::StmtId> as = arms(ir, st);
        if (as.size() < kArms) return;
        std::map<frontend::SymbolId, std::vector<frontend::ExprId>> byTarget;
        for (frontend::StmtId a : as) {
            std::map<frontend::SymbolId, frontend::ExprId> got;
            armAssigns(ir, a, got);
            for (const auto& [t, v] : got) byTarget[t].push_back(v);
        }
        for (const auto& [t, values] : byTarget) {
            std::string n = chosen(ir, values, t);
            if (!n.empty()) {
                found = n;
                return;
            }
        }
    });
    return found;
}

} // namespace kerf::emit
