// spinwright command-line program — Ctrl-C handling and the progress line.
#include "progress.hpp"

#include "spread.hpp"

#include <spinwright/control/steady_clock.hpp>

#include <chrono>   // std::chrono::milliseconds
#include <cmath>    // std::isfinite
#include <csignal>  // sigaction, SIGINT
#include <cstdio>   // std::snprintf
#include <string>   // std::string

#include <unistd.h>  // isatty, write, STDERR_FILENO

namespace spinwright_cli {

namespace {

// Constant-initialised (StopToken's constructor is constexpr), so the handler never sees it
// half-built.
spinwright::StopToken g_interrupt;
volatile std::sig_atomic_t g_interrupted = 0;

extern "C" void on_sigint(int) {
  g_interrupted = 1;
  g_interrupt.request_stop();
}

void write_stderr(const std::string& s) {
  std::size_t done = 0;
  while (done < s.size()) {
    const ssize_t n = ::write(STDERR_FILENO, s.data() + done, s.size() - done);
    if (n <= 0) return;
    done += static_cast<std::size_t>(n);
  }
}

std::string seconds_text(double s) {
  char buf[32];
  if (s < 100) {
    std::snprintf(buf, sizeof buf, "%.1f s", s);
  } else {
    std::snprintf(buf, sizeof buf, "%.0f s", s);
  }
  return buf;
}

}  // namespace

spinwright::StopToken& interrupt_token() { return g_interrupt; }

bool interrupted() { return g_interrupted != 0 || g_interrupt.stop_requested(); }

void install_interrupt_handler() {
  struct sigaction action {};
  action.sa_handler = on_sigint;
  sigemptyset(&action.sa_mask);
  action.sa_flags = static_cast<int>(SA_RESETHAND);  // a second Ctrl-C ends the program at once
  sigaction(SIGINT, &action, nullptr);
#if SPINWRIGHT_CLI_MPI
  // mpirun passes a Ctrl-C on to the ranks as SIGTERM: the same graceful end.
  sigaction(SIGTERM, &action, nullptr);
#endif
}

void SharedBest::offer(double e) noexcept {
  double cur = value_.load(std::memory_order_relaxed);
  while (e < cur && !value_.compare_exchange_weak(cur, e, std::memory_order_relaxed)) {
  }
}

ProgressLine::ProgressLine(ProgressCounters& counters, bool enabled) : counters_(counters) {
  if (enabled && ::isatty(STDERR_FILENO) == 1) thread_ = std::thread([this] { loop(); });
}

ProgressLine::~ProgressLine() { finish(); }

void ProgressLine::finish() {
  {
    std::lock_guard<std::mutex> lock(mutex_);
    done_ = true;
  }
  wake_.notify_all();
  if (thread_.joinable()) thread_.join();
  if (drawn_) {
    write_stderr("\r\033[K");
    drawn_ = false;
  }
}

void ProgressLine::loop() {
  const double start = spinwright::steady_seconds(nullptr);
  std::unique_lock<std::mutex> lock(mutex_);
  while (!done_) {
    wake_.wait_for(lock, std::chrono::milliseconds(200));
    if (done_) break;
    const double elapsed = spinwright::steady_seconds(nullptr) - start;
    if (elapsed < 1.0) continue;
    std::string line = "\r\033[Kelapsed " + seconds_text(elapsed);
    if (counters_.time_limit > 0) line += " of " + seconds_text(counters_.time_limit);
    line += "   restarts " + std::to_string(counters_.restarts_done.load(std::memory_order_relaxed)) + "/" +
            std::to_string(counters_.restarts_total);
    if (counters_.best.known()) {
      char buf[48];
      std::snprintf(buf, sizeof buf, "%.10g", counters_.best.value());
      line += std::string("   best energy ") + buf;
    }
    if (interrupted()) line += "   stopping...";
    write_stderr(line);
    drawn_ = true;
  }
}

}  // namespace spinwright_cli
