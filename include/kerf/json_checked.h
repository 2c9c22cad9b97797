// kerf/json_checked.h — nlohmann::json with its internal checks turned into exceptions.
//
// nlohmann::json checks some preconditions only with assert() (for example
// reading a missing key through a const operator[]), which release builds
// compile out: a malformed reader description would then read freed memory
// (found by tests/fuzz/fuzz_description). CMake force-includes this header in
// every kerf translation unit, so the library throws instead, and kerf reports
// a description it cannot read as an internal error.
#pragma once

#include <stdexcept>
#include <string>

namespace kerf {
/// Throws; in the few noexcept places of the library this ends the program cleanly instead.
[[noreturn]] inline void jsonCheckFailed(const char* what) {
    throw std::logic_error(std::string("malformed description: JSON check failed: ") + what);
}
} // namespace kerf

#define JSON_ASSERT(cond)                               \
    do {                                                \
        if (!(cond)) ::kerf::jsonCheckFailed(#cond);    \
    } while (false)

#include <nlohmann/json.hpp>
