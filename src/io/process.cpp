// process.cpp — posix_spawn with a pipe on standard output, wait4 for the figures.
#include "kerf/io/process.h"

#include "kerf/io/cleanup.h"

#include <cerrno>
#include <chrono>
#include <fcntl.h>
#include <spawn.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

extern char** environ;

namespace kerf::io {

ProcessResult runCaptured(const std::vector<std::string>& args) {
    ProcessResult r;
    auto t0 = std::chrono::steady_clock::now();
    int pipefd[2];
    if (pipe2(pipefd, O_CLOEXEC) != 0) {
        r.spawnError = errno;
        return r;
    }
    posix_spawn_file_actions_t actions;
    posix_spawn_file_actions_init(&actions);
    posix_spawn_file_actions_adddup2(&actions, pipefd[1], STDOUT_FILENO);
    std::vector<std::string> copy = args;
    std::vector<char*> argv;
    for (auto& a : copy) argv.push_back(a.data());
    argv.push_back(nullptr);
    pid_t pid = 0;
    int rc = posix_spawnp(&pid, argv[0], &actions, nullptr, argv.data(), environ);
    posix_spawn_file_actions_destroy(&actions);
    close(pipefd[1]);
    if (rc != 0) {
        close(pipefd[0]);
        r.spawnError = rc;
        return r;
    }
    rememberChild(pid);
    struct ChildGuard {
        pid_t pid;
        int fd;
        bool waited = false;
        ~ChildGuard() {
            // Only on an exception (e.g. out of memory while collecting): do not leave it running.
            if (fd >= 0) close(fd);
            if (!waited) {
                kill(pid, SIGTERM);
                int st;
                while (waitpid(pid, &st, 0) < 0 && errno == EINTR) {}
                forgetChild(pid);
            }
        }
    } guard{pid, pipefd[0]};

    char buf[1 << 16];
    for (;;) {
        ssize_t n = ::read(pipefd[0], buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n <= 0) break;
        r.out.append(buf, static_cast<std::size_t>(n));
    }
    close(pipefd[0]);
    guard.fd = -1;
    int status = 0;
    struct rusage ru {};
    while (wait4(pid, &status, 0, &ru) < 0 && errno == EINTR) {}
    guard.waited = true;
    forgetChild(pid);
    r.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    r.peakRssKb = ru.ru_maxrss;
    r.cpuSeconds = static_cast<double>(ru.ru_utime.tv_sec + ru.ru_stime.tv_sec) +
                   static_cast<double>(ru.ru_utime.tv_usec + ru.ru_stime.tv_usec) * 1e-6;
    if (WIFEXITED(status)) r.exitCode = WEXITSTATUS(status);
    else if (WIFSIGNALED(status)) r.signal = WTERMSIG(status);
    return r;
}

} // namespace kerf::io
