// Lockstep lanes (kernels/lanes.hpp) against the single-restart Annealer and the plain
// reference loop of reference_anneal.hpp, all measured in the same run on one thread, int32
// couplings, whole schedules (the automatic geometric schedule from a random start).
// Graphs: random 3-regular-like graph with 2^16 nodes (+-1 weights), the 256 x 256 periodic
// lattice (ferromagnet) and G22 (shared/data/maxcut/G22.txt).
// bench_lanes_schedule: ns per restart-attempt of one block of W lanes over a 100-sweep
//   schedule; counters x_annealer and x_reference are the Annealer's and the reference's ns per
//   attempt (same schedule) divided by the lanes' ns per restart-attempt.
// bench_lanes_restarts: 64 restarts x 2000 sweeps: run_restarts (lanes) against 64 Annealer
//   runs and 64 reference runs of the same schedule; x_* = their time / the lanes' time.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/lanes.hpp>
#include <spinwright/parallel/restarts.hpp>

#include "kernels/cpu_clock.hpp"
#include "kernels/reference_anneal.hpp"
#include "support/anneal_graph.hpp"

#include <cstdint>
#include <map>
#include <string>

using namespace spinwright;

namespace {

using Model = IsingModel<std::int32_t>;
constexpr std::size_t width = default_lane_width;

double cpu_seconds() { return bench_support::thread_seconds(); }

enum GraphKind { cubic = 0, lattice = 1, g22 = 2 };

const char* graph_name(int g) { return g == cubic ? "cubic65536" : g == lattice ? "lattice256" : "G22"; }

const Model& model_for(int g) {
  static std::map<int, Model> cache;
  auto it = cache.find(g);
  if (it == cache.end()) {
    if (g == cubic) {
      it = cache.emplace(g, anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(1u << 16, 2026)))
               .first;
    } else if (g == lattice) {
      it = cache.emplace(g, anneal_support::square_lattice<std::int32_t>(256, -1)).first;
    } else {
      const auto graph = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G22.txt");
      it = cache.emplace(g, anneal_support::maxcut_model<std::int32_t>(graph)).first;
    }
  }
  return it->second;
}

// Reference ns per attempt over whole schedules of `sweeps` sweeps (at least 0.5 s of them).
double reference_ns(int g, std::uint64_t sweeps) {
  static std::map<std::pair<int, std::uint64_t>, double> cache;
  const auto key = std::make_pair(g, sweeps);
  if (auto it = cache.find(key); it != cache.end()) return it->second;
  const Model& model = model_for(g);
  const BetaSpan range = estimate_beta_span(model);
  const Schedule sched = Schedule::geometric(range.beta_start, range.beta_end);
  std::uint64_t attempts = 0, sink = 0, run = 0;
  const double t0 = cpu_seconds();
  double elapsed = 0;
  while (elapsed < 0.5) {
    reference::PlainAnnealer<std::int32_t> ref(model, ++run);
    for (std::uint64_t k = 0; k < sweeps; ++k) {
      sink += ref.sweep(sched.beta_at(static_cast<double>(k) / static_cast<double>(sweeps - 1)));
      attempts += ref.size();
    }
    elapsed = cpu_seconds() - t0;
  }
  benchmark::DoNotOptimize(sink);
  return cache[key] = elapsed * 1e9 / static_cast<double>(attempts);
}

// Annealer ns per attempt over whole schedules (sequential or random order).
double annealer_ns(int g, SiteOrder order, std::uint64_t sweeps) {
  static std::map<std::tuple<int, int, std::uint64_t>, double> cache;
  const auto key = std::make_tuple(g, static_cast<int>(order), sweeps);
  if (auto it = cache.find(key); it != cache.end()) return it->second;
  const Model& model = model_for(g);
  AnnealParams p;
  p.order = order;
  p.sweeps = sweeps;
  Annealer<Model> a(model, p, 1);
  std::uint64_t attempts = 0, r = 0;
  const double t0 = cpu_seconds();
  double elapsed = 0;
  while (elapsed < 0.5) {
    a.reset(1, r++);
    a.advance();
    attempts += a.attempted();
    benchmark::DoNotOptimize(a.best().energy);
    elapsed = cpu_seconds() - t0;
  }
  return cache[key] = elapsed * 1e9 / static_cast<double>(attempts);
}

void bench_lanes_schedule(benchmark::State& st) {
  const int g = static_cast<int>(st.range(0));
  const auto order = st.range(1) == 0 ? SiteOrder::sequential : SiteOrder::random;
  const std::uint64_t sweeps = 100;
  const Model& model = model_for(g);
  AnnealParams p;
  p.order = order;
  p.sweeps = sweeps;
  LaneAnnealer<Model, width> lanes(model, p, 1, 0);
  std::uint64_t first = 0, restart_attempts = 0;
  const double t0 = cpu_seconds();
  for (auto _ : st) {
    lanes.reset(1, first);  // includes the random starts and the fields
    first += width;
    lanes.advance();
    restart_attempts += lanes.sweeps_done() * model.num_spins() * width;
    benchmark::DoNotOptimize(lanes.best_energy());
  }
  const double ns = (cpu_seconds() - t0) * 1e9 / static_cast<double>(restart_attempts);
  const double single = annealer_ns(g, order, sweeps);
  const double ref = reference_ns(g, sweeps);
  st.counters["ns_per_restart_attempt"] = ns;
  st.counters["annealer_ns"] = single;
  st.counters["reference_ns"] = ref;
  st.counters["x_annealer"] = single / ns;
  st.counters["x_reference"] = ref / ns;
  st.SetLabel(std::string(graph_name(g)) + (order == SiteOrder::sequential ? "/sequential" : "/random") + "/W" +
              std::to_string(width) + "/" + lane_unit_name(lanes.unit()));
}

void bench_lanes_restarts(benchmark::State& st) {
  const int g = static_cast<int>(st.range(0));
  const auto order = st.range(1) == 0 ? SiteOrder::sequential : SiteOrder::random;
  const std::uint64_t sweeps = 2000, restarts = 64;
  const Model& model = model_for(g);
  AnnealParams p;
  p.order = order;
  p.sweeps = sweeps;
  double lanes_seconds = 0;
  double best = 0;
  std::size_t lane_width = 0;
  for (auto _ : st) {
    const double t0 = cpu_seconds();
    const auto tally = run_restarts(model, p, 1, restarts, 1);
    lanes_seconds += cpu_seconds() - t0;
    best = static_cast<double>(tally.best().energy);
    lane_width = tally.lane_width;
  }
  lanes_seconds /= static_cast<double>(st.iterations());
  const double attempts = static_cast<double>(restarts * sweeps * model.num_spins());
  const double single = annealer_ns(g, order, sweeps) * attempts * 1e-9;
  const double ref = reference_ns(g, sweeps) * attempts * 1e-9;
  st.counters["lanes_s"] = lanes_seconds;
  st.counters["ns_per_restart_attempt"] = lanes_seconds * 1e9 / attempts;
  st.counters["annealer_s"] = single;
  st.counters["reference_s"] = ref;
  st.counters["x_annealer"] = single / lanes_seconds;
  st.counters["x_reference"] = ref / lanes_seconds;
  st.counters["best_energy"] = best;
  st.counters["lane_width"] = static_cast<double>(lane_width);
  st.SetLabel(std::string(graph_name(g)) + (order == SiteOrder::sequential ? "/sequential" : "/random") + "/64x2000");
}

void schedule_args(benchmark::internal::Benchmark* b) {
  for (int g : {cubic, lattice, g22})
    for (int order : {0, 1}) b->Args({g, order});
  b->Unit(benchmark::kMillisecond);
}

void restart_args(benchmark::internal::Benchmark* b) {
  for (int order : {0, 1}) b->Args({g22, order});
  b->Unit(benchmark::kMillisecond)->Iterations(1);
}

}  // namespace

BENCHMARK(bench_lanes_schedule)->Apply(schedule_args);
BENCHMARK(bench_lanes_restarts)->Apply(restart_args);

BENCHMARK_MAIN();
