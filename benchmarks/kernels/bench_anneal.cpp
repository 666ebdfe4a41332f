// Attempted flips per nanosecond of annealing, one thread, against the plain reference
// loop of reference_anneal.hpp measured in the same run (counter x_reference = our speed /
// reference speed). Graphs: random 3-regular-like graph with 2^16 nodes (+-1 weights), the
// 256 x 256 periodic lattice (ferromagnet, our J = -1), and G22 (Helmberg-Rendl G-set,
// shared/data/maxcut/G22.txt). Couplings int32, float, double.
// Phases: "cold" = a fixed beta at the cold end of the automatic range (after 20 untimed
// sweeps), "anneal" = whole 100-sweep runs over the automatic geometric schedule.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>

#include "kernels/cpu_clock.hpp"
#include "kernels/reference_anneal.hpp"
#include "support/anneal_graph.hpp"

#include <cstdint>
#include <map>
#include <string>

using namespace spinwright;

namespace {

double cpu_seconds() { return bench_support::thread_seconds(); }

enum GraphKind { cubic = 0, lattice = 1, g22 = 2 };
enum Phase { cold = 0, annealing = 1 };

const char* graph_name(int g) { return g == cubic ? "cubic65536" : g == lattice ? "lattice256" : "G22"; }

template <class Value>
IsingModel<Value> make_model(int g) {
  if (g == cubic) return anneal_support::maxcut_model<Value>(anneal_support::random_cubic(1u << 16, 2026));
  if (g == lattice) return anneal_support::square_lattice<Value>(256, Value(-1));
  const auto graph = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G22.txt");
  return anneal_support::maxcut_model<Value>(graph);
}

template <class Value>
const IsingModel<Value>& model_for(int g) {
  static std::map<int, IsingModel<Value>> cache;
  auto it = cache.find(g);
  if (it == cache.end()) it = cache.emplace(g, make_model<Value>(g)).first;
  return it->second;
}

constexpr std::uint64_t anneal_sweeps = 100;

// Nanoseconds per attempt of the reference loop, measured once per (graph, value, phase).
template <class Value>
double reference_ns(int g, int phase) {
  static std::map<int, double> cache;
  const int key = g * 2 + phase;
  if (auto it = cache.find(key); it != cache.end()) return it->second;
  const auto& model = model_for<Value>(g);
  const BetaSpan range = estimate_beta_span(model);
  reference::PlainAnnealer<Value> ref(model, 1);
  const Schedule sched = Schedule::geometric(range.beta_start, range.beta_end);
  if (phase == cold) {
    for (int k = 0; k < 5; ++k) ref.sweep(range.beta_end);
  }
  std::uint64_t attempts = 0;
  std::uint64_t sink = 0;
  const double t0 = cpu_seconds();
  double elapsed = 0;
  std::uint64_t k = 0;
  while (elapsed < 0.5) {
    const double beta =
        phase == cold ? range.beta_end : sched.beta_at(static_cast<double>(k % anneal_sweeps) / (anneal_sweeps - 1));
    sink += ref.sweep(beta);
    attempts += ref.size();
    ++k;
    elapsed = cpu_seconds() - t0;
  }
  benchmark::DoNotOptimize(sink);
  const double ns = elapsed * 1e9 / static_cast<double>(attempts);
  cache[key] = ns;
  return ns;
}

template <class Value>
void bench_anneal(benchmark::State& st) {
  const int g = static_cast<int>(st.range(0));
  const int phase = static_cast<int>(st.range(1));
  const auto order = st.range(2) == 0 ? SiteOrder::sequential : SiteOrder::random;
  const auto& model = model_for<Value>(g);
  AnnealParams p;
  p.order = order;
  std::uint64_t attempts = 0;
  double seconds = 0;  // measured here so that the ratio to the reference is a counter
  if (phase == cold) {
    const BetaSpan range = estimate_beta_span(model);
    p.schedule = Schedule::constant(range.beta_end);
    Annealer<IsingModel<Value>> a(model, p, 1);
    a.step(20);
    const std::uint64_t before = a.attempted();
    const double t0 = cpu_seconds();
    for (auto _ : st) a.step(1);
    seconds = cpu_seconds() - t0;
    attempts = a.attempted() - before;
    st.counters["accept_rate"] = static_cast<double>(a.accepted()) / static_cast<double>(a.attempted());
  } else {
    p.sweeps = anneal_sweeps;
    Annealer<IsingModel<Value>> a(model, p, 1);
    std::uint64_t r = 0;
    const double t0 = cpu_seconds();
    for (auto _ : st) {
      a.reset(1, r++);  // no allocation; includes the random start (n coin flips + resync)
      a.step(anneal_sweeps);
      attempts += a.attempted();
      benchmark::DoNotOptimize(a.best().energy);
    }
    seconds = cpu_seconds() - t0;
  }
  const double ns = seconds * 1e9 / static_cast<double>(attempts);
  const double ref = reference_ns<Value>(g, phase);
  st.counters["ns_per_attempt"] = ns;
  st.counters["attempts_per_ns"] = 1.0 / ns;
  st.counters["reference_ns"] = ref;
  st.counters["x_reference"] = ref / ns;
  st.SetLabel(std::string(graph_name(g)) + (phase == cold ? "/cold" : "/anneal") +
              (order == SiteOrder::sequential ? "/sequential" : "/random"));
}

void args(benchmark::internal::Benchmark* b) {
  for (int g : {cubic, lattice, g22})
    for (int phase : {cold, annealing})
      for (int order : {0, 1}) b->Args({g, phase, order});
  b->Unit(benchmark::kMillisecond);
}

}  // namespace

BENCHMARK_TEMPLATE(bench_anneal, std::int32_t)->Apply(args);
BENCHMARK_TEMPLATE(bench_anneal, float)->Apply(args);
BENCHMARK_TEMPLATE(bench_anneal, double)->Apply(args);

BENCHMARK_MAIN();
