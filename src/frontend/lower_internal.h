// lower_internal.h — the lowering's shared state, used by lower_expr.cpp
// (expressions), lower_stmt.cpp (statements and targets) and
// lower_module.cpp (drivers, member order, outputs). Private to src/frontend.
#pragma once

#include "kerf/frontend/lower.h"

#include <fmt/format.h>

#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace kerf::frontend::detail {

using algebra::negateLiteral;
using net::kFalse;
using net::kTrue;
using net::Literal;

using Bits = std::vector<Literal>;

constexpr Literal kUnassigned = 0xFFFFFFFFu;  // never assigned in this block
constexpr Literal kPartial = 0xFFFFFFFEu;     // assigned on some paths only
constexpr Literal kExternal = 0xFFFFFFFDu;    // not written by this block: read from outside
inline bool isSentinel(Literal l) { return l >= kExternal; }
inline bool isConst(Literal l) { return l == kFalse || l == kTrue; }

/// Node construction with constant folding (not structural hashing: that is
/// `tidy`'s job, so the network as read keeps the design's own structure).
class Builder {
public:
    explicit Builder(net::Network& n) : net_(n) {}
    SourceLoc loc;

    Literal andN(Bits in);
    Literal orN(Bits in);
    Literal and2(Literal a, Literal b) { return andN({a, b}); }
    Literal or2(Literal a, Literal b) { return orN({a, b}); }
    Literal xor2(Literal a, Literal b);
    Literal mux(Literal s, Literal t, Literal e);

private:
    Literal sop(std::vector<Bits> cubes);
    net::Network& net_;
};

std::optional<std::uint64_t> constValue(const Bits& b);
Bits extend(Bits b, int width, bool sign);
inline int dimOffset(int index, int msb, int lsb) { return msb >= lsb ? index - lsb : lsb - index; }

/// Members are lowered one at a time; inside a combinational block the
/// environment maps each symbol the block writes to its current bit values.
struct Env {
    std::map<SymbolId, Bits> vars;
};

class Lowerer {
public:
    Lowerer(const ModuleDesc& m, const LowerOptions& o);
    Lowered run();

    // -- module assembly (lower_module.cpp)
    Literal signalBit(SymbolId sym, int off);
    Literal inputBit(SymbolId sym, int off);
    void recordBit(SymbolId sym, int off, Literal l);
    void lowerMember(int idx);
    [[noreturn]] void fail(const std::string& msg, const SourceLoc& loc, ExitCode c = ExitCode::InputError) const {
        throw Error(msg, loc, c);
    }
    /// Location of an expression or statement range of the member being lowered.
    SourceLoc here(std::uint32_t start) const;
    std::string bitName(SymbolId sym, int off) const;
    const Symbol& sym(SymbolId s) const { return ir_.symbols[s]; }
    bool isLocal(SymbolId s) const { return ir_.symbols[s].local; }

    // -- expressions (lower_expr.cpp)
    Bits eval(ExprId e);
    Literal reduceOr(const Bits& b) { return b_.orN(b); }
    Literal equal(const Bits& a, const Bits& b);
    Literal lessThan(Bits a, Bits b, bool sign);
    Bits add(const Bits& a, const Bits& b, Literal cin);
    Bits mul(const Bits& a, const Bits& b, int w);
    Bits shift(const Bits& a, const Bits& amount, bool left, bool arith, int w);
    Bits selectElement(const Bits& v, const Bits& idx, int msb, int lsb, int ew);
    Bits evalRef(SymbolId s, int width);
    Bits readBits(SymbolId s, const std::vector<int>& offs);
    Bits wordOp(ExprId e, int w, std::string_view op, bool unary);
    bool operandUndriven(ExprId e) const;

    // -- statements and targets (lower_stmt.cpp)
    void exec(StmtId s);
    void execCase(StmtId s);
    void mergeInto(Env& target, const Env& other, Literal cond);
    void assignTarget(ExprId lv, const Bits& rhs, bool inBlock);
    void targetWriteSet(ExprId lv, std::vector<std::pair<SymbolId, int>>& out) const;
    void stmtWriteSet(StmtId s, std::vector<std::pair<SymbolId, int>>& out) const;
    /// Why a member cannot be lowered (empty when it can).
    std::string unsupportedReason(const Member& mem) const;

    const ModuleDesc& m_;
    const Ir& ir_;
    LowerOptions opts_;
    Lowered out_;
    Builder b_;
    std::vector<const Member*> members_;
    std::vector<std::uint8_t> restructured_;   // per member index
    std::vector<std::uint8_t> state_;          // 0 new, 1 in progress, 2 done
    std::vector<std::vector<int>> drivers_;    // per symbol, per bit: member index, -1 none
    std::vector<Bits> value_;                  // per symbol: resolved bit values
    std::vector<Bits> inputLits_;              // per symbol: network input literals
    std::vector<std::uint8_t> keptReads_;      // per symbol: read by kept code
    std::vector<std::uint8_t> cut_;            // per symbol: `(* keep *)` / --keep: never restructured through
    std::vector<std::uint8_t> mentioned_;      // per symbol: named by kept code (inactive branches included)
    Env* env_ = nullptr;                       // current combinational block
    const Member* current_ = nullptr;
    int depth_ = 0;                            // nesting of on-demand member lowering
    // Members being lowered because a signal they drive was read: (member, signal).
    // On a loop the tail of this chain from the repeated member names the loop.
    std::vector<std::pair<int, SymbolId>> resolving_;
    int stmtDepth_ = 0;
    int wordCount_ = 0;
    std::set<std::string> usedNames_;
};

/// Every expression reachable from a member's statements and targets, each once.
std::vector<ExprId> memberExprs(const Ir& ir, const Member& m);

} // namespace kerf::frontend::detail
