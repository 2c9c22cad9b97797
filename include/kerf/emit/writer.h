// kerf/emit/writer.h — restructured logic written back into the source file.
//
// The writer replaces, in place, only the statements whose outputs get
// smaller by at least the stated margin; every other byte of the file stays.
// Outputs keep the author's names and statement kinds (`assign` stays
// `assign`, a combinational block stays a block of the same kind); nodes
// whose function an author's signal already computes are referred to by that
// signal's name; new shared wires get descriptive names and are declared just
// before the first statement that uses them. No declaration is deleted except
// module-scope loop counters of replaced blocks.
#pragma once

#include "kerf/algebra/cover.h"
#include "kerf/frontend/lower.h"
#include "kerf/network/network.h"

#include <string>
#include <vector>

namespace kerf::emit {

/// The smallest saving for which a group of statements is rewritten.
struct MinGain {
    double value = 1;        ///< two-input gates, or percent of the group's size when `percent`
    bool percent = false;
    /// Parse "N" (gates) or "N%" (percent); throws kerf::Error (usage) on anything else.
    static MinGain parse(const std::string& text);
    std::string str() const;
    /// The margin in two-input gates for a design of `size` gates.
    double gatesOf(std::size_t size) const { return percent ? value * static_cast<double>(size) / 100.0 : value; }
};

struct WriteOptions {
    /// Prefix of every new wire name (empty: descriptive names alone).
    std::string prefix;
    MinGain minGain;
    /// Longest line the writer produces where it can break an expression.
    std::size_t lineLimit = 100;
    /// Write registers the source only names by their names (comparisons, one choice among
    /// names) where that keeps the bounds below; false: bits only.
    bool names = true;
    /// Depth a named form may reach (the goal's bound; -1: the bitwise form's depth).
    int depthBound = -1;
    /// Longest name the writer gives a new wire, the prefix not counted (docs/guide.md
    /// "Names of new wires"): a longer descriptive name gives way to the first output the
    /// wire feeds and an index, itself shortened to fit.
    std::size_t maxNameLength = 26;
    /// Fewest new wires written as one vector wire (docs/guide.md; src/emit/wire_vectors.cpp):
    /// two bits read apart (`x[1]`, `x[0]`) read worse than two names.
    std::size_t minWireFamily = 3;
    /// Text a gate saved may cost (docs/guide.md, "Text for gates"): a group whose rewrite
    /// is more than twice as long as the statements it replaces (characters other than blanks)
    /// and adds more than this many characters per gate it saves stays as written. Applies
    /// with a positive --min-gain; 0 turns the rule off.
    std::size_t maxTextPerGate = 40;
};

/// One group of statements that share restructured logic: replaced together or kept together.
struct StatementGroup {
    std::vector<int> members;                 ///< member ids, source order
    std::vector<std::pair<int, int>> lines;   ///< line ranges (1-based, inclusive) of those statements
    std::vector<std::string> outputs;         ///< signals the group drives
    std::size_t gatesBefore = 0;              ///< two-input gates of its logic as written
    std::size_t gatesAfter = 0;               ///< of the restructured logic that would replace it
    bool replaced = false;
    /// Replaced because a signal it writes, computed from others as written, turned out constant
    /// (F355): it counts as a gain though its gates as read are already 0.
    bool foldsToConstant = false;
    std::string reason;                       ///< why it was kept as written (empty when replaced)
};

/// Whether the text rule (WriteOptions::maxTextPerGate) kept group `g` as written.
bool keptForText(const StatementGroup& g);

/// One named form the writer weighed against the bitwise form (naming_cost.cpp): for
/// `--report`'s "naming" list and -v's `naming:` lines.
struct NamingDecision {
    /// "comparisons" (a register's functions as comparisons with its names, all at once),
    /// "comparisons one by one" (the same, each rewrite on its own), "choice" (a target as one
    /// choice among names), "written file" (the file as read back, checked by the flow).
    std::string form;
    std::string signal;           ///< the register or target ("" for the written file)
    bool made = true;             ///< false: no such form exists (a choice no name covers)
    bool kept = false;            ///< written by name
    std::size_t gates = 0, depth = 0;   ///< figures of the whole module with this form
    std::size_t rewritesKept = 0, rewritesTried = 0;   ///< "comparisons one by one"
    std::string reason;           ///< why kept or not: the bound or margin it keeps or breaks
};

/// What the naming weighed: the bitwise form, the bounds a named form must keep, each decision.
struct NamingRecord {
    bool weighed = false;         ///< the module has registers of named values
    std::size_t bitwiseGates = 0, bitwiseDepth = 0;
    std::size_t depthBound = 0;   ///< the goal's depth bound (or the bitwise form's depth)
    double gateLimit = 0;         ///< bitwise gates plus the --min-gain margin
    std::vector<NamingDecision> decisions;
};

struct WriteResult {
    std::string text;             ///< the whole rewritten file
    std::string file;             ///< the file it replaces
    bool changed = false;         ///< text differs from the file as read
    std::vector<StatementGroup> groups;
    std::vector<std::string> wiresAdded;   ///< new wire names, in the order declared
    std::vector<std::string> namesKept;    ///< author signals whose name now names restructured logic
    /// The header comment line written above the first change ("" when unchanged):
    /// its byte offset and length in `text`, so the caller can fill in the figures.
    std::size_t headerPos = 0, headerLen = 0;
    std::string newline = "\n";   ///< the file's line ending
    /// Bits the replaced statements read and the rewrite no longer does (its function does not
    /// depend on them), as Verilog references; they are gathered in `unusedWire` so that lint
    /// does not report them (a signal named `*unused*`: common trade practice). Empty: none.
    std::vector<std::string> notRead;
    /// Named constants (localparams, package constants) only the replaced statements named and
    /// the new text does not; also read by `unusedWire` (and listed in `notRead`).
    std::vector<std::string> constantsNotNamed;
    std::string unusedWire;
    /// Signals written by their names: domains compared by name, targets written as one choice.
    std::vector<std::string> namedDomains, namedChoices;
    /// What the naming weighed (one line per item), for -v.
    std::string namingLog;
    NamingRecord naming;
};

/// What the writer needs besides the module description.
struct WriteInput {
    const frontend::ModuleDesc* module = nullptr;
    const frontend::Lowered* lowered = nullptr;      ///< as read (outputs, members replaced, word operations)
    const net::Network* original = nullptr;          ///< the network as read, before any pass
    const net::Network* network = nullptr;           ///< the restructured network (same outputs)
    const std::vector<algebra::Factored>* forms = nullptr;   ///< factored form per node of `network`
    const std::vector<algebra::Factored>* originalForms = nullptr;   ///< factored form per node of `original`
    /// All replaced statements form one group (internal signals were dissolved into the logic).
    bool oneGroup = false;
};

/// Produce the rewritten source of the file holding the module.
WriteResult writeModule(const WriteInput& in, const WriteOptions& opts = {});

/// Replace the header comment of `r.text` by `line` (without comment marker or newline).
void setHeader(WriteResult& r, const std::string& line);

/// Is `p` usable as the start of a Verilog identifier (IEEE 1800 simple identifier rules)?
bool validIdentifierPrefix(const std::string& p);

} // namespace kerf::emit
