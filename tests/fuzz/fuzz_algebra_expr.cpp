// fuzz_algebra_expr.cpp — libFuzzer harness for the expression syntax of `kerf algebra`.
//
// The first byte picks the command (divide, kernels, factor), the rest is
// split at the first newline into F and D. Every input must end in a result
// or a located syntax error (exit 2), never in a crash, a hang or a
// sanitizer report. Sizes stay small (-max_len) because kernels grow
// exponentially with the number of cubes by design.
#include "kerf/algebra/algebra_command.h"

#include <cstddef>
#include <cstdint>
#include <sstream>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    if (size == 0) return 0;
    static const char* const kCommands[] = {"factor", "kernels", "divide", "factor"};
    std::string cmd = kCommands[data[0] & 3];
    std::string rest(reinterpret_cast<const char*>(data + 1), size - 1);
    std::vector<std::string> args{cmd};
    auto nl = rest.find('\n');
    args.push_back(rest.substr(0, nl));
    if (cmd == "divide") args.push_back(nl == std::string::npos ? "a" : rest.substr(nl + 1));
    if (data[0] & 4) args.push_back("--json");
    if (cmd == "factor" && (data[0] & 8)) { args.push_back("--method"); args.push_back("quick"); }
    if (cmd == "kernels" && (data[0] & 8)) args.push_back("--level0");
    std::ostringstream out, err;
    int rc = kerf::algebra::runAlgebraCommand(args, out, err);
    if (rc != 0 && rc != 2) __builtin_trap();   // only success or bad input are documented
    return 0;
}
