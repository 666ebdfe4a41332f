// spinwright — the one drive loop every kernel runs on: it owns the budget (sweeps, deadline,
// stop token, target), the observers and the progress calls, and gives each kernel the same
// surface (step, advance, run). The kernel shape is described in docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_DETAIL_DRIVE_HPP
#define SPINWRIGHT_KERNELS_DETAIL_DRIVE_HPP

#include "../../config.hpp"
#include "../../control.hpp"

#include <cstdint>  // std::uint64_t
#include <limits>   // std::numeric_limits

namespace spinwright {

/// A sweep budget with no limit: the run ends by its deadline, stop token or target only.
inline constexpr std::uint64_t unlimited_sweeps = ~std::uint64_t{0};

namespace detail {

// Checks a Budget once per sweep. The clock is read once per check, and only when the budget
// has a time limit (otherwise at the start and the end of the run). Elapsed time counts from
// the budget's start when it has one (a one-call function stamps its entry), else from here.
// A sweep is not begun when the last one's duration says it would end past the deadline, so a
// run ends at its deadline rather than one sweep after it.
class BudgetCheck {
 public:
  explicit BudgetCheck(const Budget& budget) noexcept
      : budget_(budget),
        timed_(budget.timed()),
        begin_(budget.clock.valid() ? budget.clock.read() : 0.0),
        start_(budget.has_start ? budget.start : begin_) {}

  bool timed() const noexcept { return timed_; }

  // Elapsed seconds on the budget's clock since its start (0 without a clock).
  double elapsed() const noexcept { return budget_.clock.valid() ? budget_.clock.read() - start_ : 0.0; }

  // True when the run must end before another sweep; `why` says why. `elapsed` is the value
  // of elapsed() just read by the caller and `next` the expected duration of the next sweep
  // (both ignored without a time limit).
  bool done(std::uint64_t sweeps, std::uint64_t limit, double best, double elapsed, double next,
            StopReason& why) const noexcept {
    if (budget_.has_target && best <= budget_.target) {
      why = StopReason::target_reached;
    } else if (budget_.stop != nullptr && budget_.stop->stop_requested()) {
      why = StopReason::stopped;
    } else if (sweeps >= limit) {
      why = StopReason::budget_exhausted;
    } else if (timed_ && (elapsed >= budget_.seconds || elapsed + next > budget_.seconds)) {
      why = StopReason::deadline;
    } else {
      return false;
    }
    return true;
  }

  // The fraction of this run's time (from its start to the deadline) that will have passed at
  // the end of the next sweep (0 without a time limit), for time-driven schedules.
  double time_fraction(double elapsed, double next) const noexcept {
    if (!timed_) return 0.0;
    const double before = begin_ - start_;  // spent before this run began (workspace, earlier runs)
    const double window = budget_.seconds - before;
    return window > 0 ? (elapsed - before + next) / window : 1.0;
  }

 private:
  const Budget& budget_;
  bool timed_;
  double begin_;
  double start_;
};

// The drive loop and the surface it gives a kernel, as a base of the kernel (CRTP).
// The kernel provides
//   bool sweep_once()                      one sweep; true when it ended at a new best
//   std::uint64_t sweeps_done() const      sweeps since the last reset / warm start
//   std::uint64_t default_sweeps() const   the budget of advance() when Budget::sweeps is 0
//   std::uint64_t progress_every() const   period of on_progress in sweeps (0: never)
//   double best_for_target() const         the energy a Budget's target is checked against
//   solution() const                       (heap builds) the result run() returns
// and may hide these no-op hooks (declaring `friend class detail::Drive<Kernel>`):
//   void begin_advance(std::uint64_t limit)  before the first sweep of advance()
//   void before_sweep(double time_fraction)  before every sweep: the run's time fraction at its end, 0 untimed
//   bool settled() const                     nothing left to do (descent at a local minimum)
template <class Kernel>
class Drive {
 public:
  /// n sweeps with no budget (the schedule's length stays what the last advance() set).
  /// No allocation.
  void step(std::uint64_t n_sweeps = 1) {
    for (std::uint64_t k = 0; k < n_sweeps && !self().settled(); ++k) {
      self().before_sweep(0.0);
      self().sweep_once();
    }
  }

  /// Runs until the budget ends: its sweeps (the kernel's default when 0; unlimited_sweeps
  /// for none), the deadline (no sweep is begun that the last one's duration says would end
  /// past it), the stop token (polled once per sweep) or the target (checked
  /// before every sweep). Observers hear of every sweep that ends at a new best and, every
  /// progress_every sweeps, of the progress. No allocation; read best() afterwards.
  /// `seconds` receives the elapsed clock time (since the budget's start when it has one).
  template <class Observer>
  StopReason advance(const Budget& budget, Observer& observer, double* seconds = nullptr) {
    Kernel& k = self();
    const std::uint64_t limit = budget.sweeps != 0 ? budget.sweeps : k.default_sweeps();
    const std::uint64_t every = k.progress_every();
    k.begin_advance(limit);
    const BudgetCheck check(budget);
    const std::uint64_t first = k.sweeps_done();
    StopReason why = StopReason::budget_exhausted;
    double previous = -1;  // elapsed() before the last sweep
    double next = 0;       // expected duration of the next sweep: the last one's
    for (;;) {
      const double elapsed = check.timed() ? check.elapsed() : 0.0;
      if (check.timed()) {
        if (previous >= 0) next = elapsed - previous;
        previous = elapsed;
      }
      if (check.done(k.sweeps_done() - first, limit, k.best_for_target(), elapsed, next, why)) break;
      if (k.settled()) break;
      k.before_sweep(check.time_fraction(elapsed, next));
      if (k.sweep_once()) notify_improvement(observer, k.sweeps_done(), k.best_for_target());
      if (every != 0 && k.sweeps_done() % every == 0) notify_progress(observer, k.sweeps_done(), k.best_for_target());
    }
    if (seconds != nullptr) *seconds = check.elapsed();
    return why;
  }

  StopReason advance(const Budget& budget = Budget{}, double* seconds = nullptr) {
    NoObserver none;
    return advance(budget, none, seconds);
  }

#if !SPINWRIGHT_NO_HEAP
  /// advance(), then the best state as the kernel's Solution, with the stop reason and the
  /// elapsed time (allocates the returned vectors).
  template <class Observer>
  auto run(const Budget& budget, Observer& observer) {
    double seconds = 0;
    const StopReason why = advance(budget, observer, &seconds);
    auto s = self().solution();
    s.reason = why;
    s.seconds = seconds;
    return s;
  }
  auto run(const Budget& budget = Budget{}) {
    NoObserver none;
    return run(budget, none);
  }
#endif

 protected:
  Drive() = default;
  void begin_advance(std::uint64_t) noexcept {}
  void before_sweep(double) noexcept {}
  bool settled() const noexcept { return false; }

 private:
  Kernel& self() noexcept { return static_cast<Kernel&>(*this); }
};

// The seconds a one-call function reports: since the budget's start when it has one (the
// call's entry, so the workspace, polish and result are included), else those of advance().
inline double call_seconds(const Budget& budget, double advance_seconds) noexcept {
  return budget.has_start && budget.clock.valid() ? budget.clock.read() - budget.start : advance_seconds;
}

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_DRIVE_HPP
