// kerf/io/reader.h — starting the slang reader (src/reader/kerf_read.py).
//
// The reader is a Python program; its exit status tells kerf what went wrong
// (documented in kerf_read.py). This file maps each to a message and one of
// kerf's exit codes, so the front end only builds arguments and parses output.
#pragma once

#include <string>
#include <vector>

namespace kerf::io {

/// The reader's output and what it cost.
struct ReaderOutput {
    std::string text;        ///< the description as printed
    double seconds = 0;      ///< wall time of the reader process
    long peakRssKb = 0;      ///< its peak resident memory
    double cpuSeconds = 0;   ///< its user + system CPU time
};

/// The Python interpreter (`KERF_PYTHON`, default `python3`) and the reader
/// script (`KERF_READER`; else PREFIX/share/kerf/reader/ beside an installed
/// PREFIX/bin/kerf; else the one in the source tree).
std::string pythonInterpreter();
std::string readerScript();

/// Run the reader with `args` (everything after the script name). Throws
/// kerf::Error with the right exit code when it cannot start or fails;
/// slang's and the reader's own messages have reached stderr by then.
ReaderOutput runReader(const std::vector<std::string>& args);

/// The modules declared at file level in the files of `args` (`-I DIR`, `-D
/// NAME`, then the files), in file and declaration order, each name once
/// (src/reader/kerf_modules.py; for `restructure --all-modules`). Throws like `runReader`.
std::vector<std::string> listModules(const std::vector<std::string>& args);

/// Time and peak memory of the most recent successful reader run (for the stage figures).
ReaderOutput lastReaderFigures();

} // namespace kerf::io
