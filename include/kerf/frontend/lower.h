// kerf/frontend/lower.h — from the module's typed IR to the Boolean network.
//
// Continuous assignments and combinational blocks become network logic;
// their statements are executed symbolically (blocking assignments update
// an environment of bit values; if/case merge branches with multiplexers or,
// for cases with mutually exclusive items, a parallel sum of products).
// Signals crossing to kept code become network inputs and outputs; so do
// internal signals that restructured code drives (no declaration is lost)
// unless `dissolveInternal` is set.
#pragma once

#include "kerf/frontend/module.h"
#include "kerf/network/network.h"

#include <cstdint>
#include <map>
#include <string>
#include <vector>

namespace kerf::frontend {

/// One bit of a named vector: the signal (module signal or generated word
/// operand) and the bit's offset from the least significant bit.
struct BitRef {
    std::string signal;
    int offset = 0;
};

/// A word-level operation kept as written: its operands leave the network
/// as outputs (or name a signal the network does not drive), its result
/// enters the network as inputs.
struct WordOp {
    std::string op;                   ///< Verilog operator, e.g. "+", "<", "<<"
    bool unary = false;
    bool isSigned = false;            ///< operands are signed
    std::string result;               ///< generated vector name of the result
    int resultWidth = 1;
    struct Operand {
        std::string name;             ///< generated vector (network outputs) or a signal name
        int width = 1;
        bool generated = true;
    };
    std::vector<Operand> operands;
};

struct LowerOptions {
    /// Turn word-level arithmetic into gates (for the proof) instead of keeping it.
    bool bitBlastArithmetic = false;
    /// Prefix of every generated name.
    std::string prefix = "kf_";
    /// Prefix of the names a word operation's result takes from what it computes
    /// (`a_plus_b`, `lvl_gt_thresh`): the user's --wire-prefix, none by default.
    std::string namePrefix;
    /// Let internal signals that only restructured code reads disappear into the
    /// logic (their declarations are removed). Off by default: every declared
    /// signal stays declared and driven. For flat netlists with thousands of wires.
    bool dissolveInternal = false;
    /// Internal signals that stay outputs even when dissolving (the proof reads
    /// kerf's rewrite this way: the author's signals are compared, kerf's own wires are not).
    std::vector<std::string> observe;
    /// Signals never restructured through (besides those declared `(* keep *)`):
    /// each is an output of the logic that drives it and an input of the logic that reads it.
    std::vector<std::string> keep;
    /// Keep statements whose value can be x as written instead of reading x as a
    /// don't-care (the synthesis reading of IEEE 1364.1 / 1800).
    bool keepX = false;
    /// Members (by id) to keep as written, with the reason: another lowering of the same
    /// module kept them, and both must agree on what kerf may rewrite.
    std::map<int, std::string> keptMembers;
    /// Signals the rewrite declares only so that lint sees bits read (the writer's unused
    /// wire, read by nothing): a statement driving only these may read bits that can be x
    /// without being kept as written, since no value of it is compared or read.
    std::vector<std::string> lintOnly;
};

/// Where a network output goes.
enum class OutputKind : std::uint8_t {
    Port,          ///< a port of the module
    Internal,      ///< an internal signal (declared in the module, not a port)
    WordOperand,   ///< an operand vector of a word-level operation kerf generates
};

/// Per network output: what it drives and the member whose logic computes it.
struct OutputSource {
    OutputKind kind = OutputKind::Port;
    int member = -1;   ///< member id (ModuleDesc::members), -1 when none
};

/// A statement left as written, with the reason, for the summary and the report.
struct KeptStatement {
    int member = -1;
    SourceLoc loc;
    std::string what;     ///< e.g. "always_ff", "assign"
    std::string reason;   ///< a sentence starting with "it ..." or a short reason
}; 

/// Limits of the expression-node merge (collapseExpressionNodes).
struct ExpressionMergeLimits {
    /// A merged node never passes this many cubes (nor its reader's count, when larger).
    std::size_t maxCubes = 4096;
    /// Merges that multiply nothing out (a product into a sum, one cube into a product: the merged
    /// node's literals are those of the two apart) are made without factoring when the node would
    /// pass this many cubes (counted before contained cubes are dropped). Factoring the growing
    /// node at every step of a long sum was quadratic (F76).
    std::size_t factorCubes = 24;
    /// Merges that multiply out are not made when the node would pass this many cubes (each
    /// such step is decided by factoring, so this bounds its cost).
    std::size_t multiplyCubes = 512;
};

/// What the expression-node merge did.
struct ExpressionMergeCounts {
    std::size_t merged = 0;       ///< nodes substituted into their reader
    std::size_t unfactored = 0;   ///< of those, decided without factoring (above factorCubes)
    std::size_t keptApart = 0;    ///< not merged: they would multiply out above multiplyCubes
};

/// The network together with everything the writer needs to put it back.
struct Lowered {
    net::Network net;
    std::vector<BitRef> inputBits;     ///< per network input, in order
    std::vector<BitRef> outputBits;    ///< per network output, in order
    std::vector<OutputSource> outputSources;   ///< per network output, in order
    std::vector<int> replaced;         ///< ids of members the network replaces
    std::vector<std::string> dissolved;///< internal signals whose declarations go
    std::vector<WordOp> wordOps;
    std::vector<std::string> notes;    ///< informational remarks for the user
    std::vector<KeptStatement> kept;   ///< every member left as written, with its reason
    /// Don't-care conditions of `net`'s outputs, by output name (see the note
    /// in kerf/network/network.h); no outputs when the source assigns no x.
    net::Network dontCares;
    /// Output bits with don't-care conditions (outputs of `dontCares`).
    std::size_t dontCareBits = 0;
    /// What the expression-node merge did (filled by the caller that runs it).
    ExpressionMergeCounts merge;
};

/// Lower the module. Throws kerf::Error with a source location on
/// combinational loops, multiple drivers, latches and unsupported code.
Lowered lower(const ModuleDesc& m, const LowerOptions& opts = {});

/// One node per written expression: a logic node that names no signal (no output reads it)
/// and that one place of one other node reads is substituted into that node (its complement
/// multiplied out where read inverted), unless the reader would pass `limits.maxCubes` cubes.
/// The figures of a written file are then those of the nodes it was printed from (F42).
/// (statement_nodes.cpp)
ExpressionMergeCounts collapseExpressionNodes(net::Network& net, const ExpressionMergeLimits& limits = {});

/// Name of a bit as used for network inputs/outputs: "a" for scalars, "a[3]" for vectors.
std::string bitName(const ModuleDesc& m, const BitRef& b);

} // namespace kerf::frontend
