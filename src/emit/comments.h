// comments.h — the author's comments inside a replaced statement, carried into its new text
// (writer-internal). See comments.cpp for the rules.
#pragma once

#include "kerf/frontend/module.h"

#include <string>
#include <vector>

namespace kerf::emit {

/// The first line of the note kerf writes for comments whose code is gone (a case item's label,
/// a comment above an `if`, a local's assignment): each on a line of its own after the code it
/// was on or above.
inline constexpr const char* kCarriedNotesIntro =
    "// comments of the replaced code, each after the code it was on or above:";

/// `text`, the new text of the replaced member `mem` (and of `removed`, members writing the same
/// signals whose text goes), with every comment inside their old text put back: a comment on or
/// directly above an assignment goes above the new assignment of that signal; any other (a case
/// item's label, a local's assignment) into a note at the start of the block, after the code of
/// its line. `src` is the text of `mem`'s file; `ind` the statement's indentation.
std::string carryComments(const frontend::ModuleDesc& m, const std::string& src, const frontend::Member& mem,
                          const std::vector<const frontend::Member*>& removed, const std::string& text,
                          const std::string& ind, std::size_t lineLimit);

}  // namespace kerf::emit
