// Quality, not speed: the two beta-span rules of kernels/beta_span.hpp at fixed sweeps.
// estimate_beta_span (hot end ln 2 over the RMS flip delta, cold end ln 1000 over the smallest
// coefficient) against sample_beta_span (hot end for a target mean acceptance of sampled
// uphill flips, cold end for a target acceptance of the smallest sampled one) at a few target
// pairs. G-set graphs and the QUBO-derived max-cut instances of shared/data/maxcut (reference
// cuts from reference.csv), int32, the annealer's defaults (geometric, random order,
// Metropolis), 32 restarts of 1000 sweeps. Counters: mean_cut, best_cut, gap_permille (mean
// distance to the reference cut, per mille), beta_start, beta_end. One iteration per case.
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
constexpr Instance instances[] = {{"G11.txt", 564},         {"G14.txt", 3064},        {"G22.txt", 13359},
                                  {"G55.txt", 10294},       {"G70.txt", 9541},        {"bqp250-1.txt", 45607},
                                  {"bqp500-1.txt", 116586}, {"be120.3.1.txt", 13067}, {"be150.8.1.txt", 27089}};

struct Rule {
  const char* name;
  int kind;  // 0: coefficients, 1: sampled, 2: sampled hot end with the coefficients' cold end
  BetaSpanTargets targets;
};
const Rule rules[] = {
    {"coefficients (ln2 / rms, ln1000 / min)", 0, {}},
    {"sampled 0.5 / 1e-3", 1, {0.5, 1e-3}},
    {"sampled 0.5 / coefficients' cold end", 2, {0.5, 1e-3}},
};

void bench_rule(benchmark::State& st) {
  const Instance inst = instances[st.range(0)];
  const Rule& rule = rules[st.range(1)];
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + inst.file);
  const auto model = anneal_support::maxcut_model<std::int32_t>(g);
  const auto w = total_weight(model);
  BetaSpan r = rule.kind == 0 ? estimate_beta_span(model) : sample_beta_span(model, rule.targets);
  if (rule.kind == 2) r.beta_end = estimate_beta_span(model).beta_end;
  AnnealParams p;
  p.sweeps = 1000;
  p.schedule = Schedule::geometric(r.beta_start, r.beta_end);
  constexpr int restarts = 32;
  double mean = 0;
  long long best = 0;
  for (auto _ : st) {
    for (std::uint64_t k = 0; k < restarts; ++k) {
      const auto s = anneal(model, p, 11, k);
      const long long cut = cut_from_energy(w, s.energy);
      mean += static_cast<double>(cut) / restarts;
      if (cut > best) best = cut;
    }
  }
  st.counters["mean_cut"] = mean;
  st.counters["best_cut"] = static_cast<double>(best);
  st.counters["gap_permille"] =
      1000 * (static_cast<double>(inst.reference) - mean) / static_cast<double>(inst.reference);
  st.counters["beta_start"] = r.beta_start;
  st.counters["beta_end"] = r.beta_end;
  st.SetLabel(std::string(inst.file) + " " + rule.name);
}

void args(benchmark::internal::Benchmark* b) {
  for (int i = 0; i < static_cast<int>(sizeof(instances) / sizeof(instances[0])); ++i)
    for (int r = 0; r < static_cast<int>(sizeof(rules) / sizeof(rules[0])); ++r) b->Args({i, r});
  b->Iterations(1)->Unit(benchmark::kMillisecond);
}

}  // namespace

BENCHMARK(bench_rule)->Apply(args);

BENCHMARK_MAIN();
