// Quality, not speed: how the beta span from the model (kernels/beta_span.hpp, docs/moves.md)
// compares with ranges scaled around it. For G11, G22 (G-set, best known cuts from
// reference.csv) and bqp250-1 (proven optimum), int32 couplings, 8 restarts of 2000 sweeps:
// counters mean_cut, best_cut and hits (restarts reaching the reference cut), for beta_start
// scaled by {0.25, 1, 4} and beta_end by {0.3, 1, 3}. One iteration per case.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <string>

using namespace spinwright;

namespace {

struct Instance {
  const char* file;
  long long reference;
};
constexpr Instance instances[] = {{"G11.txt", 564}, {"G22.txt", 13359}, {"bqp250-1.txt", 45607}};
constexpr double start_scale[] = {0.25, 1.0, 4.0};
constexpr double end_scale[] = {0.3, 1.0, 3.0};

void bench_range(benchmark::State& st) {
  const Instance inst = instances[st.range(0)];
  const double fs = start_scale[st.range(1)];
  const double fe = end_scale[st.range(2)];
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + inst.file);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  const auto w = total_weight(model);
  const BetaSpan r = estimate_beta_span(model);
  AnnealParams p;
  p.sweeps = 2000;
  p.schedule = Schedule::geometric(r.beta_start * fs, r.beta_end * fe);
  double mean = 0;
  long long best = 0;
  int hits = 0;
  for (auto _ : st) {
    for (std::uint64_t k = 0; k < 8; ++k) {
      const auto s = anneal(model, p, 5, k);
      const long long cut = cut_from_energy(w, s.energy);
      mean += static_cast<double>(cut) / 8;
      if (cut > best) best = cut;
      hits += cut >= inst.reference;
    }
  }
  st.counters["mean_cut"] = mean;
  st.counters["best_cut"] = static_cast<double>(best);
  st.counters["hits_of_8"] = hits;
  st.SetLabel(std::string(inst.file) + " start x" + std::to_string(fs) + " end x" + std::to_string(fe));
}

void args(benchmark::internal::Benchmark* b) {
  for (int i = 0; i < 3; ++i)
    for (int s = 0; s < 3; ++s)
      for (int e = 0; e < 3; ++e) b->Args({i, s, e});
  b->Iterations(1)->Unit(benchmark::kMillisecond);
}

}  // namespace

BENCHMARK(bench_range)->Apply(args);

BENCHMARK_MAIN();
