// kerf/frontend/module.h — the module as the slang reader describes it.
//
// `readModule` runs the Python reader (src/reader/kerf_read.py, started by
// kerf/io/reader.h) on the user's files; `parseDescription` turns its description
// (docs/reader-format.md) into these structures and the typed IR of
// kerf/frontend/ir.h, validated once with located errors.
#pragma once

#include "kerf/diagnostics.h"
#include "kerf/frontend/ir.h"

#include <nlohmann/json_fwd.hpp>

#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace kerf::frontend {

/// A byte range in a source file plus the line/column of its start.
struct SourceRange {
    std::string file;
    std::size_t start = 0;
    std::size_t end = 0;
    int line = 0;
    int col = 0;
    SourceLoc loc() const { return SourceLoc{file, line, col}; }
};

/// Where a signal is declared, for removing it when the rewrite dissolves it.
struct Declarator {
    std::string file;
    std::size_t start = 0, end = 0;          ///< the declarator itself
    std::size_t stmtStart = 0, stmtEnd = 0;  ///< its declaration statement
    int count = 1;                           ///< declarators in the statement
};

enum class PortDir { None, Input, Output, Inout };

/// A module-scope net or variable (ports included). `width`/`msb`/`lsb`
/// describe it flattened to one packed vector; `type` is its declared type.
struct Signal {
    std::string name;
    bool isVariable = false;   ///< reg/logic variable (vs. net)
    int width = 1;
    bool isSigned = false;
    int msb = 0, lsb = 0;
    bool vector = false;       ///< declared with a range (or of a multi-bit type)
    PortDir dir = PortDir::None;
    SourceRange src;
    std::optional<Declarator> decl;
    TypeId type = kNoId;       ///< declared type (ModuleDesc::ir.types)
    SymbolId symbol = kNoId;   ///< its symbol in the IR
    bool packed = true;        ///< false for unpacked arrays, real, string, ...
    std::vector<std::string> attributes;   ///< attribute names on the declaration, e.g. "keep"
    /// Names of its bits by offset, when the source selects its bits only through named values
    /// of an enum (`state[IDLE]`, bit_names.cpp); empty otherwise, "" for a bit no value names.
    std::vector<std::string> bitNames;

    /// Declared index of bit `offset` (offset 0 = least significant).
    int indexOf(int offset) const { return msb >= lsb ? lsb + offset : lsb - offset; }
    /// Offset of declared index `index`, or -1 when out of range.
    int offsetOf(int index) const;
    bool hasAttribute(std::string_view a) const;
};

enum class MemberKind { Assign, Comb, Kept };

/// Byte ranges `[start, end)` in the member's file of the comments attached to it.
struct MemberComments {
    std::vector<std::pair<std::size_t, std::size_t>> above;     ///< comment lines directly above it
    std::vector<std::pair<std::size_t, std::size_t>> inside;    ///< comments inside its text
    std::vector<std::pair<std::size_t, std::size_t>> trailing;  ///< a comment after it on its last line
};

/// One module member: a continuous assignment, a combinational block or kept code.
struct Member {
    int id = 0;
    MemberKind kind = MemberKind::Kept;
    SourceRange src;
    std::vector<std::string> reads, writes;
    bool netDecl = false;      ///< `wire x = e;` initializer
    std::string what, reason;  ///< for kept members
    // Assign: target and value. Comb: body (a block) and its local variables.
    ExprId lhs = kNoId, rhs = kNoId;
    StmtId body = kNoId;
    std::vector<SymbolId> locals;
    std::string style;         ///< comb: "always_comb" or "always_star"
    std::string label;         ///< comb: the block's label (`begin : p_decode`), "" when none
    bool endLabel = false;     ///< comb: the label is repeated after `end` (`end : p_decode`)
    MemberComments comments;
    /// Kept members: bits written, per signal, as inclusive offset ranges from the
    /// least significant bit, where slang knows them statically. A written signal
    /// without an entry is written as a whole.
    std::map<std::string, std::vector<std::pair<int, int>>> writeRanges;
    /// Kept members: bits read, per signal, as inclusive offset ranges, where every read of
    /// that signal is a static select. A read signal without an entry is read as a whole.
    std::map<std::string, std::vector<std::pair<int, int>>> readRanges;
    /// Kept members: every module signal their text names, inactive generate branches included.
    std::vector<std::string> mentions;
    /// Kept members: their own text can make what they write x or z by the language's rules
    /// (an x/z constant, a select that can fall out of range, a division by what can be 0, a
    /// gate primitive); reading a signal that can be x is followed by the lowering.
    bool mayBeX = false;
    /// Kept members: an always block that writes only at an edge (`always_ff`,
    /// `always @(posedge clk)`): no path from what it reads to what it writes within one
    /// evaluation (the writer's loop check between statements skips it).
    bool clocked = false;
    /// Kept members whose text can make only some of what they write x: those signals
    /// (empty: every signal it writes, when mayBeX).
    std::vector<std::string> xWrites;
    /// Digest of the member's tokens and of what its names mean (src/reader/kerf_symbols.py):
    /// two kept members with equal keys behave alike on equal inputs (`kerf equiv`).
    std::string matchKey;
    /// Overridable parameters the member's function depends on (src/reader/kerf_params.py);
    /// for a member kerf may restructure, all of them are pinned with --param.
    std::vector<std::string> params;
    /// Named constants its text refers to (indices into ModuleDesc::constants).
    std::vector<int> constants;
};

/// A localparam or package constant the logic names (src/reader/kerf_describe.py): the writer
/// names it where it writes a comparison the source made with it (`cmd == CMD_RD`).
struct NamedConstant {
    std::string name;
    std::string ref;           ///< text naming it from the module (`CMD_RD`, `pkg::CMD_RD`)
    std::string bits;          ///< its value, most significant bit first (0/1 only)
    int msb = 0, lsb = 0;      ///< its declared range
    bool sliceable = false;    ///< a one-dimensional vector: `NAME[7:4]` is valid text
    bool elsewhere = false;    ///< also named outside the members (declarations, constants)
    /// Bits `lo..hi` (offsets) of `signal` compared with the constant's bits from `constLo` up.
    struct Compare {
        std::string signal;
        int lo = 0, hi = 0, constLo = 0;
    };
    std::vector<Compare> compared;
    int width() const { return static_cast<int>(bits.size()); }
    /// Bit at offset `k` (0 = least significant).
    bool bit(int k) const { return bits[bits.size() - 1 - static_cast<std::size_t>(k)] == '1'; }
};

/// A parameter of the module that an instance can override (src/reader/kerf_params.py).
struct Parameter {
    std::string name;
    bool isType = false;
    bool pinned = false;        ///< set with --param: the logic depending on it is specialised
    std::string value;          ///< the value elaborated, as slang prints it
    std::string literal;        ///< a sized Verilog literal of the value ("" when not integral)
    bool implicitType = false;  ///< declared without a type, so an override may change its width
    int keptMembers = 0;        ///< members kept as written because they depend on it (not pinned)
    SourceRange src;
};

/// The module as read.
struct ModuleDesc {
    std::string name;
    SourceRange src;
    std::vector<std::string> portOrder;
    std::map<std::string, Signal> signals;
    std::vector<Member> members;
    std::vector<Parameter> parameters;   ///< overridable parameters, declaration order
    std::vector<NamedConstant> constants; ///< named constants the logic compares with or names
    std::vector<std::string> conditionals; ///< "file:line: `ifdef X" directives inside the module
    /// Leaf members of packed struct/union ports ("inner.a", bit offset from the LSB, width),
    /// most significant first; for counterexamples shown by member.
    struct PortMember {
        std::string name;
        int offset = 0, width = 1;
    };
    std::map<std::string, std::vector<PortMember>> portMembers;
    Ir ir;

    /// The signal of a symbol, or null for a block local.
    const Signal* signalOf(SymbolId s) const;
    /// Location of a byte range of a member's file (`start` kNoId: the member itself).
    SourceLoc locate(const Member& m, std::uint32_t start) const;
};

/// What to read: the same options slang takes.
struct ReadOptions {
    std::vector<std::string> files;
    std::vector<std::string> includeDirs;
    std::vector<std::string> defines;
    std::vector<std::string> params;     ///< NAME=VALUE top-level parameter overrides (--param)
    /// Describe this build only: lower logic that depends on overridable parameters or on the
    /// preprocessor for the values and defines given (proofs of one build, `kerf equiv`).
    bool asBuilt = false;
    std::string top;
    /// Replace a file by another when reading (used to read back kerf's own output).
    std::map<std::string, std::string> substitute;
    /// Reading back kerf's own rewrite for its measure and proof: a file listing the texts of
    /// the original's members (`memberTextList`). The reader then leaves out what only the
    /// writer uses (comments, named constants) and keys only members whose text is listed
    /// (docs/reader-format.md, "Reading back a rewrite"). Empty: a full description.
    std::string readBackTexts;
};

/// One line `LENGTH CRC32` per member of `d` (the bytes of its source range; CRC-32 of
/// IEEE 802.3, as zlib computes it), for `ReadOptions::readBackTexts`; nullopt when a
/// member's file cannot be read (then the rewrite is described in full).
std::optional<std::string> memberTextList(const ModuleDesc& d);

/// The reader's command-line arguments for `opts` (after the script name).
std::vector<std::string> readerArguments(const ReadOptions& opts);

/// Run the reader and parse its description. Throws kerf::Error (slang's own
/// messages have already reached stderr when the reader fails).
ModuleDesc readModule(const ReadOptions& opts);

/// Parse a description from its text (the reader's output). A description
/// that is not valid is kerf's own bug: kerf::Error with ExitCode::Internal.
ModuleDesc parseDescription(std::string_view text);
/// Fills Signal::bitNames from the selects of the module's expressions (bit_names.cpp);
/// parseDescription calls it.
void nameSelectedBits(ModuleDesc& m);
ModuleDesc parseDescription(const std::string& text);
/// Parse a description already parsed as JSON (tests).
ModuleDesc parseDescription(const nlohmann::json& j);

/// Verilog text for a signal name: plain identifiers as they are, others escaped (`\name `).
std::string verilogName(const std::string& name);

} // namespace kerf::frontend
