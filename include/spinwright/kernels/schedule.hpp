// spinwright — annealing schedules: how the inverse temperature beta moves from beta_start to
// beta_end over a run (geometric, linear, or a user callable of the run's fraction).
// The beta span a default schedule takes from the model: kernels/beta_span.hpp.
#ifndef SPINWRIGHT_KERNELS_SCHEDULE_HPP
#define SPINWRIGHT_KERNELS_SCHEDULE_HPP

#include "../config.hpp"
#include "../status.hpp"

#include <cmath>    // std::pow
#include <cstdint>  // std::uint8_t

namespace spinwright {

// How beta moves from beta_start to beta_end over the schedule, as a function of the sweep
// fraction f in [0, 1] (sweep k of S has f = k / (S - 1)).
enum class ScheduleShape : std::uint8_t {
  geometric,  // beta = beta_start * (beta_end / beta_start)^f
  linear,     // beta = beta_start + (beta_end - beta_start) f
  callable,   // beta = a user callable of f (Schedule::from)
};

// A schedule. With beta_start and beta_end both 0 (the default) the kernel derives the range
// from the model (the annealer: sample_beta_span). A callable is called once per sweep, never per
// attempt; it and its context must outlive the kernel that uses the schedule.
struct Schedule {
  ScheduleShape shape = ScheduleShape::geometric;
  double beta_start = 0;
  double beta_end = 0;
  double (*function)(double fraction, const void* context) = nullptr;
  const void* context = nullptr;

  static constexpr Schedule geometric(double b0, double b1) noexcept {
    return {ScheduleShape::geometric, b0, b1, nullptr, nullptr};
  }
  static constexpr Schedule linear(double b0, double b1) noexcept {
    return {ScheduleShape::linear, b0, b1, nullptr, nullptr};
  }
  // Fixed temperature: sampling at beta for the whole run.
  static constexpr Schedule constant(double beta) noexcept {
    return {ScheduleShape::linear, beta, beta, nullptr, nullptr};
  }
  // Any callable `double f(double fraction)`, held by address: it must outlive the kernel.
  template <class Fn>
  static Schedule from(const Fn& fn) noexcept {
    Schedule s;
    s.shape = ScheduleShape::callable;
    s.function = [](double fraction, const void* ctx) { return (*static_cast<const Fn*>(ctx))(fraction); };
    s.context = &fn;
    return s;
  }

  // True when the kernel must fill in beta_start / beta_end from the model.
  constexpr bool automatic() const noexcept {
    return shape != ScheduleShape::callable && beta_start == 0 && beta_end == 0;
  }

  /// Refuses an end that is not finite (non_finite_value) or negative (invalid_argument); a
  /// callable's values are checked by the acceptance at every sweep instead (an assertion).
  Status check() const noexcept {
    const bool finite = beta_start - beta_start == 0 && beta_end - beta_end == 0;
    if (!finite)
      return Status::error(StatusCode::non_finite_value, "schedule: beta_start or beta_end is NaN or infinite");
    if (shape != ScheduleShape::callable && (beta_start < 0 || beta_end < 0)) {
      return Status::error(StatusCode::invalid_argument,
                           "schedule: an inverse temperature is negative (beta_start and beta_end must be >= 0)");
    }
    if (shape == ScheduleShape::callable && function == nullptr) {
      return Status::error(StatusCode::invalid_argument, "schedule: a callable schedule without a function");
    }
    return Status::success();
  }

  double beta_at(double fraction) const noexcept {
    if (fraction < 0) fraction = 0;
    if (fraction > 1) fraction = 1;
    switch (shape) {
      case ScheduleShape::geometric:
        if (beta_start <= 0 || beta_end <= 0) return beta_start + (beta_end - beta_start) * fraction;
        return beta_start * std::pow(beta_end / beta_start, fraction);
      case ScheduleShape::linear:
        return beta_start + (beta_end - beta_start) * fraction;
      case ScheduleShape::callable:
        return function(fraction, context);
    }
    return beta_end;
  }
};

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_SCHEDULE_HPP
