// progress.cpp — the redraw thread and the per-stage figures.
#include "kerf/io/progress.h"

#include <fmt/format.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <mutex>
#include <condition_variable>
#include <sys/resource.h>
#include <thread>
#include <unistd.h>

namespace kerf::io {

namespace {

struct Redraw {
    std::thread thread;
    std::mutex mu;
    std::condition_variable cv;
    bool quit = false;
    bool drawn = false;
};

/// One redraw of the line (the caller holds r.mu).
void drawLine(Redraw& r, const char* stage, std::size_t done, std::size_t total, double secs) {
    std::string share = total ? fmt::format("  {:3d}%", static_cast<int>(100.0 * done / total)) : "";
    std::string text = fmt::format("\r\033[Kkerf: {}{}  {:.0f} s", stage, share, secs);
    ssize_t ignored = write(STDERR_FILENO, text.data(), text.size());
    (void)ignored;
    r.drawn = true;
}

void eraseLine(Redraw& r) {
    if (!r.drawn) return;
    const char clear[] = "\r\033[K";
    ssize_t ignored = write(STDERR_FILENO, clear, sizeof clear - 1);
    (void)ignored;
    r.drawn = false;
}

} // namespace

Progress& Progress::global() {
    static Progress p;
    return p;
}

void Progress::start(bool wanted) {
    if (!wanted || running_ || !isatty(STDERR_FILENO)) return;
    running_ = true;
    auto* r = new Redraw;
    thread_ = r;
    auto began = std::chrono::steady_clock::now();
    // KERF_PROGRESS_DELAY (seconds) moves the two-second threshold, e.g. for a demo or a test.
    double delay = 2.0;
    if (const char* d = std::getenv("KERF_PROGRESS_DELAY"); d && *d) delay = std::atof(d);
    // KERF_PROGRESS_INTERVAL (milliseconds, default 250) is the redraw period, short in a test;
    // 0 also redraws at every change of stage or share, so that a test sees every stage's
    // share however briefly it lasts and however the redraw thread is scheduled (F267).
    long interval = 250;
    if (const char* d = std::getenv("KERF_PROGRESS_INTERVAL"); d && *d) interval = std::max(0L, std::atol(d));
    began_ = began;
    delay_ = delay;
    eager_ = interval == 0;
    interval = std::max(1L, interval);
    r->thread = std::thread([this, r, began, delay, interval] {
        std::unique_lock lock(r->mu);
        while (!r->quit) {
            r->cv.wait_for(lock, std::chrono::milliseconds(interval));
            if (r->quit) break;
            double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - began).count();
            if (secs < delay) continue;
            drawLine(*r, stage_.load(), done_, total_, secs);
        }
        eraseLine(*r);
    });
}

void Progress::drawNow() {
    if (!eager_ || !running_) return;
    auto* r = static_cast<Redraw*>(thread_);
    std::lock_guard lock(r->mu);
    if (r->quit) return;
    double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - began_).count();
    if (secs >= delay_) drawLine(*r, stage_.load(), done_, total_, secs);
}

void Progress::stage(const char* name) {
    stage_ = name;
    total_ = 0;
    done_ = 0;
    drawNow();
}

void Progress::share(std::size_t done, std::size_t total) {
    total_ = total;
    done_ = done;
    drawNow();
}

void Progress::stop() {
    if (!running_) return;
    auto* r = static_cast<Redraw*>(thread_);
    {
        std::lock_guard lock(r->mu);
        r->quit = true;
    }
    r->cv.notify_all();
    r->thread.join();
    delete r;
    thread_ = nullptr;
    running_ = false;
}

Progress::~Progress() { stop(); }

long peakRssKb() {
    struct rusage ru {};
    getrusage(RUSAGE_SELF, &ru);
    return ru.ru_maxrss;
}

namespace {
double cpuSecondsSoFar() {
    struct rusage ru {};
    getrusage(RUSAGE_SELF, &ru);
    return static_cast<double>(ru.ru_utime.tv_sec + ru.ru_stime.tv_sec) +
           static_cast<double>(ru.ru_utime.tv_usec + ru.ru_stime.tv_usec) * 1e-6;
}
} // namespace

StageLog::StageLog() = default;

void StageLog::begin(const char* name) {
    end();
    current_ = name;
    t0_ = std::chrono::steady_clock::now();
    cpu0_ = cpuSecondsSoFar();
    Progress::global().stage(name);
}

void StageLog::end() {
    if (current_.empty()) return;
    double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0_).count();
    rows_.push_back(Row{current_, secs, peakRssKb(), false, cpuSecondsSoFar() - cpu0_});
    current_.clear();
}

void StageLog::addChild(const char* name, double seconds, long peak, double cpuSeconds) {
    if (!current_.empty()) t0_ += std::chrono::duration_cast<std::chrono::steady_clock::duration>(
                               std::chrono::duration<double>(seconds));
    rows_.push_back(Row{name, seconds, peak, true, cpuSeconds});
}

std::string StageLog::line() const {
    std::string s = "stages:";
    const char* sep = " ";
    for (const auto& r : rows_) {
        s += fmt::format("{}{} {:.2f} s, CPU {:.2f} s ({} {} MB)", sep, r.stage, r.seconds, r.cpuSeconds,
                         r.child ? "reader" : "kerf", (r.peakRssKb + 1023) / 1024);
        sep = ", ";
    }
    return s;
}

} // namespace kerf::io
