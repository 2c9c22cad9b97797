// lower_module.cpp — module assembly: which members are lowered, who drives
// each bit, the order members are lowered in, and the network's outputs.
//
// Drivers are known per bit: restructured code drives the bits its targets
// name, kept code the bit ranges the reader found (the whole signal where
// they are not static). Members are lowered drivers first (a depth-first
// order of the member dependency graph, iterative), so a long chain of
// assignments never turns into a deep recursion; a member met again while it
// is being lowered is a combinational loop. Every internal signal that
// restructured code drives stays an output (its declaration stays), unless
// `dissolveInternal` asks for the old behaviour.
#include "lower_internal.h"
#include "kerf/io/progress.h"

#include <algorithm>
#include <cstdlib>
#include <functional>
#include <unordered_set>

namespace kerf::frontend::detail {

namespace {

// On-demand lowering of members inside one dependency cycle of whole signals recurses;
// beyond this depth kerf stops with a message instead of exhausting its stack.
constexpr int kMaxMemberDepth = 20000;

/// Every value `idx` can take, plus `extra` positions above it, lies in [lo, hi].
bool indexFits(const Ir& ir, ExprId idx, std::int64_t lo, std::int64_t hi, std::int64_t extra) {
    const Expr& e = ir.expr(idx);
    if (e.kind == ExprKind::Const) {
        if (e.width > 62) return false;
        std::int64_t v = 0;
        for (std::uint32_t i = e.width; i-- > 0;) {
            char c = ir.constBit(e, i);
            if (c != '0' && c != '1') return false;
            v = v * 2 + (c == '1');
        }
        if (e.isSigned && e.width > 0 && ir.constBit(e, e.width - 1) == '1') v -= std::int64_t{1} << e.width;
        return lo <= v && v + extra <= hi;
    }
    if (e.isSigned || e.width >= 31) return false;
    return lo <= 0 && (std::int64_t{1} << e.width) - 1 + extra <= hi;
}

/// Code left as written whose own text can make a value x or z by the language's rules: an
/// x/z constant, a select that can fall out of range (IEEE 1800 11.5.1), a division, modulo
/// or power by what can be 0 (11.4.2). Conservative: a target's select counts too.
bool textMayBeX(const Ir& ir, const Member& mem) {
    if (mem.kind == MemberKind::Kept) return mem.mayBeX;
    for (const CaseTable* t : memberCaseTables(ir, mem)) {
        // Labels and values are constants of the text; '-' marks a value not assigned.
        std::size_t end = t->labels + static_cast<std::size_t>(t->labelCount) * t->width;
        for (std::size_t i = t->labels; i < end; ++i)
            if (char c = ir.constBits[i]; c == 'x' || c == 'z') return true;
        for (std::size_t k = 0; k < t->columns.size(); ++k)
            for (std::size_t i = 0, n = static_cast<std::size_t>(t->columnWidths[k]) * t->items; i < n; ++i)
                if (char c = ir.constBits[t->columns[k] + i]; c == 'x' || c == 'z') return true;
    }
    for (ExprId id : memberExprs(ir, mem)) {
        const Expr& e = ir.expr(id);
        switch (e.kind) {
        case ExprKind::Const:
            for (std::uint32_t i = 0; i < e.width; ++i)
                if (char c = ir.constBit(e, i); c != '0' && c != '1') return true;
            break;
        case ExprKind::Index:
            if (!indexFits(ir, e.b, std::min(e.msb, e.lsb), std::max(e.msb, e.lsb), 0)) return true;
            break;
        case ExprKind::Range:
            if (std::min(e.left(), e.right()) < std::min(e.msb, e.lsb) ||
                std::max(e.left(), e.right()) > std::max(e.msb, e.lsb))
                return true;
            break;
        case ExprKind::Indexed: {
            // Positions per element of the selected dimension, and elements selected.
            std::int64_t count = std::abs(static_cast<std::int64_t>(e.msb) - e.lsb) + 1;
            std::int64_t valueWidth = ir.expr(e.a).width;
            std::int64_t elem = count > 0 && valueWidth % count == 0 ? valueWidth / count : 0;
            if (elem <= 0 || !e.up || !indexFits(ir, e.b, std::min(e.msb, e.lsb), std::max(e.msb, e.lsb),
                                                 static_cast<std::int64_t>(e.width) / elem - 1))
                return true;
            break;
        }
        case ExprKind::Binary: {
            BinaryOp o = e.binaryOp();
            if (o == BinaryOp::Div || o == BinaryOp::Mod || o == BinaryOp::Pow) {
                const Expr& d = ir.expr(e.b);
                if (o == BinaryOp::Pow || d.kind != ExprKind::Const) return true;
                bool nonzero = false;
                for (std::uint32_t i = 0; i < d.width; ++i) {
                    char c = ir.constBit(d, i);
                    if (c != '0' && c != '1') return true;
                    nonzero = nonzero || c == '1';
                }
                if (!nonzero) return true;
            }
            break;
        }
        default:
            break;
        }
    }
    return false;
}

} // namespace

Lowerer::Lowerer(const ModuleDesc& m, const LowerOptions& o, const std::map<int, std::string>& forcedKept)
    : m_(m), ir_(m.ir), opts_(o), forcedKept_(forcedKept), b_(out_.net) {}

void Lowerer::keep(const std::string& reason) const {
    throw KeepMember{current_ ? current_->id : -1, reason};
}

SourceLoc Lowerer::here(std::uint32_t start) const {
    if (function_) {
        SourceLoc l = start == kNoId ? SourceLoc{} : ir_.locate(function_->file, start);
        return l.file.empty() ? function_->loc : l;
    }
    if (!current_) return {};
    return m_.locate(*current_, start);
}

std::string Lowerer::bitName(SymbolId s, int off) const {
    const Signal* sig = m_.signalOf(s);
    if (!sig) return fmt::format("{}[{}]", ir_.symbols[s].name, off);
    return frontend::bitName(m_, BitRef{sig->name, off});
}

bool Lowerer::drivesOnlyLintWires(const Member& mem) const {
    if (opts_.lintOnly.empty() || mem.writes.empty()) return false;
    for (const auto& w : mem.writes)
        if (std::find(opts_.lintOnly.begin(), opts_.lintOnly.end(), w) == opts_.lintOnly.end()) return false;
    return true;
}

Bit Lowerer::inputBit(SymbolId s, int off) {
    // Ports and signals from kept code are taken as 0/1 (the proof's model).
    auto& v = inputLits_[s];
    if (v.empty()) v.assign(static_cast<std::size_t>(std::max(ir_.symbols[s].width, 1)), known(kUnassigned));
    if (off < 0 || off >= static_cast<int>(v.size())) return kRuleX;
    if (current_ && s < keptX_.size() && off < static_cast<int>(keptX_[s].size()) && keptX_[s][off] &&
        !xReaders_.count(current_->id) && !drivesOnlyLintWires(*current_))
        xReaders_[current_->id] = fmt::format(
            "it reads '{}', which code kept as written can make x; gates in its place would not treat that x "
            "as the source does", bitName(s, off));
    if (v[off].v == kUnassigned) {
        BitRef br{ir_.symbols[s].name, off};
        v[off] = known(algebra::makeLiteral(out_.net.addInput(bitName(s, off)), false));
        out_.inputBits.push_back(br);
    }
    return v[off];
}

void Lowerer::recordBit(SymbolId s, int off, Bit b) {
    auto& v = value_[s];
    int w = ir_.symbols[s].width;
    if (v.empty()) v.assign(static_cast<std::size_t>(w), known(kUnassigned));
    if (off < 0 || off >= w) return;
    v[off] = b;
    net::NodeId id = algebra::literalVar(b.v);
    if (out_.net.isLogic(id) && out_.net.node(id).name.empty()) out_.net.node(id).name = bitName(s, off);
}

Bit Lowerer::signalBit(SymbolId s, int off) {
    // Innermost environment first: a function's locals, then its caller's block.
    for (Env* e = env_; e; e = e->parent) {
        auto it = e->vars.find(s);
        if (it == e->vars.end()) continue;
        if (off < static_cast<int>(it->second.size())) {
            Bit l = it->second[off];
            if (!isSentinel(l)) return l;
            if (l.v != kExternal) {
                if (ir_.symbols[s].function >= 0)   // a static function's variable from an earlier call
                    keep(fmt::format("the function '{}' reads '{}' before assigning it",
                                     ir_.functions[static_cast<std::size_t>(ir_.symbols[s].function)].name,
                                     ir_.symbols[s].name));
                const char* what = isLocal(s) ? "is read before it is assigned"
                                              : "is read before this block assigns it (a combinational loop or a latch)";
                fail(fmt::format("'{}' {}", ir_.symbols[s].name, what), current_->src.loc());
            }
        }
        break;
    }
    if (isLocal(s)) fail(fmt::format("'{}' is read outside its block", ir_.symbols[s].name), here(kNoId), ExitCode::Internal);
    if (cut_[s]) return inputBit(s, off);
    const auto& d = drivers_[s];
    if (off < 0 || off >= static_cast<int>(d.size())) return inputBit(s, off);
    int dm = d[off];
    if (dm < 0 || !restructured_[dm]) return inputBit(s, off);
    auto& v = value_[s];
    if (v.empty() || v[off].v == kUnassigned) {
        resolving_.emplace_back(dm, s);
        lowerMember(dm);
        resolving_.pop_back();
        if (value_[s].empty() || value_[s][off].v == kUnassigned)
            fail(fmt::format("'{}' is not driven by the statement that claims it", bitName(s, off)),
                 members_[dm]->src.loc(), ExitCode::Internal);
    }
    return value_[s][off];
}

void Lowerer::lowerMember(int idx) {
    if (state_[idx] == 2) return;
    const Member& mem = *members_[idx];
    if (state_[idx] == 1) {
        // Name each signal on the loop with the statement that drives it. The last
        // entry is the read that came back to this member; the members resolved
        // since this one started (after its earlier entry, if any) close the loop.
        std::string chain;
        std::size_t last = resolving_.size();
        if (last > 0) {
            std::size_t start = last - 1;
            while (start > 0 && resolving_[start - 1].first != idx) --start;
            const std::string& first = ir_.symbols[resolving_[last - 1].second].name;
            chain = fmt::format("'{}' (driven at {})", first, mem.src.loc().str());
            for (std::size_t i = start; i + 1 < last; ++i)
                chain += fmt::format(", which reads '{}' (driven at {})", ir_.symbols[resolving_[i].second].name,
                                     members_[resolving_[i].first]->src.loc().str());
            chain += fmt::format(", which reads '{}' again", first);
        }
        fail(fmt::format("combinational loop: this {} depends on its own result{}{}",
                         mem.kind == MemberKind::Assign ? "assignment" : "block", chain.empty() ? "" : ": ", chain),
             mem.src.loc());
    }
    if (depth_ >= kMaxMemberDepth)
        fail(fmt::format("statements depend on each other in a chain more than {} long through whole signals; "
                         "kerf cannot order them", kMaxMemberDepth), mem.src.loc());
    state_[idx] = 1;
    ++depth_;
    const Member* savedCurrent = current_;
    Env* savedEnv = env_;
    std::set<ExprId> savedAssignedX = std::move(assignedX_);
    assignedX_.clear();
    collectAssignedX(ir_, mem, assignedX_);
    current_ = &mem;
    b_.loc = mem.src.loc();
    if (mem.kind == MemberKind::Assign) {
        env_ = nullptr;
        const Expr& lhs = ir_.expr(mem.lhs);
        Bits rhs = extend(eval(mem.rhs), static_cast<int>(lhs.width), ir_.expr(mem.rhs).isSigned);
        assignTarget(mem.lhs, rhs, false);
    } else {
        Env env;
        env_ = &env;
        for (SymbolId l : mem.locals) env.vars[l].assign(static_cast<std::size_t>(ir_.symbols[l].width), known(kUnassigned));
        std::vector<std::pair<SymbolId, int>> writes;
        stmtWriteSet(mem.body, writes);
        std::sort(writes.begin(), writes.end());
        writes.erase(std::unique(writes.begin(), writes.end()), writes.end());
        for (auto& [s, off] : writes) {
            auto& v = env.vars[s];
            if (v.empty()) v.assign(static_cast<std::size_t>(ir_.symbols[s].width), known(kExternal));
            v[off] = known(kUnassigned);
        }
        exec(mem.body);
        b_.loc = mem.src.loc();
        for (auto& [s, off] : writes) {
            Bit l = env.vars[s][off];
            if (l.v == kPartial || l.v == kUnassigned)
                fail(fmt::format("'{}' is not assigned on every path through this combinational block, "
                                 "so it would hold its value (a latch); assign it a default at the top of the block",
                                 bitName(s, off)), mem.src.loc());
            recordBit(s, off, l);
        }
    }
    current_ = savedCurrent;
    env_ = savedEnv;
    assignedX_ = std::move(savedAssignedX);
    --depth_;
    state_[idx] = 2;
}

void Lowerer::markKeptXBits(const std::function<SymbolId(const std::string&)>& symbolOf) {
    // Bits that code left as written can make x (F19), per bit: the bits a kept member writes
    // (its bit ranges, or every bit a lowerable member's targets can reach) when its own text
    // can make x or it reads a signal with such a bit (by name: what kept code reads is not
    // known per bit), until nothing changes. A restructured statement that reads one of these
    // bits is kept as written (inputBit), and what it writes joins them on the next lowering.
    const std::size_t n = members_.size();
    keptX_.assign(ir_.symbols.size(), {});
    // Per member: 0 not a source, 1 the signals its own text makes x (xWrites), 2 everything
    // it writes (it reads a signal that can be x, or its text can make all of them x).
    std::vector<std::uint8_t> anyX(ir_.symbols.size(), 0), source(n, 0);
    auto markWrites = [&](std::size_t i, bool all) {
        source[i] = all ? 2 : 1;
        const Member& mem = *members_[i];
        std::vector<std::pair<SymbolId, int>> bits;
        if (mem.kind == MemberKind::Kept) {
            const auto& names = all || mem.xWrites.empty() ? mem.writes : mem.xWrites;
            for (const auto& name : names) {
                SymbolId s = symbolOf(name);
                if (s == kNoId || s >= keptX_.size()) continue;
                auto r = mem.writeRanges.find(name);
                if (r == mem.writeRanges.end()) {
                    for (int b = 0; b < ir_.symbols[s].width; ++b) bits.emplace_back(s, b);
                } else {
                    for (auto [lo, hi] : r->second)
                        for (int b = std::max(lo, 0); b <= hi && b < ir_.symbols[s].width; ++b) bits.emplace_back(s, b);
                }
            }
        } else if (mem.kind == MemberKind::Assign) {
            targetWriteSet(mem.lhs, bits);
        } else {
            stmtWriteSet(mem.body, bits);
        }
        for (auto [s, off] : bits) {
            if (s >= keptX_.size() || isLocal(s) || off < 0 || off >= ir_.symbols[s].width) continue;
            auto& v = keptX_[s];
            if (v.empty()) v.assign(static_cast<std::size_t>(ir_.symbols[s].width), 0);
            v[static_cast<std::size_t>(off)] = 1;
            anyX[s] = 1;
        }
    };
    auto readsX = [&](std::size_t i) {
        for (const auto& name : members_[i]->reads)
            if (SymbolId s = symbolOf(name); s != kNoId && s < anyX.size() && anyX[s]) return true;
        return false;
    };
    for (bool changed = true; changed;) {
        changed = false;
        for (std::size_t i = 0; i < n; ++i) {
            if (source[i] == 2 || restructured_[i]) continue;
            if (readsX(i)) {
                markWrites(i, true);
                changed = true;
            } else if (source[i] == 0 && textMayBeX(ir_, *members_[i])) {
                markWrites(i, false);
                changed = true;
            }
        }
    }
}

Lowered Lowerer::run() {
    const std::string& moduleFile = m_.src.file;
    const std::size_t nsym = ir_.symbols.size();
    for (const Member& mem : m_.members) members_.push_back(&mem);
    const std::size_t n = members_.size();
    restructured_.assign(n, 0);
    state_.assign(n, 0);
    drivers_.assign(nsym, {});
    value_.assign(nsym, {});
    inputLits_.assign(nsym, {});
    keptReads_.assign(nsym, 0);
    cut_.assign(nsym, 0);
    mentioned_.assign(nsym, 0);
    for (const auto& [name, sig] : m_.signals)
        if (sig.symbol != kNoId && sig.symbol < nsym && sig.hasAttribute("keep")) cut_[sig.symbol] = 1;
    for (const auto& name : opts_.keep) {
        auto it = m_.signals.find(name);
        if (it == m_.signals.end() || it->second.symbol == kNoId)
            throw Error(fmt::format("--keep {}: module {} has no signal of that name", name, m_.name));
        cut_[it->second.symbol] = 1;
    }
    auto symbolOf = [&](const std::string& name) -> SymbolId {
        auto it = m_.signals.find(name);
        return it == m_.signals.end() ? kNoId : it->second.symbol;
    };

    // Which members are lowered; the others are kept as written, each with its reason.
    for (std::size_t i = 0; i < n; ++i) {
        const Member& mem = *members_[i];
        if (mem.kind == MemberKind::Kept) {
            out_.kept.push_back({mem.id, mem.src.loc(), mem.what, mem.reason});
            continue;
        }
        std::string what = mem.kind == MemberKind::Assign ? "assign" : mem.style == "always_star" ? "always" : mem.style;
        std::string why;
        if (!moduleFile.empty() && mem.src.file != moduleFile) why = "it comes from another file";
        else if (auto f = forcedKept_.find(static_cast<int>(i)); f != forcedKept_.end()) why = f->second;
        else why = unsupportedReason(mem);
        if (!why.empty()) {
            out_.notes.push_back(fmt::format("{}: left as written: {}", mem.src.loc().str(), why));
            out_.kept.push_back({mem.id, mem.src.loc(), what, why});
            continue;
        }
        restructured_[i] = 1;
    }

    markKeptXBits(symbolOf);

    // Bit-level drivers: two statements driving one bit is an error unless both are kept code.
    for (std::size_t i = 0; i < n; ++i) {
        const Member& mem = *members_[i];
        std::vector<std::pair<SymbolId, int>> bits;
        if (restructured_[i]) {
            current_ = &mem;
            if (mem.kind == MemberKind::Assign) targetWriteSet(mem.lhs, bits);
            else stmtWriteSet(mem.body, bits);
            current_ = nullptr;
        } else {
            for (const auto& name : mem.writes) {
                SymbolId s = symbolOf(name);
                if (s == kNoId) continue;
                int w = ir_.symbols[s].width;
                auto r = mem.writeRanges.find(name);
                if (r == mem.writeRanges.end()) {
                    for (int b = 0; b < w; ++b) bits.emplace_back(s, b);
                } else {
                    for (auto [lo, hi] : r->second)
                        for (int b = std::max(lo, 0); b <= hi && b < w; ++b) bits.emplace_back(s, b);
                }
            }
            for (const auto& name : mem.reads)
                if (SymbolId s = symbolOf(name); s != kNoId) keptReads_[s] = 1;
            for (const auto& name : mem.mentions)
                if (SymbolId s = symbolOf(name); s != kNoId) mentioned_[s] = 1;
        }
        std::sort(bits.begin(), bits.end());
        bits.erase(std::unique(bits.begin(), bits.end()), bits.end());
        for (auto& [s, off] : bits) {
            auto& d = drivers_[s];
            if (d.empty()) d.assign(static_cast<std::size_t>(ir_.symbols[s].width), -1);
            if (off < 0 || off >= static_cast<int>(d.size())) continue;
            int prev = d[off];
            int mine = static_cast<int>(i);
            if (prev >= 0 && prev != mine && (restructured_[prev] || restructured_[i])) {
                const Member& other = *members_[prev];
                current_ = nullptr;
                fail(fmt::format("'{}' has more than one driver (also driven at {})", bitName(s, off),
                                 other.src.loc().str()),
                     mem.src.loc());
            }
            if (prev < 0 || restructured_[i]) d[off] = mine;
        }
    }

    // Lower drivers before readers: depth-first over "reads a signal that member d drives".
    // Only what a member reads counts: taking the signal an assignment writes as read made
    // every statement writing a bit of a vector depend on all the others (n squared edges
    // for `assign y[i] = ...` over an n-bit y: F150).
    std::vector<std::vector<int>> deps(n);
    // Restructured members driving some bit of a signal, each once (built when first read).
    std::vector<std::vector<int>> driverMembers(nsym);
    std::vector<std::uint8_t> driverMembersMade(nsym, 0);
    for (std::size_t i = 0; i < n; ++i) {
        if (!restructured_[i]) continue;
        std::vector<int> ds;
        for (const ReadSpan& r : memberReadSpans(ir_, *members_[i])) {
            SymbolId s = r.sym;
            if (isLocal(s) || cut_[s]) continue;
            if (r.lo >= 0) {
                // A select of constant position depends on the drivers of the bits it names
                // only: `y[k]` read by each of n statements over a y that n statements write
                // took n squared edges (F150's remaining case).
                const auto& d = drivers_[s];
                for (int b = r.lo; b <= r.hi && b < static_cast<int>(d.size()); ++b)
                    if (d[b] >= 0 && restructured_[d[b]] && d[b] != static_cast<int>(i)) ds.push_back(d[b]);
                continue;
            }
            if (!driverMembersMade[s]) {
                driverMembersMade[s] = 1;
                auto& dm = driverMembers[s];
                for (int d : drivers_[s])
                    if (d >= 0 && restructured_[d]) dm.push_back(d);
                std::sort(dm.begin(), dm.end());
                dm.erase(std::unique(dm.begin(), dm.end()), dm.end());
            }
            for (int d : driverMembers[s])
                if (d != static_cast<int>(i)) ds.push_back(d);
        }
        std::sort(ds.begin(), ds.end());
        ds.erase(std::unique(ds.begin(), ds.end()), ds.end());
        deps[i] = std::move(ds);
    }
    // Strongly connected components (Tarjan, iterative) come out dependencies first; the
    // members of one component, which may or may not form a real loop bit by bit, are
    // lowered in source order, as a reader of the source would follow them.
    std::vector<int> order;
    {
        std::vector<int> index(n, -1), low(n, 0);
        std::vector<std::uint8_t> onStack(n, 0);
        std::vector<int> sccStack;
        std::vector<std::pair<int, std::size_t>> call;
        int counter = 0;
        for (std::size_t r = 0; r < n; ++r) {
            if (!restructured_[r] || index[r] >= 0) continue;
            call.push_back({static_cast<int>(r), 0});
            while (!call.empty()) {
                auto [v, k] = call.back();
                if (k == 0 && index[v] < 0) {
                    index[v] = low[v] = counter++;
                    sccStack.push_back(v);
                    onStack[v] = 1;
                }
                if (k < deps[v].size()) {
                    call.back().second = k + 1;
                    int d = deps[v][k];
                    if (index[d] < 0) call.push_back({d, 0});
                    else if (onStack[d]) low[v] = std::min(low[v], index[d]);
                    continue;
                }
                call.pop_back();
                if (!call.empty()) low[call.back().first] = std::min(low[call.back().first], low[v]);
                if (low[v] == index[v]) {
                    std::vector<int> comp;
                    int x;
                    do {
                        x = sccStack.back();
                        sccStack.pop_back();
                        onStack[x] = 0;
                        comp.push_back(x);
                    } while (x != v);
                    std::sort(comp.begin(), comp.end());
                    order.insert(order.end(), comp.begin(), comp.end());
                }
            }
        }
    }
    std::size_t lowered = 0;
    for (int i : order) {
        io::Progress::global().share(lowered++, order.size());
        lowerMember(i);
    }
    io::Progress::global().share(lowered, order.size());
    // Restructured statements that read a bit kept code can make x are kept, all at once; the
    // module is lowered again with them kept (what they write can then be x in turn).
    if (!xReaders_.empty()) throw KeepMembers{std::move(xReaders_)};
    for (std::size_t i = 0; i < n; ++i)
        if (restructured_[i]) out_.replaced.push_back(members_[i]->id);

    // Outputs: restructured bits of ports, of signals kept code reads, and (unless
    // dissolving) of every other signal restructured code drives.
    std::set<std::string> observed(opts_.observe.begin(), opts_.observe.end());
    std::vector<std::string> names = m_.portOrder;
    std::set<std::string> inPorts(names.begin(), names.end());
    for (const auto& [name, sig] : m_.signals)
        if (!inPorts.count(name)) names.push_back(name);
    for (const auto& name : names) {
        const Signal& sig = m_.signals.at(name);
        SymbolId s = sig.symbol;
        if (s == kNoId || s >= nsym || value_[s].empty()) continue;
        const auto& d = drivers_[s];
        bool allMine = true;
        for (int b = 0; b < sig.width; ++b)
            if (b >= static_cast<int>(d.size()) || d[b] < 0 || !restructured_[d[b]]) allMine = false;
        bool port = sig.dir != PortDir::None;
        bool needed = port || keptReads_[s] || !allMine || cut_[s] || mentioned_[s] || !opts_.dissolveInternal ||
                      observed.count(name);
        if (!needed) {
            if (sig.decl) out_.dissolved.push_back(name);
            continue;
        }
        for (int b = 0; b < sig.width; ++b) {
            if (value_[s][b].v == kUnassigned) continue;
            out_.net.addOutput(frontend::bitName(m_, {name, b}), value_[s][b].v);
            out_.outputBits.push_back(BitRef{name, b});
            int member = b < static_cast<int>(d.size()) && d[b] >= 0 ? members_[d[b]]->id : -1;
            out_.outputSources.push_back(OutputSource{port ? OutputKind::Port : OutputKind::Internal, member});
            outputUnknown_.push_back(value_[s][b].x);
            outputRuleX_.push_back(value_[s][b].s);
        }
    }
    // An x reached a decision in a member lowered before the first assigned x (members of
    // one loop of blocks go in source order): kept as xDecides would have kept it.
    if (assignedXMade_ && !xDecidedEarly_.empty()) {
        std::map<int, std::string> early;
        for (int id : xDecidedEarly_)
            early[id] = "an x the source assigns can reach a decision in it (an if condition, a case selector "
                        "or item, `===`), where Verilog decides on it (IEEE 1800 12.4, 12.5); kerf does not "
                        "read that x as a don't-care";
        throw KeepMembers{std::move(early)};
    }
    // Unknown output bits are don't-cares (the synthesis reading of x, IEEE 1364.1 /
    // 1800): the proof compares only where they are known. --keep-x keeps their statements.
    // An x by the language's rules (not assigned by the author) is never a don't-care,
    // and neither is an x that reaches kept code, which may turn it into 0 or 1: those
    // statements are kept as written, so the x stays exactly where the source has it.
    for (std::size_t i = 0; i < outputUnknown_.size(); ++i) {
        if (outputUnknown_[i] == kFalse) continue;
        int member = out_.outputSources[i].member;
        const BitRef& br = out_.outputBits[i];
        auto sit = m_.signals.find(br.signal);
        bool toKept = sit != m_.signals.end() && sit->second.symbol != kNoId &&
                      (keptReads_[sit->second.symbol] || mentioned_[sit->second.symbol]);
        if (member >= 0) {
            current_ = members_[static_cast<std::size_t>(member)];
            if (outputRuleX_[i] != kFalse)
                keep(fmt::format("'{}' can be x by the language's rules (a select out of range, a comparison with "
                                 "x or z, ...), which kerf does not turn into a don't-care",
                                 frontend::bitName(m_, br)));
            if (toKept) keep(fmt::format("its x reaches code kept as written through '{}'", br.signal));
            if (opts_.keepX) keep("its value can be x, which kerf reads as a don't-care; --keep-x keeps it as written");
        }
        ++out_.dontCareBits;
    }
    if (out_.dontCareBits > 0) {
        out_.dontCares = out_.net;
        out_.dontCares.outputs().clear();
        for (std::size_t i = 0; i < outputUnknown_.size(); ++i)
            if (outputUnknown_[i] != kFalse) out_.dontCares.addOutput(out_.net.outputs()[i].name, outputUnknown_[i]);
        out_.dontCares.removeUnreachable();
        out_.net.removeUnreachable();
    }
    // Module-scope loop variables that the reader made block-local go with their blocks
    // only when internal signals are dissolved; otherwise their declarations stay.
    if (opts_.dissolveInternal) {
        std::set<SymbolId> loopVars;
        for (std::size_t i = 0; i < n; ++i)
            if (restructured_[i] && members_[i]->kind == MemberKind::Comb)
                for (SymbolId l : members_[i]->locals) loopVars.insert(l);
        std::set<std::string> keptTouched;
        for (std::size_t i = 0; i < n; ++i)
            if (!restructured_[i]) {
                for (const auto& x : members_[i]->writes) keptTouched.insert(x);
                for (const auto& x : members_[i]->reads) keptTouched.insert(x);
                for (const auto& x : members_[i]->mentions) keptTouched.insert(x);
            }
        for (SymbolId l : loopVars) {
            const std::string& name = ir_.symbols[l].name;
            auto it = m_.signals.find(name);
            if (it == m_.signals.end() || !it->second.decl || it->second.dir != PortDir::None) continue;
            SymbolId s = it->second.symbol;
            if (keptTouched.count(name) || (s != kNoId && (!value_[s].empty() || !inputLits_[s].empty() || cut_[s])))
                continue;
            out_.dissolved.push_back(name);
        }
    }
    return std::move(out_);
}

} // namespace kerf::frontend::detail

namespace kerf::frontend {

std::string bitName(const ModuleDesc& m, const BitRef& b) {
    auto it = m.signals.find(b.signal);
    if (it == m.signals.end()) return fmt::format("{}[{}]", b.signal, b.offset);
    if (!it->second.vector && it->second.width == 1) return b.signal;
    return fmt::format("{}[{}]", b.signal, it->second.indexOf(b.offset));
}

Lowered lower(const ModuleDesc& m, const LowerOptions& opts) {
    // A member the lowering finds it must keep after all is kept, and the module lowered again.
    std::map<int, std::string> forced = opts.keptMembers;
    for (;;) {
        try {
            detail::Lowerer l(m, opts, forced);
            return l.run();
        } catch (const detail::KeepMember& k) {
            if (k.member < 0 || forced.count(k.member))
                throw Error(fmt::format("lowering kept asking to keep member {} ({})", k.member, k.reason), {},
                            ExitCode::Internal);
            forced[k.member] = k.reason;
        } catch (const detail::KeepMembers& k) {
            for (const auto& [member, reason] : k.members) {
                if (member < 0 || forced.count(member))
                    throw Error(fmt::format("lowering kept asking to keep member {} ({})", member, reason), {},
                                ExitCode::Internal);
                forced[member] = reason;
            }
        }
    }
}

} // namespace kerf::frontend
