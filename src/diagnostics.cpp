// diagnostics.cpp — rendering of source locations and errors.
#include "kerf/diagnostics.h"

#include <fmt/format.h>

namespace kerf {

std::string SourceLoc::str() const {
    if (file.empty()) return {};
    if (line <= 0) return file;
    if (col <= 0) return fmt::format("{}:{}", file, line);
    return fmt::format("{}:{}:{}", file, line, col);
}

std::string Error::render() const {
    std::string where = loc_.str();
    if (where.empty()) return fmt::format("error: {}", what());
    return fmt::format("{}: error: {}", where, what());
}

} // namespace kerf
