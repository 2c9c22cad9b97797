// kerf/proof/boundary.h — what a proof between two versions of a module
// compares, and what it leaves to the statements both keep as written.
//
// The networks compare the logic kerf lowers. Everything else — registers,
// instances, blocks kerf cannot lower, parameter-dependent logic, text the
// current defines leave out — is kept code. Kept statements of the two
// sides are paired by their match keys (the reader's digest of their
// tokens as slang reads them, whitespace and comments ignored, with the
// types, values and definitions their names refer to). A matched pair
// bounds the proof: its outputs are free inputs shared by name, the
// signals it reads are compared as outputs. A kept statement without a
// partner leaves the logic it drives uncompared, so the result can only be
// "different" (when a compared output already differs) or "undecided",
// never "equivalent".
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"
#include "kerf/proof/equivalence.h"

#include <string>
#include <utility>
#include <vector>

namespace kerf::proof {

/// A statement one side keeps as written.
struct KeptStatement {
    int member = -1;
    frontend::SourceRange src;
    std::string what, reason, key;
    std::vector<std::string> writes;
};

/// "file:line: what (reason)".
std::string describeKept(const KeptStatement& k);

/// Kept statements of two designs paired by match key (source order within a key).
struct KeptMatch {
    std::vector<std::pair<KeptStatement, KeptStatement>> matched;
    std::vector<KeptStatement> onlyA, onlyB;
};

/// Members of `m` the lowering did not replace.
std::vector<KeptStatement> keptStatements(const frontend::ModuleDesc& m, const frontend::Lowered& low);

KeptMatch matchKept(const frontend::ModuleDesc& a, const frontend::Lowered& lowA, const frontend::ModuleDesc& b,
                    const frontend::Lowered& lowB);

/// Matched pairs whose source bytes differ ("file:line" of each pair's first side).
/// `kerf restructure` keeps statements byte for byte, so any entry is a kerf bug.
std::vector<std::string> keptTextDiffers(const KeptMatch& match);

/// One side of a bounded proof: the module as read and its network lowered for the proof.
struct ProofSide {
    const frontend::ModuleDesc& desc;
    const frontend::Lowered& low;
};

struct BoundedResult {
    Verdict verdict = Verdict::Undecided;
    ProofResult proof;                        ///< over the outputs both networks compute
    KeptMatch kept;
    /// Outputs one network computes while the other leaves them to kept code
    /// without a partner (so they are not compared), "name (first|second)".
    std::vector<std::string> oneSided;
    /// Output-port bits one side drives and the other drives with nothing.
    std::vector<std::string> undrivenOnOneSide;
    /// Of kept.onlyA/onlyB: elaboration-time constructs that drive no signal of the module
    /// (a generate block holding only checks, such as kerf's --param guard; an elaboration
    /// task). They cannot change an output, so they do not make the result undecided; they
    /// are listed.
    std::vector<KeptStatement> inert;
    std::size_t comparedOutputs = 0;
};

/// Compare two versions of a module at the boundary described above. Throws
/// kerf::Error (exit 2) when the port lists differ.
BoundedResult proveBounded(const ProofSide& a, const ProofSide& b, const ProofOptions& opts);

} // namespace kerf::proof
