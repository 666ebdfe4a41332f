// Quality of the `auto` choice in its time-filling mode (kernels/auto.hpp): for each G-set graph
// of shared/data/maxcut/, solve_auto with a per-instance budget of CPU seconds (of the running
// thread: the machine is shared) and the cut it returns against the best known cut of
// reference.csv; for bqp250-1..5, the CPU time until solve_auto holds the proven optimum
// (Budget::with_target), with a cap.
//
// Environment (for a quick run): SPINWRIGHT_QUALITY_SECONDS (budget per G-set run, default 5),
// SPINWRIGHT_QUALITY_SEEDS (seeds 1..k per G-set graph, default 3), SPINWRIGHT_QUALITY_CAP
// (bqp250 cap in seconds, default 2), SPINWRIGHT_QUALITY_BQP_SEEDS (default 5).
// The last G-set line, "gset/summary", aggregates the graphs that ran before it.
// Results and the command line are in docs/quality.md.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/auto.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "kernels/cpu_clock.hpp"
#include "support/temper_graph.hpp"

#include <algorithm>  // std::sort, std::min
#include <cstdint>
#include <cstdlib>  // std::getenv, std::atof, std::atoi
#include <limits>
#include <map>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

using bench_support::cpu_clock;
using bench_support::thread_seconds;

double env_double(const char* name, double fallback) {
  const char* v = std::getenv(name);
  return v != nullptr && *v != '\0' ? std::atof(v) : fallback;
}
int env_int(const char* name, int fallback) {
  const char* v = std::getenv(name);
  return v != nullptr && *v != '\0' ? std::atoi(v) : fallback;
}

double gset_seconds() { return env_double("SPINWRIGHT_QUALITY_SECONDS", 5.0); }
int gset_seeds() { return env_int("SPINWRIGHT_QUALITY_SEEDS", 3); }
double bqp_cap() { return env_double("SPINWRIGHT_QUALITY_CAP", 2.0); }
int bqp_seeds() { return env_int("SPINWRIGHT_QUALITY_BQP_SEEDS", 5); }

const char* const gset[] = {"G1", "G11", "G14", "G22", "G43", "G48", "G55", "G62", "G70"};
const char* const bqp[] = {"bqp250-1", "bqp250-2", "bqp250-3", "bqp250-4", "bqp250-5"};

struct Instance {
  IsingModel<std::int32_t> model;
  std::int64_t reference = 0;
  std::int64_t weight = 0;
};

Instance load(const char* name) {
  Instance x;
  x.model = test_support::load_maxcut<std::int32_t>(name);
  x.reference = test_support::reference_cut(test_support::maxcut_path("reference.csv"), name);
  x.weight = total_weight(x.model);
  return x;
}

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  const std::size_t m = v.size();
  return m % 2 == 1 ? v[m / 2] : 0.5 * (v[m / 2 - 1] + v[m / 2]);
}

// Ratios cut / best known of every seed of each G-set graph that ran, for the summary line.
std::map<std::string, std::vector<double>>& gset_ratios() {
  static std::map<std::string, std::vector<double>> r;
  return r;
}

void bm_gset(benchmark::State& state, const char* name) {
  const Instance x = load(name);
  const double seconds = gset_seconds();
  const int seeds = gset_seeds();
  std::vector<double> cuts;
  std::vector<double> used;
  std::string per_seed;
  for (auto _ : state) {
    cuts.clear();
    used.clear();
    per_seed.clear();
    for (int seed = 1; seed <= seeds; ++seed) {
      const auto s =
          solve_auto(x.model, static_cast<std::uint64_t>(seed), 0, Budget{}.with_time_limit(seconds, cpu_clock()));
      const std::int64_t cut = cut_from_energy(x.weight, s.energy);
      cuts.push_back(static_cast<double>(cut));
      used.push_back(s.seconds);
      per_seed += (per_seed.empty() ? "" : " ") + std::to_string(cut);
    }
  }
  const double best_known = static_cast<double>(x.reference);
  const double min_cut = *std::min_element(cuts.begin(), cuts.end());
  const double med_cut = median(cuts);
  auto& ratios = gset_ratios()[name];
  ratios.clear();
  for (const double c : cuts) ratios.push_back(c / best_known);
  state.SetLabel(std::string(name) + " N=" + std::to_string(x.model.num_spins()) + " cuts " + per_seed);
  state.counters["best_known"] = best_known;
  state.counters["cut_median"] = med_cut;
  state.counters["cut_min"] = min_cut;
  state.counters["ratio_median"] = med_cut / best_known;
  state.counters["ratio_min"] = min_cut / best_known;
  state.counters["cpu_s_median"] = median(used);
}

// mean_ratio: mean over the graphs of the mean ratio over seeds; mean_ratio_capped: the same
// with each ratio capped at 1 (a cut above the best known counts as equal to it); min_ratio:
// the lowest ratio of any seed on any graph.
void bm_gset_summary(benchmark::State& state) {
  for (auto _ : state) {
  }
  double sum = 0;
  double sum_capped = 0;
  double lowest = std::numeric_limits<double>::infinity();
  for (const auto& [name, ratios] : gset_ratios()) {
    double mean = 0;
    double mean_capped = 0;
    for (const double r : ratios) {
      mean += r / static_cast<double>(ratios.size());
      mean_capped += std::min(r, 1.0) / static_cast<double>(ratios.size());
      lowest = std::min(lowest, r);
    }
    sum += mean;
    sum_capped += mean_capped;
  }
  const auto count = static_cast<double>(gset_ratios().size());
  state.SetLabel("graphs " + std::to_string(gset_ratios().size()));
  state.counters["mean_ratio"] = count > 0 ? sum / count : 0.0;
  state.counters["mean_ratio_capped"] = count > 0 ? sum_capped / count : 0.0;
  state.counters["min_ratio"] = count > 0 ? lowest : 0.0;
}

void bm_bqp(benchmark::State& state, const char* name) {
  const Instance x = load(name);
  const double cap = bqp_cap();
  const int seeds = bqp_seeds();
  const double target = static_cast<double>(energy_from_cut(x.weight, x.reference));
  std::vector<double> times;
  int reached = 0;
  for (auto _ : state) {
    times.clear();
    reached = 0;
    for (int seed = 1; seed <= seeds; ++seed) {
      const double start = thread_seconds(nullptr);
      const auto s = solve_auto(x.model, static_cast<std::uint64_t>(seed), 0,
                                Budget{}.with_time_limit(cap, cpu_clock()).with_target(target));
      const double t = thread_seconds(nullptr) - start;
      const bool ok = cut_from_energy(x.weight, s.energy) >= x.reference;
      reached += ok ? 1 : 0;
      times.push_back(ok ? t : std::numeric_limits<double>::infinity());
    }
  }
  state.SetLabel(std::string(name) + " N=" + std::to_string(x.model.num_spins()));
  state.counters["optimum"] = static_cast<double>(x.reference);
  state.counters["reached"] = reached;
  state.counters["seeds"] = seeds;
  state.counters["cpu_s_median"] = median(times);
  state.counters["cpu_s_max"] = *std::max_element(times.begin(), times.end());
  state.counters["cap_s"] = cap;
}

const bool registered = [] {
  for (const char* name : bqp) {
    benchmark::RegisterBenchmark((std::string("bqp/") + name).c_str(), bm_bqp, name)
        ->Iterations(1)
        ->Unit(benchmark::kSecond);
  }
  for (const char* name : gset) {
    benchmark::RegisterBenchmark((std::string("gset/") + name).c_str(), bm_gset, name)
        ->Iterations(1)
        ->Unit(benchmark::kSecond);
  }
  benchmark::RegisterBenchmark("gset/summary", bm_gset_summary)->Iterations(1);
  return true;
}();

}  // namespace

BENCHMARK_MAIN();
