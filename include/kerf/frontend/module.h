// kerf/frontend/module.h — the module as the slang reader describes it.
//
// `readModule` runs the Python reader (src/reader/kerf_read.py, started by
// kerf/io/reader.h) on the user's files and parses its JSON (docs/reader-format.md) into these
// plain structures. Expression and statement trees stay as JSON: the
// lowering walks them directly.
#pragma once

#include "kerf/diagnostics.h"

#include <nlohmann/json.hpp>

#include <map>
#include <optional>
#include <string>
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

/// A module-scope net or variable (ports included), flattened to one packed vector.
struct Signal {
    std::string name;
    bool isVariable = false;   ///< reg/logic variable (vs. net)
    int width = 1;
    bool isSigned = false;
    int msb = 0, lsb = 0;
    bool vector = false;       ///< declared with a range
    PortDir dir = PortDir::None;
    SourceRange src;
    std::optional<Declarator> decl;

    /// Declared index of bit `offset` (offset 0 = least significant).
    int indexOf(int offset) const { return msb >= lsb ? lsb + offset : lsb - offset; }
    /// Offset of declared index `index`, or -1 when out of range.
    int offsetOf(int index) const;
};

enum class MemberKind { Assign, Comb, Kept };

/// One module member: a continuous assignment, a combinational block or kept code.
struct Member {
    int id = 0;
    MemberKind kind = MemberKind::Kept;
    SourceRange src;
    std::vector<std::string> reads, writes;
    bool netDecl = false;      ///< `wire x = e;` initializer
    std::string what, reason;  ///< for kept members
    nlohmann::json body;       ///< the member's JSON object (lhs/rhs or body/locals)
    /// Digest of the member's tokens and of what its names mean (src/reader/kerf_symbols.py):
    /// two kept members with equal keys behave alike on equal inputs (`kerf equiv`).
    std::string matchKey;
    /// Overridable parameters the member's function depends on (src/reader/kerf_params.py);
    /// for a member kerf may restructure, all of them are pinned with --param.
    std::vector<std::string> params;
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
    std::vector<std::string> conditionals; ///< "file:line: `ifdef X" directives inside the module
    /// Leaf members of packed struct/union ports ("inner.a", bit offset from the LSB, width),
    /// most significant first; for counterexamples shown by member.
    struct PortMember {
        std::string name;
        int offset = 0, width = 1;
    };
    std::map<std::string, std::vector<PortMember>> portMembers;
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
};

/// The reader's command-line arguments for `opts` (after the script name).
std::vector<std::string> readerArguments(const ReadOptions& opts);

/// Run the reader and parse its description. Throws kerf::Error (slang's own
/// messages have already reached stderr when the reader fails).
ModuleDesc readModule(const ReadOptions& opts);

/// Parse a description already in memory (tests, and the reader's output).
ModuleDesc parseDescription(const nlohmann::json& j);

/// Verilog text for a signal name: plain identifiers as they are, others escaped (`\name `).
std::string verilogName(const std::string& name);

} // namespace kerf::frontend
