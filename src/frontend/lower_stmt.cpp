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
#include <unordered_set>

namespace kerf::frontend::detail {

namespace {

// Deeper nesting of statements (not counting `else if` chains) keeps the block as written.
constexpr int kMaxNesting = 2000;
constexpr int kMaxLoopIterations = 65536;

} // namespace

// ---- what a member touches --------------------------------------------------------

std::vector<ExprId> memberExprs(const Ir& ir, const Member& m) {
    std::vector<ExprId> roots;
    if (m.kind == MemberKind::Assign) {
        roots = {m.lhs, m.rhs};
    } else if (m.kind == MemberKind::Comb) {
        std::vector<StmtId> work{m.body};
        while (!work.empty()) {
            const Stmt& s = ir.stmt(work.back());
            work.pop_back();
            switch (s.kind) {
            case StmtKind::Block:
                for (std::uint32_t k = 0; k < s.b; ++k) work.push_back(ir.lists[s.a + k]);
                break;
            case StmtKind::Assign: roots.push_back(s.a); roots.push_back(s.b); break;
            case StmtKind::If:
                roots.push_back(s.a);
                work.push_back(s.b);
                if (s.c != kNoId) work.push_back(s.c);
                break;
            case StmtKind::Case:
                roots.push_back(s.a);
                for (std::uint32_t k = 0; k < s.c; ++k) {
                    const CaseItem& ci = ir.caseItems[s.b + k];
                    for (std::uint32_t j = 0; j < ci.count; ++j) roots.push_back(ir.lists[ci.exprs + j]);
                    work.push_back(ci.body);
                }
                if (s.d != kNoId) work.push_back(s.d);
                break;
            case StmtKind::For:
                for (std::uint32_t k = 0; k < s.b; ++k) roots.push_back(ir.forInits[s.a + k].value);
                roots.push_back(s.c);
                for (std::uint32_t k = 0; k < s.e; ++k) work.push_back(ir.lists[s.d + k]);
                work.push_back(s.f);
                break;
            case StmtKind::Empty: break;
            }
        }
    }
    std::vector<ExprId> out;
    std::unordered_set<ExprId> seen;
    std::vector<ExprId> work(roots.rbegin(), roots.rend());
    while (!work.empty()) {
        ExprId id = work.back();
        work.pop_back();
        if (!seen.insert(id).second) continue;
        out.push_back(id);
        const Expr& e = ir.expr(id);
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
        }
    }
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
        }
    }
    return true;
}

/// Targets the lowering cannot write: a part select whose base depends on a
/// signal, selects nested under a select, anything that is not a target.
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
        case ExprKind::Index: case ExprKind::Range: case ExprKind::Indexed:
            if (ir.expr(e.a).kind != ExprKind::Ref) return "a nested select on the left-hand side is left as written";
            if (e.kind == ExprKind::Indexed && !refersOnlyToLocals(ir, e.b))
                return "a part select with a variable base on the left-hand side is left as written";
            break;
        default:
            return "the left-hand side is not an assignable target";
        }
    }
    return {};
}

} // namespace

std::string Lowerer::unsupportedReason(const Member& mem) const {
    for (ExprId id : memberExprs(ir_, mem)) {
        const Expr& e = ir_.expr(id);
        if (e.kind != ExprKind::Binary) continue;
        BinaryOp o = e.binaryOp();
        if (o == BinaryOp::Div || o == BinaryOp::Mod || o == BinaryOp::Pow)
            return fmt::format("operator '{}' is left as written", opText(o));
    }
    if (mem.kind == MemberKind::Assign) return targetReason(ir_, mem.lhs);
    // Targets of every assignment, and the nesting depth (an `else if` chain counts once).
    std::vector<std::pair<StmtId, int>> work{{mem.body, 0}};
    while (!work.empty()) {
        auto [id, depth] = work.back();
        work.pop_back();
        if (depth > kMaxNesting) return fmt::format("it nests statements more than {} deep", kMaxNesting);
        const Stmt& s = ir_.stmt(id);
        switch (s.kind) {
        case StmtKind::Block:
            for (std::uint32_t k = 0; k < s.b; ++k) work.push_back({ir_.lists[s.a + k], depth + 1});
            break;
        case StmtKind::Assign:
            if (auto r = targetReason(ir_, s.a); !r.empty()) return r;
            break;
        case StmtKind::If:
            work.push_back({s.b, depth + 1});
            if (s.c != kNoId) work.push_back({s.c, ir_.stmt(s.c).kind == StmtKind::If ? depth : depth + 1});
            break;
        case StmtKind::Case:
            for (std::uint32_t k = 0; k < s.c; ++k) work.push_back({ir_.caseItems[s.b + k].body, depth + 1});
            if (s.d != kNoId) work.push_back({s.d, depth + 1});
            break;
        case StmtKind::For:
            for (std::uint32_t k = 0; k < s.e; ++k) work.push_back({ir_.lists[s.d + k], depth + 1});
            work.push_back({s.f, depth + 1});
            break;
        case StmtKind::Empty: break;
        }
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
    std::vector<int> offs;
    if (e.kind == ExprKind::Ref) {
        s = e.a;
        for (int i = 0; i < ir_.symbols[s].width; ++i) offs.push_back(i);
    } else {
        const Expr& parent = ir_.expr(e.a);
        if (parent.kind != ExprKind::Ref) return;
        s = parent.a;
        int pw = ir_.symbols[s].width;
        int w = static_cast<int>(e.width);
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
                    if (off >= 0 && off * w + i < pw) offs.push_back(off * w + i);
            }
        } else if (e.kind == ExprKind::Range) {
            int lo = dimOffset(e.right(), e.msb, e.lsb), hi = dimOffset(e.left(), e.msb, e.lsb);
            if (lo > hi) std::swap(lo, hi);
            int ew = std::max(1, w / (hi - lo + 1));
            for (int i = lo * ew; i < (hi + 1) * ew; ++i)
                if (i >= 0 && i < pw) offs.push_back(i);
        } else {
            for (int i = 0; i < pw; ++i) offs.push_back(i);   // variable select: may write any bit
        }
    }
    if (isLocal(s)) return;
    for (int o : offs) out.emplace_back(s, o);
}

void Lowerer::stmtWriteSet(StmtId root, std::vector<std::pair<SymbolId, int>>& out) const {
    std::vector<StmtId> work{root};
    while (!work.empty()) {
        const Stmt& s = ir_.stmt(work.back());
        work.pop_back();
        switch (s.kind) {
        case StmtKind::Assign: targetWriteSet(s.a, out); break;
        case StmtKind::Block:
            for (std::uint32_t k = 0; k < s.b; ++k) work.push_back(ir_.lists[s.a + k]);
            break;
        case StmtKind::If:
            work.push_back(s.b);
            if (s.c != kNoId) work.push_back(s.c);
            break;
        case StmtKind::Case:
            for (std::uint32_t k = 0; k < s.c; ++k) work.push_back(ir_.caseItems[s.b + k].body);
            if (s.d != kNoId) work.push_back(s.d);
            break;
        case StmtKind::For:
            work.push_back(s.f);
            break;
        case StmtKind::Empty: break;
        }
    }
}

// ---- assignments -------------------------------------------------------------

void Lowerer::assignTarget(ExprId lvId, const Bits& rhs0, bool inBlock) {
    const Expr& lv = ir_.expr(lvId);
    int w = static_cast<int>(lv.width);
    Bits rhs = extend(rhs0, w, false);
    auto set = [&](SymbolId s, int off, Literal l) {
        if (inBlock) {
            auto it = env_->vars.find(s);
            if (it == env_->vars.end() || off < 0 || off >= static_cast<int>(it->second.size())) return;
            it->second[off] = l;
        } else {
            recordBit(s, off, l);
        }
    };
    auto get = [&](SymbolId s, int off) -> Literal {
        if (!inBlock) return kUnassigned;
        auto it = env_->vars.find(s);
        if (it == env_->vars.end() || off < 0 || off >= static_cast<int>(it->second.size())) return kUnassigned;
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
    const Expr& parent = ir_.expr(lv.a);
    if (parent.kind != ExprKind::Ref) fail("nested selects on the left-hand side are not supported", here(lv.start));
    SymbolId s = parent.a;
    int pw = static_cast<int>(parent.width);
    if (lv.kind == ExprKind::Range) {
        int lo = dimOffset(lv.right(), lv.msb, lv.lsb), hi = dimOffset(lv.left(), lv.msb, lv.lsb);
        if (lo > hi) std::swap(lo, hi);
        int ew = std::max(1, w / (hi - lo + 1));
        for (int i = lo * ew, k = 0; i < (hi + 1) * ew; ++i, ++k)
            if (i >= 0 && i < pw) set(s, i, rhs[k]);
        return;
    }
    Bits idx = eval(lv.b);
    if (lv.kind == ExprKind::Index) {
        if (auto k = constValue(idx)) {
            int off = dimOffset(static_cast<int>(*k), lv.msb, lv.lsb);
            for (int i = 0; i < w; ++i)
                if (off >= 0 && off * w + i < pw) set(s, off * w + i, rhs[i]);
            return;
        }
        int count = pw / std::max(w, 1);
        int lo = std::min(lv.msb, lv.lsb), hi = std::max(lv.msb, lv.lsb);
        for (int index = lo; index <= hi; ++index) {
            int off = dimOffset(index, lv.msb, lv.lsb);
            if (off < 0 || off >= count || index < 0) continue;
            // A position the index cannot take is never written.
            if (idx.size() < 63 && (std::uint64_t(index) >> idx.size()) != 0) continue;
            Bits cv;
            for (std::size_t i = 0; i < idx.size(); ++i) cv.push_back(i < 63 && ((std::uint64_t(index) >> i) & 1) ? kTrue : kFalse);
            Literal sel = equal(idx, cv);
            for (int i = 0; i < w; ++i) {
                Literal old = get(s, off * w + i);
                if (isSentinel(old)) {
                    if (sel == kTrue) set(s, off * w + i, rhs[i]);
                    else if (sel != kFalse) set(s, off * w + i, kPartial);
                    continue;
                }
                set(s, off * w + i, b_.mux(sel, rhs[i], old));
            }
        }
        return;
    }
    // Indexed part select whose base is constant here (loop variables only).
    if (auto k = constValue(idx)) {
        int n = std::abs(lv.msb - lv.lsb) + 1;
        int ew = std::max(1, pw / n);
        int count = std::max(1, w / ew);
        int first = static_cast<int>(*k), last = lv.up ? first + count - 1 : first - count + 1;
        int a = dimOffset(first, lv.msb, lv.lsb), b = dimOffset(last, lv.msb, lv.lsb);
        int offLo = std::min(a, b) * ew;
        for (int i = 0; i < w; ++i)
            if (offLo + i >= 0 && offLo + i < pw) set(s, offLo + i, rhs[i]);
        return;
    }
    fail("a variable part select on the left-hand side is not supported", here(lv.start));
}

// ---- statements ------------------------------------------------------------

void Lowerer::mergeInto(Env& target, const Env& other, Literal cond) {
    for (auto& [s, bits] : target.vars) {
        const Bits& ob = other.vars.at(s);
        for (std::size_t i = 0; i < bits.size(); ++i) {
            Literal a = bits[i], b = ob[i];
            if (a == b) continue;
            if (isSentinel(a) || isSentinel(b)) bits[i] = kPartial;
            else bits[i] = b_.mux(cond, a, b);
        }
    }
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
        // environment before the chain; the branches merge from the last one back.
        std::vector<std::pair<Literal, StmtId>> arms;
        StmtId last = kNoId;
        StmtId cur = id;
        for (;;) {
            const Stmt& c = ir_.stmt(cur);
            if (c.start != kNoId) b_.loc = here(c.start);
            Literal cond = reduceOr(eval(c.a));
            if (cond == kTrue) { last = c.b; break; }
            if (cond != kFalse) arms.emplace_back(cond, c.b);
            if (c.c == kNoId) break;
            if (ir_.stmt(c.c).kind != StmtKind::If) { last = c.c; break; }
            cur = c.c;
        }
        Env before = *env_;
        if (last != kNoId) exec(last);
        for (std::size_t k = arms.size(); k-- > 0;) {
            Env elseEnv = std::move(*env_);
            *env_ = before;
            exec(arms[k].second);
            mergeInto(*env_, elseEnv, arms[k].first);
        }
        return;
    }
    case StmtKind::Case:
        execCase(id);
        return;
    case StmtKind::For: {
        for (std::uint32_t k = 0; k < s.b; ++k) {
            const ForInit& init = ir_.forInits[s.a + k];
            Bits v = eval(init.value);
            Bits& slot = env_->vars[init.var];
            slot = extend(v, static_cast<int>(slot.size()), false);
        }
        for (int iter = 0;; ++iter) {
            if (iter > kMaxLoopIterations)
                fail(fmt::format("a for loop runs more than {} iterations", kMaxLoopIterations), here(s.start));
            Literal c = reduceOr(eval(s.c));
            if (c == kFalse) break;
            if (c != kTrue)
                fail("a for loop's condition is not constant; only loops with constant bounds are unrolled", here(s.start));
            exec(s.f);
            for (std::uint32_t k = 0; k < s.e; ++k) exec(ir_.lists[s.d + k]);
        }
        return;
    }
    }
}

void Lowerer::execCase(StmtId id) {
    const Stmt& s = ir_.stmt(id);
    const Expr& sel = ir_.expr(s.a);
    Bits selBits = eval(s.a);
    struct Item {
        Literal cond;
        StmtId body;
        std::string pattern;   // constant pattern, MSB first ('-' = wildcard); empty when not constant
    };
    std::vector<Item> items;
    std::size_t width = selBits.size();
    for (std::uint32_t k = 0; k < s.c; ++k) {
        const CaseItem& ci = ir_.caseItems[s.b + k];
        for (std::uint32_t j = 0; j < ci.count; ++j) width = std::max<std::size_t>(width, ir_.expr(ir_.lists[ci.exprs + j]).width);
    }
    bool selSigned = sel.isSigned;
    Bits selW = extend(selBits, static_cast<int>(width), selSigned);
    bool allConst = true;
    for (std::uint32_t k = 0; k < s.c; ++k) {
        const CaseItem& ci = ir_.caseItems[s.b + k];
        for (std::uint32_t j = 0; j < ci.count; ++j) {
            ExprId xid = ir_.lists[ci.exprs + j];
            const Expr& x = ir_.expr(xid);
            std::string pattern;
            Literal c;
            if (x.kind == ExprKind::Const) {
                // The item's bits, MSB first, extended to the case width.
                std::string bits;
                for (std::uint32_t i = x.width; i-- > 0;) bits.push_back(ir_.constBit(x, i));
                char fillc = x.isSigned && selSigned && !bits.empty() ? bits[0] : '0';
                while (bits.size() < width) bits.insert(bits.begin(), fillc);
                Bits a, b;
                bool never = false;
                for (std::size_t i = 0; i < width; ++i) {
                    char ch = bits[bits.size() - 1 - i];
                    bool wild = ch == 'z' ? s.caseKind != CaseKind::Normal
                              : ch == 'x' ? (s.caseKind == CaseKind::X || s.caseKind == CaseKind::Inside)
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
                c = equal(selW, extend(eval(xid), static_cast<int>(width), x.isSigned && selSigned));
            }
            items.push_back(Item{c, ci.body, pattern});
        }
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
    bool hasDefault = s.d != kNoId;

    Env before = *env_;
    std::vector<Env> results;
    for (const auto& it : items) {
        *env_ = before;
        if (it.cond != kFalse) exec(it.body);
        results.push_back(*env_);
    }
    *env_ = before;
    if (hasDefault && !full) exec(s.d);
    Env dflt = std::move(*env_);

    Bits conds;
    for (const auto& it : items) conds.push_back(it.cond);
    Literal defaultCond = full ? kFalse : negateLiteral(b_.orN(conds));
    Env merged = dflt;
    for (auto& [name, bits] : merged.vars) {
        const Bits& dbits = dflt.vars[name];
        for (std::size_t bit = 0; bit < bits.size(); ++bit) {
            bool same = true, sentinel = isSentinel(dbits[bit]) && !full;
            for (std::size_t i = 0; i < results.size(); ++i) {
                Literal v = results[i].vars[name][bit];
                if (items[i].cond == kFalse) continue;
                if (v != dbits[bit]) same = false;
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
                if (!full) {
                    if (!init) first = dbits[bit];
                    else if (dbits[bit] != first) allEq = false;
                }
                bits[bit] = allEq ? first : kPartial;
                continue;
            }
            if (exclusive) {
                // Group items by value: value v contributes (OR of its conditions) & v.
                std::map<Literal, Bits> byValue;
                for (std::size_t i = 0; i < results.size(); ++i)
                    if (items[i].cond != kFalse) byValue[results[i].vars[name][bit]].push_back(items[i].cond);
                if (!full) byValue[dbits[bit]].push_back(defaultCond);
                Bits terms;
                for (auto& [v, cs] : byValue) {
                    if (v == kFalse) continue;
                    terms.push_back(b_.and2(b_.orN(cs), v));
                }
                bits[bit] = b_.orN(terms);
            } else {
                Literal acc = dbits[bit];
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

} // namespace kerf::frontend::detail
