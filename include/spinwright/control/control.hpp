// spinwright — how a run is bounded and observed: budgets (sweeps and a deadline on an
// injectable clock), a stop token, a target energy, and observers.
// No <chrono> or <thread> here: a firmware build supplies its own clock; a hosted build can
// use steady_clock() from control/steady_clock.hpp.
#ifndef SPINWRIGHT_CONTROL_CONTROL_HPP
#define SPINWRIGHT_CONTROL_CONTROL_HPP

#include "../config.hpp"

#include <atomic>       // std::atomic (lock-free bool on every supported target)
#include <cstdint>      // std::uint64_t, std::uint8_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::void_t, std::false_type
#include <utility>      // std::declval

namespace spinwright {

// How a run ended. Data, not an error.
enum class StopReason : std::uint8_t {
  budget_exhausted,  // the sweep budget was spent
  deadline,          // the clock passed the deadline
  target_reached,    // a state at or below the target energy was found
  stopped,           // the stop token was set
};

inline constexpr const char* to_string(StopReason r) noexcept {
  switch (r) {
    case StopReason::budget_exhausted:
      return "budget_exhausted";
    case StopReason::deadline:
      return "deadline";
    case StopReason::target_reached:
      return "target_reached";
    case StopReason::stopped:
      return "stopped";
  }
  return "unknown";
}

// A clock is a plain function pointer with a context, returning seconds on any fixed origin.
// Firmware passes its own tick counter; hosted code passes steady_clock().
struct Clock {
  double (*now)(void* context) = nullptr;
  void* context = nullptr;
  bool valid() const noexcept { return now != nullptr; }
  double read() const noexcept { return now(context); }
};

// A flag another thread (or a signal handler) sets to stop a run; kernels poll it once per
// sweep, so a run stops within one sweep of the request.
class StopToken {
 public:
  void request_stop() noexcept { flag_.store(true, std::memory_order_relaxed); }
  bool stop_requested() const noexcept { return flag_.load(std::memory_order_relaxed); }
  void reset() noexcept { flag_.store(false, std::memory_order_relaxed); }

 private:
  std::atomic<bool> flag_{false};
};

// Limits on one restart. A zero sweep count means "the kernel's default"; a deadline is in
// the clock's seconds and ignored without a clock.
struct Budget {
  std::uint64_t sweeps = 0;
  double seconds = std::numeric_limits<double>::infinity();  // relative to the run's start
  Clock clock{};
  const StopToken* stop = nullptr;
  bool has_target = false;
  double target = 0;  // stop when the best energy is <= target (energies as double)

  Budget& with_sweeps(std::uint64_t n) noexcept {
    sweeps = n;
    return *this;
  }
  Budget& with_time_limit(double s, Clock c) noexcept {
    seconds = s;
    clock = c;
    return *this;
  }
  Budget& with_stop(const StopToken& token) noexcept {
    stop = &token;
    return *this;
  }
  Budget& with_target(double energy) noexcept {
    has_target = true;
    target = energy;
    return *this;
  }
};

// Observers: a user type with any of
//   void on_improvement(std::uint64_t sweep, double energy)
//   void on_progress(std::uint64_t sweep, double best_energy)   // every `progress_every` sweeps
// Kernels call them through these helpers, so a type may define only what it needs.
struct NoObserver {};

namespace detail {
template <class T, class = void>
struct has_on_improvement : std::false_type {};
template <class T>
struct has_on_improvement<T, std::void_t<decltype(std::declval<T&>().on_improvement(std::uint64_t{}, 0.0))>>
    : std::true_type {};
template <class T, class = void>
struct has_on_progress : std::false_type {};
template <class T>
struct has_on_progress<T, std::void_t<decltype(std::declval<T&>().on_progress(std::uint64_t{}, 0.0))>>
    : std::true_type {};
}  // namespace detail

template <class Observer>
void notify_improvement(Observer& o, std::uint64_t sweep, double energy) {
  if constexpr (detail::has_on_improvement<Observer>::value) o.on_improvement(sweep, energy);
}
template <class Observer>
void notify_progress(Observer& o, std::uint64_t sweep, double best) {
  if constexpr (detail::has_on_progress<Observer>::value) o.on_progress(sweep, best);
}

// Tracks a budget during a run: call start() once, then should_stop(sweeps_done, best) once
// per sweep. Reads the clock at most once per call.
class BudgetGuard {
 public:
  BudgetGuard() = default;
  explicit BudgetGuard(const Budget& b) : budget_(b) {}

  void start() noexcept { start_ = budget_.clock.valid() ? budget_.clock.read() : 0.0; }

  double elapsed() const noexcept { return budget_.clock.valid() ? budget_.clock.read() - start_ : 0.0; }

  // `sweep_limit` is the kernel's own budget (the Budget's sweeps, or its default).
  bool should_stop(std::uint64_t sweeps_done, std::uint64_t sweep_limit, double best, StopReason& why) const noexcept {
    if (budget_.has_target && best <= budget_.target) {
      why = StopReason::target_reached;
      return true;
    }
    if (budget_.stop != nullptr && budget_.stop->stop_requested()) {
      why = StopReason::stopped;
      return true;
    }
    if (sweeps_done >= sweep_limit) {
      why = StopReason::budget_exhausted;
      return true;
    }
    if (budget_.clock.valid() && budget_.seconds != std::numeric_limits<double>::infinity() &&
        budget_.clock.read() - start_ >= budget_.seconds) {
      why = StopReason::deadline;
      return true;
    }
    return false;
  }

  const Budget& budget() const noexcept { return budget_; }

 private:
  Budget budget_{};
  double start_ = 0;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_CONTROL_HPP
