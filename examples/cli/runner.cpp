// spinwright command-line program — kernel dispatch over restarts. The kernels themselves are
// instantiated in runner_<type>.cpp, one translation unit per value type (runner_kernels.hpp).
#include "runner.hpp"

#include "spread.hpp"

#include <spinwright/control/steady_clock.hpp>
#include <spinwright/kernels/auto.hpp>

#include <algorithm>  // std::max, std::min
#include <cmath>      // std::ceil
#include <thread>     // std::thread::hardware_concurrency

namespace spinwright_cli {

const char* kernel_name(Kernel k) {
  switch (k) {
    case Kernel::sqa:
      return "sqa";
    case Kernel::population:
      return "population";
    default:
      return spinwright::to_string(static_cast<spinwright::KernelKind>(k));
  }
}

bool kernel_from_name(const std::string& name, bool& is_auto, Kernel& out) {
  is_auto = name == "auto";
  if (is_auto) return true;
  for (const Kernel k : {Kernel::anneal, Kernel::temper, Kernel::tabu, Kernel::breakout, Kernel::descent, Kernel::exact,
                         Kernel::sqa, Kernel::population}) {
    if (name == kernel_name(k)) {
      out = k;
      return true;
    }
  }
  return false;
}

std::size_t exact_limit() { return spinwright::exact_default_limit; }

AutoPick auto_choice(const LoadedModel& m) {
  const spinwright::AutoChoice c = visit(m, [](const auto& model) { return spinwright::choose_kernel(model); });
  AutoPick pick;
  pick.kernel = kernel_of(c.kernel);
  pick.sweeps = c.sweeps;
  pick.reason = c.reason;
  return pick;
}

Kernel auto_fill_choice(const LoadedModel& m, double seconds) {
  return kernel_of(visit(m, [seconds](const auto& model) { return spinwright::auto_fill_kernel(model, seconds); }));
}

double fill_share(const RunOptions& o) {
  const unsigned threads = o.threads != 0 ? o.threads : std::max(1u, std::thread::hardware_concurrency());
  const double waves =
      std::ceil(static_cast<double>(o.restarts) / (static_cast<double>(threads) * static_cast<double>(job_ranks())));
  return o.time_limit / (waves < 1 ? 1 : waves);
}

std::uint64_t count_at(const spinwright::Tally<double>& tally, double energy, double scale) {
  std::uint64_t k = 0;
  const double tol = 1e-9 * (scale > 1 ? scale : 1.0);
  for (const double e : tally.energies()) k += e <= energy + tol;
  return k;
}

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

Failure enumerate_exact(const LoadedModel& m, const spinwright::ExactParams& params, unsigned threads,
                        spinwright::ExactResult<double>& out) {
  return visit(m, [&](const auto& model) { return detail::exact_on(m, model, params, threads, out); });
}

Failure run_kernel(const LoadedModel& m, const RunOptions& options, RunResult& out) {
  RunOptions o = options;
  if (o.threads == 0) o.threads = std::max(1u, std::thread::hardware_concurrency());
  out.value_type = m.value_type;
  const double start = spinwright::steady_seconds(nullptr);
  Failure f;
  if (o.kernel == Kernel::exact) {
    spinwright::ExactParams params;
    params.stop = &interrupt_token();  // polled every 2^16 states: Ctrl-C ends it without an answer
    spinwright::ExactResult<double> r;
    f = enumerate_exact(m, params, o.threads, r);
    if (!f.failed()) {
      spinwright::Solution<double> s;
      s.spins = r.spins;
      s.energy = r.energy;
      s.seconds = spinwright::steady_seconds(nullptr) - start;
      s.sweeps = 0;
      out.tally = spinwright::Tally<double>();
      out.tally.add(std::move(s));
      out.exact = true;
      out.ground_count = r.ground_states;
      out.threads = o.threads;
      if (o.progress != nullptr) o.progress->restarts_done.store(1);
    }
  } else {
    out.threads = static_cast<unsigned>(std::min<std::uint64_t>(o.threads, std::max<std::uint64_t>(o.restarts, 1)));
    o.threads = out.threads;
    f = visit(m, [&](const auto& model) { return detail::run_restarts_on(m, model, o, start, out); });
  }
  out.seconds = spinwright::steady_seconds(nullptr) - start;
  out.interrupted = interrupted();
  return f;
}

}  // namespace spinwright_cli
