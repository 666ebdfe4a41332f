// spinwright — Budget: what bounds one restart (sweeps, a deadline on a Clock, a stop
// token, a target energy). The kernels check it once per sweep (kernels/detail/drive.hpp).
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
// the clock's seconds and ignored without a clock. The deadline counts from `start` when the
// budget has one (the one-call functions stamp it at their entry, so building the workspace,
// the closing polish and the result count against the limit), otherwise from the start of
// the kernel's advance().
struct Budget {
  std::uint64_t sweeps = 0;
  double seconds = std::numeric_limits<double>::infinity();  // relative to the start
  Clock clock{};
  bool has_start = false;
  double start = 0;  // a reading of `clock` (has_start)
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
  /// The deadline counts from this reading of the clock instead of from advance()'s start.
  Budget& starting_at(double clock_reading) noexcept {
    has_start = true;
    start = clock_reading;
    return *this;
  }
  /// True with a clock and a finite time limit.
  bool timed() const noexcept { return clock.valid() && seconds < std::numeric_limits<double>::infinity(); }
  /// The budget with its start stamped now (a timed budget without a start), else unchanged:
  /// what a one-call function does at its entry.
  Budget stamped() const noexcept {
    Budget b = *this;
    if (b.timed() && !b.has_start) b.starting_at(b.clock.read());
    return b;
  }
  /// Seconds left before the deadline (infinity untimed, the whole limit without a start;
  /// negative once past it).
  double remaining() const noexcept {
    if (!timed()) return std::numeric_limits<double>::infinity();
    return has_start ? seconds - (clock.read() - start) : seconds;
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

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_BUDGET_HPP
