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
#include <dirent.h>
#include <fcntl.h>
#include <signal.h>
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

namespace {

/// A whole small file (at most `limit` bytes) read through an open descriptor; nullopt on error.
std::optional<std::string> readSmall(int fd, std::size_t limit) {
    std::string out;
    char buf[512];
    while (out.size() <= limit) {
        ssize_t n = ::read(fd, buf, sizeof buf);
        if (n < 0) {
            if (errno == EINTR) continue;
            return std::nullopt;
        }
        if (n == 0) return out;
        out.append(buf, static_cast<std::size_t>(n));
    }
    return std::nullopt;
}

std::optional<std::string> readSmallFile(const std::string& path) {
    int fd = open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) return std::nullopt;
    auto s = readSmall(fd, 4096);
    close(fd);
    return s;
}

std::string trimmed(std::string s) {
    while (!s.empty() && (s.back() == '\n' || s.back() == ' ' || s.back() == '\r')) s.pop_back();
    return s;
}

/// The start time of process `pid` (field 22 of /proc/PID/stat, clock ticks since boot):
/// with the pid it names one process, however often the pid is reused. "" when there is no
/// such process (or only its zombie); nullopt when it cannot be told (no /proc).
std::optional<std::string> processStart(long pid) {
    std::string path = pid == 0 ? std::string("/proc/self/stat") : fmt::format("/proc/{}/stat", pid);
    int fd = open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) {
        if (errno == ENOENT || errno == ESRCH) {
            struct stat st {};
            if (stat("/proc/self/stat", &st) == 0) return std::string();   // /proc works: no such process
        }
        return std::nullopt;
    }
    auto text = readSmall(fd, 4096);
    close(fd);
    if (!text) return std::string();   // the process ended while being read
    auto close_paren = text->rfind(')');   // the command name may hold spaces and ')'
    if (close_paren == std::string::npos) return std::nullopt;
    std::size_t pos = close_paren + 1;
    for (int field = 3; field <= 22; ++field) {
        while (pos < text->size() && (*text)[pos] == ' ') ++pos;
        std::size_t end = text->find(' ', pos);
        if (end == std::string::npos) end = text->size();
        // A zombie (Z) or dead (X) process never runs again: it is gone, only not yet reaped.
        if (field == 3 && end > pos && ((*text)[pos] == 'Z' || (*text)[pos] == 'X')) return std::string();
        if (field == 22) return text->substr(pos, end - pos);
        pos = end;
    }
    return std::nullopt;
}

/// Who made a work directory, as its owner file says.
struct Owner {
    std::string host, boot, pidns, start;
    long pid = 0;
};

constexpr const char* kOwnerHeader = "kerf work directory";

Owner selfOwner() {
    Owner o;
    char host[256] = {};
    if (gethostname(host, sizeof host - 1) == 0) o.host = host;
    for (char& c : o.host)
        if (c == ' ' || c == '\n' || c == '\r') c = '_';
    if (auto b = readSmallFile("/proc/sys/kernel/random/boot_id")) o.boot = trimmed(*b);
    char ns[128] = {};
    ssize_t n = readlink("/proc/self/ns/pid", ns, sizeof ns - 1);
    if (n > 0) o.pidns = std::string(ns, static_cast<std::size_t>(n));
    o.pid = static_cast<long>(getpid());
    if (auto s = processStart(0)) o.start = *s;
    return o;
}

std::string ownerText(const Owner& o) {
    auto field = [](const std::string& v) { return v.empty() ? std::string("-") : v; };
    return fmt::format("{}\nhost {}\nboot {}\npidns {}\npid {}\nstart {}\n", kOwnerHeader, field(o.host), field(o.boot),
                       field(o.pidns), o.pid, field(o.start));
}

std::optional<Owner> parseOwner(const std::string& text) {
    Owner o;
    bool header = false, pid = false;
    std::size_t pos = 0;
    while (pos < text.size()) {
        std::size_t end = text.find('\n', pos);
        if (end == std::string::npos) end = text.size();
        std::string line = text.substr(pos, end - pos);
        pos = end + 1;
        if (line == kOwnerHeader) {
            header = true;
            continue;
        }
        auto sp = line.find(' ');
        if (sp == std::string::npos) return std::nullopt;
        std::string key = line.substr(0, sp), value = line.substr(sp + 1);
        if (value == "-") value.clear();
        if (key == "host") o.host = value;
        else if (key == "boot") o.boot = value;
        else if (key == "pidns") o.pidns = value;
        else if (key == "start") o.start = value;
        else if (key == "pid") {
            char* e = nullptr;
            errno = 0;
            long v = std::strtol(value.c_str(), &e, 10);
            if (errno != 0 || e == value.c_str() || *e != '\0' || v <= 0) return std::nullopt;
            o.pid = v;
            pid = true;
        }
    }
    if (!header || !pid || o.host.empty()) return std::nullopt;
    return o;
}

/// Whether the process an owner file names is certainly gone.
bool ownerIsGone(const Owner& o, const Owner& self) {
    if (o.host != self.host) return false;   // another machine sharing the directory: not ours to judge
    if (!o.boot.empty() && !self.boot.empty() && o.boot != self.boot) return true;   // made before a restart
    if (o.pidns != self.pidns) return false;   // its pids are not ours
    if (o.pid == self.pid && o.start == self.start) return false;
    if (!o.start.empty()) {
        auto now = processStart(o.pid);
        if (now) return *now != o.start;   // "" (no process) or another process under a reused pid
    }
    // No start time to compare: only a pid that names no process at all is gone.
    return kill(static_cast<pid_t>(o.pid), 0) != 0 && errno == ESRCH;
}

} // namespace

WorkDir::WorkDir() {
    std::string tmpl = fmt::format("{}/kerf-{}-XXXXXX", tempRoot(), static_cast<long>(getpid()));
    std::vector<char> name(tmpl.begin(), tmpl.end());
    name.push_back('\0');
    const std::string owner = ownerText(selfOwner());
    SignalBlock held;   // create and remember as one step
    if (!mkdtemp(name.data())) throw fileError("cannot create a temporary directory in", tempRoot(), errno);
    dir_ = name.data();
    rememberPath(dir_);
    // The owner file lets a later run remove the directory if this process is killed by a
    // signal nothing can catch (sweepStaleWorkDirs).
    std::string path = dir_ + "/" + kWorkDirOwnerFile;
    int fd = open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
    if (fd < 0) {
        int err = errno;
        rmdir(dir_.c_str());
        forgetPath(dir_);
        throw fileError("cannot create the temporary file", path, err);
    }
    rememberPath(path);
    owner_ = path;
    try {
        writeAll(fd, owner, path);
    } catch (...) {
        close(fd);
        unlink(path.c_str());
        forgetPath(path);
        rmdir(dir_.c_str());
        forgetPath(dir_);
        throw;
    }
    close(fd);
}

std::string WorkDir::add(const std::string& name, std::string_view text) {
    // A file of the owner file's name (a design file called so) is stored under another name.
    std::string path = dir_ + "/" + (name == kWorkDirOwnerFile ? "_" + name : name);
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
    // Without its owner file the directory is never swept: it is the user's now.
    unlink(owner_.c_str());
    forgetPath(owner_);
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
    unlink(owner_.c_str());
    forgetPath(owner_);
    rmdir(dir_.c_str());
    forgetPath(dir_);
}

SweepResult sweepStaleWorkDirs() {
    SweepResult result;
    try {
        const std::string root = tempRoot();
        int rootFd = open(root.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
        if (rootFd < 0) return result;
        DIR* list = fdopendir(rootFd);
        if (!list) {
            close(rootFd);
            return result;
        }
        const Owner self = selfOwner();
        const uid_t me = geteuid();
        std::vector<std::string> names;
        while (dirent* e = readdir(list)) {
            std::string n = e->d_name;
            if (n.rfind("kerf-", 0) == 0 && n.rfind("kerf-report-", 0) != 0) names.push_back(n);
        }
        for (const auto& n : names) {
            struct stat st {};
            if (fstatat(rootFd, n.c_str(), &st, AT_SYMLINK_NOFOLLOW) != 0) continue;
            if (!S_ISDIR(st.st_mode) || st.st_uid != me || (st.st_mode & 077) != 0) continue;
            int dirFd = openat(rootFd, n.c_str(), O_RDONLY | O_DIRECTORY | O_NOFOLLOW | O_CLOEXEC);
            if (dirFd < 0) continue;
            struct stat again {};
            bool same = fstat(dirFd, &again) == 0 && again.st_dev == st.st_dev && again.st_ino == st.st_ino;
            std::optional<Owner> owner;
            if (same) {
                int ownerFd = openat(dirFd, kWorkDirOwnerFile, O_RDONLY | O_NOFOLLOW | O_CLOEXEC);
                if (ownerFd >= 0) {
                    struct stat os {};
                    if (fstat(ownerFd, &os) == 0 && S_ISREG(os.st_mode) && os.st_uid == me)
                        if (auto text = readSmall(ownerFd, 4096)) owner = parseOwner(*text);
                    close(ownerFd);
                }
            }
            if (!owner || !ownerIsGone(*owner, self)) {
                close(dirFd);
                continue;
            }
            // Its files first, the owner file last (a sweep cut short is finished by the next one).
            unsigned long long bytes = 0;
            bool onlyFiles = true;
            int listFd = dup(dirFd);
            DIR* inside = listFd >= 0 ? fdopendir(listFd) : nullptr;
            if (!inside) {
                if (listFd >= 0) close(listFd);
                close(dirFd);
                continue;
            }
            std::vector<std::string> files;
            while (dirent* e = readdir(inside)) {
                std::string f = e->d_name;
                if (f == "." || f == ".." || f == kWorkDirOwnerFile) continue;
                files.push_back(f);
            }
            closedir(inside);
            for (const auto& f : files) {
                struct stat fs {};
                if (fstatat(dirFd, f.c_str(), &fs, AT_SYMLINK_NOFOLLOW) != 0) continue;
                if (S_ISDIR(fs.st_mode)) {
                    onlyFiles = false;   // kerf makes none: not a directory as kerf left it
                    continue;
                }
                if (unlinkat(dirFd, f.c_str(), 0) == 0) bytes += static_cast<unsigned long long>(fs.st_size);
            }
            if (onlyFiles) {
                unlinkat(dirFd, kWorkDirOwnerFile, 0);
                if (unlinkat(rootFd, n.c_str(), AT_REMOVEDIR) == 0) result.removed.push_back(root + "/" + n);
            }
            result.bytes += bytes;
            close(dirFd);
        }
        closedir(list);
    } catch (...) {
        // Best effort: a sweep never stops a run.
    }
    return result;
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
