// spinwright command-line program — the kernels over restarts for one model type. Included
// only by runner_int32.cpp, runner_int64.cpp and runner_double.cpp, each of which instantiates
// it for the Ising and QUBO models of its value type (one translation unit per value type).
#ifndef SPINWRIGHT_CLI_RUNNER_KERNELS_HPP
#define SPINWRIGHT_CLI_RUNNER_KERNELS_HPP

#include "runner.hpp"
#include "spread.hpp"

#include <spinwright/control/steady_clock.hpp>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/auto.hpp>
#include <spinwright/kernels/beta_span.hpp>
#include <spinwright/kernels/bit_sliced.hpp>
#include <spinwright/kernels/breakout.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/kernels/lanes.hpp>
#include <spinwright/kernels/population.hpp>
#include <spinwright/kernels/quantum_anneal.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/parallel/bit_sliced_restarts.hpp>
#include <spinwright/parallel/exact_threads.hpp>
#include <spinwright/parallel/restarts.hpp>

#include <algorithm>  // std::max, std::min
#include <atomic>     // std::atomic
#include <cmath>      // std::ceil, std::log, std::isfinite
#include <memory>     // std::unique_ptr
#include <limits>     // std::numeric_limits
#include <thread>     // std::thread
#include <vector>     // std::vector

namespace spinwright_cli::detail {

// Passes and seconds of the closing descent after Ctrl-C: short, so the program still ends
// promptly, but enough to take the best state seen down to (or near) a local minimum.
inline constexpr std::uint64_t interrupt_polish_passes = 64;
inline constexpr double interrupt_polish_seconds = 0.25;

template <class Energy>
spinwright::Solution<double> as_double(spinwright::Solution<Energy>&& s) {
  if constexpr (std::is_same_v<Energy, double>) {
    return std::move(s);
  } else {
    spinwright::Solution<double> d;
    d.spins = std::move(s.spins);
    d.energy = static_cast<double>(s.energy);
    d.sweeps = s.sweeps;
    d.attempted = s.attempted;
    d.accepted = s.accepted;
    d.seconds = s.seconds;
    d.reason = s.reason;
    d.restart = s.restart;
    return d;
  }
}

inline bool cut(spinwright::StopReason r) {
  return r == spinwright::StopReason::stopped || r == spinwright::StopReason::deadline;
}

// The closing descent of annealing and tempering: steepest after a full schedule; after a
// deadline cut the schedule short, the cheaper first-improvement descent, so the limit is passed
// by one descent at most; after Ctrl-C a first-improvement descent bounded by
// interrupt_polish_passes and interrupt_polish_seconds (the stop token is already set, so the
// descent does not poll it). A restart stopped before its first sweep is left as it is.
// `settled`: the kernel has checked that the state is a local minimum of single flips
// (BitSlicedAnnealer::improvable_best), so the steepest descent's one pass of N attempts,
// which that check replaced, is only counted.
template <class Model>
spinwright::Solution<typename Model::energy_type> finish(const Model& model,
                                                         spinwright::Solution<typename Model::energy_type>&& s,
                                                         bool settled = false) {
  using spinwright::StopReason;
  if (settled && !cut(s.reason)) {
    s.sweeps += 1;
    s.attempted += model.num_spins();
    return std::move(s);
  }
  if (s.reason == StopReason::stopped) {
    if (s.sweeps == 0) return std::move(s);
    spinwright::DescentParams params;
    params.rule = spinwright::DescentRule::first_improvement;
    params.initial = s.spins.data();
    spinwright::Descender<Model> d(model, params, 0, s.restart);
    spinwright::Budget b;
    b.sweeps = interrupt_polish_passes;
    b.with_time_limit(interrupt_polish_seconds, spinwright::steady_clock());
    auto p = d.run(b);
    p.sweeps += s.sweeps;
    p.attempted += s.attempted;
    p.accepted += s.accepted;
    p.seconds += s.seconds;
    p.reason = s.reason;
    p.restart = s.restart;
    return p;
  }
  if (s.reason == StopReason::deadline) return spinwright::polish(model, s, spinwright::DescentRule::first_improvement);
  return spinwright::polish(model, s, spinwright::DescentRule::steepest);
}

// Feeds the progress line; kernels call it from their own thread.
struct ProgressObserver {
  ProgressCounters* counters = nullptr;
  Trace* trace = nullptr;  // --plot: this restart's trace
  double start = 0;
  void on_improvement(std::uint64_t sweep, double energy) {
    if (counters != nullptr) counters->best.offer(energy);
    if (trace != nullptr) trace->push_back({sweep, spinwright::steady_seconds(nullptr) - start, energy});
  }
};

// The schedule's ends from the options: a given beta, or -ln(p) over the beta span's delta
// scale, or the automatic end. Usage errors name the option.
template <class Model>
Failure resolve_schedule(const Model& model, const ScheduleOptions& o, double& b0, double& b1) {
  const spinwright::BetaSpan span = spinwright::estimate_beta_span(model);
  b0 = span.beta_start;
  b1 = span.beta_end;
  if (o.beta_start > 0) b0 = o.beta_start;
  if (o.beta_end > 0) b1 = o.beta_end;
  // A model without a non-zero coefficient has no delta scale: its span is 1 .. 1.
  const double hot = span.hot_delta > 0 ? span.hot_delta : 1.0;
  const double cold = span.cold_delta > 0 ? span.cold_delta : 1.0;
  if (o.accept_start > 0) b0 = -std::log(o.accept_start) / hot;
  if (o.accept_end > 0) b1 = -std::log(o.accept_end) / cold;
  if (!(b0 > 0) || !(b1 > 0) || !std::isfinite(b0) || !std::isfinite(b1)) {
    return usage_failure("the schedule's inverse temperatures must be positive and finite",
                         "check --beta-start/--beta-end or --accept-start/--accept-end");
  }
  if (b1 < b0) {
    return usage_failure("the schedule would heat up: its start is colder (beta " + std::to_string(b0) +
                             ") than its end (beta " + std::to_string(b1) + ")",
                         "give a start hotter than the end (smaller beta, or larger acceptance)");
  }
  return {};
}

template <class Model>
spinwright::Solution<double> one_restart(const Model& model, const RunOptions& o, std::uint64_t r, double run_start,
                                         double b0, double b1, std::atomic<std::uint64_t>& cut_short) {
  spinwright::Budget budget;
  budget.sweeps = o.time_driven ? spinwright::unlimited_sweeps : o.sweeps;
  budget.stop = &interrupt_token();
  if (o.has_target) budget.with_target(o.target);
  if (o.time_limit < std::numeric_limits<double>::infinity()) {
    // An equal share of the limit per restart, and never more than what is left of the whole run.
    const double share = fill_share(o);
    const double left = o.time_limit - (spinwright::steady_seconds(nullptr) - run_start);
    budget.with_time_limit(std::max(0.0, std::min(share, left)), spinwright::steady_clock());
  } else {
    budget.clock = spinwright::steady_clock();  // for Solution::seconds
  }
  Trace* trace = o.traces != nullptr && r < o.traces->size() ? &(*o.traces)[static_cast<std::size_t>(r)] : nullptr;
  const double restart_start = spinwright::steady_seconds(nullptr);
  ProgressObserver observer{o.progress, trace, restart_start};
  const std::int8_t* warm = o.warm != nullptr ? o.warm->data() : nullptr;
  spinwright::Solution<double> s;
  bool counts_as_cut = false;
  if (o.fill_time) {
    s = as_double(spinwright::solve_auto(model, o.seed, r, budget));
    counts_as_cut = s.reason == spinwright::StopReason::stopped;
  } else {
    spinwright::Solution<typename Model::energy_type> raw;
    switch (o.kernel) {
      case Kernel::anneal: {
        spinwright::AnnealParams p;
        p.initial = warm;
        if (o.schedule.given()) p.schedule = spinwright::Schedule::geometric(b0, b1);
        // Annealing keeps the best state seen at sweep ends; a descent takes it to the local
        // minimum below (never raises the energy).
        raw = finish(model, spinwright::anneal(model, p, o.seed, r, budget, observer));
        break;
      }
      case Kernel::descent: {
        spinwright::DescentParams p;
        p.initial = warm;
        raw = spinwright::descend(model, p, o.seed, r, budget);
        break;
      }
      case Kernel::temper: {
        spinwright::TemperParams p;
        p.initial = warm;
        if (o.schedule.given()) {
          p.ladder.beta_min = b0;
          p.ladder.beta_max = b1;
        }
        raw = finish(model, static_cast<spinwright::Solution<typename Model::energy_type>>(
                                spinwright::temper(model, p, o.seed, r, budget, observer)));
        break;
      }
      case Kernel::tabu: {
        spinwright::TabuParams p;
        p.initial = warm;
        raw = spinwright::tabu_walk(model, p, o.seed, r, budget, observer);
        break;
      }
      case Kernel::breakout: {
        spinwright::BreakoutParams p;
        p.initial = warm;
        raw = spinwright::breakout(model, p, o.seed, r, budget, observer);
        break;
      }
      case Kernel::sqa: {
        spinwright::QuantumAnnealParams p;
        p.initial = warm;
        raw = finish(model, spinwright::quantum_anneal(model, p, o.seed, r, budget, observer));
        break;
      }
      case Kernel::population: {
        spinwright::PopulationParams p;
        p.initial = warm;
        raw = finish(model, spinwright::population_anneal(model, p, o.seed, r, budget, observer));
        break;
      }
      case Kernel::exact:
        break;  // exact_on
    }
    s = as_double(std::move(raw));
    // A time-driven run ends at its deadline by design; only Ctrl-C cuts it short.
    counts_as_cut = o.time_driven ? s.reason == spinwright::StopReason::stopped : cut(s.reason);
  }
  if (counts_as_cut) cut_short.fetch_add(1, std::memory_order_relaxed);
  if (trace != nullptr) trace->push_back({s.sweeps, spinwright::steady_seconds(nullptr) - restart_start, s.energy});
  if (o.progress != nullptr) {
    o.progress->best.offer(s.energy);
    o.progress->restarts_done.fetch_add(1, std::memory_order_relaxed);
  }
  return s;
}

// Runs work(b) for b = 0 .. blocks - 1 on up to `threads` threads (blocks taken in turn).
template <class Work>
void on_threads(unsigned threads, std::uint64_t blocks, Work&& work) {
  std::atomic<std::uint64_t> next{0};
  auto worker = [&]() {
    for (std::uint64_t b = next.fetch_add(1); b < blocks; b = next.fetch_add(1)) work(b);
  };
  const auto used = static_cast<unsigned>(std::min<std::uint64_t>(threads, blocks));
  if (used <= 1) {
    worker();
    return;
  }
  std::vector<std::thread> pool;
  for (unsigned t = 0; t < used; ++t) pool.emplace_back(worker);
  for (auto& th : pool) th.join();
}

// The budget of a group of restarts stepped together (lanes, a bit-sliced word): the run's
// sweeps, Ctrl-C, and a clock for the reported seconds.
inline spinwright::Budget group_budget(const RunOptions& o) {
  spinwright::Budget budget;
  budget.sweeps = o.sweeps;
  budget.stop = &interrupt_token();
  budget.clock = spinwright::steady_clock();
  return budget;
}

// One restart of a group, closed as one_restart closes its own: the group's stop reason and
// seconds, the cut-short count, the closing descent, the progress line.
template <class Model>
spinwright::Solution<double> close_restart(const Model& model, const RunOptions& o,
                                           spinwright::Solution<typename Model::energy_type>&& s,
                                           spinwright::StopReason why, double seconds,
                                           std::atomic<std::uint64_t>& cut_short, bool settled = false) {
  s.reason = why;
  s.seconds = seconds;
  if (cut(why)) cut_short.fetch_add(1, std::memory_order_relaxed);
  spinwright::Solution<double> out = as_double(finish(model, std::move(s), settled));
  if (o.progress != nullptr) {
    o.progress->best.offer(out.energy);
    o.progress->restarts_done.fetch_add(1, std::memory_order_relaxed);
  }
  return out;
}

// Many annealing restarts of a whole schedule: blocks of lanes (kernels/lanes.hpp) on the
// threads, each lane's best polished as one_restart's is; restarts first .. first + count - 1.
// Lane r's answer depends on (seed, r) only (not on the block it runs in), so shares of any
// size, on any rank, give the same tally.
template <class Model>
std::vector<spinwright::Solution<double>> lane_share(const Model& model, const RunOptions& o, std::uint64_t first,
                                                     std::uint64_t count, double b0, double b1,
                                                     std::atomic<std::uint64_t>& cut_short) {
  constexpr std::size_t width = spinwright::default_lane_width;
  spinwright::AnnealParams p;
  p.initial = o.warm != nullptr ? o.warm->data() : nullptr;
  if (o.schedule.given()) p.schedule = spinwright::Schedule::geometric(b0, b1);
  std::vector<spinwright::Solution<double>> results(static_cast<std::size_t>(count));
  on_threads(o.threads, (count + width - 1) / width, [&](std::uint64_t b) {
    const std::uint64_t at = b * width;
    const auto n = static_cast<std::size_t>(std::min<std::uint64_t>(width, count - at));
    spinwright::LaneAnnealer<Model, width> lanes(model, p, o.seed, first + at, n);
    ProgressObserver observer{o.progress, nullptr, 0};
    double seconds = 0;
    const spinwright::StopReason why = lanes.advance(group_budget(o), observer, &seconds);
    for (std::size_t l = 0; l < n; ++l) {
      results[static_cast<std::size_t>(at + l)] = close_restart(model, o, lanes.solution(l), why, seconds, cut_short);
    }
  });
  return results;
}

// Bit-sliced annealing of restarts first .. first + count - 1 (first a multiple of 64): one
// kernel per word of 64 restarts on the threads; restart r's answer depends on (seed, r / 64,
// r mod 64) only, so any split into whole words gives the same tally. Each restart's best is
// polished as one_restart's is. A lone word (64 restarts or fewer) on several threads shares
// its half-sweeps among them (checkerboard). The words run a thread's worth at a time and the closing
// descents of those words are then dealt to the threads one restart at a time, so that 64
// restarts (one word) still polish on every thread. A restart whose best state the kernel
// finds settled (improvable_best: no single flip lowers it, the usual case at the end of a
// schedule) needs no descent: the same answer and counters, without building a descender; and
// its spins are copied out only if it may be the run's best (the word's lowest settled energy).
template <class Model>
std::vector<spinwright::Solution<double>> bit_sliced_share(const Model& model, const RunOptions& o, std::uint64_t first,
                                                           std::uint64_t count, double b0, double b1, bool shared,
                                                           std::atomic<std::uint64_t>& cut_short) {
  spinwright::BitSlicedParams p;
  p.initial = o.warm != nullptr ? o.warm->data() : nullptr;
  p.shared_draws = shared;
  if (o.schedule.given()) p.schedule = spinwright::Schedule::geometric(b0, b1);
  std::vector<spinwright::Solution<double>> results(static_cast<std::size_t>(count));
  const std::uint64_t words = (count + 63) / 64;
  const std::uint64_t group = o.threads == 0 ? 1 : o.threads;
  for (std::uint64_t w0 = 0; w0 < words; w0 += group) {
    const std::uint64_t in_group = std::min<std::uint64_t>(group, words - w0);
    const std::uint64_t lo = 64 * w0, hi = std::min<std::uint64_t>(count, 64 * (w0 + in_group));
    std::vector<spinwright::Solution<typename Model::energy_type>> raw(static_cast<std::size_t>(hi - lo));
    std::vector<spinwright::StopReason> why(static_cast<std::size_t>(in_group));
    std::vector<double> seconds(static_cast<std::size_t>(in_group), 0.0);
    std::vector<std::uint64_t> improvable(static_cast<std::size_t>(in_group), ~std::uint64_t{0});
    on_threads(o.threads, in_group, [&](std::uint64_t g) {
      spinwright::BitSlicedAnnealer<Model, 1> kernel(model, p, o.seed, first / 64 + w0 + g);
      // A lone word on several threads: its half-sweeps are shared by all of them.
      std::unique_ptr<spinwright::BitSlicedThreadTeam> team;
      if (in_group == 1 && o.threads > 1 && kernel.checkerboard()) {
        team = std::make_unique<spinwright::BitSlicedThreadTeam>(o.threads);
        kernel.set_team(team.get());
      }
      why[static_cast<std::size_t>(g)] = kernel.advance(group_budget(o), &seconds[static_cast<std::size_t>(g)]);
      kernel.set_team(nullptr);
      team.reset();
      const std::uint64_t movable = kernel.improvable_best(0);
      improvable[static_cast<std::size_t>(g)] = movable;
      const std::uint64_t in_word = std::min<std::uint64_t>(64, hi - lo - 64 * g);
      // Spins only where they can matter: restarts that the closing descent moves, and settled
      // restarts at the word's lowest settled energy (a settled restart above that is beaten
      // by one of this word, so it is never the run's best; it keeps its energy and counters).
      // A run cut short (Ctrl-C) polishes every restart from its spins: all are kept then.
      const bool may_omit = !cut(why[static_cast<std::size_t>(g)]);
      bool any_settled = false;
      typename Model::energy_type lowest{};
      for (std::uint64_t k = 0; k < in_word; ++k) {
        if (((movable >> k) & 1u) != 0) continue;
        const auto e = kernel.best_energy(static_cast<std::size_t>(k));
        if (!any_settled || e < lowest) lowest = e;
        any_settled = true;
      }
      for (std::uint64_t k = 0; k < in_word; ++k) {
        auto& slot = raw[static_cast<std::size_t>(64 * g + k)];
        const bool settled = ((movable >> k) & 1u) == 0;
        if (!may_omit || !settled || kernel.best_energy(static_cast<std::size_t>(k)) == lowest) {
          slot = kernel.solution_of(static_cast<std::size_t>(k));
        } else {
          slot = kernel.solution_of(static_cast<std::size_t>(k), false);
        }
      }
    });
    on_threads(o.threads, hi - lo, [&](std::uint64_t r) {
      const auto g = static_cast<std::size_t>(r / 64);
      const bool settled = ((improvable[g] >> (r % 64)) & 1u) == 0;
      results[static_cast<std::size_t>(lo + r)] =
          close_restart(model, o, std::move(raw[static_cast<std::size_t>(r)]), why[g], seconds[g], cut_short, settled);
    });
  }
  return results;
}

// Bit-sliced annealing runs when it applies: annealing over a whole schedule as for lanes, at
// least half a word of restarts, and a model bit_sliced_fits takes (couplings of one magnitude,
// fields 0 or of that magnitude, degree <= 15).
template <class Model>
bool bit_sliced_applies(const Model& model, const RunOptions& o) {
  if constexpr (Model::is_dense || Model::form != spinwright::Form::ising) {
    return false;
  } else {
    return o.kernel == Kernel::anneal && !o.fill_time && !o.time_driven && !o.has_target && o.traces == nullptr &&
           o.restarts >= 32 && !(o.time_limit < std::numeric_limits<double>::infinity()) &&
           spinwright::bit_sliced_fits(model).ok();
  }
}

// Lanes run when they apply: annealing over a whole schedule (no time filling, target, time
// limit or per-restart trace: those are per restart), at least half a block of restarts, a
// sparse model within the lanes' field bound.
template <class Model>
bool lanes_apply(const Model& model, const RunOptions& o) {
  if constexpr (Model::is_dense) {
    return false;
  } else {
    constexpr std::size_t width = spinwright::default_lane_width;
    return o.kernel == Kernel::anneal && !o.fill_time && !o.time_driven && !o.has_target && o.traces == nullptr &&
           o.restarts >= width / 2 && !(o.time_limit < std::numeric_limits<double>::infinity()) &&
           spinwright::LaneAnnealer<Model, width>::fits(model);
  }
}

template <class Model>
Failure run_restarts_on(const LoadedModel& m, const Model& model, const RunOptions& o, double start, RunResult& out) {
  (void)m;
  double b0 = 0, b1 = 0;
  const bool scheduled = o.kernel == Kernel::anneal || o.kernel == Kernel::temper;
  if (scheduled && !o.fill_time) {
    if (o.schedule.given()) {
      Failure f = resolve_schedule(model, o.schedule, b0, b1);
      if (f.failed()) return f;
    } else {
      const spinwright::BetaSpan span = spinwright::estimate_beta_span(model);
      b0 = span.beta_start;
      b1 = span.beta_end;
    }
  }
  out.beta_start = b0;
  out.beta_end = b1;
  std::atomic<std::uint64_t> cut_short{0};
  if (bit_sliced_applies(model, o)) {
    // Shared draws (fast, restarts of one word correlated) for solve; independent bits when the
    // restarts feed statistics (bench) or share one warm start (shared draws would run them as one).
    const bool shared = !o.independent_restarts && o.warm == nullptr;
    out.tally = spread_shares<double>(
        o.restarts,
        [&](std::uint64_t first, std::uint64_t count) {
          return bit_sliced_share(model, o, first, count, b0, b1, shared, cut_short);
        },
        64);
    out.bit_sliced = true;
    out.shared_draws = shared;
    out.cut_short = cut_short.load();
    return {};
  }
  if (lanes_apply(model, o)) {
    out.tally = spread_shares<double>(o.restarts, [&](std::uint64_t first, std::uint64_t count) {
      return lane_share(model, o, first, count, b0, b1, cut_short);
    });
    out.lane_width = spinwright::default_lane_width;
    out.lane_unit = spinwright::lane_unit_name(spinwright::best_lane_unit());
    out.cut_short = cut_short.load();
    return {};
  }
  if (o.fill_time && o.kernel == Kernel::anneal) {
    // What solve_auto anneals with in each restart's share of the limit.
    const spinwright::AutoFillGroup group = spinwright::auto_fill_group_for(model, fill_share(o));
    out.fill_group = spinwright::to_string(group);
    if (group == spinwright::AutoFillGroup::bit_sliced) {
      out.bit_sliced = true;
      out.shared_draws = true;
    } else if (group == spinwright::AutoFillGroup::lanes) {
      out.lane_width = spinwright::default_lane_width;
      out.lane_unit = spinwright::lane_unit_name(spinwright::best_lane_unit());
    }
  }
  out.tally = spread_restarts<double>(
      o.restarts, o.threads, [&](std::uint64_t r) { return one_restart(model, o, r, start, b0, b1, cut_short); });
  out.cut_short = cut_short.load();
  return {};
}

template <class Model>
Failure exact_on(const LoadedModel& m, const Model& model, const spinwright::ExactParams& params, unsigned threads,
                 spinwright::ExactResult<double>& out) {
  auto result = spinwright::solve_exact_threads(model, params, threads);
  if (!result && result.status().code == spinwright::StatusCode::stopped) {
    return interrupted_failure(m.path + ": exact enumeration interrupted (Ctrl-C) before it finished: no answer");
  }
  if (!result) return input_failure(m.path + ": " + result.status().message);
  auto& r = result.value();
  out = spinwright::ExactResult<double>{};
  out.energy = static_cast<double>(r.energy);
  out.spins = std::move(r.spins);
  out.ground_states = r.ground_states;
  out.states = r.states;
  out.used_flip_symmetry = r.used_flip_symmetry;
  for (const auto& l : r.levels) out.levels.push_back({static_cast<double>(l.energy), l.count, l.first_index});
  return {};
}

}  // namespace spinwright_cli::detail

// Explicit instantiations for the Ising and QUBO models of one value type; used inside
// namespace spinwright_cli::detail.
#define SPINWRIGHT_CLI_INSTANTIATE(Value)                                                                             \
  template Failure run_restarts_on(const LoadedModel&, const IsingOf<Value>&, const RunOptions&, double, RunResult&); \
  template Failure run_restarts_on(const LoadedModel&, const QuboOf<Value>&, const RunOptions&, double, RunResult&);  \
  template Failure exact_on(const LoadedModel&, const IsingOf<Value>&, const spinwright::ExactParams&, unsigned,      \
                            spinwright::ExactResult<double>&);                                                        \
  template Failure exact_on(const LoadedModel&, const QuboOf<Value>&, const spinwright::ExactParams&, unsigned,       \
                            spinwright::ExactResult<double>&);

#endif  // SPINWRIGHT_CLI_RUNNER_KERNELS_HPP
