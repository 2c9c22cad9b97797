// kerf/algebra/algebra_command.h — the `kerf algebra` subcommand.
#pragma once

#include <ostream>
#include <string>
#include <vector>

namespace kerf::algebra {

/// Runs `kerf algebra ARGS...`; `args` are the words after `algebra`
/// (e.g. {"divide", "a & c | b & c", "a | b", "--json"}).
/// Results go to `out`, messages to `err`. Returns 0 on success and 2 on bad
/// input or usage (kerf::ExitCode::InputError).
int runAlgebraCommand(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

} // namespace kerf::algebra
