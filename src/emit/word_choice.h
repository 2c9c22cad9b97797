// word_choice.h — statements written as a choice among bitwise word operations (writer-internal).
//
// An ALU written as `case (op)` over `a + b`, `a & b`, `a | b`, `a ^ b`, `a << b[2:0]`, ...
// reads as one choice. The engine's rewrite merges its bitwise arms, which are gates over the
// same operands, into and-or terms that mix the arms and that no `case` or `?:` can show
// (F191). The writer's text rule (Writer::textHeavy) keeps such a statement as written when
// its rewrite is more than twice its text (docs/guide.md, "Text for gates"), whatever it
// saves: a choice written again as a choice would cost what the source costs, so keeping it
// is the honest form. Arithmetic and shift arms stay word operations, each one term of the
// rewrite: a choice among those (a shifter) reads as a choice rewritten too.
#pragma once

#include "kerf/frontend/module.h"

#include <string>

namespace kerf::emit {

/// The name of a vector (at least two bits) that `mem` assigns as a choice among at least
/// three values of which at least three are bitwise operations on vectors (`a & b`, `a | b`,
/// `a ^ b`, `~a`): the arms of a `case` (items and default), an if / else-if chain, or a `?:`
/// chain; "" when none.
std::string wordChoiceTarget(const frontend::ModuleDesc& m, const frontend::Member& mem);

} // namespace kerf::emit
