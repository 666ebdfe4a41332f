// A user-written single-flip move (written only from docs/moves.md, driven through the
// generic move loop) against the built-in SingleFlip (hand-inlined loop), random site order,
// same graphs and seeds: both make exactly the same proposals, decisions and RNG draws, so
// the time ratio is the cost of going through the move concept. Counter ratio_to_builtin =
// user time / built-in time (goal: <= 1.10). Thread CPU time.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/anneal.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <ctime>  // clock_gettime
#include <map>

using namespace spinwright;

namespace {

double cpu_seconds() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

template <class Model>
struct UserFlip {
  using proposal_type = typename Model::index_type;
  std::size_t moves_per_sweep(const SpinState<Model>& s) const { return s.size(); }
  proposal_type propose(const SpinState<Model>& s, Xoshiro256& rng) {
    return static_cast<proposal_type>(rng.below(static_cast<std::uint32_t>(s.size())));
  }
  typename Model::energy_type delta(const SpinState<Model>& s, const proposal_type& i) const { return s.delta(i); }
  void apply(SpinState<Model>& s, const proposal_type& i, typename Model::energy_type d) { s.flip_with_delta(i, d); }
};

using Model = IsingModel<std::int32_t>;

const Model& cubic_model() {
  static const Model m = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(1u << 16, 2026));
  return m;
}

template <class Move>
double ns_per_attempt(bool cold, std::uint64_t sweeps) {
  const Model& m = cubic_model();
  AnnealParams p;
  p.order = SiteOrder::random;
  p.sweeps = 100;
  if (cold) p.schedule = Schedule::constant(estimate_beta_span(m).beta_end);
  Annealer<Model, Move> a(m, p, Move{}, 1);
  a.step(5);
  const std::uint64_t before = a.attempted();
  const double t0 = cpu_seconds();
  a.step(sweeps);
  const double t = cpu_seconds() - t0;
  benchmark::DoNotOptimize(a.best().energy);
  return t * 1e9 / static_cast<double>(a.attempted() - before);
}

template <class Move>
void bench_move(benchmark::State& st) {
  const bool cold = st.range(0) == 0;
  double total_user = 0, total_builtin = 0;
  for (auto _ : st) {
    // Interleaved so both see the same machine load.
    total_builtin += ns_per_attempt<SingleFlip<Model>>(cold, 40);
    total_user += ns_per_attempt<Move>(cold, 40);
  }
  st.counters["builtin_ns_per_attempt"] = total_builtin / static_cast<double>(st.iterations());
  st.counters["user_ns_per_attempt"] = total_user / static_cast<double>(st.iterations());
  st.counters["ratio_to_builtin"] = total_user / total_builtin;
  st.SetLabel(cold ? "cubic65536/int32/cold/random" : "cubic65536/int32/annealing-schedule/random");
}

}  // namespace

BENCHMARK_TEMPLATE(bench_move, UserFlip<Model>)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond);

BENCHMARK_MAIN();
