// kerf/io/process.h — running a helper program and collecting its standard output.
#pragma once

#include <string>
#include <vector>

namespace kerf::io {

/// How a child process ended.
struct ProcessResult {
    int spawnError = 0;       ///< errno of a failed start (then nothing else is set)
    int exitCode = -1;        ///< exit status when it exited normally, else -1
    int signal = 0;           ///< the signal that ended it, else 0
    std::string out;          ///< everything it wrote on standard output
    double seconds = 0;       ///< wall time
    double cpuSeconds = 0;    ///< its user + system CPU time (from wait4)
    long peakRssKb = 0;       ///< its peak resident memory (from wait4)
};

/// Start `argv[0]` (looked up on PATH) with `argv`, its standard error going
/// to kerf's and its standard output collected. Waits for it. The child is
/// stopped if kerf dies of a signal meanwhile (kerf/io/cleanup.h).
ProcessResult runCaptured(const std::vector<std::string>& argv);

} // namespace kerf::io
