// kerf/diagnostics.h — source locations and user-facing errors.
#pragma once

#include <stdexcept>
#include <string>

namespace kerf {

/// A position in a source file, 1-based line and column; empty file means "no location".
struct SourceLoc {
    std::string file;
    int line = 0;
    int col = 0;
    /// "file:line:col" (or "file:line", or "" when unknown).
    std::string str() const;
};

/// Exit codes shared by every command (documented in README and `--help`).
enum class ExitCode : int {
    Ok = 0,
    Different = 1,      ///< `equiv`/`--check`: the designs differ or the file would change
    InputError = 2,     ///< bad input: syntax, elaboration, loops, drivers, latches, usage
    Unproved = 3,       ///< proof budget exhausted: not proved, not refuted
    ToolMissing = 4,    ///< Python or pyslang missing
    Internal = 5,       ///< a bug in kerf (e.g. the proof found the rewrite wrong)
    Resources = 6,      ///< out of memory or disk space (or another system limit)
};

/// An error that carries a location and an exit code; caught in main and printed.
class Error : public std::runtime_error {
public:
    Error(std::string message, SourceLoc loc = {}, ExitCode code = ExitCode::InputError)
        : std::runtime_error(std::move(message)), loc_(std::move(loc)), code_(code) {}
    const SourceLoc& loc() const { return loc_; }
    ExitCode code() const { return code_; }
    /// "file:line:col: error: message"
    std::string render() const;

private:
    SourceLoc loc_;
    ExitCode code_;
};

} // namespace kerf
