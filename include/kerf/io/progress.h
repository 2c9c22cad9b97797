// kerf/io/progress.h — progress on standard error, and per-stage time and memory.
//
// Progress is for a person watching a terminal: it appears only when standard
// error is a terminal, only once a run has taken more than two seconds, and
// not with --quiet. It redraws one line ("kerf: prove  40%  12 s") from a
// background thread; the work only stores the stage and the share done (lowering:
// members; proof: nodes swept, then outputs compared). KERF_PROGRESS_DELAY
// (seconds) and KERF_PROGRESS_INTERVAL (milliseconds) move the threshold and the
// redraw period, for a demo or a test (0: redraw at every change of stage or share too).
// StageLog records wall time, CPU time and peak memory per stage for -v and the
// JSON report (CPU time tells a stage's own cost on a machine shared with other work).
#pragma once

#include <atomic>
#include <chrono>
#include <cstddef>
#include <string>
#include <vector>

namespace kerf::io {

/// The one progress line of this run.
class Progress {
public:
    static Progress& global();
    /// Start redrawing if `wanted` and standard error is a terminal.
    void start(bool wanted);
    /// Enter a stage ("reading", "restructuring", ...); the share done restarts.
    void stage(const char* name);
    /// Share of the current stage done, e.g. outputs proved of all outputs.
    void share(std::size_t done, std::size_t total);
    /// Clear the line and stop redrawing (also at exit).
    void stop();
    ~Progress();

private:
    Progress() = default;
    /// With KERF_PROGRESS_INTERVAL=0: redraw now, from the working thread.
    void drawNow();
    std::atomic<const char*> stage_{""};
    std::atomic<std::size_t> done_{0}, total_{0};
    std::atomic<bool> running_{false};
    bool eager_ = false;
    std::chrono::steady_clock::time_point began_;
    double delay_ = 2.0;
    void* thread_ = nullptr;
};

/// Peak resident memory of kerf itself so far, in KiB.
long peakRssKb();

/// Wall time, CPU time and peak memory per stage of a run.
class StageLog {
public:
    struct Row {
        std::string stage;
        double seconds = 0;
        long peakRssKb = 0;      ///< peak of the process doing the stage (kerf, or the reader)
        bool child = false;      ///< measured on the reader process
        double cpuSeconds = 0;   ///< user + system CPU time of that process during the stage
    };
    StageLog();
    /// Close the running stage (if any) and start `name`; also tells Progress.
    void begin(const char* name);
    /// Close the running stage.
    void end();
    /// A stage that ran in a child process, measured there. Its wall time is taken out
    /// of the running stage's, which waited for it (the child's CPU is never kerf's).
    void addChild(const char* name, double seconds, long peakRssKb, double cpuSeconds = 0);
    const std::vector<Row>& rows() const { return rows_; }
    /// "stages: read 1.20 s (reader 310 MB), lower 0.40 s (kerf 120 MB), ..."
    std::string line() const;

private:
    std::vector<Row> rows_;
    std::string current_;
    std::chrono::steady_clock::time_point t0_;
    double cpu0_ = 0;
};

} // namespace kerf::io
