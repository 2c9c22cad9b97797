// Work directories and the sweep of those left by killed runs (kerf/io/files.h).
//
// Which directories a sweep may remove follows common trade practice for pid files and
// lock files: the owner's pid alone is not enough (pids are reused), so the process's start
// time is recorded beside it and compared; what cannot be judged (another host, another pid
// namespace, another user, no owner file) is left alone.
#include "kerf/io/files.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;
using kerf::io::kWorkDirOwnerFile;
using kerf::io::sweepStaleWorkDirs;
using kerf::io::WorkDir;

namespace {

/// A private $TMPDIR for one test; the old value comes back when it ends.
class PrivateTmp {
public:
    PrivateTmp() {
        std::string tmpl = (fs::temp_directory_path() / "kerf-unit-sweep-XXXXXX").string();
        dir_ = mkdtemp(tmpl.data());
        const char* old = std::getenv("TMPDIR");
        hadOld_ = old != nullptr;
        if (old) old_ = old;
        setenv("TMPDIR", dir_.c_str(), 1);
    }
    ~PrivateTmp() {
        if (hadOld_) setenv("TMPDIR", old_.c_str(), 1);
        else unsetenv("TMPDIR");
        std::error_code ec;
        fs::remove_all(dir_, ec);
    }
    const std::string& dir() const { return dir_; }

private:
    std::string dir_, old_;
    bool hadOld_ = false;
};

std::string slurp(const std::string& path) {
    std::ifstream in(path);
    std::stringstream s;
    s << in.rdbuf();
    return s.str();
}

/// The owner file's text with one field replaced (`key value` lines).
std::string withField(const std::string& owner, const std::string& key, const std::string& value) {
    std::istringstream in(owner);
    std::string line, out;
    while (std::getline(in, line)) {
        if (line.rfind(key + " ", 0) == 0) line = key + " " + value;
        out += line + "\n";
    }
    return out;
}

/// A directory as a killed kerf would leave it: mode 0700, a file, and `owner` as its owner file.
std::string leftover(const std::string& tmp, const std::string& name, const std::string& owner) {
    std::string d = tmp + "/" + name;
    fs::create_directory(d);
    chmod(d.c_str(), 0700);
    std::ofstream(d + "/design.sv") << "module m; endmodule\n";
    if (!owner.empty()) std::ofstream(d + "/" + kWorkDirOwnerFile) << owner;
    return d;
}

/// The pid of a process that has ended and been reaped.
long goneProcess() {
    pid_t pid = fork();
    if (pid == 0) _exit(0);
    int status = 0;
    waitpid(pid, &status, 0);
    return pid;
}

/// This process's own owner text, as a work directory records it.
std::string ownOwnerText() {
    WorkDir w;
    return slurp(w.path() + "/" + kWorkDirOwnerFile);
}

} // namespace

TEST(WorkDirSweep, OwnerFileNamesThisProcess) {
    PrivateTmp tmp;
    WorkDir w;
    std::string owner = slurp(w.path() + "/" + kWorkDirOwnerFile);
    EXPECT_NE(owner.find("pid " + std::to_string(getpid()) + "\n"), std::string::npos) << owner;
    EXPECT_NE(fs::path(w.path()).filename().string().find("kerf-" + std::to_string(getpid()) + "-"),
              std::string::npos);
    struct stat st {};
    ASSERT_EQ(stat(w.path().c_str(), &st), 0);
    EXPECT_EQ(st.st_mode & 0777, 0700u);
    // A live directory (this process's) survives a sweep.
    EXPECT_TRUE(sweepStaleWorkDirs().removed.empty());
    EXPECT_TRUE(fs::exists(w.path()));
}

TEST(WorkDirSweep, RemovesTheDirectoryOfAGoneProcess) {
    PrivateTmp tmp;
    std::string owner = withField(ownOwnerText(), "pid", std::to_string(goneProcess()));
    std::string d = leftover(tmp.dir(), "kerf-1-gone00", owner);
    auto r = sweepStaleWorkDirs();
    ASSERT_EQ(r.removed.size(), 1u);
    EXPECT_EQ(r.removed[0], d);
    EXPECT_FALSE(fs::exists(d));
    EXPECT_EQ(r.bytes, std::string("module m; endmodule\n").size());
}

TEST(WorkDirSweep, PidReusedByAnotherProcessCountsAsGone) {
    PrivateTmp tmp;
    // This process's pid, but another start time: the pid now names another process.
    std::string owner = withField(ownOwnerText(), "start", "1");
    std::string d = leftover(tmp.dir(), "kerf-2-reused", owner);
    EXPECT_EQ(sweepStaleWorkDirs().removed.size(), 1u);
    EXPECT_FALSE(fs::exists(d));
}

TEST(WorkDirSweep, AnEarlierBootCountsAsGone) {
    PrivateTmp tmp;
    std::string owner = ownOwnerText();
    if (owner.find("boot -\n") != std::string::npos) GTEST_SKIP() << "no boot id on this system";
    std::string d = leftover(tmp.dir(), "kerf-3-boot00", withField(owner, "boot", "an-earlier-boot"));
    EXPECT_EQ(sweepStaleWorkDirs().removed.size(), 1u);
    EXPECT_FALSE(fs::exists(d));
}

TEST(WorkDirSweep, LeavesWhatItCannotJudge) {
    PrivateTmp tmp;
    const std::string own = ownOwnerText();
    const std::string gone = withField(own, "pid", std::to_string(goneProcess()));
    std::vector<std::string> kept = {
        // a live process: this one
        leftover(tmp.dir(), "kerf-4-live00", own),
        // another host sharing the directory, another pid namespace
        leftover(tmp.dir(), "kerf-5-host00", withField(gone, "host", "another-host")),
        leftover(tmp.dir(), "kerf-6-ns0000", withField(gone, "pidns", "pid:[1]")),
        // no owner file: kept for a bug report, or made by an older kerf
        leftover(tmp.dir(), "kerf-7-none00", ""),
        // an owner file that is not one
        leftover(tmp.dir(), "kerf-8-junk00", "not an owner file\n"),
        // a bug-report directory, even with an owner file
        leftover(tmp.dir(), "kerf-report-abc123", gone),
        // not kerf's name
        leftover(tmp.dir(), "other-9-gone", gone),
    };
    // Readable by others: not a directory kerf made.
    std::string open = leftover(tmp.dir(), "kerf-10-open00", gone);
    chmod(open.c_str(), 0755);
    kept.push_back(open);
    // A link to a gone process's directory is not followed.
    std::string target = leftover(tmp.dir(), "target-of-link", gone);
    fs::create_directory_symlink(target, tmp.dir() + "/kerf-11-link00");
    kept.push_back(target);
    // Another user's directory (only root can make one here).
    if (geteuid() == 0) {
        std::string theirs = leftover(tmp.dir(), "kerf-12-user00", gone);
        ASSERT_EQ(chown(theirs.c_str(), 12345, 12345), 0);
        kept.push_back(theirs);
    }
    EXPECT_TRUE(sweepStaleWorkDirs().removed.empty());
    for (const auto& d : kept) EXPECT_TRUE(fs::exists(d + "/design.sv")) << d;
    EXPECT_TRUE(fs::is_symlink(tmp.dir() + "/kerf-11-link00"));
}

TEST(WorkDirSweep, KeptDirectoryIsNeverSwept) {
    PrivateTmp tmp;
    std::string path;
    {
        WorkDir w;
        w.add("design.sv", "module m; endmodule\n");
        path = w.keep();
    }
    ASSERT_TRUE(fs::exists(path + "/design.sv"));
    EXPECT_FALSE(fs::exists(path + "/" + kWorkDirOwnerFile));
    EXPECT_TRUE(sweepStaleWorkDirs().removed.empty());
    EXPECT_TRUE(fs::exists(path + "/design.sv"));
}

TEST(WorkDirSweep, AFileNamedLikeTheOwnerFileIsStoredApart) {
    PrivateTmp tmp;
    WorkDir w;
    std::string p = w.add(kWorkDirOwnerFile, "module m; endmodule\n");
    EXPECT_NE(p, w.path() + "/" + kWorkDirOwnerFile);
    EXPECT_EQ(slurp(p), "module m; endmodule\n");
    EXPECT_NE(slurp(w.path() + "/" + kWorkDirOwnerFile).find("kerf work directory"), std::string::npos);
}
