// cleanup.cpp — a fixed table of paths and child processes, cleared by a signal handler.
//
// The table is plain arrays written by the main thread and read by the
// handler; each slot is published by setting its `used` flag last, so the
// handler never sees a half-written path. Signals are re-raised with the
// default action after cleanup so kerf's exit status still says what killed it.
#include "kerf/io/cleanup.h"

#include <csignal>
#include <cstring>
#include <limits.h>
#include <pthread.h>
#include <signal.h>
#include <unistd.h>

namespace kerf::io {

namespace {

constexpr int kSlots = 32;
constexpr int kPathMax = PATH_MAX;

struct PathSlot {
    volatile sig_atomic_t used = 0;
    char path[kPathMax] = {};
};

PathSlot gPaths[kSlots];
volatile pid_t gChildren[kSlots] = {};
volatile sig_atomic_t gInstalled = 0;

constexpr int kSignals[] = {SIGINT, SIGTERM, SIGHUP, SIGPIPE, SIGQUIT};

extern "C" void onFatalSignal(int sig) {
    // Files first, then the (now empty) directories that held them.
    for (auto& s : gPaths)
        if (s.used) unlink(s.path);
    for (auto& s : gPaths)
        if (s.used) rmdir(s.path);
    for (auto& c : gChildren)
        if (c > 0) kill(c, SIGTERM);
    signal(sig, SIG_DFL);
    raise(sig);
}

} // namespace

static_assert(sizeof(sigset_t) <= 128, "SignalBlock keeps the signal mask in 128 bytes");

SignalBlock::SignalBlock() {
    sigset_t block;
    sigemptyset(&block);
    for (int sig : kSignals) sigaddset(&block, sig);
    pthread_sigmask(SIG_BLOCK, &block, reinterpret_cast<sigset_t*>(saved_));
}

SignalBlock::~SignalBlock() { pthread_sigmask(SIG_SETMASK, reinterpret_cast<sigset_t*>(saved_), nullptr); }

void installCleanupHandlers() {
    if (gInstalled) return;
    gInstalled = 1;
    for (int sig : kSignals) {
        struct sigaction old {};
        sigaction(sig, nullptr, &old);
        // A signal the caller chose to ignore (e.g. `nohup`) stays ignored.
        if (old.sa_handler == SIG_IGN) continue;
        struct sigaction sa {};
        sa.sa_handler = onFatalSignal;
        sigemptyset(&sa.sa_mask);
        for (int other : kSignals) sigaddset(&sa.sa_mask, other);
        sa.sa_flags = 0;
        sigaction(sig, &sa, nullptr);
    }
}

bool rememberPath(const std::string& path) {
    if (path.size() >= static_cast<std::size_t>(kPathMax)) return false;
    for (auto& s : gPaths) {
        if (s.used) continue;
        std::memcpy(s.path, path.c_str(), path.size() + 1);
        s.used = 1;
        return true;
    }
    return false;
}

void forgetPath(const std::string& path) {
    for (auto& s : gPaths)
        if (s.used && path == s.path) {
            s.used = 0;
            return;
        }
}

void rememberChild(pid_t pid) {
    for (auto& c : gChildren)
        if (c == 0) {
            c = pid;
            return;
        }
}

void forgetChild(pid_t pid) {
    for (auto& c : gChildren)
        if (c == pid) c = 0;
}

} // namespace kerf::io
