// lower_stmt.cpp — statements and assignment targets of combinational blocks.
//
// Blocking assignments update the block's environment (IEEE 1800-2017
// 10.4.1); `if` merges the environments of its branches with a multiplexer
// per differing bit, an `else if` chain without recursing along the chain;
// a `case` whose items are distinct constants merges as a parallel sum of
// products (its item conditions are mutually exclusive), overlapping wildcard
// items as a priority chain (12.5); `for` loops with constant bounds are
// unrolled (12.7.1). A bit assigned on some paths but not all is a latch.
#include "lower_internal.h"

#include <algorithm>
#include <cstdlib>
#include <limits>
#include <optional>
#include <unordered_set>

namespace kerf::frontend::detail {

namespace {

// Deeper nesting of statements (not counting `else if` chains) keeps the block as written.
constexpr int kMaxNesting = 2000;
constexpr int kMaxLoopIterations = 65536;

} // namespace

// ---- what a member touches --------------------------------------------------------

namespace {

/// Root expressions of a statement tree (targets, values, conditions, case items, loop parts).
/// The parts of an assignment target that are read: the positions of its selects, not the
/// signal it writes.
void targetReadRoots(const Ir& ir, ExprId lv, std::vector<ExprId>& roots) {
    const Expr& e = ir.expr(lv);
    switch (e.kind) {
    case ExprKind::Ref: break;
    case ExprKind::Range: targetReadRoots(ir, e.a, roots); break;
    case ExprKind::Index: case ExprKind::Indexed:
        roots.push_back(e.b);
        targetReadRoots(ir, e.a, roots);
        break;
    case ExprKind::Concat:
        for (std::uint32_t k = 0; k < e.b; ++k) targetReadRoots(ir, ir.lists[e.a + k], roots);
        break;
    default: roots.push_back(lv); break;   // not a target the lowering writes: read it all
    }
}

/// Roots of the expressions a statement tree holds; with `readsOnly`, an assignment's target
/// gives only the parts of it that are read (targetReadRoots).
void stmtRoots(const Ir& ir, StmtId root, std::vector<ExprId>& roots, bool readsOnly = false) {
    auto target = [&](ExprId lv) {
        if (readsOnly) targetReadRoots(ir, lv, roots);
        else roots.push_back(lv);
    };
    forEachStmt(ir, {root}, LoopSteps::Visit, [&](const Stmt& s) {
        switch (s.kind) {
        case StmtKind::Assign: target(s.a); roots.push_back(s.b); break;
        case StmtKind::If: roots.push_back(s.a); break;
        case StmtKind::Case:
            roots.push_back(s.a);
            for (std::uint32_t k = 0; k < s.c; ++k) {
                const CaseItem& ci = ir.caseItems[s.b + k];
                for (std::uint32_t j = 0; j < ci.count; ++j) roots.push_back(ir.lists[ci.exprs + j]);
            }
            break;
        case StmtKind::CaseTable:
            roots.push_back(s.a);
            for (ExprId t : ir.caseTables[s.b].targets) target(t);
            break;
        case StmtKind::For:
            for (std::uint32_t k = 0; k < s.b; ++k) roots.push_back(ir.forInits[s.a + k].value);
            roots.push_back(s.c);
            break;
        case StmtKind::Block: case StmtKind::Empty: break;
        }
    });
}

/// Values a statement tree assigns (right-hand sides).
/// (A case table's values are columns, not expressions: see tableValueBits.)
void stmtValues(const Ir& ir, StmtId root, std::vector<ExprId>& values) {
    forEachStmt(ir, {root}, LoopSteps::Skip, [&](const Stmt& s) {
        if (s.kind == StmtKind::Assign) values.push_back(s.b);
    });
}

/// Every value character ('0' '1' 'x' 'z') of the case tables of a member and of the
/// functions it calls.
template <typename F>
void tableValueBits(const Ir& ir, const Member& mem, F each) {
    for (const CaseTable* t : memberCaseTables(ir, mem))
        for (std::size_t k = 0; k < t->columns.size(); ++k)
            for (std::size_t i = 0, n = static_cast<std::size_t>(t->columnWidths[k]) * t->items; i < n; ++i) {
                char c = ir.constBits[t->columns[k] + i];
                if (c != '-') each(c);
            }
}

void memberValues(const Ir& ir, const Member& mem, std::vector<ExprId>& values) {
    if (mem.kind == MemberKind::Assign) values.push_back(mem.rhs);
    else if (mem.kind == MemberKind::Comb) stmtValues(ir, mem.body, values);
}

/// Constants that can reach an assigned value unchanged: through ?: branches,
/// concatenations, replications, conversions, selects, and the values a called
/// function assigns. `each` is called on every such constant.
template <typename F>
void valueConstants(const Ir& ir, std::vector<ExprId> work, F each) {
    std::set<std::uint32_t> functions;
    std::set<ExprId> seen;
    while (!work.empty()) {
        ExprId id = work.back();
        work.pop_back();
        if (!seen.insert(id).second) continue;
        const Expr& e = ir.expr(id);
        switch (e.kind) {
        case ExprKind::Const: each(id, e); break;
        case ExprKind::Cond: work.push_back(e.b); work.push_back(e.c); break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) work.push_back(ir.lists[e.a + k]);
            break;
        case ExprKind::Replicate: case ExprKind::Convert: case ExprKind::Index: case ExprKind::Range:
        case ExprKind::Indexed:
            work.push_back(e.a);
            break;
        case ExprKind::Call:
            if (functions.insert(e.a).second) stmtValues(ir, ir.functions[e.a].body, work);
            break;
        default: break;
        }
    }
}

} // namespace

std::vector<const CaseTable*> memberCaseTables(const Ir& ir, const Member& mem) {
    std::vector<const CaseTable*> out;
    if (mem.kind != MemberKind::Comb) return out;
    std::vector<StmtId> roots{mem.body};
    std::set<std::uint32_t> functions;
    for (ExprId id : memberExprs(ir, mem))
        if (ir.expr(id).kind == ExprKind::Call && functions.insert(ir.expr(id).a).second)
            roots.push_back(ir.functions[ir.expr(id).a].body);
    forEachStmt(ir, std::move(roots), LoopSteps::Skip, [&](const Stmt& s) {
        if (s.kind == StmtKind::CaseTable) out.push_back(&ir.caseTables[s.b]);
    });
    return out;
}

namespace {

/// A set of expression ids in one flat table (open addressing): the walks below visit every
/// node of a member, and a node-per-entry hash set spent most of its time in the allocator.
class IdSet {
public:
    /// Whether `id` was new.
    bool insert(ExprId id) {
        if (2 * (size_ + 1) > slots_.size()) grow();
        std::size_t mask = slots_.size() - 1;
        for (std::size_t i = hash(id) & mask;; i = (i + 1) & mask) {
            if (slots_[i] == id) return false;
            if (slots_[i] == kEmpty) {
                slots_[i] = id;
                ++size_;
                return true;
            }
        }
    }

private:
    static constexpr ExprId kEmpty = ~ExprId{0};
    static std::size_t hash(ExprId id) { return static_cast<std::size_t>(id) * 0x9E3779B97F4A7C15ull >> 17; }
    void grow() {
        std::vector<ExprId> old = std::move(slots_);
        slots_.assign(std::max<std::size_t>(64, old.size() * 2), kEmpty);
        size_ = 0;
        for (ExprId id : old)
            if (id != kEmpty) insert(id);
    }
    std::vector<ExprId> slots_;
    std::size_t size_ = 0;
};

/// Visits every expression member `m` evaluates (its statements' roots, their children, and
/// the bodies of the functions it calls, each once), parents before children in source order.
/// `visit(id, e)` returns whether to go on into `e`'s children.
template <typename Visit>
void walkMemberExprs(const Ir& ir, const Member& m, bool readsOnly, Visit&& visit) {
    std::vector<ExprId> roots;
    if (m.kind == MemberKind::Assign) {
        if (readsOnly) targetReadRoots(ir, m.lhs, roots);
        else roots.push_back(m.lhs);
        roots.push_back(m.rhs);
    } else if (m.kind == MemberKind::Comb) {
        stmtRoots(ir, m.body, roots, readsOnly);
    }
    IdSet seen;
    std::set<std::uint32_t> functions;
    std::vector<ExprId> work(roots.rbegin(), roots.rend());
    while (!work.empty()) {
        ExprId id = work.back();
        work.pop_back();
        if (!seen.insert(id)) continue;
        const Expr& e = ir.expr(id);
        if (!visit(id, e)) continue;
        switch (e.kind) {
        case ExprKind::Const: case ExprKind::Ref: break;
        case ExprKind::Unary: case ExprKind::Convert: case ExprKind::Replicate: case ExprKind::Range:
            work.push_back(e.a);
            break;
        case ExprKind::Binary: case ExprKind::Index: case ExprKind::Indexed:
            work.push_back(e.b);
            work.push_back(e.a);
            break;
        case ExprKind::Cond:
            work.push_back(e.c);
            work.push_back(e.b);
            work.push_back(e.a);
            break;
        case ExprKind::Concat:
            for (std::uint32_t k = e.b; k-- > 0;) work.push_back(ir.lists[e.a + k]);
            break;
        case ExprKind::Call: {
            for (std::uint32_t k = e.c; k-- > 0;) work.push_back(ir.lists[e.b + k]);
            if (functions.insert(e.a).second) {
                std::vector<ExprId> fr;
                stmtRoots(ir, ir.functions[e.a].body, fr, readsOnly);
                work.insert(work.end(), fr.rbegin(), fr.rend());
            }
            break;
        }
        }
    }
}

} // namespace

std::vector<ExprId> memberExprs(const Ir& ir, const Member& m, bool readsOnly) {
    std::vector<ExprId> out;
    walkMemberExprs(ir, m, readsOnly, [&](ExprId id, const Expr&) {
        out.push_back(id);
        return true;
    });
    return out;
}

namespace {

/// The constant position `e` names (a Const of 0s and 1s, at most 62 bits), as the lowering
/// reads it.
std::optional<std::int64_t> constPosition(const Ir& ir, const Expr& e) {
    if (e.kind != ExprKind::Const || e.width == 0 || e.width > 62) return std::nullopt;
    std::int64_t v = 0;
    for (std::uint32_t i = e.width; i-- > 0;) {
        char c = ir.constBit(e, i);
        if (c != '0' && c != '1') return std::nullopt;
        v = v * 2 + (c == '1');
    }
    if (e.isSigned && ir.constBit(e, e.width - 1) == '1') v -= std::int64_t{1} << e.width;
    return v;
}

} // namespace

std::vector<ReadSpan> memberReadSpans(const Ir& ir, const Member& m) {
    std::vector<ReadSpan> out;
    walkMemberExprs(ir, m, true, [&](ExprId, const Expr& e) {
        if (e.kind == ExprKind::Ref) {
            out.push_back({e.a, -1, -1});
        } else if (e.kind == ExprKind::Range && ir.expr(e.a).kind == ExprKind::Ref) {
            // The bits the lowering's Range reads of a whole signal (lower_expr.cpp).
            int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
            if (lo > hi) std::swap(lo, hi);
            int ew = std::max(1, static_cast<int>(e.width) / std::max(hi - lo + 1, 1));
            out.push_back({ir.expr(e.a).a, std::max(lo * ew, 0), std::max((hi + 1) * ew - 1, -1)});
            return false;
        } else if (e.kind == ExprKind::Index && ir.expr(e.a).kind == ExprKind::Ref) {
            if (auto pos = constPosition(ir, ir.expr(e.b))) {
                // The element the lowering's Index reads of a whole signal; a position outside
                // the dimension reads x and nothing of the signal.
                std::int64_t off = e.msb >= e.lsb ? *pos - e.lsb : e.lsb - *pos;
                std::int64_t count = std::abs(static_cast<std::int64_t>(e.msb) - e.lsb) + 1;
                std::int64_t w = e.width;
                if (off >= 0 && off < count && (off + 1) * w - 1 <= std::numeric_limits<int>::max())
                    out.push_back({ir.expr(e.a).a, static_cast<int>(off * w), static_cast<int>((off + 1) * w - 1)});
                return false;
            }
        }
        return true;
    });
    return out;
}

namespace {

bool refersOnlyToLocals(const Ir& ir, ExprId root) {
    std::vector<ExprId> work{root};
    while (!work.empty()) {
        const Expr& e = ir.expr(work.back());
        work.pop_back();
        switch (e.kind) {
        case ExprKind::Const: break;
        case ExprKind::Ref:
            if (!ir.symbols[e.a].local) return false;
            break;
        case ExprKind::Unary: case ExprKind::Convert: case ExprKind::Replicate: case ExprKind::Range:
            work.push_back(e.a);
            break;
        case ExprKind::Binary: case ExprKind::Index: case ExprKind::Indexed:
            work.push_back(e.a);
            work.push_back(e.b);
            break;
        case ExprKind::Cond:
            work.push_back(e.a);
            work.push_back(e.b);
            work.push_back(e.c);
            break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) work.push_back(ir.lists[e.a + k]);
            break;
        case ExprKind::Call:
            return false;   // a function may read signals
        }
    }
    return true;
}

/// Targets the lowering cannot write: a part select whose base depends on a
/// signal, anything that is not a target.
std::string targetReason(const Ir& ir, ExprId lv) {
    std::vector<ExprId> work{lv};
    while (!work.empty()) {
        const Expr& e = ir.expr(work.back());
        work.pop_back();
        switch (e.kind) {
        case ExprKind::Ref: break;
        case ExprKind::Concat:
            for (std::uint32_t k = 0; k < e.b; ++k) work.push_back(ir.lists[e.a + k]);
            break;
        case ExprKind::Index: case ExprKind::Range: case ExprKind::Indexed: {
            // A chain of selects down to a signal (`m[i][j]`, `req[i].hdr.tag`).
            const Expr* base = &ir.expr(e.a);
            while (base->kind == ExprKind::Index || base->kind == ExprKind::Range || base->kind == ExprKind::Indexed)
                base = &ir.expr(base->a);
            if (base->kind != ExprKind::Ref) return "the left-hand side is not an assignable target";
            break;
        }
        default:
            return "the left-hand side is not an assignable target";
        }
    }
    return {};
}

} // namespace

void collectAssignedX(const Ir& ir, const Member& mem, std::set<ExprId>& out) {
    std::vector<ExprId> values;
    memberValues(ir, mem, values);
    valueConstants(ir, values, [&](ExprId id, const Expr&) { out.insert(id); });
}

std::string Lowerer::unsupportedReason(const Member& mem) const {
    // Values assigned, through the functions it calls: a z there drives z; an x there,
    // with --keep-x, keeps the statement.
    std::vector<ExprId> values;
    memberValues(ir_, mem, values);
    bool drivesZ = false, assignsX = false;
    valueConstants(ir_, values, [&](ExprId, const Expr& e) {
        for (std::uint32_t i = 0; i < e.width; ++i) {
            char c = ir_.constBit(e, i);
            drivesZ = drivesZ || c == 'z';
            assignsX = assignsX || c == 'x';
        }
    });
    tableValueBits(ir_, mem, [&](char c) {
        drivesZ = drivesZ || c == 'z';
        assignsX = assignsX || c == 'x';
    });
    if (drivesZ) return "it can drive z (a tri-state driver), which kerf always keeps as written";
    if (opts_.keepX && assignsX) return "it assigns x (a don't-care); --keep-x keeps it as written";
    for (ExprId id : memberExprs(ir_, mem)) {
        const Expr& e = ir_.expr(id);
        if (e.kind != ExprKind::Binary) continue;
        BinaryOp o = e.binaryOp();
        // Division, modulo and power by a constant (or a loop variable, constant once the
        // loop is unrolled) are lowered; by a signal they stay as written.
        if ((o == BinaryOp::Div || o == BinaryOp::Mod || o == BinaryOp::Pow) && !refersOnlyToLocals(ir_, e.b))
            return fmt::format("operator '{}' with a variable right operand is left as written", opText(o));
    }
    // Targets of every assignment, and the nesting depth (an `else if` chain counts once),
    // in the member and in the functions it calls.
    std::vector<std::pair<StmtId, int>> work;
    if (mem.kind == MemberKind::Assign) {
        if (auto r = targetReason(ir_, mem.lhs); !r.empty()) return r;
    } else {
        work.push_back({mem.body, 0});
    }
    std::set<std::uint32_t> called;
    for (ExprId id : memberExprs(ir_, mem))
        if (ir_.expr(id).kind == ExprKind::Call && called.insert(ir_.expr(id).a).second)
            work.push_back({ir_.functions[ir_.expr(id).a].body, 0});
    while (!work.empty()) {
        auto [id, depth] = work.back();
        work.pop_back();
        if (depth > kMaxNesting) return fmt::format("it nests statements more than {} deep", kMaxNesting);
        const Stmt& s = ir_.stmt(id);
        if (s.kind == StmtKind::Assign) {
            if (auto r = targetReason(ir_, s.a); !r.empty()) return r;
        } else if (s.kind == StmtKind::CaseTable) {
            for (ExprId t : ir_.caseTables[s.b].targets)
                if (auto r = targetReason(ir_, t); !r.empty()) return r;
        }
        forEachChild(ir_, s, LoopSteps::Visit, [&, depth = depth](StmtId c) {
            bool elseIf = s.kind == StmtKind::If && c == s.c && ir_.stmt(c).kind == StmtKind::If;
            work.push_back({c, elseIf ? depth : depth + 1});
        });
    }
    return {};
}

// ---- write sets -------------------------------------------------------------

void Lowerer::targetWriteSet(ExprId lv, std::vector<std::pair<SymbolId, int>>& out) const {
    const Expr& e = ir_.expr(lv);
    if (e.kind == ExprKind::Concat) {
        for (std::uint32_t k = 0; k < e.b; ++k) targetWriteSet(ir_.lists[e.a + k], out);
        return;
    }
    SymbolId s = kNoId;
    std::vector<int> offs = targetBits(lv, s);
    if (s == kNoId || isLocal(s)) return;
    for (int o : offs) out.emplace_back(s, o);
}

std::vector<int> Lowerer::targetBits(ExprId lv, SymbolId& s) const {
    const Expr& e = ir_.expr(lv);
    if (e.kind == ExprKind::Ref) {
        s = e.a;
        std::vector<int> all(static_cast<std::size_t>(ir_.symbols[s].width));
        for (std::size_t i = 0; i < all.size(); ++i) all[i] = static_cast<int>(i);
        return all;
    }
    if (e.kind != ExprKind::Index && e.kind != ExprKind::Range && e.kind != ExprKind::Indexed) return {};
    // A select of a whole signal picks its bits by position: the signal's list of every bit
    // is not built for it (as in targetPlaces).
    const Expr& pe = ir_.expr(e.a);
    const bool ofSignal = pe.kind == ExprKind::Ref;
    std::vector<int> parent;
    int pw = 0;
    if (ofSignal) {
        s = pe.a;
        pw = static_cast<int>(ir_.symbols[s].width);
    } else {
        parent = targetBits(e.a, s);
        pw = static_cast<int>(parent.size());
    }
    auto parentBit = [&](int i) { return ofSignal ? i : parent[static_cast<std::size_t>(i)]; };
    int w = static_cast<int>(e.width);
    std::vector<int> offs;
    if (e.kind == ExprKind::Index && ir_.expr(e.b).kind == ExprKind::Const) {
        const Expr& ix = ir_.expr(e.b);
        std::uint64_t k = 0;
        bool known = true;
        for (std::uint32_t i = ix.width; i-- > 0;) {
            char c = ir_.constBit(ix, i);
            if (c != '0' && c != '1') known = false;
            if (i < 63) k |= std::uint64_t(c == '1') << i;
        }
        if (known && k < (std::uint64_t{1} << 31)) {
            int off = dimOffset(static_cast<int>(k), e.msb, e.lsb);
            for (int i = 0; i < w; ++i)
                if (off >= 0 && off * w + i < pw) offs.push_back(parentBit(off * w + i));
        }
    } else if (e.kind == ExprKind::Range) {
        int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
        if (lo > hi) std::swap(lo, hi);
        int ew = std::max(1, w / (hi - lo + 1));
        for (int i = lo * ew; i < (hi + 1) * ew; ++i)
            if (i >= 0 && i < pw) offs.push_back(parentBit(i));
    } else {
        // variable select: may write any bit of its parent
        for (int i = 0; i < pw; ++i) offs.push_back(parentBit(i));
    }
    return offs;
}

void Lowerer::stmtWriteSet(StmtId root, std::vector<std::pair<SymbolId, int>>& out) const {
    forEachStmt(ir_, {root}, LoopSteps::Skip, [&](const Stmt& s) {
        if (s.kind == StmtKind::Assign) targetWriteSet(s.a, out);
        else if (s.kind == StmtKind::CaseTable)
            for (ExprId t : ir_.caseTables[s.b].targets) targetWriteSet(t, out);
    });
}

// ---- assignments -------------------------------------------------------------

void Lowerer::assignTarget(ExprId lvId, const Bits& rhs0, bool inBlock) {
    const Expr& lv = ir_.expr(lvId);
    int w = static_cast<int>(lv.width);
    Bits rhs = extend(rhs0, w, false);
    auto set = [&](SymbolId s, int off, Bit b) {
        if (inBlock) {
            auto it = env_->vars.find(s);
            if (it == env_->vars.end() || off < 0 || off >= static_cast<int>(it->second.size())) return;
            it->second[off] = b;
        } else {
            recordBit(s, off, b);
        }
    };
    auto get = [&](SymbolId s, int off) -> Bit {
        if (!inBlock) return known(kUnassigned);
        auto it = env_->vars.find(s);
        if (it == env_->vars.end() || off < 0 || off >= static_cast<int>(it->second.size())) return known(kUnassigned);
        return it->second[off];
    };
    if (lv.kind == ExprKind::Concat) {
        // Parts are MSB first: the last part takes the low bits.
        int pos = 0;
        for (std::uint32_t k = lv.b; k-- > 0;) {
            ExprId part = ir_.lists[lv.a + k];
            int pw = static_cast<int>(ir_.expr(part).width);
            Bits slice(rhs.begin() + std::min(pos, w), rhs.begin() + std::min(pos + pw, w));
            assignTarget(part, slice, inBlock);
            pos += pw;
        }
        return;
    }
    if (lv.kind == ExprKind::Ref) {
        for (int i = 0; i < w; ++i) set(lv.a, i, rhs[i]);
        return;
    }
    // A chain of selects (`m[i][j]`, `req[i].hdr.tag`, `y[s*2 +: 2]`): every place the target
    // can name, each under the condition that it is the one named, written in turn (the
    // conditions are exclusive: distinct index values).
    SymbolId s = kNoId;
    std::vector<Placement> places = targetPlaces(lvId, s);
    for (const auto& [sel, offs] : places) {
        for (int i = 0; i < w && i < static_cast<int>(offs.size()); ++i) {
            int bit = offs[static_cast<std::size_t>(i)];
            if (bit < 0) continue;   // out of range: not written (11.5.1)
            if (sel == kTrue) {
                set(s, bit, rhs[static_cast<std::size_t>(i)]);
                continue;
            }
            Bit old = get(s, bit);
            if (isSentinel(old)) set(s, bit, known(kPartial));
            else set(s, bit, bMux(sel, rhs[static_cast<std::size_t>(i)], old));
        }
    }
}

std::vector<Lowerer::Placement> Lowerer::targetPlaces(ExprId lvId, SymbolId& sym) {
    const Expr& lv = ir_.expr(lvId);
    if (lv.kind == ExprKind::Ref) {
        sym = lv.a;
        std::vector<int> all(static_cast<std::size_t>(ir_.symbols[lv.a].width));
        for (std::size_t i = 0; i < all.size(); ++i) all[i] = static_cast<int>(i);
        return {{kTrue, std::move(all)}};
    }
    if (lv.kind != ExprKind::Index && lv.kind != ExprKind::Range && lv.kind != ExprKind::Indexed)
        fail("the left-hand side is not an assignable target", here(lv.start), ExitCode::Internal);
    // A select of a whole signal (`y[i]`, the common case) places bits of the signal itself:
    // its placement is not built (it lists every bit of the signal, so `assign y[i] = ...`
    // over an n-bit y cost n per statement).
    const bool ofSignal = ir_.expr(lv.a).kind == ExprKind::Ref;
    std::vector<Placement> outer;
    if (ofSignal) sym = ir_.expr(lv.a).a;
    else outer = targetPlaces(lv.a, sym);
    const int w = static_cast<int>(lv.width);
    const int pw = static_cast<int>(ir_.expr(lv.a).width);
    const int lo = std::min(lv.msb, lv.lsb), hi = std::max(lv.msb, lv.lsb);
    const int n = hi - lo + 1;
    // Sub-places within the parent's bits: (condition, parent bit per target bit, -1 none).
    std::vector<Placement> inner;
    auto at = [&](std::int64_t bit) { return bit >= 0 && bit < pw ? static_cast<int>(bit) : -1; };
    if (lv.kind == ExprKind::Range) {
        int a = dimOffset(lv.right(), lv.msb, lv.lsb), b = dimOffset(lv.left(), lv.msb, lv.lsb);
        if (a > b) std::swap(a, b);
        int ew = std::max(1, w / (b - a + 1));
        std::vector<int> offs;
        for (int i = a * ew; i < (b + 1) * ew; ++i) offs.push_back(at(i));
        inner.push_back({kTrue, std::move(offs)});
    } else {
        Bits idx = eval(lv.b);
        bool idxSigned = ir_.expr(lv.b).isSigned;
        Lits iv = values(idx);
        Literal idxKnown = negateLiteral(anyX(idx));
        // A constant index names one position: only it is tried (trying every position made
        // `assign y[i] = ...` over an n-bit y cost n each, n squared in all: F150). The position
        // is still checked by indexIs, so a wrong guess here can only drop it, never misplace it.
        std::optional<std::int64_t> only = constantPosition(idx, idxSigned);
        auto candidate = [&](std::int64_t p) { return !only || p == *only; };
        // With a constant index the loops below visit that one position: stepping over the
        // others cost n per statement still (F150's remaining case).
        auto firstFrom = [&](std::int64_t from) { return only ? std::max(from, *only) : from; };
        auto lastTo = [&](std::int64_t to) { return only ? std::min(to, *only) : to; };
        if (lv.kind == ExprKind::Index) {
            // 11.5.1: a write to a position out of range, or through an unknown index, does nothing.
            for (std::int64_t index = firstFrom(lo); index <= lastTo(hi); ++index) {
                if (!candidate(index)) continue;
                Literal c = b_.and2(indexIs(iv, idxSigned, index), idxKnown);
                if (c == kFalse) continue;   // a position the index cannot name is never written
                int off = dimOffset(static_cast<int>(index), lv.msb, lv.lsb);
                std::vector<int> offs;
                for (int i = 0; i < w; ++i) offs.push_back(at(static_cast<std::int64_t>(off) * w + i));
                inner.push_back({c, std::move(offs)});
            }
        } else {
            // Indexed part select: the elements each base would write (those in range).
            int ew = std::max(1, pw / n);
            int count = std::max(1, w / ew);
            for (std::int64_t start = firstFrom(static_cast<std::int64_t>(lo) - count + 1);
                 start <= lastTo(static_cast<std::int64_t>(hi) + count - 1); ++start) {
                if (!candidate(start)) continue;
                Literal c = b_.and2(indexIs(iv, idxSigned, start), idxKnown);
                if (c == kFalse) continue;
                std::int64_t first = lv.up ? start : start - count + 1;   // lowest index written
                std::vector<int> offs(static_cast<std::size_t>(w), -1);
                for (int el = 0; el < count; ++el) {
                    std::int64_t index = first + el;
                    if (index < lo || index > hi) continue;
                    int off = dimOffset(static_cast<int>(index), lv.msb, lv.lsb);
                    int slot = lv.msb >= lv.lsb ? el : count - 1 - el;
                    for (int i = 0; i < ew; ++i) {
                        std::size_t t = static_cast<std::size_t>(slot * ew + i);
                        if (t < offs.size()) offs[t] = at(static_cast<std::int64_t>(off) * ew + i);
                    }
                }
                inner.push_back({c, std::move(offs)});
            }
        }
    }
    if (ofSignal) {
        const int sw = static_cast<int>(ir_.symbols[sym].width);
        for (auto& place : inner)
            for (int& p : place.second)
                if (p >= sw) p = -1;
        return inner;
    }
    std::vector<Placement> out;
    for (const auto& [oc, ooffs] : outer)
        for (const auto& [ic, ioffs] : inner) {
            Literal c = b_.and2(oc, ic);
            if (c == kFalse) continue;
            std::vector<int> offs;
            offs.reserve(ioffs.size());
            for (int p : ioffs) offs.push_back(p >= 0 && p < static_cast<int>(ooffs.size()) ? ooffs[static_cast<std::size_t>(p)] : -1);
            out.push_back({c, std::move(offs)});
        }
    return out;
}

// ---- statements ------------------------------------------------------------

void Lowerer::mergeInto(Env& target, const Env& other, Literal cond) {
    for (auto& [s, bits] : target.vars) {
        const Bits& ob = other.vars.at(s);
        for (std::size_t i = 0; i < bits.size(); ++i) {
            Bit a = bits[i], b = ob[i];
            if (a == b) continue;
            if (isSentinel(a) || isSentinel(b)) bits[i] = known(kPartial);
            else bits[i] = bMux(cond, a, b);
        }
    }
}

void Lowerer::unassignedToUnknown(Env& env) {
    bool any = false;
    for (auto& [s, bits] : env.vars)
        for (Bit& b : bits)
            if (b.v == kUnassigned || b.v == kPartial) {
                b = kAssignedX;
                any = true;
                assignedXMade_ = true;
            }
    if (any && opts_.keepX)
        keep("it leaves signals unassigned where no branch applies (an incomplete unique or priority case or if, "
             "or full_case), which kerf reads as don't-cares; --keep-x keeps it as written");
}

void Lowerer::exec(StmtId id) {
    const Stmt& s = ir_.stmt(id);
    if (s.start != kNoId) b_.loc = here(s.start);
    struct Depth {
        int& d;
        explicit Depth(int& x) : d(++x) {}
        ~Depth() { --d; }
    } guard(stmtDepth_);
    switch (s.kind) {
    case StmtKind::Empty:
        return;
    case StmtKind::Block:
        for (std::uint32_t k = 0; k < s.b; ++k) exec(ir_.lists[s.a + k]);
        return;
    case StmtKind::Assign: {
        const Expr& lhs = ir_.expr(s.a);
        const Expr& rhsE = ir_.expr(s.b);
        Bits rhs = extend(eval(s.b), static_cast<int>(lhs.width), rhsE.isSigned);
        assignTarget(s.a, rhs, true);
        return;
    }
    case StmtKind::If: {
        // `if (c1) s1 else if (c2) s2 ... else sn`: every condition is evaluated in the
        // environment before the chain; the branches merge from the last one back. A
        // condition that is x or z is false (12.4).
        std::vector<std::pair<Literal, StmtId>> arms;
        StmtId last = kNoId;
        StmtId cur = id;
        bool ended = false;   // an arm is always taken (a constant true condition or an else)
        for (;;) {
            const Stmt& c = ir_.stmt(cur);
            if (c.start != kNoId) b_.loc = here(c.start);
            Bit t = truth(eval(c.a));
            xDecides(t.x, t.s, "an if condition", "12.4");
            Literal cond = t.v;
            if (cond == kTrue) { last = c.b; ended = true; break; }
            if (cond != kFalse) arms.emplace_back(cond, c.b);
            if (c.c == kNoId) break;
            if (ir_.stmt(c.c).kind != StmtKind::If) { last = c.c; ended = true; break; }
            cur = c.c;
        }
        Env before = *env_;
        if (last != kNoId) exec(last);
        else if (!ended && (s.check == CheckKind::Unique || s.check == CheckKind::Priority))
            unassignedToUnknown(*env_);   // 12.4.2: no condition true is a violation
        for (std::size_t k = arms.size(); k-- > 0;) {
            Env elseEnv = std::move(*env_);
            *env_ = before;
            exec(arms[k].second);
            mergeInto(*env_, elseEnv, arms[k].first);
        }
        return;
    }
    case StmtKind::Case:
    case StmtKind::CaseTable:
        execCase(id);
        return;
    case StmtKind::For: {
        for (std::uint32_t k = 0; k < s.b; ++k) {
            const ForInit& init = ir_.forInits[s.a + k];
            Bits v = eval(init.value);
            Bits& slot = env_->vars[init.var];
            slot = extend(v, static_cast<int>(slot.size()), false);
        }
        // The variables that hold constants. The condition must be constant to go on, so it reads
        // only these; when an iteration leaves every one of them as it found it, each later
        // iteration repeats it and the loop never ends (F65: refused at once, not after the limit).
        auto constantState = [&] {
            std::vector<std::pair<SymbolId, const Bits*>> st;
            for (const auto& [sym, bits] : env_->vars)
                if (std::all_of(bits.begin(), bits.end(), [](const Bit& b) {
                        return b.x == kFalse && (b.v == kFalse || b.v == kTrue);
                    }))
                    st.push_back({sym, &bits});
            return st;
        };
        std::vector<std::pair<SymbolId, Bits>> before;
        for (int iter = 0;; ++iter) {
            if (iter > kMaxLoopIterations)
                fail(fmt::format("a for loop runs more than {} iterations", kMaxLoopIterations), here(s.start));
            Bit c = truth(eval(s.c));
            if (c.x == kFalse && c.v == kFalse) break;
            if (c.x != kFalse || c.v != kTrue)
                fail("a for loop's condition is not constant; only loops with constant bounds are unrolled", here(s.start));
            before.clear();
            for (const auto& [sym, bits] : constantState()) before.push_back({sym, *bits});
            exec(s.f);
            for (std::uint32_t k = 0; k < s.e; ++k) exec(ir_.lists[s.d + k]);
            auto after = constantState();
            bool same = after.size() == before.size();
            for (std::size_t k = 0; same && k < after.size(); ++k)
                same = after[k].first == before[k].first && *after[k].second == before[k].second;
            if (same)
                fail("a for loop's iteration leaves its constant variables as they were, so it never ends",
                     here(s.start));
        }
        return;
    }
    }
}

Literal Lowerer::caseLabelCond(const std::string& labelBits, bool labelSigned, bool selSigned, const Bits& selW,
                               CaseKind kind, bool selMaybeUnknown, std::string& pattern) {
    // The label's bits, MSB first, extended to the case width.
    const std::size_t width = selW.size();
    std::string bits = labelBits;
    char fillc = labelSigned && selSigned && !bits.empty() ? bits[0] : '0';
    if (bits.size() < width) bits.insert(bits.begin(), width - bits.size(), fillc);
    pattern.clear();
    Lits terms;
    bool never = false;
    for (std::size_t i = 0; i < width; ++i) {
        char ch = bits[bits.size() - 1 - i];
        bool unknownItem = ch == 'x' || ch == 'z';
        bool wild = ch == 'z' ? kind != CaseKind::Normal
                  : ch == 'x' ? (kind == CaseKind::X || kind == CaseKind::Inside)
                              : false;
        if (wild) { pattern.push_back('-'); continue; }
        if (unknownItem) {
            // Matches only the same x or z in the selector (12.5).
            if (selMaybeUnknown) keep("a case item with x or z bits compared with a selector that can be x or z");
            never = true;
            continue;
        }
        pattern.push_back(ch);
        const Bit& b = selW[i];
        Literal eq = ch == '1' ? b.v : negateLiteral(b.v);
        // casex: an unknown selector bit matches anything; elsewhere it matches nothing.
        terms.push_back(kind == CaseKind::X ? b_.or2(b.x, eq) : b_.and2(negateLiteral(b.x), eq));
    }
    std::reverse(pattern.begin(), pattern.end());
    if (never) {
        pattern.clear();
        return kFalse;
    }
    return b_.andN(terms);
}

void Lowerer::execCase(StmtId id) {
    const Stmt& s = ir_.stmt(id);
    const CaseTable* table = s.kind == StmtKind::CaseTable ? &ir_.caseTables[s.b] : nullptr;
    const Expr& sel = ir_.expr(s.a);
    Bits selBits = eval(s.a);
    struct Arm {
        Literal cond;          // the label matches (x/z compared as 12.5 says)
        std::uint32_t item;    // the item (case item or table row) it belongs to
        std::string pattern;   // constant pattern, MSB first ('-' = wildcard); empty when not constant
    };
    std::vector<Arm> arms;
    std::size_t width = selBits.size();
    if (table) {
        width = std::max<std::size_t>(width, table->width);
    } else {
        for (std::uint32_t k = 0; k < s.c; ++k) {
            const CaseItem& ci = ir_.caseItems[s.b + k];
            for (std::uint32_t j = 0; j < ci.count; ++j) width = std::max<std::size_t>(width, ir_.expr(ir_.lists[ci.exprs + j]).width);
        }
    }
    bool selSigned = sel.isSigned;
    Bits selW = extend(selBits, static_cast<int>(width), selSigned);
    Literal selX = anyX(selW);
    bool selMaybeUnknown = selX != kFalse;
    const CaseKind kind = s.caseKind;
    if (selMaybeUnknown && kind == CaseKind::Z)
        keep("a casez selector that can be x or z (x is not told apart from z here)");
    if (selMaybeUnknown) xDecides(selX, anyS(selW), "a case selector", "12.5");
    bool allConst = true;
    if (table) {
        std::string bits(table->width, '0');
        arms.reserve(table->labelCount);
        for (std::uint32_t k = 0; k < table->items; ++k)
            for (std::uint32_t j = table->labelBegin(k); j < table->labelEnd(k); ++j) {
                const char* lsbFirst = ir_.constBits.data() + table->labels + static_cast<std::size_t>(j) * table->width;
                for (std::uint32_t i = 0; i < table->width; ++i) bits[table->width - 1 - i] = lsbFirst[i];
                Arm arm{kFalse, k, {}};
                arm.cond = caseLabelCond(bits, table->labelsSigned, selSigned, selW, kind, selMaybeUnknown, arm.pattern);
                if (arm.pattern.empty()) allConst = false;
                arms.push_back(std::move(arm));
            }
    } else {
        for (std::uint32_t k = 0; k < s.c; ++k) {
            const CaseItem& ci = ir_.caseItems[s.b + k];
            for (std::uint32_t j = 0; j < ci.count; ++j) {
                ExprId xid = ir_.lists[ci.exprs + j];
                const Expr& x = ir_.expr(xid);
                std::string pattern;
                Literal c;
                if (ci.conditions != kNoId && ir_.itemIsCondition[ci.conditions + j]) {
                    allConst = false;
                    Bit t = truth(eval(xid));   // a range of a case inside: matches when true (x: no match)
                    xDecides(t.x, t.s, "a case inside range", "12.5.4");
                    c = t.v;
                } else if (x.kind == ExprKind::Const) {
                    std::string bits;
                    for (std::uint32_t i = x.width; i-- > 0;) bits.push_back(ir_.constBit(x, i));
                    c = caseLabelCond(bits, x.isSigned, selSigned, selW, kind, selMaybeUnknown, pattern);
                    if (pattern.empty()) allConst = false;
                } else {
                    allConst = false;
                    Bits item = extend(eval(xid), static_cast<int>(width), x.isSigned && selSigned);
                    Literal itemX = anyX(item);
                    xDecides(itemX, anyS(item), "a case item", "12.5");
                    if (kind == CaseKind::Inside) {
                        c = equality(selW, item, true).v;   // `==?` true (12.5.4)
                    } else {
                        if (itemX != kFalse && (selMaybeUnknown || kind != CaseKind::Normal))
                            keep("a case item that can be x or z compared with x/z semantics kerf does not model");
                        if (kind == CaseKind::X) {
                            Lits terms;
                            for (std::size_t i = 0; i < width; ++i)
                                terms.push_back(b_.or2(selW[i].x, negateLiteral(b_.xor2(selW[i].v, item[i].v))));
                            c = b_.andN(terms);
                        } else {
                            c = b_.andN({negateLiteral(selX), negateLiteral(itemX), equal(values(selW), values(item))});
                        }
                    }
                }
                arms.push_back(Arm{c, k, pattern});
            }
        }
    }
    // Mutually exclusive items (no two patterns can match the same value) merge in
    // parallel; a selector with unknown bits can match several casex items.
    bool exclusive = allConst && !selMaybeUnknown;
    if (exclusive) {
        bool wild = false;
        for (const auto& it : arms) wild = wild || it.pattern.find('-') != std::string::npos;
        if (!wild) {
            std::unordered_set<std::string> seen;
            seen.reserve(arms.size());
            for (const auto& it : arms)
                if (!seen.insert(it.pattern).second) exclusive = false;
        } else if (arms.size() <= 4000) {
            for (std::size_t i = 0; i < arms.size() && exclusive; ++i)
                for (std::size_t j = i + 1; j < arms.size() && exclusive; ++j) {
                    const auto& p = arms[i].pattern;
                    const auto& q = arms[j].pattern;
                    bool overlap = true;
                    for (std::size_t b = 0; b < p.size(); ++b)
                        if (p[b] != '-' && q[b] != '-' && p[b] != q[b]) { overlap = false; break; }
                    if (overlap) exclusive = false;
                }
        } else {
            exclusive = false;
        }
    }
    // Items covering every known value make the default unreachable.
    bool full = false;
    if (allConst && !selMaybeUnknown && width <= 16) {
        std::vector<std::uint8_t> hit(std::size_t{1} << width, 0);
        for (const auto& it : arms) {
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
    bool hasDefault = s.d != kNoId;

    Env before = *env_;
    std::vector<Env> results;
    if (!table)
        for (const auto& it : arms) {
            *env_ = before;
            if (it.cond != kFalse) exec(ir_.caseItems[s.b + it.item].body);
            results.push_back(*env_);
        }
    *env_ = before;
    if (hasDefault && !full) exec(s.d);
    // 12.5.3: no item matching a unique or priority case is a violation; the synthesis
    // reading (and `(* full_case *)`) makes what it would leave unassigned a don't-care.
    if (!hasDefault && !full &&
        (s.check == CheckKind::Unique || s.check == CheckKind::Priority || (s.attrs & kFullCase)))
        unassignedToUnknown(*env_);
    Env dflt = std::move(*env_);

    // A table row's value of a bit: the constant the column of the target that row assigns
    // there holds, or the value before the case where the row assigns none. Per symbol and
    // bit, the (target, position) pairs that can write it.
    using Slots = std::vector<std::pair<std::uint32_t, std::uint32_t>>;
    std::map<SymbolId, std::vector<Slots>> placed;
    if (table) {
        if (s.start != kNoId) b_.loc = here(s.start);
        for (std::size_t k = 0; k < table->targets.size(); ++k) {
            SymbolId sym = kNoId;
            std::vector<Placement> places = targetPlaces(table->targets[k], sym);
            auto var = before.vars.find(sym);
            if (places.empty() || var == before.vars.end()) continue;   // writes nothing here
            if (places.size() != 1 || places[0].first != kTrue)
                fail("a case table target is not a fixed part of a signal", here(s.start), ExitCode::Internal);
            auto& slots = placed[sym];
            slots.resize(var->second.size());
            const auto& offs = places[0].second;
            for (std::size_t p = 0; p < offs.size(); ++p)
                if (offs[p] >= 0 && static_cast<std::size_t>(offs[p]) < slots.size())
                    slots[static_cast<std::size_t>(offs[p])].push_back(
                        {static_cast<std::uint32_t>(k), static_cast<std::uint32_t>(p)});
        }
        // Targets sharing a bit: no row may assign two of them (the reader's promise).
        for (const auto& [sym, slots] : placed)
            for (const Slots& sl : slots) {
                if (sl.size() < 2) continue;
                for (std::uint32_t item = 0; item < table->items; ++item) {
                    int assigned = 0;
                    for (const auto& [k, p] : sl)
                        assigned += ir_.constBits[table->columns[k] + static_cast<std::size_t>(item) * table->columnWidths[k] + p] != '-';
                    if (assigned > 1)
                        fail("a case table item assigns two targets that share a bit", here(s.start), ExitCode::Internal);
                }
            }
    }

    Lits conds;
    conds.reserve(arms.size());
    for (const auto& it : arms) conds.push_back(it.cond);
    Literal defaultCond = full ? kFalse : negateLiteral(b_.orN(conds));
    Env merged = dflt;
    for (auto& entry : merged.vars) {
        const SymbolId name = entry.first;   // not a structured binding: lambdas below read it
        Bits& bits = entry.second;
        const Bits& dbits = dflt.vars[name];
        const Bits& bbits = before.vars.at(name);
        auto pl = placed.find(name);
        const std::vector<Slots>* slots = pl == placed.end() ? nullptr : &pl->second;
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            const Slots* sl = slots ? &(*slots)[bit] : nullptr;
            // The value arm `i` leaves in this bit.
            auto value = [&](std::size_t i) -> Bit {
                if (!table) return results[i].vars[name][bit];
                if (sl)
                    for (const auto& [k, p] : *sl) {
                        char c = ir_.constBits[table->columns[k] +
                                               static_cast<std::size_t>(arms[i].item) * table->columnWidths[k] + p];
                        if (c == '-') continue;
                        // A value the source assigns: an x in it is the author's don't-care.
                        if (c != '1' && c != '0') assignedXMade_ = true;
                        return c == '1' ? known(kTrue) : c == '0' ? known(kFalse) : kAssignedX;
                    }
                return bbits[bit];
            };
            bool same = true, sentinel = isSentinel(dbits[bit]) && !full;
            for (std::size_t i = 0; i < arms.size(); ++i) {
                if (arms[i].cond == kFalse) continue;
                Bit v = value(i);
                if (!(v == dbits[bit])) same = false;
                if (isSentinel(v)) sentinel = true;
            }
            if (same && !full) continue;
            if (sentinel) {
                // Equal sentinels everywhere keep their meaning; anything else is a partial assignment.
                Bit first = known(kPartial);
                bool allEq = true;
                bool init = false;
                for (std::size_t i = 0; i < arms.size(); ++i) {
                    if (arms[i].cond == kFalse) continue;
                    Bit v = value(i);
                    if (!init) { first = v; init = true; } else if (!(v == first)) allEq = false;
                }
                if (!full) {
                    if (!init) first = dbits[bit];
                    else if (!(dbits[bit] == first)) allEq = false;
                }
                bits[bit] = allEq ? first : known(kPartial);
                continue;
            }
            if (exclusive) {
                // Group items by value: value v contributes (OR of its conditions) & v.
                std::map<Bit, Lits> byValue;
                for (std::size_t i = 0; i < arms.size(); ++i)
                    if (arms[i].cond != kFalse) byValue[value(i)].push_back(arms[i].cond);
                if (!full) byValue[dbits[bit]].push_back(defaultCond);
                Lits vterms, xterms, sterms;
                for (auto& [v, cs] : byValue) {
                    Literal c = b_.orN(cs);
                    if (v.v != kFalse) vterms.push_back(b_.and2(c, v.v));
                    if (v.x != kFalse) xterms.push_back(b_.and2(c, v.x));
                    if (v.s != kFalse) sterms.push_back(b_.and2(c, v.s));
                }
                bits[bit] = {b_.orN(vterms), b_.orN(xterms), b_.orN(sterms)};
            } else {
                Bit acc = dbits[bit];
                bool start = full;
                for (std::size_t i = arms.size(); i-- > 0;) {
                    if (arms[i].cond == kFalse) continue;
                    Bit v = value(i);
                    if (start) { acc = v; start = false; continue; }
                    acc = bMux(arms[i].cond, v, acc);
                }
                bits[bit] = acc;
            }
        }
    }
    *env_ = std::move(merged);
}

} // namespace kerf::frontend::detail
