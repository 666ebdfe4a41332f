// Time to target: CPU seconds (of the running thread; the machine is shared) until a kernel
// first holds a state whose cut equals the reference cut of reference.csv, for annealing
// (independent restarts of a fixed schedule, run back to back), tempering (one run) and tabu
// search (one run), each with default parameters, and tabu search with the other automatic
// tenure (tabu_hundredth: TabuTenure::hundredth, kernels/tabu.hpp). Median over seeds; a seed that does not
// reach the target within the cap counts as "not reached" (and as +inf in the median).
// Instances: bqp250-1..5 (OR-Library, proven optima) and the G-set graphs G11, G14, G22, G43
// (best known cuts, Benlic & Hao 2013), all from shared/data/maxcut/.
// Results and the command line are in docs/time-to-target.md.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
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
enum Kernel { annealing = 0, tempering = 1, tabu = 2, tabu_hundredth = 3 };
const char* const kernel_names[] = {"anneal", "temper", "tabu", "tabu_hundredth"};
constexpr int kernel_count = 4;

bool is_gset(int inst) { return inst >= 5; }
int seeds_for(int inst) { return is_gset(inst) ? 3 : 5; }
double cap_for(int inst) { return is_gset(inst) ? 10.0 : 10.0; }
// Annealing restarts: schedule length in sweeps.
std::uint64_t anneal_sweeps_for(int inst) { return is_gset(inst) ? 20000 : 2000; }

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
};

Outcome run_one(int kernel, int inst, std::uint64_t seed) {
  const Instance& x = instance(inst);
  const double target = static_cast<double>(energy_from_cut(x.weight, x.reference));
  const double cap = cap_for(inst);
  const double start = thread_seconds(nullptr);
  Outcome out;
  std::int64_t best = std::numeric_limits<std::int64_t>::max();
  if (kernel == annealing) {
    AnnealParams p;
    p.sweeps = anneal_sweeps_for(inst);
    for (std::uint64_t r = 0;; ++r) {
      const double left = cap - (thread_seconds(nullptr) - start);
      if (left <= 0) break;
      const auto s = anneal(x.model, p, seed, r, Budget{}.with_time_limit(left, cpu_clock()).with_target(target));
      best = s.energy < best ? s.energy : best;
      if (s.reason == StopReason::target_reached || s.reason == StopReason::deadline) break;
    }
  } else if (kernel == tempering) {
    const auto s =
        temper(x.model, TemperParams{}, seed, 0,
               Budget{}.with_sweeps(~std::uint64_t{0}).with_time_limit(cap, cpu_clock()).with_target(target));
    best = s.energy;
  } else {
    TabuParams p;  // tabu: the default tenure; tabu_hundredth: N / 100 + [1, 10] (TabuTenure)
    if (kernel == tabu_hundredth) p.tenure_rule = TabuTenure::hundredth;
    const auto s =
        tabu_walk(x.model, p, seed, 0,
                  Budget{}.with_sweeps(~std::uint64_t{0}).with_time_limit(cap, cpu_clock()).with_target(target));
    best = s.energy;
  }
  out.seconds = thread_seconds(nullptr) - start;
  out.cut = cut_from_energy(x.weight, best);
  out.reached = out.cut >= x.reference;
  return out;
}

void bm_time_to_target(benchmark::State& state) {
  const int kernel = static_cast<int>(state.range(0));
  const int inst = static_cast<int>(state.range(1));
  std::vector<double> times;
  int reached = 0;
  std::int64_t best_cut = 0;
  for (auto _ : state) {
    times.clear();
    reached = 0;
    for (int seed = 1; seed <= seeds_for(inst); ++seed) {
      const Outcome o = run_one(kernel, inst, static_cast<std::uint64_t>(seed));
      times.push_back(o.reached ? o.seconds : std::numeric_limits<double>::infinity());
      reached += o.reached ? 1 : 0;
      best_cut = o.cut > best_cut ? o.cut : best_cut;
    }
  }
  std::sort(times.begin(), times.end());
  const double median =
      times.size() % 2 == 1 ? times[times.size() / 2] : 0.5 * (times[times.size() / 2 - 1] + times[times.size() / 2]);
  state.SetLabel(std::string(kernel_names[kernel]) + " " + instances[inst]);
  state.counters["median_cpu_s"] = median;
  state.counters["reached"] = reached;
  state.counters["seeds"] = seeds_for(inst);
  state.counters["best_cut"] = static_cast<double>(best_cut);
  state.counters["reference"] = static_cast<double>(instance(inst).reference);
  state.counters["cap_s"] = cap_for(inst);
}

void all_pairs(benchmark::internal::Benchmark* b) {
  for (int inst = 0; inst < instance_count; ++inst)
    for (int k = 0; k < kernel_count; ++k) b->Args({k, inst});
}

}  // namespace

BENCHMARK(bm_time_to_target)->Apply(all_pairs)->Iterations(1)->Unit(benchmark::kSecond);

BENCHMARK_MAIN();
