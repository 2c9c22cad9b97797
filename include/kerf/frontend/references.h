// kerf/frontend/references.h — Verilog text that names bits of a signal the
// way its declared type allows.
//
// Every writer of Verilog text uses these to refer to a bit or a slice of a
// signal: a plain name for a one-bit signal (never `x[0]` on a scalar or a
// one-bit enum), `mem[1][3]` for a bit of a 2-D packed array (never a flat
// `mem[35]`, which SystemVerilog reads as element 35), struct and union
// fields by name (`req.hdr.valid`), declared index coordinates for vectors
// (`asc[2:3]` on `logic [0:3] asc`), and targets of enum type assigned in a
// form every tool accepts (IEEE 1800-2017 6.19.3: a value of another type is
// not assigned to an enum without a cast).
#pragma once

#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <string>
#include <vector>

namespace kerf::frontend {

/// Text reading bits [lo, lo + count) of `signal` (offsets from its least
/// significant bit). A range that no single select names is a concatenation
/// of selects, most significant first. A name kerf generated (not a signal of
/// the module) is indexed flat.
std::string referenceText(const ModuleDesc& m, const std::string& signal, int lo, int count = 1);
/// Text reading one bit.
std::string referenceText(const ModuleDesc& m, const BitRef& bit);

/// One assignable piece of a target: assign it bits [lo, lo + count) of the value,
/// written as `valuePrefix + value + valueSuffix`.
struct TargetPiece {
    int lo = 0, count = 1;
    std::string lhs;           ///< e.g. "mem[1][3]", "req.hdr.valid", "st[1:0]", "{a.x, a.y}"
    std::string valuePrefix;   ///< e.g. "(" for a one-bit enum target
    std::string valueSuffix;   ///< e.g. ") ? ON : OFF"
};

/// How to assign bits [lo, lo + count) of `signal`: one piece, or several when
/// the range cannot be a single valid target (it includes a one-bit enum field).
std::vector<TargetPiece> targetPieces(const ModuleDesc& m, const std::string& signal, int lo, int count = 1);

} // namespace kerf::frontend
