// expression.h — factored forms as readable Verilog expressions (writer-internal).
//
// A node's factored form becomes a small printable tree: each sub-expression
// takes the polarity that needs the fewest inversions (so `~(~a & ~b)` prints
// as `a | b`), two-literal exclusive-or shapes print with `^`, a two-way
// choice `s & a | ~s & b` prints as `s ? a : b`, and bits of one vector
// compared against constants print as `v[7:4] == 4'h0`. The layout breaks long
// expressions at their operators, the operator leading each continuation line.
#pragma once

#include "kerf/algebra/cover.h"

namespace kerf::frontend {
struct ModuleDesc;
}

#include <cstdint>
#include <deque>
#include <optional>
#include <set>
#include <span>
#include <string>
#include <unordered_map>
#include <vector>

namespace kerf::emit {

/// How a network variable is referred to by name.
struct VarRef {
    std::string text;          ///< Verilog text: "paddr[3]", "acc_w"
    std::string signal;        ///< the vector it is a bit of (slice grouping); "" when none
    int offset = 0;            ///< bit offset from the vector's least significant bit
    int width = 1;             ///< the vector's width
    int msb = 0, lsb = 0;      ///< the vector's declared range
    bool inverted = false;     ///< the name holds the complement of the variable
    int rank = 0;              ///< order among operands of one AND/OR (lower first)
    /// A bit the source selects by a name (`state[IDLE]`, frontend::nameSelectedBits): printed
    /// alone, never grouped with other bits of its vector into a slice, comparison or reduction.
    bool byName = false;
    /// The module whose signal `signal` is: slices are then named as its declared type
    /// allows (`m[1][3:2]`, `req.hdr.tag`); null for vectors kerf generates (indexed flat).
    const frontend::ModuleDesc* module = nullptr;
};

/// A printable expression.
struct PExpr {
    enum class Kind { Zero, One, Ref, And, Or, Xor, Compare, Mux };
    Kind kind = Kind::Zero;
    bool neg = false;            ///< printed with `~` in front
    std::string text;            ///< Ref: the reference; Compare: the whole comparison
    const VarRef* ref = nullptr; ///< Ref: what it names
    int constant = -1;           ///< Compare: the named constant it names (ModuleDesc::constants)
    /// Compare: the vector whose bits [sliceLo, sliceHi] (offsets) it reads; the text alone
    /// does not say which bits a statement reads (the writer orders a block's statements by them).
    std::string sliceSignal;
    int sliceLo = 0, sliceHi = -1;
    int rank = 0;
    std::vector<PExpr> kids;     ///< And/Or/Xor operands; Mux: select, then, else

    bool atomic() const { return kind == Kind::Ref || kind == Kind::Zero || kind == Kind::One; }
};

/// Builds printable expressions for the nodes of a network.
class ExprBuilder {
public:
    /// `refs[v]`: how variable v is named, or empty when its form is written inline;
    /// `forms[v]`: the factored form of logic variable v.
    /// `reduced`: signals the source reduces (`|v`); an OR (AND) of all bits of a slice of one
    /// is written as that reduction (reductions.cpp), not as a comparison with a constant.
    ExprBuilder(const std::vector<std::optional<VarRef>>& refs, const std::vector<algebra::Factored>& forms,
                const std::set<std::string>* reduced = nullptr)
        : refs_(refs), forms_(forms), reduced_(reduced) {}

    /// The expression for a literal (a name, its complement, or an inline form).
    PExpr literal(algebra::Literal l);
    /// The definition of variable v (its form), complemented when `negate`.
    PExpr definition(std::uint32_t v, bool negate);
    /// Inversions needed to print v's form in the given polarity.
    int inversions(std::uint32_t v, bool negate);

private:
    int cost(const algebra::Factored& f, bool neg);
    int costLit(algebra::Literal l);
    PExpr build(const algebra::Factored& f, bool neg);
    PExpr buildLit(algebra::Literal l);
    void groupSlices(PExpr& e);
    void groupXorSlices(PExpr& e);
    std::vector<std::uint8_t> sliceKids(const algebra::Factored& f) const;
    bool comparisons(const algebra::Factored& f) const;
    const algebra::Factored* xorGrouped(const algebra::Factored& f);
    const algebra::Factored& choiceArm(const algebra::Factored& f, std::size_t kid, std::size_t drop);

    const std::vector<std::optional<VarRef>>& refs_;
    const std::vector<algebra::Factored>& forms_;
    const std::set<std::string>* reduced_ = nullptr;
    std::unordered_map<const algebra::Factored*, int> memo_[2];
    /// Forms made from others — sums regrouped so that each exclusive-or pair is one term
    /// (xorGrouped), the arms of a choice (choiceArm) — kept alive here because the memos are
    /// keyed by address: a form that died could hand its entry to a new one at its address.
    std::deque<algebra::Factored> regrouped_;
    std::unordered_map<const algebra::Factored*, const algebra::Factored*> regroupedOf_;
    std::unordered_map<const algebra::Factored*, const algebra::Factored*> armOf_[2];
};

/// Is f the exclusive or `x ^ y` of two variables (written as a sum `x & ~y | ~x & y`, or its
/// complement when `inverted`)? x and y are returned uncomplemented.
bool xorForm(const algebra::Factored& f, algebra::Literal& x, algebra::Literal& y, bool& inverted);

/// Adds to `out` the named constants (ModuleDesc::constants indices) that `e` names.
void collectConstants(const PExpr& e, std::set<int>& out);

/// The text of a comparison or reduction `text` complemented: `v == K` <-> `v != K`,
/// `|v` <-> `~|v`, `&v` <-> `~&v`.
std::string complementedCompare(const std::string& text);

/// The comparison of bits `loOff..hiOff` of the vector `r` is a bit of with the value
/// `bitsMsbFirst`, as the printer writes it (`opcode == 7'b0110011`, `state_q == XFER` with the
/// source's constant where it has one); `constant` is set as PExpr::constant.
std::string comparisonText(const VarRef& r, int loOff, int hiOff, const std::vector<int>& bitsMsbFirst,
                           int& constant);

/// The text of bits `loOff..hiOff` of the vector `r` is a bit of, as the printer writes a
/// slice (`opcode[6:2]`, the whole `opcode`, `req.addr[13:10]`; `{...}` where the declared type
/// splits them).
std::string sliceTextOf(const VarRef& r, int loOff, int hiOff);

/// Whether `r`'s signal is declared with an enum type (its values are named by the source).
bool vectorIsEnum(const VarRef& r);

/// Flat text of an expression (no line breaks).
std::string flatText(const PExpr& e);

/// Lay out `e` starting at column `col`: the first line continues the current
/// one, later lines carry their own indentation (spaces). Lines are broken at
/// the top-level operators when the flat text would pass `limit` (reserve
/// `tail` columns on the last line, e.g. for ";").
std::string layoutText(const PExpr& e, std::size_t col, std::size_t limit, std::size_t tail = 1);

/// Vector template: if the per-bit expressions `bits` (least significant
/// first) differ only in referring to consecutive bits of the same vectors
/// (or to the same scalar), the one vector-wide expression; else empty.
/// Whether a run has a template is closed under shortening the run from its
/// end (every condition holds for a prefix of at least two bits), which lets the
/// writer find the longest run by bisection.
std::optional<PExpr> vectorTemplate(std::span<const PExpr> bits);

} // namespace kerf::emit
