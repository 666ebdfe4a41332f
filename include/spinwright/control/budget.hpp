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

}  // namespace spinwright

#endif  // SPINWRIGHT_CONTROL_BUDGET_HPP
