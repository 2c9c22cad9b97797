// kerf/io/cleanup.h — files removed and child processes stopped on every way out.
//
// kerf keeps temporary files (a rewrite being proved, a file being written
// atomically) and may have the reader running as a child. When kerf is
// interrupted (SIGINT, SIGTERM, SIGHUP) or its output pipe closes (SIGPIPE),
// a signal handler removes the registered files, stops the registered child
// and then dies of the same signal, as the shell expects. The handler only
// uses async-signal-safe calls (unlink, kill, signal, raise) on a fixed table.
#pragma once

#include <string>
#include <sys/types.h>

namespace kerf::io {

/// Install the handlers once (idempotent). Called by the command line before any work.
void installCleanupHandlers();

/// Remove `path` (a file, or an empty directory once its files are gone) if kerf dies of a signal before `forgetPath`. Returns false when the
/// table is full (the caller still removes the file on normal exit paths).
bool rememberPath(const std::string& path);
/// The file has been removed or renamed into place: no longer remove it.
void forgetPath(const std::string& path);

/// Holds back the fatal signals while it lives, so that creating a file and
/// remembering it happen as one step (a signal between them would leak the file).
class SignalBlock {
public:
    SignalBlock();
    ~SignalBlock();
    SignalBlock(const SignalBlock&) = delete;
    SignalBlock& operator=(const SignalBlock&) = delete;

private:
    unsigned char saved_[128];   // the previous signal mask (sigset_t)
};

/// Stop `pid` (SIGTERM) if kerf dies of a signal while it runs.
void rememberChild(pid_t pid);
void forgetChild(pid_t pid);

} // namespace kerf::io
