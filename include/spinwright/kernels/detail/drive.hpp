// spinwright — the one drive loop every kernel runs on: it owns the budget (sweeps, deadline,
// stop token, target), the observers and the progress calls, and gives each kernel the same
// surface (step, advance, run). The kernel shape is described in docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_DETAIL_DRIVE_HPP
#define SPINWRIGHT_KERNELS_DETAIL_DRIVE_HPP

#include "../../config.hpp"
#include "../../control.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t
#include <limits>   // std::numeric_limits

namespace spinwright {

/// A sweep budget with no limit: the run ends by its deadline, stop token or target only.
inline constexpr std::uint64_t unlimited_sweeps = ~std::uint64_t{0};

namespace detail {

// The deadline of a sweep whose duration the drive cannot predict yet (the first sweep of a
// timed advance: no earlier sweep of this run has been timed). A kernel that watches it reads
// the clock every sweep_watch_every attempts of that sweep and ends the sweep early once the
// deadline has passed, so a run whose set-up left less than one sweep of time ends within a
// few thousand attempts of its deadline instead of one whole sweep after it.
struct SweepDeadline {
  Clock clock{};
  double at = 0;  // the deadline as a reading of `clock`
  bool passed() const noexcept { return clock.read() >= at; }
};

// Attempts between two clock reads in a watched sweep: a read costs well under a microsecond
// and this many attempts some microseconds, so watching adds a few percent to that one sweep.
inline constexpr std::size_t sweep_watch_every = 1024;

// A watched sweep through a move generator's surface (propose, delta, apply): the same
// proposals and random draws as an unwatched sweep of the same move, in the same order, so a
// watched sweep that the deadline does not cut is the same sweep. `attempts` is the sweep's
// length on entry and the attempts made on return; returns the number accepted.
template <class Move, class State, class Accept, class Rng>
std::uint64_t watched_sweep(Move& move, State& state, const Accept& acceptor, Rng& stream, std::size_t& attempts,
                            const SweepDeadline& deadline) {
  Rng rng = stream;
  std::uint64_t accepted = 0;
  const std::size_t m = attempts;
  std::size_t k = 0;
  for (; k < m; ++k) {
    if (k != 0 && k % sweep_watch_every == 0 && deadline.passed()) break;
    const auto p = move.propose(state, rng);
    const auto d = move.delta(state, p);
    if (acceptor.accept(d, rng)) {
      move.apply(state, p, d);
      ++accepted;
    }
  }
  stream = rng;
  attempts = k;
  return accepted;
}

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

  // The deadline for a kernel to watch inside a sweep (timed budgets only).
  SweepDeadline sweep_deadline() const noexcept { return {budget_.clock, start_ + budget_.seconds}; }

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
//   void watch_deadline(const SweepDeadline*) before every sweep: the deadline to watch inside
//                                            that sweep (its duration cannot be predicted yet),
//                                            or null; null again when advance() returns
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
    // The first sweep of a timed run has no measured duration: the kernel watches the
    // deadline inside it (when it can), so the set-up plus that sweep cannot overrun by a sweep.
    const SweepDeadline deadline = check.timed() ? check.sweep_deadline() : SweepDeadline{};
    for (;;) {
      const double elapsed = check.timed() ? check.elapsed() : 0.0;
      if (check.timed()) {
        if (previous >= 0) next = elapsed - previous;
        previous = elapsed;
      }
      if (check.done(k.sweeps_done() - first, limit, k.best_for_target(), elapsed, next, why)) break;
      if (k.settled()) break;
      k.before_sweep(check.time_fraction(elapsed, next));
      k.watch_deadline(check.timed() && next <= 0 ? &deadline : nullptr);
      if (k.sweep_once()) notify_improvement(observer, k.sweeps_done(), k.best_for_target());
      if (every != 0 && k.sweeps_done() % every == 0) notify_progress(observer, k.sweeps_done(), k.best_for_target());
    }
    k.watch_deadline(nullptr);
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
  void watch_deadline(const SweepDeadline*) noexcept {}
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
