// Warm re-solve latency, the trading-engine loop: edit 1% of the pair coefficients in place,
// then re-solve from the previous answer with a small fixed sweep budget on a reused
// Annealer (warm_start + step). Reported per model, over 1,000 re-solves:
//   p50_us, p99_us      latency of one re-solve (edits excluded), microseconds
//   allocs_per_resolve  operator new calls inside the re-solves (must be 0)
//   cold_ratio          median over 25 re-solves of (time a cold solve from random spins needs
//                       to reach the warm answer's energy) / (warm re-solve time); cold solves
//                       double their sweep budget from the warm budget until they get there
//                       (capped at 256x; a cap hit counts at the cap)
// Models: a 256-variable dense integer QUBO (invented random data, fixed seed) and a
// 2,000-node sparse random 3-regular-like graph with integer weights (invented, fixed seed).
//
// BM_warm_gap/<edit permille>/<heat percent>/<sweeps>: when to re-solve from scratch. On the
// sparse graph, 50 rounds of edits (each round re-draws that share of the pair coefficients),
// each followed by a warm re-solve from the previous answer (warm_start from the held state +
// step(sweeps) on warm_schedule(model, heat)). After rounds 1, 10 and 50 the warm answer is
// compared with a fresh solve of the same model (anneal() from random spins, 4,000 sweeps):
//   gap_r1, gap_r10, gap_r50  (warm energy - fresh energy) / |fresh energy|, percent, mean over
//                             3 edit streams (positive: the warm answer is worse)
//   warm_us                   median time of one warm re-solve
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model.hpp>

#include "support/alloc_counter.hpp"

#include <algorithm>
#include <chrono>
#include <cstdint>
#include <vector>

using namespace spinwright;

namespace {

using clock_type = std::chrono::steady_clock;

double micros(clock_type::duration d) { return std::chrono::duration<double, std::micro>(d).count(); }

DenseQuboModel<std::int32_t> dense_qubo(std::size_t n) {
  Xoshiro256 rng(256);
  auto m = DenseQuboModel<std::int32_t>::zeros(n).value();
  for (std::uint32_t i = 0; i < n; ++i) {
    (void)m.set_site_term(i, static_cast<std::int32_t>(rng.below(201)) - 100);
    for (std::uint32_t j = i + 1; j < n; ++j) (void)m.set_pair(i, j, static_cast<std::int32_t>(rng.below(201)) - 100);
  }
  return m;
}

IsingModel<std::int32_t> sparse_graph(std::uint32_t n) {
  Xoshiro256 rng(2000);
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_coupling(i, (i + 1) % n, static_cast<std::int32_t>(rng.below(21)) - 10);
    b.add_coupling(i, rng.below(n), static_cast<std::int32_t>(rng.below(21)) - 10);
  }
  return std::move(b.build().value());
}

// The (i, j) of every stored pair, i < j, so edits pick existing pairs.
template <class Model>
std::vector<std::pair<std::uint32_t, std::uint32_t>> pairs_of(const Model& m) {
  std::vector<std::pair<std::uint32_t, std::uint32_t>> p;
  for (std::uint32_t i = 0; i < m.num_spins(); ++i)
    m.for_each_neighbour(static_cast<typename Model::index_type>(i), [&](auto j, auto) {
      if (j > i) p.push_back({i, static_cast<std::uint32_t>(j)});
    });
  return p;
}

template <class Model>
void run(benchmark::State& st, Model model, std::uint64_t warm_sweeps) {
  const auto pairs = pairs_of(model);
  const std::size_t edits = std::max<std::size_t>(1, pairs.size() / 100);
  AnnealParams cold_params;  // the automatic schedule
  Annealer<Model> cold_probe(model, cold_params, 1);
  const BetaSpan range = cold_probe.beta_span();
  AnnealParams warm_params;
  warm_params.sweeps = warm_sweeps;
  warm_params.schedule = Schedule::geometric(range.beta_end * 0.2, range.beta_end);  // stay cold: keep the answer

  for (auto _ : st) {
    Xoshiro256 rng(77);
    Annealer<Model> solver(model, warm_params, 1);
    cold_params.sweeps = 4000;
    std::vector<std::int8_t> answer = anneal(model, cold_params, 1).spins;  // first cold solve
    std::vector<double> latency;
    std::vector<double> ratios;
    std::size_t allocations = 0;
    for (int r = 0; r < 1000; ++r) {
      for (std::size_t e = 0; e < edits; ++e) {
        const auto& p = pairs[rng.below(static_cast<std::uint32_t>(pairs.size()))];
        (void)model.set_pair(
            static_cast<typename Model::index_type>(p.first), static_cast<typename Model::index_type>(p.second),
            static_cast<typename Model::value_type>(static_cast<int>(rng.below(201)) - 100 + (r == 0)));
      }
      alloc_counter::start();
      const auto t0 = clock_type::now();
      solver.warm_start(answer.data(), 1, static_cast<std::uint64_t>(r));
      solver.step(warm_sweeps);
      const auto t1 = clock_type::now();
      allocations += alloc_counter::stop();
      const auto best = solver.best();
      std::copy(best.spins, best.spins + best.size, answer.begin());
      latency.push_back(micros(t1 - t0));
      if (r % 40 == 0) {  // cold solve reaching the same energy
        std::uint64_t sweeps = warm_sweeps;
        double cold_us = 0;
        for (;;) {
          AnnealParams p = cold_params;
          p.sweeps = sweeps;
          const auto c0 = clock_type::now();
          const auto s = anneal(model, p, 9, static_cast<std::uint64_t>(r));
          cold_us = micros(clock_type::now() - c0);
          if (s.energy <= best.energy || sweeps >= 256 * warm_sweeps) break;
          sweeps *= 2;
        }
        ratios.push_back(cold_us / latency.back());
      }
    }
    std::sort(latency.begin(), latency.end());
    std::sort(ratios.begin(), ratios.end());
    st.counters["p50_us"] = latency[latency.size() / 2];
    st.counters["p99_us"] = latency[latency.size() * 99 / 100];
    st.counters["allocs_per_resolve"] = static_cast<double>(allocations) / 1000.0;
    st.counters["cold_ratio"] = ratios[ratios.size() / 2];
    st.counters["edits"] = static_cast<double>(edits);
    st.counters["sweeps"] = static_cast<double>(warm_sweeps);
  }
}

void BM_warm_resolve_dense_qubo_256(benchmark::State& st) { run(st, dense_qubo(256), 10); }
void BM_warm_resolve_sparse_2000(benchmark::State& st) { run(st, sparse_graph(2000), 20); }

void BM_warm_gap(benchmark::State& st) {
  const double share = static_cast<double>(st.range(0)) / 1000.0;
  const double heat = static_cast<double>(st.range(1)) / 100.0;
  const auto sweeps = static_cast<std::uint64_t>(st.range(2));
  const int streams = 3;
  double gap[3] = {0, 0, 0};
  std::vector<double> warm_us;
  for (auto _ : st) {
    for (int stream = 0; stream < streams; ++stream) {
      auto model = sparse_graph(2000);
      using Model = decltype(model);
      const auto pairs = pairs_of(model);
      const std::size_t edits = std::max<std::size_t>(1, static_cast<std::size_t>(share * static_cast<double>(pairs.size())));
      AnnealParams fresh;
      fresh.sweeps = 4000;
      AnnealParams warm;
      warm.sweeps = sweeps;
      warm.schedule = warm_schedule(model, heat);
      const auto first = anneal(model, fresh, 100 + static_cast<std::uint64_t>(stream));
      SpinState<Model> held(model);
      held.set_spins(first.spins.data());
      Annealer<Model> solver(model, warm, 1);
      Xoshiro256 rng = Xoshiro256::for_restart(31, static_cast<std::uint64_t>(stream));
      int slot = 0;
      for (int r = 1; r <= 50; ++r) {
        for (std::size_t e = 0; e < edits; ++e) {
          const auto& p = pairs[rng.below(static_cast<std::uint32_t>(pairs.size()))];
          const auto v = static_cast<typename Model::value_type>(static_cast<int>(rng.below(21)) - 10);
          if (v == 0) continue;
          (void)edit_pair(model, held, static_cast<typename Model::index_type>(p.first),
                          static_cast<typename Model::index_type>(p.second), v);
        }
        const auto t0 = clock_type::now();
        solver.warm_start(held, 7, static_cast<std::uint64_t>(r));
        solver.step(sweeps);
        warm_us.push_back(micros(clock_type::now() - t0));
        held.set_spins(solver.best().spins);
        if (r == 1 || r == 10 || r == 50) {
          const auto f = anneal(model, fresh, 500 + static_cast<std::uint64_t>(r), static_cast<std::uint64_t>(stream));
          const double fe = static_cast<double>(f.energy);
          gap[slot++] += 100.0 * (static_cast<double>(held.energy()) - fe) / (fe < 0 ? -fe : fe) / streams;
        }
      }
    }
  }
  std::sort(warm_us.begin(), warm_us.end());
  st.counters["gap_r1"] = gap[0];
  st.counters["gap_r10"] = gap[1];
  st.counters["gap_r50"] = gap[2];
  st.counters["warm_us"] = warm_us[warm_us.size() / 2];
}

}  // namespace

BENCHMARK(BM_warm_gap)
    ->Args({10, 10, 100})
    ->Args({10, 30, 100})
    ->Args({10, 60, 100})
    ->Args({200, 10, 100})
    ->Args({200, 30, 100})
    ->Args({200, 60, 100})
    ->Args({10, 100, 100})
    ->Args({200, 100, 100})
    ->Args({10, 60, 400})
    ->Args({200, 60, 400})
    ->Iterations(1)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_warm_resolve_dense_qubo_256)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_warm_resolve_sparse_2000)->Iterations(1)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
