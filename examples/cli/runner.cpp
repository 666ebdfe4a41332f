// spinwright command-line program — kernel dispatch over restarts. Every kernel is
// instantiated here, and only here, for the two model types of the program.
#include "runner.hpp"

#include <spinwright/control/steady_clock.hpp>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/auto.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/kernels/lanes.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/parallel/exact_threads.hpp>
#include <spinwright/parallel/restarts.hpp>

#include <algorithm>  // std::max
#include <atomic>     // std::atomic
#include <cmath>      // std::ceil
#include <thread>     // std::thread
#include <vector>     // std::vector

namespace spinwright_cli {

const char* kernel_name(Kernel k) {
  switch (k) {
    case Kernel::anneal:
      return "anneal";
    case Kernel::temper:
      return "temper";
    case Kernel::tabu:
      return "tabu";
    case Kernel::descent:
      return "descent";
    case Kernel::exact:
      return "exact";
  }
  return "anneal";
}

bool kernel_from_name(const std::string& name, bool& is_auto, Kernel& out) {
  is_auto = name == "auto";
  if (is_auto) return true;
  for (const Kernel k : {Kernel::anneal, Kernel::temper, Kernel::tabu, Kernel::descent, Kernel::exact}) {
    if (name == kernel_name(k)) {
      out = k;
      return true;
    }
  }
  return false;
}

std::size_t exact_limit() { return spinwright::exact_default_limit; }

namespace {
Kernel from_kind(spinwright::KernelKind k) {
  switch (k) {
    case spinwright::KernelKind::anneal:
      return Kernel::anneal;
    case spinwright::KernelKind::temper:
      return Kernel::temper;
    case spinwright::KernelKind::tabu:
      return Kernel::tabu;
    case spinwright::KernelKind::descent:
      return Kernel::descent;
    case spinwright::KernelKind::exact:
      return Kernel::exact;
  }
  return Kernel::anneal;
}
}  // namespace

AutoPick auto_choice(const LoadedModel& m) {
  const spinwright::AutoChoice c = visit(m, [](const auto& model) { return spinwright::choose_kernel(model); });
  AutoPick pick;
  pick.kernel = from_kind(c.kernel);
  pick.sweeps = c.sweeps;
  pick.reason = c.reason;
  return pick;
}

Kernel auto_fill_choice(const LoadedModel& m) {
  return from_kind(visit(m, [](const auto& model) { return spinwright::auto_fill_kernel(model); }));
}

std::uint64_t count_at(const spinwright::Tally<double>& tally, double energy, double scale) {
  std::uint64_t k = 0;
  const double tol = 1e-9 * (scale > 1 ? scale : 1.0);
  for (const double e : tally.energies()) k += e <= energy + tol;
  return k;
}

namespace {

bool cut(const spinwright::Solution<double>& s) {
  return s.reason == spinwright::StopReason::stopped || s.reason == spinwright::StopReason::deadline;
}

// The closing descent of annealing and tempering: steepest after a full schedule; after a
// deadline cut the schedule short (the best state may still be far from a local minimum), the
// cheaper first-improvement descent, so the limit is passed by one descent at most; none after
// Ctrl-C, which must stop promptly.
template <class Model>
spinwright::Solution<double> finish(const Model& model, const spinwright::Solution<double>& s) {
  if (s.reason == spinwright::StopReason::stopped) return s;
  if (s.reason == spinwright::StopReason::deadline) {
    return spinwright::polish(model, s, spinwright::DescentRule::first_improvement);
  }
  return spinwright::polish(model, s, spinwright::DescentRule::steepest);
}

// Feeds the progress line; kernels call it from their own thread.
struct ProgressObserver {
  ProgressCounters* counters = nullptr;
  void on_improvement(std::uint64_t, double energy) {
    if (counters != nullptr) counters->best.offer(energy);
  }
};

template <class Model>
spinwright::Solution<double> one_restart(const Model& model, const RunOptions& o, std::uint64_t r, double run_start,
                                         std::atomic<std::uint64_t>& cut_short) {
  spinwright::Budget budget;
  budget.sweeps = o.sweeps;
  budget.stop = &interrupt_token();
  if (o.has_target) budget.with_target(o.target);
  if (o.time_limit < std::numeric_limits<double>::infinity()) {
    // An equal share of the limit per restart (the restarts run `threads` at a time), and
    // never more than what is left of the whole run.
    const double waves = std::ceil(static_cast<double>(o.restarts) / static_cast<double>(o.threads));
    const double share = o.time_limit / (waves < 1 ? 1 : waves);
    const double left = o.time_limit - (spinwright::steady_seconds(nullptr) - run_start);
    budget.with_time_limit(std::max(0.0, std::min(share, left)), spinwright::steady_clock());
  } else {
    budget.clock = spinwright::steady_clock();  // for Solution::seconds
  }
  ProgressObserver observer{o.progress};
  const std::int8_t* warm = o.warm != nullptr ? o.warm->data() : nullptr;
  spinwright::Solution<double> s;
  if (o.fill_time) {
    s = spinwright::solve_auto(model, o.seed, r, budget);
    if (s.reason == spinwright::StopReason::stopped) cut_short.fetch_add(1, std::memory_order_relaxed);
    if (o.progress != nullptr) {
      o.progress->best.offer(s.energy);
      o.progress->restarts_done.fetch_add(1, std::memory_order_relaxed);
    }
    return s;
  }
  switch (o.kernel) {
    case Kernel::anneal: {
      spinwright::AnnealParams p;
      p.initial = warm;
      s = spinwright::anneal(model, p, o.seed, r, budget, observer);
      // Annealing keeps the best state seen at sweep ends; a descent takes it to the local
      // minimum below (never raises the energy).
      s = finish(model, s);
      break;
    }
    case Kernel::descent: {
      spinwright::DescentParams p;
      p.initial = warm;
      s = spinwright::descend(model, p, o.seed, r, budget);
      break;
    }
    case Kernel::temper: {
      spinwright::TemperParams p;
      p.initial = warm;
      s = static_cast<spinwright::Solution<double>>(spinwright::temper(model, p, o.seed, r, budget, observer));
      s = finish(model, s);
      break;
    }
    case Kernel::tabu: {
      spinwright::TabuParams p;
      p.initial = warm;
      s = spinwright::tabu_walk(model, p, o.seed, r, budget, observer);
      break;
    }
    case Kernel::exact:
      break;  // run_exact_kernel
  }
  if (cut(s)) {
    cut_short.fetch_add(1, std::memory_order_relaxed);
  }
  if (o.progress != nullptr) {
    o.progress->best.offer(s.energy);
    o.progress->restarts_done.fetch_add(1, std::memory_order_relaxed);
  }
  return s;
}

// Many annealing restarts of a whole schedule: blocks of lanes (kernels/lanes.hpp) on the
// threads, each lane's best polished as one_restart's is. False (nothing run) when lanes do not
// apply: another kernel, time filling, a target or a time limit (both are per restart), too few
// restarts, a dense model, or a model beyond the lanes' field bound.
template <class Model>
bool lanes_restarts(const Model& model, const RunOptions& o, spinwright::Tally<double>& tally,
                    std::atomic<std::uint64_t>& cut_short) {
  constexpr std::size_t width = spinwright::default_lane_width;
  using Lanes = spinwright::LaneAnnealer<Model, width>;
  if constexpr (Model::is_dense) {
    return false;
  } else {
    if (o.kernel != Kernel::anneal || o.fill_time || o.has_target || o.restarts < width / 2 ||
        o.time_limit < std::numeric_limits<double>::infinity() || !Lanes::fits(model)) {
      return false;
    }
    spinwright::AnnealParams p;
    p.initial = o.warm != nullptr ? o.warm->data() : nullptr;
    const std::uint64_t blocks = (o.restarts + width - 1) / width;
    std::vector<spinwright::Solution<double>> results(static_cast<std::size_t>(o.restarts));
    std::atomic<std::uint64_t> next{0};
    auto worker = [&]() {
      ProgressObserver observer{o.progress};
      for (std::uint64_t b = next.fetch_add(1); b < blocks; b = next.fetch_add(1)) {
        const std::uint64_t first = b * width;
        const auto count = static_cast<std::size_t>(std::min<std::uint64_t>(width, o.restarts - first));
        Lanes lanes(model, p, o.seed, first, count);
        spinwright::Budget budget;
        budget.sweeps = o.sweeps;
        budget.stop = &interrupt_token();
        budget.clock = spinwright::steady_clock();
        double seconds = 0;
        const spinwright::StopReason why = lanes.advance(budget, observer, &seconds);
        for (std::size_t l = 0; l < count; ++l) {
          const auto lane = lanes.solution(l);
          spinwright::Solution<double> s;
          s.spins = lane.spins;
          s.energy = static_cast<double>(lane.energy);
          s.sweeps = lane.sweeps;
          s.attempted = lane.attempted;
          s.accepted = lane.accepted;
          s.restart = lane.restart;
          s.reason = why;
          s.seconds = seconds;
          if (cut(s)) cut_short.fetch_add(1, std::memory_order_relaxed);
          results[static_cast<std::size_t>(first + l)] = finish(model, s);
          if (o.progress != nullptr) {
            o.progress->best.offer(results[static_cast<std::size_t>(first + l)].energy);
            o.progress->restarts_done.fetch_add(1, std::memory_order_relaxed);
          }
        }
      }
    };
    const auto threads = static_cast<unsigned>(std::min<std::uint64_t>(o.threads, blocks));
    if (threads <= 1) {
      worker();
    } else {
      std::vector<std::thread> pool;
      for (unsigned t = 0; t < threads; ++t) pool.emplace_back(worker);
      for (auto& th : pool) th.join();
    }
    tally = spinwright::Tally<double>();
    for (auto& s : results) tally.add(std::move(s));
    return true;
  }
}

template <class Model>
Failure run_exact_kernel(const LoadedModel& m, const Model& model, const RunOptions& o, RunResult& out) {
  spinwright::ExactParams params;
  params.stop = &interrupt_token();  // polled every 2^16 states: Ctrl-C ends it without an answer
  const double start = spinwright::steady_seconds(nullptr);
  auto result = spinwright::solve_exact_threads(model, params, o.threads);
  if (!result && result.status().code == spinwright::StatusCode::stopped) {
    return interrupted_failure(m.path + ": exact enumeration interrupted (Ctrl-C) before it finished: no answer");
  }
  if (!result) {
    return input_failure(m.path + ": exact enumeration refused: the model has " + std::to_string(m.num_spins()) +
                         " spins and the limit is " + std::to_string(exact_limit()));
  }
  spinwright::Solution<double> s;
  s.spins = result->spins;
  s.energy = static_cast<double>(result->energy);
  s.seconds = spinwright::steady_seconds(nullptr) - start;
  s.sweeps = 0;
  out.tally = spinwright::Tally<double>();
  out.tally.add(std::move(s));
  out.exact = true;
  out.ground_count = result->ground_count;
  out.threads = o.threads;
  if (o.progress != nullptr) o.progress->restarts_done.store(1);
  return {};
}

}  // namespace

Failure check_restarts(const LoadedModel& m, std::uint64_t restarts, const std::string& command) {
  // Every restart keeps its best state until the tally is assembled.
  const double bytes = static_cast<double>(restarts) * static_cast<double>(m.num_spins() + 64);
  if (bytes > static_cast<double>(max_restart_bytes)) {
    return usage_failure("--restarts " + std::to_string(restarts) + " would keep " + std::to_string(restarts) +
                             " states of " + std::to_string(m.num_spins()) + " spins in memory (limit 1 GiB)",
                         "use fewer restarts, or run 'spinwright " + command + "' several times with other seeds");
  }
  return {};
}

Failure run_kernel(const LoadedModel& m, const RunOptions& options, RunResult& out) {
  RunOptions o = options;
  if (o.threads == 0) o.threads = std::max(1u, std::thread::hardware_concurrency());
  const double start = spinwright::steady_seconds(nullptr);
  Failure f;
  if (o.kernel == Kernel::exact) {
    f = visit(m, [&](const auto& model) { return run_exact_kernel(m, model, o, out); });
  } else {
    out.threads = static_cast<unsigned>(std::min<std::uint64_t>(o.threads, std::max<std::uint64_t>(o.restarts, 1)));
    o.threads = out.threads;
    std::atomic<std::uint64_t> cut_short{0};
    const bool lanes = visit(m, [&](const auto& model) { return lanes_restarts(model, o, out.tally, cut_short); });
    if (lanes) {
      out.lane_width = spinwright::default_lane_width;
      out.lane_unit = spinwright::lane_unit_name(spinwright::best_lane_unit());
    } else {
      out.tally = visit(m, [&](const auto& model) {
        return spinwright::run_restarts<double>(
            o.restarts, o.threads, [&](std::uint64_t r) { return one_restart(model, o, r, start, cut_short); });
      });
    }
    out.cut_short = cut_short.load();
  }
  out.seconds = spinwright::steady_seconds(nullptr) - start;
  out.interrupted = interrupted();
  return f;
}

}  // namespace spinwright_cli
