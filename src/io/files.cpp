// files.cpp — input checks, atomic writes, private work directories, bug-report copies.
//
// Atomic replacement is the usual POSIX recipe (common trade practice):
// mkstemp beside the target, write, fchmod, fsync, rename, fsync the
// directory. Targets that are not regular files cannot be replaced by a
// rename (a device node must stay a device node) and are written in place.
#include "kerf/io/files.h"

#include "kerf/io/cleanup.h"

#include <fmt/format.h>

#include <cerrno>
#include <climits>
#include <cstdlib>
#include <cstring>
#include <optional>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

namespace kerf::io {

namespace {

std::string dirOf(const std::string& path) {
    auto slash = path.rfind('/');
    if (slash == std::string::npos) return ".";
    if (slash == 0) return "/";
    return path.substr(0, slash);
}

std::string baseOf(const std::string& path) {
    auto slash = path.rfind('/');
    return slash == std::string::npos ? path : path.substr(slash + 1);
}

std::string tempRoot() {
    const char* t = std::getenv("TMPDIR");
    std::string d = t && *t ? t : "/tmp";
    while (d.size() > 1 && d.back() == '/') d.pop_back();
    return d;
}

/// Follow symbolic links to the file that will really be written.
std::string resolveLinks(const std::string& path) {
    std::string cur = path;
    for (int hops = 0; hops < 40; ++hops) {
        struct stat st {};
        if (lstat(cur.c_str(), &st) != 0 || !S_ISLNK(st.st_mode)) return cur;
        char buf[PATH_MAX];
        ssize_t n = readlink(cur.c_str(), buf, sizeof buf - 1);
        if (n < 0) return cur;
        std::string target(buf, static_cast<std::size_t>(n));
        cur = target.front() == '/' ? target : dirOf(cur) + "/" + target;
    }
    throw Error(fmt::format("cannot write '{}': too many levels of symbolic links", path));
}

void writeAll(int fd, std::string_view text, const std::string& path) {
    const char* p = text.data();
    std::size_t left = text.size();
    while (left > 0) {
        ssize_t n = ::write(fd, p, left);
        if (n < 0) {
            if (errno == EINTR) continue;
            throw fileError("cannot write", path, errno);
        }
        p += n;
        left -= static_cast<std::size_t>(n);
    }
}

mode_t currentUmask() {
    mode_t m = umask(0);
    umask(m);
    return m;
}

/// Replace `target` (a regular file or a new name) by `text` with permission bits `mode`.
void replaceRegular(const std::string& target, const std::string& shown, std::string_view text, mode_t mode,
                    const struct stat* old) {
    std::string tmpl = dirOf(target) + "/." + baseOf(target) + ".kerf-XXXXXX";
    std::vector<char> name(tmpl.begin(), tmpl.end());
    name.push_back('\0');
    std::optional<SignalBlock> held(std::in_place);   // create and remember as one step
    int fd = mkstemp(name.data());
    if (fd >= 0) rememberPath(name.data());
    held.reset();
    if (fd < 0) {
        int err = errno;
        struct stat dst {};
        if ((err == ENOENT || err == ENOTDIR) && stat(dirOf(target).c_str(), &dst) != 0)
            throw Error(fmt::format("cannot write '{}': the directory '{}' does not exist", shown, dirOf(target)));
        throw fileError(fmt::format("cannot write '{}': no file can be created in", shown), dirOf(target), err);
    }
    std::string tmp(name.data());
    auto fail = [&](const char* what, int err) {
        close(fd);
        unlink(tmp.c_str());
        forgetPath(tmp);
        throw fileError(what, shown, err);
    };
    try {
        writeAll(fd, text, shown);
    } catch (...) {
        close(fd);
        unlink(tmp.c_str());
        forgetPath(tmp);
        throw;
    }
    if (fchmod(fd, mode) != 0) fail("cannot set the permissions of", errno);
    // Keep the owner when we may (root rewriting someone's file); otherwise the file is ours.
    if (old && geteuid() == 0 && fchown(fd, old->st_uid, old->st_gid) != 0) {}
    if (fsync(fd) != 0) fail("cannot write", errno);
    if (close(fd) != 0) {
        int err = errno;
        unlink(tmp.c_str());
        forgetPath(tmp);
        throw fileError("cannot write", shown, err);
    }
    if (std::rename(tmp.c_str(), target.c_str()) != 0) {
        int err = errno;
        unlink(tmp.c_str());
        forgetPath(tmp);
        throw fileError("cannot replace", shown, err);
    }
    forgetPath(tmp);
    int dfd = open(dirOf(target).c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (dfd >= 0) {
        fsync(dfd);   // best effort: some file systems refuse fsync on directories
        close(dfd);
    }
}

} // namespace

Error fileError(const std::string& what, const std::string& path, int err) {
    bool resources = err == ENOSPC || err == EDQUOT || err == ENOMEM || err == EFBIG;
    return Error(fmt::format("{} '{}': {}", what, path, std::strerror(err)), {},
                 resources ? ExitCode::Resources : ExitCode::InputError);
}

std::string readFile(const std::string& path) {
    int fd = open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) throw fileError("cannot read", path, errno);
    struct stat st {};
    if (fstat(fd, &st) == 0 && S_ISDIR(st.st_mode)) {
        close(fd);
        throw Error(fmt::format("cannot read '{}': it is a directory", path));
    }
    std::string out;
    if (S_ISREG(st.st_mode)) out.reserve(static_cast<std::size_t>(st.st_size));
    char buf[1 << 16];
    for (;;) {
        ssize_t n = ::read(fd, buf, sizeof buf);
        if (n < 0) {
            if (errno == EINTR) continue;
            int err = errno;
            close(fd);
            throw fileError("cannot read", path, err);
        }
        if (n == 0) break;
        out.append(buf, static_cast<std::size_t>(n));
    }
    close(fd);
    return out;
}

void checkSourceFile(const std::string& path) {
    struct stat st {};
    if (stat(path.c_str(), &st) != 0) {
        int err = errno;
        if (err == ENOENT) throw Error(fmt::format("cannot read '{}': no such file", path));
        throw fileError("cannot read", path, err);
    }
    if (S_ISDIR(st.st_mode))
        throw Error(fmt::format("'{}' is a directory; give the Verilog/SystemVerilog files to read", path));
    int fd = open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) throw fileError("cannot read", path, errno);
    char buf[1 << 16];
    ssize_t n;
    do n = ::read(fd, buf, sizeof buf);
    while (n < 0 && errno == EINTR);
    int err = errno;
    close(fd);
    if (n < 0) throw fileError("cannot read", path, err);
    const void* nul = std::memchr(buf, '\0', static_cast<std::size_t>(n));
    if (nul) {
        auto offset = static_cast<const char*>(nul) - buf;
        int line = 1;
        for (ssize_t i = 0; i < offset; ++i) line += buf[i] == '\n';
        throw Error("this is not a text file (it holds a NUL byte); kerf reads Verilog/SystemVerilog source",
                    SourceLoc{path, line, 0});
    }
}

std::string writeFileAtomic(const std::string& path, std::string_view text, const WriteFileOptions& opts) {
    if (path.empty()) throw Error("cannot write: empty file name");
    std::string target = resolveLinks(path);
    struct stat st {};
    bool exists = stat(target.c_str(), &st) == 0;
    if (exists && S_ISDIR(st.st_mode)) throw Error(fmt::format("cannot write '{}': it is a directory", path));
    if (exists && !S_ISREG(st.st_mode)) {
        // A device or pipe: it cannot be replaced, only written.
        if (!opts.backupSuffix.empty())
            throw Error(fmt::format("cannot keep a backup of '{}': it is not a regular file", path));
        int fd = open(target.c_str(), O_WRONLY | O_CLOEXEC | O_NOCTTY);
        if (fd < 0) throw fileError("cannot write", path, errno);
        try {
            writeAll(fd, text, path);
        } catch (...) {
            close(fd);
            throw;
        }
        if (close(fd) != 0) throw fileError("cannot write", path, errno);
        return target;
    }
    mode_t mode = exists ? (st.st_mode & 07777) : (0666 & ~currentUmask());
    if (exists && !opts.backupSuffix.empty()) {
        std::string old = readFile(target);
        replaceRegular(target + opts.backupSuffix, path + opts.backupSuffix, old, mode, &st);
    }
    replaceRegular(target, path, text, mode, exists ? &st : nullptr);
    return target;
}

std::string keepLineEndings(std::string_view original, std::string text) {
    std::size_t lf = 0, crlf = 0;
    for (std::size_t i = 0; i < original.size(); ++i)
        if (original[i] == '\n') {
            ++lf;
            crlf += i > 0 && original[i - 1] == '\r';
        }
    if (lf == 0 || crlf != lf) return text;
    std::string out;
    out.reserve(text.size() + text.size() / 32);
    for (std::size_t i = 0; i < text.size(); ++i) {
        if (text[i] == '\n' && (i == 0 || text[i - 1] != '\r')) out += '\r';
        out += text[i];
    }
    return out;
}

void writeStdout(std::string_view text) {
    writeAll(STDOUT_FILENO, text, "standard output");
}

WorkDir::WorkDir() {
    std::string tmpl = tempRoot() + "/kerf-XXXXXX";
    std::vector<char> name(tmpl.begin(), tmpl.end());
    name.push_back('\0');
    SignalBlock held;   // create and remember as one step
    if (!mkdtemp(name.data())) throw fileError("cannot create a temporary directory in", tempRoot(), errno);
    dir_ = name.data();
    rememberPath(dir_);
}

std::string WorkDir::add(const std::string& name, std::string_view text) {
    std::string path = dir_ + "/" + name;
    int fd;
    {
        SignalBlock held;   // create and remember as one step
        fd = open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
        if (fd >= 0) rememberPath(path);
    }
    if (fd < 0) throw fileError("cannot create the temporary file", path, errno);
    files_.push_back(path);
    try {
        writeAll(fd, text, path);
    } catch (...) {
        close(fd);
        throw;
    }
    if (close(fd) != 0) throw fileError("cannot write", path, errno);
    return path;
}

const std::string& WorkDir::keep() {
    kept_ = true;
    for (const auto& f : files_) forgetPath(f);
    forgetPath(dir_);
    return dir_;
}

WorkDir::~WorkDir() {
    if (kept_) return;
    for (const auto& f : files_) {
        unlink(f.c_str());
        forgetPath(f);
    }
    rmdir(dir_.c_str());
    forgetPath(dir_);
}

std::string saveBugReport(const std::vector<std::pair<std::string, std::string>>& files) {
    std::string tmpl = tempRoot() + "/kerf-report-XXXXXX";
    std::vector<char> name(tmpl.begin(), tmpl.end());
    name.push_back('\0');
    if (!mkdtemp(name.data())) return {};
    std::string dir = name.data();
    for (const auto& [file, text] : files) {
        std::string path = dir + "/" + baseOf(file);
        int fd = open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
        if (fd < 0) continue;
        try {
            writeAll(fd, text, path);
        } catch (...) {
        }
        close(fd);
    }
    return dir;
}

} // namespace kerf::io
