// spinwright command-line program — Ctrl-C handling and the self-updating progress line.
//
// The SIGINT handler sets a StopToken (a lock-free atomic store, safe in a signal handler);
// kernels poll it once per sweep. The handler is installed with SA_RESETHAND, so a second
// Ctrl-C ends the program at once.
//
// The progress line goes to stderr only when stderr is a terminal and --quiet is absent, and
// only once a run has lasted about a second. It is redrawn in place (carriage return) a few
// times per second and erased before the report is written.
#ifndef SPINWRIGHT_CLI_PROGRESS_HPP
#define SPINWRIGHT_CLI_PROGRESS_HPP

#include <spinwright/control.hpp>

#include <atomic>              // std::atomic
#include <condition_variable>  // std::condition_variable
#include <cstdint>             // std::uint64_t
#include <limits>              // std::numeric_limits
#include <mutex>               // std::mutex
#include <thread>              // std::thread

namespace spinwright_cli {

// The token every kernel of this process polls; set by Ctrl-C.
spinwright::StopToken& interrupt_token();
void install_interrupt_handler();
bool interrupted();

// Best energy so far, shared between threads (lowest wins).
class SharedBest {
 public:
  void offer(double e) noexcept;
  bool known() const noexcept { return value() < std::numeric_limits<double>::infinity(); }
  double value() const noexcept { return value_.load(std::memory_order_relaxed); }

 private:
  std::atomic<double> value_{std::numeric_limits<double>::infinity()};
};

struct ProgressCounters {
  std::atomic<std::uint64_t> restarts_done{0};
  std::uint64_t restarts_total = 0;
  double time_limit = 0;  // 0: none
  SharedBest best;
};

class ProgressLine {
 public:
  // Starts the drawing thread when `enabled` and stderr is a terminal.
  ProgressLine(ProgressCounters& counters, bool enabled);
  ~ProgressLine();
  ProgressLine(const ProgressLine&) = delete;
  ProgressLine& operator=(const ProgressLine&) = delete;
  // Stops drawing and erases the line; idempotent.
  void finish();

 private:
  void loop();
  ProgressCounters& counters_;
  std::thread thread_;
  std::mutex mutex_;
  std::condition_variable wake_;
  bool done_ = false;
  bool drawn_ = false;
};

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_PROGRESS_HPP
