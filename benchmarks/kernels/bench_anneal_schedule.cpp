// Whole annealing schedules, one restart, one thread, against the textbook annealer of
// reference_anneal.hpp (adjacency lists, local field recomputed per attempt, exp per attempt,
// std::mt19937_64, linear schedule over the same beta span, sequential sweeps) run in the same
// process at the same sweep count. One iteration is one whole schedule from a random start.
//
// Counters: ns_per_attempt (ours, CPU time), reference_ns (textbook), x_reference = textbook
// time / our time, energy / reference_energy (ours: best state at a sweep end; textbook: its
// last state; lower is better), cut / reference_cut for the max-cut graphs.
// Graphs: G22, G55, G70 (Helmberg-Rendl G-set, shared/data/maxcut; 2000 sweeps, as
// `spinwright solve FILE --kernel anneal --sweeps 2000` runs them), a random 3-regular graph
// with 2^16 nodes (+-1 weights) and the 256 x 256 periodic ferromagnet (500 sweeps each).
// Value types int32 and double; site order sequential and random.
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

enum GraphKind { g22 = 0, g55 = 1, g70 = 2, cubic = 3, lattice = 4 };

const char* graph_name(int g) {
  switch (g) {
    case g22:
      return "G22";
    case g55:
      return "G55";
    case g70:
      return "G70";
    case cubic:
      return "cubic65536";
    default:
      return "torus256";
  }
}

bool is_gset(int g) { return g == g22 || g == g55 || g == g70; }
std::uint64_t sweeps_for(int g) { return is_gset(g) ? 2000 : 500; }

const anneal_support::Graph& graph_for(int g) {
  static std::map<int, anneal_support::Graph> cache;
  auto it = cache.find(g);
  if (it != cache.end()) return it->second;
  anneal_support::Graph graph;
  if (g == cubic) {
    graph = anneal_support::random_cubic(1u << 16, 2026);
  } else if (is_gset(g)) {
    graph = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + graph_name(g) + ".txt");
  }
  return cache.emplace(g, graph).first->second;
}

template <class Value>
IsingModel<Value> make_model(int g) {
  if (g == lattice) return anneal_support::square_lattice<Value>(256, Value(-1));
  return anneal_support::maxcut_model<Value>(graph_for(g));
}

template <class Value>
const IsingModel<Value>& model_for(int g) {
  static std::map<int, IsingModel<Value>> cache;
  auto it = cache.find(g);
  if (it == cache.end()) it = cache.emplace(g, make_model<Value>(g)).first;
  return it->second;
}

double total_weight(int g) {
  if (g == lattice) return 0;
  double w = 0;
  for (const auto& e : graph_for(g).edges) w += static_cast<double>(e.w);
  return w;
}

struct ReferenceRun {
  double ns = 0;
  double energy = 0;
};

// The textbook annealer over the whole schedule, measured once per (graph, value type).
template <class Value>
ReferenceRun reference_run(int g) {
  static std::map<int, ReferenceRun> cache;
  if (auto it = cache.find(g); it != cache.end()) return it->second;
  const auto& model = model_for<Value>(g);
  const BetaSpan span = estimate_beta_span(model);
  const Schedule sched = Schedule::linear(span.beta_start, span.beta_end);
  const std::uint64_t sweeps = sweeps_for(g);
  reference::PlainAnnealer<Value> ref(model, 1);
  std::uint64_t sink = 0;
  const double t0 = bench_support::thread_seconds();
  for (std::uint64_t k = 0; k < sweeps; ++k) {
    sink += ref.sweep(sched.beta_at(static_cast<double>(k) / static_cast<double>(sweeps - 1)));
  }
  const double elapsed = bench_support::thread_seconds() - t0;
  benchmark::DoNotOptimize(sink);
  ReferenceRun r;
  r.ns = elapsed * 1e9 / static_cast<double>(sweeps * ref.size());
  r.energy = static_cast<double>(model.energy(ref.spins().data()));
  cache[g] = r;
  return r;
}

template <class Value>
void bench_schedule(benchmark::State& st) {
  const int g = static_cast<int>(st.range(0));
  const auto order = st.range(1) == 0 ? SiteOrder::sequential : SiteOrder::random;
  const auto& model = model_for<Value>(g);
  AnnealParams p;
  p.order = order;
  p.sweeps = sweeps_for(g);
  Annealer<IsingModel<Value>> a(model, p, 1);
  std::uint64_t attempts = 0;
  std::uint64_t r = 0;
  double energy = 0;
  double seconds = 0;
  for (auto _ : st) {
    a.reset(1, r++);  // no allocation; includes the random start (n coin flips + resync)
    const double t0 = bench_support::thread_seconds();
    a.step(p.sweeps);
    seconds += bench_support::thread_seconds() - t0;
    attempts += a.attempted();
    energy += static_cast<double>(a.best().energy);
  }
  const double ns = seconds * 1e9 / static_cast<double>(attempts);
  const ReferenceRun ref = reference_run<Value>(g);
  energy /= static_cast<double>(r);
  st.counters["ns_per_attempt"] = ns;
  st.counters["reference_ns"] = ref.ns;
  st.counters["x_reference"] = ref.ns / ns;
  st.counters["accept_rate"] = static_cast<double>(a.accepted()) / static_cast<double>(a.attempted());
  st.counters["energy"] = energy;
  st.counters["reference_energy"] = ref.energy;
  if (g != lattice) {
    const double w = total_weight(g);
    st.counters["cut"] = (w - energy) / 2;
    st.counters["reference_cut"] = (w - ref.energy) / 2;
  }
  st.SetLabel(std::string(graph_name(g)) + (order == SiteOrder::sequential ? "/sequential" : "/random"));
}

void args(benchmark::internal::Benchmark* b) {
  for (int g : {g22, g55, g70, cubic, lattice})
    for (int order : {0, 1}) b->Args({g, order});
  b->Unit(benchmark::kMillisecond)->Iterations(3);
}

}  // namespace

BENCHMARK_TEMPLATE(bench_schedule, std::int32_t)->Apply(args);
BENCHMARK_TEMPLATE(bench_schedule, double)->Apply(args);

BENCHMARK_MAIN();
