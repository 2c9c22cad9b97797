// reader.cpp — the reader's exit statuses turned into kerf's messages and exit codes.
#include "kerf/io/reader.h"

#include "kerf/diagnostics.h"
#include "kerf/io/process.h"

#include <fmt/format.h>

#include <cerrno>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <sstream>
#include <unistd.h>

namespace kerf::io {

namespace {

// Exit statuses of src/reader/kerf_read.py (its module docstring lists them).
constexpr int kReaderOk = 0;
constexpr int kReaderDesignErrors = 1;
constexpr int kReaderUsage = 2;
constexpr int kReaderNoPyslang = 3;
constexpr int kReaderInternal = 4;
constexpr int kReaderOutOfMemory = 5;
constexpr int kReaderWrongVersion = 6;

ReaderOutput gLast;

} // namespace

ReaderOutput lastReaderFigures() { return ReaderOutput{{}, gLast.seconds, gLast.peakRssKb, gLast.cpuSeconds}; }

std::string pythonInterpreter() {
    if (const char* p = std::getenv("KERF_PYTHON"); p && *p) return p;
    return "python3";
}

std::string installedScript(const std::string& name) {
    // An installed kerf (cmake --install) finds its scripts beside itself:
    // PREFIX/bin/kerf and PREFIX/share/kerf/reader/NAME.
    std::error_code ec;
    std::filesystem::path exe = std::filesystem::read_symlink("/proc/self/exe", ec);
    if (ec) return {};
    std::filesystem::path p = exe.parent_path().parent_path() / "share" / "kerf" / "reader" / name;
    return std::filesystem::exists(p, ec) ? p.string() : std::string();
}

std::string readerScript() {
    if (const char* p = std::getenv("KERF_READER"); p && *p) return p;
    if (std::string s = installedScript("kerf_read.py"); !s.empty()) return s;
    return KERF_READER_PATH;
}

std::string modulesScript() {
    if (std::string s = installedScript("kerf_modules.py"); !s.empty()) return s;
    // In the source tree: src/reader/kerf_modules.py, beside the reader.
    return (std::filesystem::path(KERF_READER_PATH).parent_path() / "kerf_modules.py").string();
}

std::vector<std::string> listModules(const std::vector<std::string>& args) {
    std::vector<std::string> argv{pythonInterpreter(), modulesScript()};
    argv.insert(argv.end(), args.begin(), args.end());
    ProcessResult r = runCaptured(argv);
    if (r.spawnError != 0)
        throw Error(fmt::format("cannot start '{}': {}. Install Python 3 and run 'pip install -r requirements.txt' "
                                "(or set KERF_PYTHON)", argv[0], std::strerror(r.spawnError)), {},
                    r.spawnError == ENOMEM || r.spawnError == EAGAIN ? ExitCode::Resources : ExitCode::ToolMissing);
    if (r.exitCode == kReaderDesignErrors) throw Error("the design has errors (reported above by slang); nothing was written");
    if (r.exitCode == kReaderNoPyslang || r.exitCode == 126 || r.exitCode == 127)
        throw Error("pyslang is not installed for this Python: run 'pip install -r requirements.txt' "
                    "(or set KERF_PYTHON)", {}, ExitCode::ToolMissing);
    if (r.exitCode != kReaderOk)
        throw Error(fmt::format("listing the modules failed (exit {}, signal {}); its messages are above. This is "
                                "a kerf bug: please report it with the input", r.exitCode, r.signal), {},
                    ExitCode::Internal);
    std::vector<std::string> names;
    std::istringstream in(r.out);
    for (std::string line; std::getline(in, line);)
        if (!line.empty()) names.push_back(line);
    return names;
}

ReaderOutput runReader(const std::vector<std::string>& args) {
    std::string script = readerScript();
    if (access(script.c_str(), R_OK) != 0)
        throw Error(fmt::format("the Verilog reader '{}' is missing or unreadable: {} (reinstall kerf, or set "
                                "KERF_READER)", script, std::strerror(errno)), {}, ExitCode::ToolMissing);
    // Python runs a directory as a package and fails with its own exit 1, the code of "the
    // design has errors": the wrong message. KERF_READER names the script itself.
    if (std::error_code ec; !std::filesystem::is_regular_file(script, ec))
        throw Error(fmt::format("the Verilog reader '{}' is not a file (set KERF_READER to the path of "
                                "kerf_read.py, or reinstall kerf)", script), {}, ExitCode::ToolMissing);
    std::vector<std::string> argv{pythonInterpreter(), script};
    argv.insert(argv.end(), args.begin(), args.end());
    ProcessResult r = runCaptured(argv);
    if (r.spawnError != 0) {
        if (r.spawnError == ENOMEM || r.spawnError == EAGAIN)
            throw Error(fmt::format("cannot start the Verilog reader: {} (out of memory or processes)",
                                    std::strerror(r.spawnError)), {}, ExitCode::Resources);
        throw Error(fmt::format("cannot start the Verilog reader with '{}': {}. Install Python 3 and run "
                                "'pip install -r requirements.txt' (or set KERF_PYTHON)",
                                argv[0], std::strerror(r.spawnError)), {}, ExitCode::ToolMissing);
    }
    if (r.signal != 0) {
        if (r.signal == SIGKILL)
            throw Error("the Verilog reader was killed (SIGKILL), most often by the system when memory runs out; "
                        "nothing was written", {}, ExitCode::Resources);
        throw Error(fmt::format("the Verilog reader died of signal {} ({}); nothing was written", r.signal,
                                strsignal(r.signal)), {}, ExitCode::Internal);
    }
    switch (r.exitCode) {
    case kReaderOk: break;
    case kReaderDesignErrors:
        throw Error("the design has errors (reported above by slang); nothing was written");
    case kReaderUsage:
        throw Error("the reader could not select a module (see above); nothing was written");
    case kReaderNoPyslang:
        throw Error("pyslang is not installed for this Python: run 'pip install -r requirements.txt' "
                    "(or set KERF_PYTHON)", {}, ExitCode::ToolMissing);
    case kReaderOutOfMemory:
        throw Error("the Verilog reader ran out of memory; nothing was written", {}, ExitCode::Resources);
    case kReaderWrongVersion:
        throw Error("the Python or pyslang version does not fit this kerf (see above): run "
                    "'pip install -r requirements.txt' (or set KERF_PYTHON)", {}, ExitCode::ToolMissing);
    case 126:
    case 127:
        throw Error(fmt::format("cannot run '{}': install Python 3 (or set KERF_PYTHON)", argv[0]), {},
                    ExitCode::ToolMissing);
    case kReaderInternal:
    default:
        throw Error(fmt::format("the Verilog reader failed (exit {}); its messages are above. This is a kerf "
                                "bug: please report it with the input", r.exitCode), {}, ExitCode::Internal);
    }
    gLast.seconds = r.seconds;
    gLast.peakRssKb = r.peakRssKb;
    gLast.cpuSeconds = r.cpuSeconds;
    return ReaderOutput{std::move(r.out), r.seconds, r.peakRssKb, r.cpuSeconds};
}

} // namespace kerf::io
