// Time to target for simulated quantum annealing and population annealing beside simulated
// annealing: CPU seconds (of the running thread; the machine is shared) until a kernel first
// holds a state whose cut equals the reference cut of reference.csv. Each kernel runs
// independent restarts of a fixed length back to back with default parameters but for
// the lengths below. Median over seeds; a seed that misses the target within the cap counts as
// +inf. Instances: bqp250-1..5 (OR-Library, proven optima) and G11, G14, G22, G43 (best known
// cuts, Benlic & Hao 2013), from shared/data/maxcut/. Results and command: docs/quantum.md.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/population.hpp>
#include <spinwright/kernels/quantum_anneal.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "kernels/cpu_clock.hpp"
#include "support/temper_graph.hpp"

#include <algorithm>  // std::sort
#include <cstdint>
#include <limits>
#include <map>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

using bench_support::cpu_clock;
using bench_support::thread_seconds;

const char* const instances[] = {"bqp250-1", "bqp250-2", "bqp250-3", "bqp250-4", "bqp250-5",
                                 "G11",      "G14",      "G22",      "G43"};
constexpr int instance_count = 9;
enum Kernel { annealing = 0, quantum = 1, population = 2 };
const char* const kernel_names[] = {"anneal", "sqa", "population"};

bool is_gset(int inst) { return inst >= 5; }
constexpr int seeds = 3;
constexpr double cap = 5.0;

struct Instance {
  IsingModel<std::int32_t> model;
  std::int64_t reference = 0;
  std::int64_t weight = 0;
};

const Instance& instance(int inst) {
  static std::map<int, Instance> cache;
  auto it = cache.find(inst);
  if (it == cache.end()) {
    Instance x;
    x.model = test_support::load_maxcut<std::int32_t>(instances[inst]);
    x.reference = test_support::reference_cut(test_support::maxcut_path("reference.csv"), instances[inst]);
    x.weight = total_weight(x.model);
    it = cache.emplace(inst, std::move(x)).first;
  }
  return it->second;
}

struct Outcome {
  double seconds = 0;
  bool reached = false;
  std::int64_t cut = 0;
  std::uint64_t restarts = 0;
};

template <class Run>
Outcome restarts_until(int inst, Run&& run) {
  const Instance& x = instance(inst);
  const double target = static_cast<double>(energy_from_cut(x.weight, x.reference));
  const double start = thread_seconds(nullptr);
  Outcome out;
  std::int64_t best = std::numeric_limits<std::int64_t>::max();
  for (std::uint64_t r = 0;; ++r) {
    const double left = cap - (thread_seconds(nullptr) - start);
    if (left <= 0) break;
    const auto s = run(x.model, r, Budget{}.with_time_limit(left, cpu_clock()).with_target(target));
    ++out.restarts;
    best = s.energy < best ? s.energy : best;
    if (s.reason == StopReason::target_reached || s.reason == StopReason::deadline) break;
  }
  out.seconds = thread_seconds(nullptr) - start;
  out.cut = cut_from_energy(x.weight, best);
  out.reached = out.cut >= x.reference;
  return out;
}

Outcome run_one(int kernel, int inst, std::uint64_t seed) {
  using M = IsingModel<std::int32_t>;
  if (kernel == annealing) {
    AnnealParams p;
    p.sweeps = is_gset(inst) ? 20000 : 2000;
    return restarts_until(inst, [&](const M& m, std::uint64_t r, const Budget& b) { return anneal(m, p, seed, r, b); });
  }
  if (kernel == quantum) {
    QuantumAnnealParams p;
    p.sweeps = is_gset(inst) ? 2000 : 1000;
    p.slices = 16;
    return restarts_until(
        inst, [&](const M& m, std::uint64_t r, const Budget& b) { return quantum_anneal(m, p, seed, r, b); });
  }
  PopulationParams p;
  p.population = 100;
  p.steps = is_gset(inst) ? 1000 : 200;
  p.sweeps_per_step = 2;
  return restarts_until(
      inst, [&](const M& m, std::uint64_t r, const Budget& b) { return population_anneal(m, p, seed, r, b); });
}

void bm_quantum_time_to_target(benchmark::State& state) {
  const int kernel = static_cast<int>(state.range(0));
  const int inst = static_cast<int>(state.range(1));
  std::vector<double> times;
  int reached = 0;
  std::int64_t best_cut = 0;
  double restarts = 0;
  for (auto _ : state) {
    times.clear();
    reached = 0;
    for (int seed = 1; seed <= seeds; ++seed) {
      const Outcome o = run_one(kernel, inst, static_cast<std::uint64_t>(seed));
      times.push_back(o.reached ? o.seconds : std::numeric_limits<double>::infinity());
      reached += o.reached ? 1 : 0;
      best_cut = o.cut > best_cut ? o.cut : best_cut;
      restarts += static_cast<double>(o.restarts);
    }
  }
  std::sort(times.begin(), times.end());
  state.SetLabel(std::string(kernel_names[kernel]) + " " + instances[inst]);
  state.counters["median_cpu_s"] = times[times.size() / 2];
  state.counters["reached"] = reached;
  state.counters["seeds"] = seeds;
  state.counters["restarts"] = restarts / seeds;
  state.counters["best_cut"] = static_cast<double>(best_cut);
  state.counters["reference"] = static_cast<double>(instance(inst).reference);
  state.counters["cap_s"] = cap;
}

void all_pairs(benchmark::internal::Benchmark* b) {
  for (int inst = 0; inst < instance_count; ++inst)
    for (int k = 0; k < 3; ++k) b->Args({k, inst});
}

}  // namespace

BENCHMARK(bm_quantum_time_to_target)->Apply(all_pairs)->Iterations(1)->Unit(benchmark::kSecond);

BENCHMARK_MAIN();
