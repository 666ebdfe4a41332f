// Spin-flip attempts per nanosecond of whole annealing schedules on the +-J 3D periodic lattice
// L = 32 (32,768 spins, int32 couplings): the bit-sliced kernel (64 restarts per word; 1, 2 and 4
// words per pass; one and two threads) beside the single-restart Annealer (sequential order)
// and the plain reference loop of reference_anneal.hpp, all in the same run, each over the same
// automatic geometric schedule of 500 sweeps. attempts_per_ns uses wall-clock time (what a user
// waits); cpu_attempts_per_ns uses the calling thread's CPU time (single-thread rows only: the
// machines are shared); x_reference = our wall rate / the reference's wall rate.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/bit_sliced.hpp>
#include <spinwright/parallel/bit_sliced_restarts.hpp>
#include <spinwright/problems/lattice.hpp>

#include "kernels/cpu_clock.hpp"
#include "kernels/reference_anneal.hpp"

#include <chrono>
#include <cstdint>
#include <string>

using namespace spinwright;

namespace {

using Model = IsingModel<std::int32_t>;
constexpr std::uint64_t sweeps = 500;

const Model& lattice() {
  static const Model m = plus_minus_cubic_lattice<std::int32_t>(32, 2026).value();
  return m;
}

double now() { return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count(); }

double& reference_cpu_rate() {
  static double rate = 0;
  return rate;
}

// Reference rate (attempts per ns), measured once: one whole schedule of the plain loop.
double reference_rate() {
  static double rate = 0;
  if (rate > 0) return rate;
  const Model& model = lattice();
  const BetaSpan span = estimate_beta_span(model);
  const Schedule sched = Schedule::geometric(span.beta_start, span.beta_end);
  reference::PlainAnnealer<std::int32_t> ref(model, 1);
  std::uint64_t sink = 0;
  const double t0 = now();
  const double c0 = bench_support::thread_seconds();
  for (std::uint64_t k = 0; k < sweeps; ++k) sink += ref.sweep(sched.beta_at(static_cast<double>(k) / (sweeps - 1)));
  reference_cpu_rate() =
      static_cast<double>(sweeps * model.num_spins()) / ((bench_support::thread_seconds() - c0) * 1e9);
  const double seconds = now() - t0;
  benchmark::DoNotOptimize(sink);
  rate = static_cast<double>(sweeps * model.num_spins()) / (seconds * 1e9);
  return rate;
}

double reference_rate();

void report(benchmark::State& st, double attempts, double seconds, double best_per_spin, double cpu = 0) {
  const double rate = attempts / (seconds * 1e9);
  reference_rate();  // measured first, whatever the filter runs
  if (cpu > 0) {
    st.counters["cpu_attempts_per_ns"] = attempts / (cpu * 1e9);
    st.counters["x_reference_cpu"] = attempts / (cpu * 1e9) / reference_cpu_rate();
  }
  st.counters["attempts_per_ns"] = rate;
  st.counters["reference_per_ns"] = reference_rate();
  st.counters["x_reference"] = rate / reference_rate();
  st.counters["best_per_spin"] = best_per_spin;
}

void bench_reference(benchmark::State& st) {
  double rate = 0;
  for (auto _ : st) rate = reference_rate();
  report(st, rate, 1e-9, 0, 1e-9 * rate / reference_cpu_rate());
  st.SetLabel("L32 plain reference, 1 restart");
}

void bench_annealer(benchmark::State& st) {
  const Model& model = lattice();
  AnnealParams p;
  p.sweeps = sweeps;
  p.order = SiteOrder::sequential;
  Annealer<Model> a(model, p, 1);
  double seconds = 0, attempts = 0, cpu = 0;
  std::uint64_t r = 0;
  for (auto _ : st) {
    const double t0 = now();
    const double c0 = bench_support::thread_seconds();
    a.reset(1, r++);
    a.advance();
    cpu += bench_support::thread_seconds() - c0;
    seconds += now() - t0;
    attempts += static_cast<double>(a.attempted());
  }
  report(st, attempts, seconds, static_cast<double>(a.best().energy) / static_cast<double>(model.num_spins()), cpu);
  st.SetLabel("L32 Annealer int32 sequential, 1 restart");
}

template <std::size_t Words, bool Shared>
void bench_kernel(benchmark::State& st) {
  const Model& model = lattice();
  BitSlicedParams p;
  p.sweeps = sweeps;
  p.shared_draws = Shared;
  BitSlicedAnnealer<Model, Words> k(model, p, 1);
  double seconds = 0, attempts = 0, cpu = 0;
  std::uint64_t first = 0;
  for (auto _ : st) {
    const double t0 = now();
    const double c0 = bench_support::thread_seconds();
    k.reset(1, first);
    k.advance();
    cpu += bench_support::thread_seconds() - c0;
    seconds += now() - t0;
    first += Words;
    attempts += static_cast<double>(k.attempted());
  }
  report(st, attempts, seconds, static_cast<double>(k.best().energy) / static_cast<double>(model.num_spins()), cpu);
  st.SetLabel(std::string("L32 bit-sliced kernel, ") + (Shared ? "shared draws, " : "independent bits, ") +
              std::to_string(64 * Words) + " restarts, 1 thread");
}

void bench_one_call(benchmark::State& st) {
  const Model& model = lattice();
  const auto restarts = static_cast<std::uint64_t>(st.range(0));
  const auto threads = static_cast<unsigned>(st.range(1));
  BitSlicedParams p;
  p.sweeps = sweeps;
  p.shared_draws = st.range(2) != 0;
  double seconds = 0, attempts = 0, best = 0;
  std::uint64_t seed = 1;
  for (auto _ : st) {
    const double t0 = now();
    const auto tally = anneal_bit_sliced(model, p, seed++, restarts, threads);
    seconds += now() - t0;
    attempts += static_cast<double>(restarts * sweeps * model.num_spins());
    best = static_cast<double>(tally->best().energy) / static_cast<double>(model.num_spins());
  }
  report(st, attempts, seconds, best);
  st.SetLabel(std::string("L32 anneal_bit_sliced, ") + (p.shared_draws ? "shared draws, " : "independent bits, ") +
              std::to_string(restarts) + " restarts, " + std::to_string(threads) + " thread(s)");
}

}  // namespace

BENCHMARK(bench_reference)->Iterations(1)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(bench_annealer)->Iterations(3)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_TEMPLATE(bench_kernel, 1, false)->Iterations(1)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_TEMPLATE(bench_kernel, 1, true)->Iterations(3)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_TEMPLATE(bench_kernel, 2, true)->Iterations(3)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK_TEMPLATE(bench_kernel, 4, true)->Iterations(3)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(bench_one_call)
    ->Args({64, 1, 1})
    ->Args({64, 2, 1})
    ->Args({128, 1, 1})
    ->Args({128, 2, 1})
    ->Args({256, 1, 1})
    ->Args({256, 2, 1})
    ->Args({256, 2, 0})
    ->Iterations(3)
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();

BENCHMARK_MAIN();
