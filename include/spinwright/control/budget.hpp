// spinwright — Budget: what bounds one restart (sweeps, a deadline on a Clock, a stop
// token, a target energy), and BudgetGuard, which checks it once per sweep.
#ifndef SPINWRIGHT_CONTROL_BUDGET_HPP
#define SPINWRIGHT_CONTROL_BUDGET_HPP

#include "../config.hpp"
#include "clock.hpp"
#include "stop_reason.hpp"
#include "stop_token.hpp"

#include <cstdint>  // std::uint64_t
#include <limits>   // std::numeric_limits

namespace spinwright {

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

#endif  // SPINWRIGHT_CONTROL_BUDGET_HPP
