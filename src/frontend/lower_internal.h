// lower_internal.h — the lowering's shared state, used by lower_expr.cpp
// (expressions), lower_stmt.cpp (statements and targets) and
// lower_module.cpp (drivers, member order, outputs). Private to src/frontend.
//
// Values are four-valued (IEEE 1800-2017 6.3.1): every bit is its value and
// an "unknown" flag that is true where the bit is x or z (a dual-rail
// encoding), plus a third flag for unknowns that come from the language's
// rules rather than from the author: a select out of range, a comparison
// with an x/z constant. Ports and signals from kept code are taken as 0/1.
// An output that can be x only because the source assigns x (the synthesis
// reading of IEEE 1364.1 / 1800) has that as its don't-care condition
// (Lowered::dontCares); a statement whose value can be x for any other
// reason, or whose x would reach kept code (which may turn it into 0 or 1)
// or a decision (an if condition, a case selector: see xDecides), is kept as
// written.
#pragma once

#include "kerf/frontend/lower.h"

#include <fmt/format.h>

#include <functional>
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

using Lits = std::vector<Literal>;

/// One four-valued bit: `v` its value, `x` true where it is unknown (then `v` does
/// not matter), `s` true where it is unknown by a rule of the language rather than
/// by an x the source assigns (s implies x).
struct Bit {
    Literal v = kFalse;
    Literal x = kFalse;
    Literal s = kFalse;
    bool operator==(const Bit&) const = default;
    bool operator<(const Bit& o) const { return v != o.v ? v < o.v : x != o.x ? x < o.x : s < o.s; }
};
using Bits = std::vector<Bit>;

inline Bit known(Literal v) { return {v, kFalse, kFalse}; }
/// An x the source assigns as a value (a don't-care).
inline constexpr Bit kAssignedX{kFalse, kTrue, kFalse};
/// An x by the language's rules (a select out of range, ...).
inline constexpr Bit kRuleX{kFalse, kTrue, kTrue};

constexpr Literal kUnassigned = 0xFFFFFFFFu;  // never assigned in this block
constexpr Literal kPartial = 0xFFFFFFFEu;     // assigned on some paths only
constexpr Literal kExternal = 0xFFFFFFFDu;    // not written by this block: read from outside
inline bool isSentinel(Literal l) { return l >= kExternal; }
inline bool isSentinel(Bit b) { return isSentinel(b.v); }
inline bool isConst(Literal l) { return l == kFalse || l == kTrue; }

/// Node construction with constant folding (not structural hashing: that is
/// `tidy`'s job, so the network as read keeps the design's own structure).
class Builder {
public:
    explicit Builder(net::Network& n) : net_(n) {}
    SourceLoc loc;

    Literal andN(Lits in);
    Literal orN(Lits in);
    // Constants answer at once: constant arithmetic (loop indices) makes most of these calls.
    Literal and2(Literal a, Literal b) {
        if (a == kFalse || b == kFalse) return kFalse;
        if (a == kTrue) return b;
        if (b == kTrue) return a;
        return andN({a, b});
    }
    Literal or2(Literal a, Literal b) {
        if (a == kTrue || b == kTrue) return kTrue;
        if (a == kFalse) return b;
        if (b == kFalse) return a;
        return orN({a, b});
    }
    Literal xor2(Literal a, Literal b);
    Literal mux(Literal s, Literal t, Literal e);

private:
    Literal sop(std::vector<Lits> cubes);
    net::Network& net_;
};

/// The value of bits that are all known constants (at most 64 of them).
std::optional<std::uint64_t> constValue(const Bits& b);
/// The position a constant index of at most 62 bits names (two's complement when signed);
/// none when the index is not constant or wider.
std::optional<std::int64_t> constantPosition(const Bits& idx, bool isSigned);
Bits extend(Bits b, int width, bool sign);
Lits values(const Bits& b);
inline int dimOffset(int index, int msb, int lsb) { return msb >= lsb ? index - lsb : lsb - index; }

/// Members are lowered one at a time; inside a combinational block the
/// environment maps each symbol the block writes to its current bit values.
struct Env {
    std::map<SymbolId, Bits> vars;
    Env* parent = nullptr;   ///< a function's environment: the caller's, for module signals
};

/// Thrown while lowering a member that must be kept as written after all
/// (something only the lowering finds out); the module is lowered again with
/// the member kept.
struct KeepMember {
    int member;
    std::string reason;
};

/// Members found to read bits that kept code can make x, with their reasons: all of them
/// are kept, and the module lowered again.
struct KeepMembers {
    std::map<int, std::string> members;
};

class Lowerer {
public:
    Lowerer(const ModuleDesc& m, const LowerOptions& o, const std::map<int, std::string>& forcedKept);
    Lowered run();

    // -- module assembly (lower_module.cpp)
    Bit signalBit(SymbolId sym, int off);
    Bit inputBit(SymbolId sym, int off);
    /// The member writes only LowerOptions::lintOnly signals (the writer's unused wire).
    bool drivesOnlyLintWires(const Member& mem) const;
    void recordBit(SymbolId sym, int off, Bit b);
    void lowerMember(int idx);
    /// The bits kept code can make x (keptX_); restructured statements reading them are kept.
    void markKeptXBits(const std::function<SymbolId(const std::string&)>& symbolOf);
    [[noreturn]] void fail(const std::string& msg, const SourceLoc& loc, ExitCode c = ExitCode::InputError) const {
        throw Error(msg, loc, c);
    }
    [[noreturn]] void keep(const std::string& reason) const;
    /// Location of an expression or statement range of the member being lowered.
    SourceLoc here(std::uint32_t start) const;
    std::string bitName(SymbolId sym, int off) const;
    const Symbol& sym(SymbolId s) const { return ir_.symbols[s]; }
    bool isLocal(SymbolId s) const { return ir_.symbols[s].local; }

    // -- four-valued bit operations (lower_expr.cpp)
    Literal anyX(const Bits& a);
    Literal anyS(const Bits& a);
    /// The rule flag of a result that is unknown where `x` is: unknown by a rule when
    /// an operand was (conservative: a mixed cause counts as a rule).
    Literal ruleOf(Literal x, Literal operandsS) { return b_.and2(x, operandsS); }
    Bit bNot(Bit a) { return {negateLiteral(a.v), a.x, a.s}; }
    Bit bAnd(const Bits& in);
    Bit bOr(const Bits& in);
    Bit bXor(Bit a, Bit b) { return {b_.xor2(a.v, b.v), b_.or2(a.x, b.x), b_.or2(a.s, b.s)}; }
    /// `s ? t : e` with a known select.
    Bit bMux(Literal s, Bit t, Bit e) { return {b_.mux(s, t.v, e.v), b_.mux(s, t.x, e.x), b_.mux(s, t.s, e.s)}; }
    /// `s ? t : e` (11.4.11: an unknown select merges the two values bit by bit).
    Bit bCond(Bit s, Bit t, Bit e);
    /// The logical value of a vector (11.4.7): 1 if a bit is 1, 0 if all are 0, else x.
    Bit truth(const Bits& a);
    /// Keeps the current statement when an x the source assigns can reach `where`, a point
    /// where Verilog turns x into a definite outcome (the else branch, no case item, `===`
    /// false). Reading that x as a don't-care would let a rewrite of its statement change
    /// this one; kept, this statement keeps the x's statement as written too (its x then
    /// reaches kept code). An x by the language's rules is modelled exactly and passes.
    void xDecides(Literal x, Literal s, const char* where, const char* clause);
    /// `a == b` (11.4.5); `wild` treats the unknown bits of `b` as wildcards (`==?`, 11.4.6).
    Bit equality(const Bits& a, const Bits& b, bool wild = false);

    // -- expressions (lower_expr.cpp)
    Bits eval(ExprId e);
    Literal equal(const Lits& a, const Lits& b);
    Literal lessThan(Lits a, Lits b, bool sign);
    Lits add(const Lits& a, const Lits& b, Literal cin);
    Lits mul(const Lits& a, const Lits& b, int w);
    Lits shift(const Lits& a, const Lits& amount, bool left, Literal fill, int w);
    /// Quotient (or remainder) of w-bit values, truncating toward zero (11.4.2); `b` not 0.
    Lits divide(const Lits& a, const Lits& b, bool isSigned, bool remainder);
    /// Literal true when `idx` (its own width and signedness) equals the position `p`;
    /// false when `p` is a value `idx` cannot take.
    Literal indexIs(const Lits& idx, bool isSigned, std::int64_t p);
    Bits selectElement(const Bits& v, const Bits& idx, bool idxSigned, int msb, int lsb, int ew);
    Bits evalRef(SymbolId s, int width);
    /// The value of a call: the function's body run on the arguments (its locals are its own).
    Bits callFunction(std::uint32_t f, const std::vector<Bits>& args, int width);
    Bits readBits(SymbolId s, const std::vector<int>& offs);
    /// For a chain of constant selects that ends in a signal (`s.f[1]`, `m[2][3:0]`), the signal
    /// and the bit offsets the chain selects (-1 where out of range); false for anything else.
    bool constantSelect(ExprId id, SymbolId& sym, std::vector<int>& offs) const;
    Bits wordOp(ExprId e, int w, std::string_view op, bool unary, const Bits* a, const Bits* b, Literal x,
                Literal sx);
    bool operandUndriven(ExprId e) const;
    /// Name of a word operation's result (see lower_expr.cpp, "Names of word results").
    std::string wordResultName(ExprId e, std::string_view op, bool unary);
    /// What an operand reads, for a result's name: a stem ("" when it is not a plain
    /// reference, select, conversion or zero-extension of one, or a small constant) and the
    /// select that tells two reads of one signal apart ("7_4"; "" for the whole).
    std::pair<std::string, std::string> operandStem(ExprId e) const;
    bool nameTaken(const std::string& n) const;

    // -- statements and targets (lower_stmt.cpp)
    void exec(StmtId s);
    /// A `case` or a case table: every label's condition, then the items' values merged per bit
    /// (a parallel sum of products when the labels are exclusive constants, else a priority chain).
    void execCase(StmtId s);
    /// The condition that a constant label (bits MSB first) matches the selector `selW`, already
    /// at the case width (12.5); `pattern` gets the label's bits MSB first with '-' for a
    /// wildcard, and is left empty when the label can never match.
    Literal caseLabelCond(const std::string& bits, bool labelSigned, bool selSigned, const Bits& selW,
                          CaseKind kind, bool selMaybeUnknown, std::string& pattern);
    void mergeInto(Env& target, const Env& other, Literal cond);
    /// Bits a block leaves unassigned on a path that cannot happen by the source's
    /// own statement (an incomplete `unique`/`priority` case or if, `(* full_case *)`)
    /// become don't-cares.
    void unassignedToUnknown(Env& env);
    void assignTarget(ExprId lv, const Bits& rhs, bool inBlock);
    /// One place a target can name: the condition that it is the one named, and per bit of
    /// the target the symbol's bit written there (-1: out of range, not written).
    using Placement = std::pair<Literal, std::vector<int>>;
    /// The places a chain of selects down to a symbol (`sym`) can name.
    std::vector<Placement> targetPlaces(ExprId lv, SymbolId& sym);
    /// Bits of its symbol a target may write (every bit a variable select can reach).
    std::vector<int> targetBits(ExprId lv, SymbolId& sym) const;
    void targetWriteSet(ExprId lv, std::vector<std::pair<SymbolId, int>>& out) const;
    void stmtWriteSet(StmtId s, std::vector<std::pair<SymbolId, int>>& out) const;
    /// Why a member cannot be lowered (empty when it can).
    std::string unsupportedReason(const Member& mem) const;

    const ModuleDesc& m_;
    const Ir& ir_;
    LowerOptions opts_;
    std::map<int, std::string> forcedKept_;    // member index -> why it is kept after all
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
    std::vector<std::vector<std::uint8_t>> keptX_;  // per symbol, per bit: kept code can make it x
    std::map<int, std::string> xReaders_;      // restructured members reading such a bit -> why kept
    std::vector<Literal> outputUnknown_;       // per network output: its unknown flag
    std::vector<Literal> outputRuleX_;         // per network output: unknown by a rule of the language
    std::set<ExprId> assignedX_;               // constants whose x bits the current member assigns as values
    bool assignedXMade_ = false;               // an x the source assigns was lowered (see xDecides)
    std::vector<int> xDecidedEarly_;           // members where x reached a decision before one was
    Env* env_ = nullptr;                       // current combinational block
    const Member* current_ = nullptr;
    int depth_ = 0;                            // nesting of on-demand member lowering
    // Members being lowered because a signal they drive was read: (member, signal).
    // On a loop the tail of this chain from the repeated member names the loop.
    std::vector<std::pair<int, SymbolId>> resolving_;
    int stmtDepth_ = 0;
    int callDepth_ = 0;
    const Function* function_ = nullptr;       // the function whose body is being lowered, if any
    int wordCount_ = 0;
    std::map<int, int> wordsOfMember_;         // member id -> word operations lowered in it
    std::set<std::string> otherNames_;         // parameters, named constants, functions (filled on first use)
    std::set<std::string> usedNames_;
};

/// Every expression reachable from a member's statements and targets, each once. With
/// `readsOnly`, a target's written signal is left out (a select's position is kept): what the
/// member reads, in its statements and in the functions it calls.
std::vector<ExprId> memberExprs(const Ir& ir, const Member& m, bool readsOnly = false);
/// What a member reads of one signal: bits [lo, hi] of it, or all of it when lo < 0.
struct ReadSpan {
    SymbolId sym;
    int lo, hi;
};
/// The signals a member reads (as memberExprs with `readsOnly`), each read through a select
/// of constant position given as the bits it names, any other read as the whole signal: the
/// order of lowering depends only on the bits a statement reads. A span may repeat.
std::vector<ReadSpan> memberReadSpans(const Ir& ir, const Member& m);
/// The case tables of a member's statements and of the functions it calls.
std::vector<const CaseTable*> memberCaseTables(const Ir& ir, const Member& m);
/// Constants a member assigns as values (through ?:, concatenations, conversions):
/// their x bits are the author's don't-cares.
void collectAssignedX(const Ir& ir, const Member& m, std::set<ExprId>& out);

} // namespace kerf::frontend::detail
