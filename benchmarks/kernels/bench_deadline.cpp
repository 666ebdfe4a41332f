// How far past its deadline a one-call function returns (kernels/auto.hpp solve_auto in its
// time-filling mode, kernels/anneal.hpp anneal() with its default parameters: 1000 sweeps): the clock is read just
// before the call and just after it returns, and the overrun is that span minus the limit.
// Model: a 20,000-spin sparse int32 Ising model (a ring plus one random chord per spin,
// couplings in -10..10; invented data, fixed seed). Limits 1, 5 and 20 ms, and 0.6 ms (about
// the workspace plus one sweep: the set-up leaves less than a sweep's time, the case a first
// sweep of unknown duration used to overrun by most of a sweep); the argument is the limit in
// microseconds. 41 calls each, seed = call number. The clock is the thread's CPU time (kernels/cpu_clock.hpp: the machine is
// shared); the wall-clock span of the same calls is reported beside it.
// Counters: median_ms, p90_ms (call span on the CPU clock), median_x / p90_x (span / limit),
// goal_median_ok / goal_p90_ok (median <= 1.10 limit + 0.1 ms, p90 <= 1.25 limit + 0.3 ms),
// wall_median_ms, wall_p90_ms. BM_deadline_workspace: the time to build anneal()'s workspace
// alone (its median_ms; the goal counters do not apply). Results in docs/embedding.md.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/auto.hpp>
#include <spinwright/model.hpp>

#include "kernels/cpu_clock.hpp"

#include <algorithm>
#include <chrono>
#include <cstdint>
#include <vector>

using namespace spinwright;

namespace {

using bench_support::cpu_clock;
using bench_support::thread_seconds;

IsingModel<std::int32_t> sparse_model(std::uint32_t n) {
  Xoshiro256 rng(20000);
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_coupling(i, (i + 1) % n, static_cast<std::int32_t>(rng.below(21)) - 10);
    b.add_coupling(i, rng.below(n), static_cast<std::int32_t>(rng.below(21)) - 10);
  }
  return std::move(b.build().value());
}

const IsingModel<std::int32_t>& model() {
  static const IsingModel<std::int32_t> m = sparse_model(20000);
  return m;
}

double quantile(std::vector<double> v, double q) {
  std::sort(v.begin(), v.end());
  const std::size_t k = static_cast<std::size_t>(q * static_cast<double>(v.size() - 1) + 0.5);
  return v[k];
}

template <class Call>
void measure(benchmark::State& st, double limit, Call call) {
  constexpr int calls = 41;
  std::vector<double> cpu;
  std::vector<double> wall;
  double energy = 0;
  for (auto _ : st) {
    for (int c = 0; c < calls; ++c) {
      const auto w0 = std::chrono::steady_clock::now();
      const double t0 = thread_seconds();
      const double e = call(static_cast<std::uint64_t>(c + 1), limit);
      const double t1 = thread_seconds();
      const auto w1 = std::chrono::steady_clock::now();
      cpu.push_back(t1 - t0);
      wall.push_back(std::chrono::duration<double>(w1 - w0).count());
      energy += e;
    }
  }
  const double med = quantile(cpu, 0.5);
  const double p90 = quantile(cpu, 0.9);
  st.counters["limit_ms"] = 1e3 * limit;
  st.counters["median_ms"] = 1e3 * med;
  st.counters["p90_ms"] = 1e3 * p90;
  st.counters["median_x"] = med / limit;
  st.counters["p90_x"] = p90 / limit;
  st.counters["goal_median_ok"] = med <= 1.10 * limit + 1e-4 ? 1 : 0;
  st.counters["goal_p90_ok"] = p90 <= 1.25 * limit + 3e-4 ? 1 : 0;
  st.counters["wall_median_ms"] = 1e3 * quantile(wall, 0.5);
  st.counters["wall_p90_ms"] = 1e3 * quantile(wall, 0.9);
  st.counters["mean_energy"] = energy / static_cast<double>(cpu.size());
}

void BM_deadline_solve_auto(benchmark::State& st) {
  const double limit = static_cast<double>(st.range(0)) * 1e-6;
  (void)model();
  measure(st, limit, [](std::uint64_t seed, double seconds) {
    Budget b;
    b.with_time_limit(seconds, cpu_clock());
    return static_cast<double>(solve_auto(model(), seed, 0, b).energy);
  });
}

void BM_deadline_anneal(benchmark::State& st) {
  const double limit = static_cast<double>(st.range(0)) * 1e-6;
  (void)model();
  measure(st, limit, [](std::uint64_t seed, double seconds) {
    Budget b;
    b.with_time_limit(seconds, cpu_clock());
    return static_cast<double>(anneal(model(), AnnealParams{}, seed, 0, b).energy);
  });
}

// The floor under a limit: building anneal()'s workspace (state, acceptance tables, beta span,
// random start) with no sweep at all.
void BM_deadline_workspace(benchmark::State& st) {
  (void)model();
  measure(st, 1e-3, [](std::uint64_t seed, double) {
    Annealer<IsingModel<std::int32_t>> a(model(), AnnealParams{}, seed);
    return static_cast<double>(a.best().energy);
  });
}

}  // namespace

BENCHMARK(BM_deadline_workspace)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_deadline_solve_auto)->Arg(600)->Arg(1000)->Arg(5000)->Arg(20000)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_deadline_anneal)->Arg(600)->Arg(1000)->Arg(5000)->Arg(20000)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
