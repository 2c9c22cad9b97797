// kerf/frontend/ir.h — the typed front-end IR: declared types, expressions and
// statements of the module as compact arenas addressed by index.
//
// Built once from the reader's description (docs/reader-format.md) and
// validated there with located errors; nothing downstream looks at the JSON.
// Expressions and statements are stored children first (every operand index
// is smaller than the node's own), so one forward pass over an arena visits
// operands before their users and no traversal needs recursion.
#pragma once

#include "kerf/diagnostics.h"

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace kerf::frontend {

using TypeId = std::uint32_t;
using ExprId = std::uint32_t;
using StmtId = std::uint32_t;
using SymbolId = std::uint32_t;
/// "No node" (a missing `else`, `default`, an unknown type).
inline constexpr std::uint32_t kNoId = 0xFFFFFFFFu;

// ---- declared types ---------------------------------------------------------

/// How the bits of a type are organised as the source declares them.
enum class TypeKind : std::uint8_t {
    Logic,    ///< one bit (`logic`, `bit`, `reg` without a range)
    Vector,   ///< one packed dimension of single bits `[msb:lsb]` (also `int`, `byte`, ...)
    Array,    ///< a packed dimension `[msb:lsb]` of `element`s that are not single bits
    Struct,   ///< packed struct: named fields at bit offsets
    Union,    ///< packed union: named fields, all at offset 0
    Enum,     ///< enum over `base` with named values
    Other,    ///< not a packed integral type (unpacked array, real, string, ...)
};

/// A field of a packed struct or union; `offset` counts from the least significant bit.
struct TypeField {
    std::string name;
    int offset = 0;
    TypeId type = kNoId;
};

/// A named value of an enum; `bits` MSB first (empty when not a plain constant);
/// `ref` is the text naming it from the module (`IDLE`, `pkg::IDLE`), empty when none is known.
struct EnumMember {
    std::string name;
    std::string bits;
    std::string ref;
};

/// A declared type.
struct Type {
    TypeKind kind = TypeKind::Vector;
    int width = 1;
    bool isSigned = false;
    bool fourState = true;
    std::string name;   ///< typedef name, empty for an anonymous type
    std::string ref;    ///< text naming the typedef from the module (`state_t`, `pkg::req_t`), empty when none
    int msb = 0, lsb = 0;          ///< Vector, Array: the declared range
    TypeId element = kNoId;        ///< Array: element type
    TypeId base = kNoId;           ///< Enum: base type
    std::vector<TypeField> fields; ///< Struct, Union
    std::vector<EnumMember> values;///< Enum
    std::string text;              ///< Other: slang's spelling of the type
};

// ---- expressions -----------------------------------------------------------

enum class ExprKind : std::uint8_t {
    Const,      ///< constant bits (0 1 x z)
    Ref,        ///< a whole symbol (module signal or block local)
    Unary,
    Binary,
    Cond,       ///< c ? a : b
    Concat,     ///< parts, most significant first
    Replicate,  ///< {count{part}}
    Index,      ///< element select value[index] of the dimension [msb:lsb]
    Range,      ///< constant part select value[left:right] in declared coordinates
    Indexed,    ///< value[base +: width] / value[base -: width], base not constant
    Convert,    ///< extend (by the operand's signedness) or truncate to the node's width
    Call,       ///< a call of a function of Ir::functions, its body inlined
};

enum class UnaryOp : std::uint8_t { Plus, Minus, BitNot, RedAnd, RedNand, RedOr, RedNor, RedXor, RedXnor, LogicNot };

enum class BinaryOp : std::uint8_t {
    Add, Sub, Mul, Div, Mod, Pow,
    And, Or, Xor, Xnor,
    Eq, Ne, CaseEq, CaseNe, WildEq, WildNe,
    Lt, Le, Gt, Ge,
    LogicAnd, LogicOr, Implies, Equiv,
    Shl, Shr, AShl, AShr,
};

/// Verilog spelling of an operator ("~&", "<<<", ...).
std::string_view opText(UnaryOp op);
std::string_view opText(BinaryOp op);

/// One expression node. Field use by kind:
///   Const      a = offset in Ir::constBits (width characters '0' '1' 'x' 'z', LSB first)
///   Ref        a = symbol
///   Unary      a = operand                      (op = UnaryOp)
///   Binary     a, b = operands                  (op = BinaryOp)
///   Cond       a = condition, b = then, c = else
///   Concat     a = offset in Ir::lists, b = count (parts MSB first)
///   Replicate  a = part, b = count
///   Index      a = value, b = index; msb/lsb of the selected dimension
///   Range      a = value, left()/right(); msb/lsb of the selected dimension
///   Indexed    a = value, b = base, up = `+:`; msb/lsb of the selected dimension
///   Convert    a = operand
///   Call       a = function (Ir::functions), b = offset in Ir::lists, c = count (arguments)
struct Expr {
    ExprKind kind = ExprKind::Const;
    std::uint8_t op = 0;
    bool isSigned = false;
    bool up = true;
    std::uint32_t width = 1;
    TypeId type = kNoId;
    std::uint32_t start = kNoId, end = kNoId;   ///< byte range in the member's file, kNoId when unknown
    std::uint32_t a = kNoId, b = kNoId, c = kNoId;
    std::int32_t msb = 0, lsb = 0;

    UnaryOp unaryOp() const { return static_cast<UnaryOp>(op); }
    BinaryOp binaryOp() const { return static_cast<BinaryOp>(op); }
    int left() const { return static_cast<std::int32_t>(b); }
    int right() const { return static_cast<std::int32_t>(c); }
};

// ---- statements ------------------------------------------------------------

enum class StmtKind : std::uint8_t { Block, Assign, If, Case, For, Empty, CaseTable };
enum class CaseKind : std::uint8_t { Normal, Z, X, Inside };
/// `unique`/`unique0`/`priority` written on an if or case.
enum class CheckKind : std::uint8_t { None, Unique, Unique0, Priority };

/// Synthesis attributes written on a case statement.
enum CaseAttr : std::uint8_t { kFullCase = 1, kParallelCase = 2 };

struct CaseItem {
    std::uint32_t exprs = 0, count = 0;   ///< offset/count in Ir::lists (ExprIds)
    StmtId body = kNoId;
    /// Offset in Ir::itemIsCondition of one flag per expression (kNoId: none is): a flagged
    /// expression is a condition (a `case inside` range) rather than a value to match.
    std::uint32_t conditions = kNoId;
};

/// A case whose items are constant labels and whose item bodies only assign constants to
/// fixed bits, held as columns (the reader's `case_table`, docs/reader-format.md): one
/// string of labels and, per target, one string of the values every item assigns it.
struct CaseTable {
    std::uint32_t width = 0;          ///< bits per label
    bool labelsSigned = false;        ///< the labels' common type is signed
    std::uint32_t items = 0;
    std::uint32_t labelCount = 0;
    /// Offset in Ir::constBits of the labels, `width` characters each, LSB first, item by item.
    std::uint32_t labels = 0;
    /// Per item its first label (items + 1 entries); empty when every item has one label.
    std::vector<std::uint32_t> firstLabel;
    /// The assigned targets: a Ref, or a constant Range or Index of a Ref; targets may share
    /// bits, but no item assigns two that do.
    std::vector<ExprId> targets;
    /// Per target, the offset in Ir::constBits of its values: `items` runs of the target's
    /// width, LSB first; '-' where the item does not assign the target.
    std::vector<std::uint32_t> columns;
    std::vector<std::uint32_t> columnWidths;   ///< per target: the width of its runs (its width)

    std::uint32_t labelBegin(std::uint32_t item) const { return firstLabel.empty() ? item : firstLabel[item]; }
    std::uint32_t labelEnd(std::uint32_t item) const { return firstLabel.empty() ? item + 1 : firstLabel[item + 1]; }
};

struct ForInit {
    SymbolId var = kNoId;
    ExprId value = kNoId;
};

/// One statement. Field use by kind:
///   Block   a = offset in Ir::lists, b = count (StmtIds)
///   Assign  a = target (an expression of Ref/Index/Range/Indexed/Concat), b = value
///   If      a = condition, b = then, c = else (kNoId when none)
///   Case    a = selector, b = offset in Ir::caseItems, c = count, d = default (kNoId when none)
///   CaseTable  a = selector, b = index in Ir::caseTables, d = default (kNoId when none)
///   For     a = offset in Ir::forInits, b = count, c = condition,
///           d = offset in Ir::lists of the step statements, e = their count, f = body
struct Stmt {
    StmtKind kind = StmtKind::Empty;
    CaseKind caseKind = CaseKind::Normal;
    CheckKind check = CheckKind::None;
    std::uint8_t attrs = 0;   ///< CaseAttr bits
    std::uint32_t start = kNoId, end = kNoId;
    std::uint32_t a = kNoId, b = kNoId, c = kNoId, d = kNoId, e = kNoId, f = kNoId;
};

// ---- symbols and the arena -------------------------------------------------

/// A module signal or a local variable of a combinational block.
struct Symbol {
    std::string name;
    TypeId type = kNoId;
    int width = 1;
    bool isSigned = false;
    int msb = 0, lsb = 0;
    bool local = false;
    int member = -1;      ///< locals of a block: index of the member that declares them
    int function = -1;    ///< locals of a function (arguments and result included): its index
    int signal = -1;      ///< module signals: position in the description's signal list
};

/// A function the module calls, described once; every call lowers its body.
struct Function {
    std::string name;
    bool automatic = true;           ///< variables start as x at each call; static ones keep values
    SymbolId result = kNoId;         ///< the variable named like the function
    std::vector<SymbolId> args;      ///< input arguments, in order
    std::vector<SymbolId> locals;    ///< every variable of the function (arguments and result included)
    StmtId body = kNoId;             ///< a block
    std::string file;                ///< where it is declared (node ranges are offsets in it)
    SourceLoc loc;
};

/// Line starts of a file whose byte offsets the description uses.
struct FileLines {
    std::string path;
    std::vector<std::uint32_t> starts;
    /// Line and column (1-based) of byte `offset`.
    SourceLoc loc(std::uint32_t offset) const;
};

/// All nodes of one module.
struct Ir {
    std::vector<Type> types;
    std::vector<Expr> exprs;
    std::vector<Stmt> stmts;
    std::vector<std::uint32_t> lists;
    std::vector<CaseItem> caseItems;
    std::vector<CaseTable> caseTables;
    std::vector<ForInit> forInits;
    std::vector<std::uint8_t> itemIsCondition;
    std::string constBits;           ///< all constants, LSB first
    std::vector<Symbol> symbols;     ///< indexed by SymbolId
    std::vector<Function> functions;
    std::vector<FileLines> files;

    const Expr& expr(ExprId id) const { return exprs[id]; }
    const Stmt& stmt(StmtId id) const { return stmts[id]; }
    const Type& type(TypeId id) const { return types[id]; }
    /// Bit `i` (0 = least significant) of a constant: '0', '1', 'x' or 'z'.
    char constBit(const Expr& e, std::uint32_t i) const { return constBits[e.a + i]; }
    const std::uint32_t* list(std::uint32_t offset) const { return lists.data() + offset; }
    /// Location of a byte offset in `file` (no location when unknown).
    SourceLoc locate(const std::string& file, std::uint32_t offset) const;
};

/// Which child statements `forEachChild` reports for a `for` loop: the step statements
/// (`i++`) assign only the loop variable, so walks over what a block assigns or computes
/// may skip them.
enum class LoopSteps : bool { Skip = false, Visit = true };

/// Calls `sub(StmtId)` on every child statement of `s`, in source order: a block's
/// statements; then and else of an if; every item body, then the default, of a case or
/// case table; a loop's step statements (when `steps` says so), then its body.
template <typename Sub>
void forEachChild(const Ir& ir, const Stmt& s, LoopSteps steps, Sub&& sub) {
    switch (s.kind) {
    case StmtKind::Block:
        for (std::uint32_t k = 0; k < s.b; ++k) sub(ir.lists[s.a + k]);
        break;
    case StmtKind::If:
        sub(s.b);
        if (s.c != kNoId) sub(s.c);
        break;
    case StmtKind::Case:
        for (std::uint32_t k = 0; k < s.c; ++k) sub(ir.caseItems[s.b + k].body);
        if (s.d != kNoId) sub(s.d);
        break;
    case StmtKind::CaseTable:
        if (s.d != kNoId) sub(s.d);
        break;
    case StmtKind::For:
        if (steps == LoopSteps::Visit)
            for (std::uint32_t k = 0; k < s.e; ++k) sub(ir.lists[s.d + k]);
        sub(s.f);
        break;
    case StmtKind::Assign: case StmtKind::Empty: break;
    }
}

/// Calls `visit(const Stmt&)` on every statement of the trees under `roots`, depth first
/// (each statement before its children; the order every walk of the lowering shares, so
/// their results line up).
template <typename Visit>
void forEachStmt(const Ir& ir, std::vector<StmtId> roots, LoopSteps steps, Visit&& visit) {
    std::vector<StmtId>& work = roots;
    while (!work.empty()) {
        const Stmt& s = ir.stmt(work.back());
        work.pop_back();
        visit(s);
        forEachChild(ir, s, steps, [&](StmtId c) { work.push_back(c); });
    }
}

} // namespace kerf::frontend
