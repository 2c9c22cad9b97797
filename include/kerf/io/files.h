// kerf/io/files.h — reading inputs, writing outputs atomically, temporary files.
//
// Every file kerf writes goes through here: a temporary created exclusively
// (mkstemp) beside the target, filled, fsync'ed, given the target's mode and
// renamed over it, so a reader of the target sees the old or the new file,
// never a partial one. Symbolic links are followed (the link stays a link);
// devices and pipes (`-o /dev/stdout`, `/dev/full`) are written directly and
// their write errors reported. Temporaries are removed on every exit path,
// including death by SIGINT/SIGPIPE (kerf/io/cleanup.h).
#pragma once

#include "kerf/diagnostics.h"

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace kerf::io {

/// Read a whole file. Missing, unreadable or a directory: kerf::Error (exit 2) naming it.
std::string readFile(const std::string& path);

/// Check a source file before the reader sees it: it exists, is not a directory,
/// can be read and is text (no NUL byte in its first 64 KiB). Throws kerf::Error (exit 2).
void checkSourceFile(const std::string& path);

/// How `writeFileAtomic` treats an existing target.
struct WriteFileOptions {
    /// When not empty, the target's previous contents are kept in `target + backupSuffix`
    /// (itself written atomically, with the target's mode) before the new text replaces it.
    std::string backupSuffix;
};

/// Write `text` to `path` atomically (see the header comment). A symbolic link is
/// followed and its final target rewritten; an existing target keeps its permission
/// bits, a new one gets 0666 minus the umask. Returns the path actually written.
/// Errors: kerf::Error naming the path — exit 6 when the disk is full, 2 otherwise.
std::string writeFileAtomic(const std::string& path, std::string_view text, const WriteFileOptions& opts = {});

/// `text` with the line endings of `original`: when every line of `original` ends
/// in CR LF, bare LFs in `text` become CR LF; otherwise `text` is returned as is.
std::string keepLineEndings(std::string_view original, std::string text);

/// Write to standard output with every byte accounted for (a closed pipe kills
/// kerf by SIGPIPE as usual; other errors, e.g. a full disk, are kerf::Error).
void writeStdout(std::string_view text);

/// A private directory under $TMPDIR (`kerf-PID-XXXXXX`, mkdtemp, mode 0700) for files
/// that exist only during a run, e.g. the rewrite while it is proved. Removed with its
/// files when it goes out of scope or kerf dies of a signal — unless `keep()` was called.
/// It holds an owner file (`kWorkDirOwnerFile`: host, boot, pid namespace, pid and the
/// process's start time) so that a later run can tell, after a SIGKILL that nothing can
/// catch, that the process which made it is gone (`sweepStaleWorkDirs`). `keep()` removes
/// the owner file: a directory kept for a bug report is never swept.
class WorkDir {
public:
    WorkDir();
    ~WorkDir();
    WorkDir(const WorkDir&) = delete;
    WorkDir& operator=(const WorkDir&) = delete;

    const std::string& path() const { return dir_; }
    /// Create (exclusively) and fill `dir/name`; returns its path.
    std::string add(const std::string& name, std::string_view text);
    /// Leave the directory and its files in place (for a bug report); returns its path.
    const std::string& keep();

private:
    std::string dir_;
    std::string owner_;   // the owner file's path
    std::vector<std::string> files_;
    bool kept_ = false;
};

/// The name of a work directory's owner file.
inline constexpr const char* kWorkDirOwnerFile = ".kerf-owner";

/// What `sweepStaleWorkDirs` removed.
struct SweepResult {
    std::vector<std::string> removed;   // directories removed
    unsigned long long bytes = 0;       // the size of the files they held
};

/// Remove the work directories under $TMPDIR that kerf processes of this user left when
/// they died without cleaning up (SIGKILL, the out-of-memory killer). A directory is
/// removed only when all of these hold: its name is `kerf-...` (not `kerf-report-...`), it
/// is a real directory (not a link) owned by this user with mode 0700, it holds a regular
/// owner file of this user written by a kerf on this host in this boot and pid namespace
/// (or in an earlier boot), and the process it names is gone — no process with that pid,
/// or one that started at another time (the pid was reused). Anything else is left alone:
/// another user's, another host's or another pid namespace's directories, a live process's,
/// and directories without an owner file (kept for a bug report, or made by an older kerf).
/// Only regular files directly inside are removed; never throws.
SweepResult sweepStaleWorkDirs();

/// Save files for a bug report in a new directory under $TMPDIR
/// (`kerf-report-XXXXXX`) and return the directory; on failure returns "".
std::string saveBugReport(const std::vector<std::pair<std::string, std::string>>& files);

/// An error for a failed system call on `path`: exit 6 for ENOSPC/EDQUOT/ENOMEM, 2 otherwise.
Error fileError(const std::string& what, const std::string& path, int err);

} // namespace kerf::io
