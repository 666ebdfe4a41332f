// Quality of the breakout local search (kernels/breakout.hpp) at a fixed time per run, against
// the published best cuts and against a plain annealer given the same time.
//   gset/<graph>/<variant>   the shared G-set graphs, SPINWRIGHT_QUALITY_SECONDS (default 5) CPU
//                            seconds of the running thread per run, seeds 1..SPINWRIGHT_QUALITY_SEEDS
//                            (default 3); counters: cut per seed, ratios to the best known cut
//   qubo/<instance>          bqp / be instances in max-cut form: CPU seconds until the reference
//                            cut (Budget::with_target), capped at SPINWRIGHT_QUALITY_CAP (default 2)
//   gen/<family>/<variant>   generated graphs (problems/graph_families.hpp, graph seed
//                            SPINWRIGHT_QUALITY_GRAPH_SEED, default 1): the cut of
//                            each variant at equal time (no reference value: the best variant wins)
// Variants: breakout (the defaults), fixed_jump (adaptive_jump = false), random_jump (directed =
// false), tabu (TabuWalker defaults, no time rule), anneal_ref (benchmarks/kernels/reference_anneal.hpp,
// geometric beta over the model's beta span, following the elapsed fraction of the time), auto
// (solve_auto filling the time: the baseline), auto_polish (solve_auto for 80 % of the
// time, then the breakout search from its best), dense (qubo/ only: breakout on the dense copy).
// tabu_hundredth / breakout_hundredth: the same with the tabu tenure N / 100 + a draw in [1, 10]
// per cycle (TabuTenure::hundredth; for breakout through its tenure = N / 100 + 1, spread 9).
// SPINWRIGHT_QUALITY_SWEEPS > 0: gset/ and gen/ runs of the walk-based variants take that many
// sweeps (N moves each) instead of a time limit: quality at fixed steps, independent of the load.
// The "*/summary" lines aggregate the runs before them. Results and commands: docs/quality.md.
#include <benchmark/benchmark.h>

#include <spinwright/kernels/auto.hpp>
#include <spinwright/kernels/beta_span.hpp>
#include <spinwright/kernels/breakout.hpp>
#include <spinwright/kernels/schedule.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/problems/graph_families.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "kernels/cpu_clock.hpp"
#include "kernels/reference_anneal.hpp"
#include "support/temper_graph.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <limits>
#include <map>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

using bench_support::cpu_clock;
using bench_support::thread_seconds;
using Model = IsingModel<std::int32_t>;

double env_double(const char* name, double fallback) {
  const char* v = std::getenv(name);
  return v != nullptr && *v != '\0' ? std::atof(v) : fallback;
}
int env_int(const char* name, int fallback) {
  const char* v = std::getenv(name);
  return v != nullptr && *v != '\0' ? std::atoi(v) : fallback;
}

double run_seconds() { return env_double("SPINWRIGHT_QUALITY_SECONDS", 5.0); }
int run_seeds() { return env_int("SPINWRIGHT_QUALITY_SEEDS", 3); }
int graph_seed() { return env_int("SPINWRIGHT_QUALITY_GRAPH_SEED", 1); }
double qubo_cap() { return env_double("SPINWRIGHT_QUALITY_CAP", 2.0); }
std::uint64_t fixed_sweeps() { return static_cast<std::uint64_t>(env_int("SPINWRIGHT_QUALITY_SWEEPS", 0)); }


enum class Variant {
  breakout,
  fixed_jump,
  random_jump,
  tabu,
  anneal_ref,
  auto_fill,
  auto_polish,
  dense,
  tabu_hundredth,
  breakout_hundredth
};
const char* name_of(Variant v) {
  switch (v) {
    case Variant::breakout:
      return "breakout";
    case Variant::fixed_jump:
      return "fixed_jump";
    case Variant::random_jump:
      return "random_jump";
    case Variant::tabu:
      return "tabu";
    case Variant::anneal_ref:
      return "anneal_ref";
    case Variant::auto_fill:
      return "auto";
    case Variant::auto_polish:
      return "auto_polish";
    case Variant::dense:
      return "dense";
    case Variant::tabu_hundredth:
      return "tabu_hundredth";
    case Variant::breakout_hundredth:
      return "breakout_hundredth";
  }
  return "?";
}

TabuParams tabu_params(Variant v) {
  TabuParams p;
  if (v == Variant::tabu_hundredth) p.tenure_rule = TabuTenure::hundredth;
  return p;
}

BreakoutParams breakout_params(const Model& m, Variant v) {
  BreakoutParams p;
  p.adaptive_jump = v != Variant::fixed_jump;
  p.directed = v != Variant::random_jump;
  if (v == Variant::breakout_hundredth) {
    p.tenure = m.num_spins() / 100 + 1;
    p.tenure_spread = 9;
  }
  return p;
}

// The plain annealer for `seconds` of CPU time; its final energy (it ends cold).
std::int64_t plain_anneal(const Model& m, std::uint64_t seed, double seconds) {
  reference::PlainAnnealer<std::int32_t> a(m, seed);
  const BetaSpan span = estimate_beta_span(m);
  const Schedule sched = Schedule::geometric(span.beta_start, span.beta_end);
  const double start = thread_seconds();
  for (;;) {
    const double f = (thread_seconds() - start) / seconds;
    if (f >= 1.0) break;
    a.sweep(sched.beta_at(f));
  }
  a.sweep(span.beta_end);
  return m.energy(a.spins().data());
}

std::int64_t run_variant(const Model& m, Variant v, std::uint64_t seed, double seconds, double* used = nullptr) {
  const Budget budget = Budget{}.with_time_limit(seconds, cpu_clock());
  Budget b = budget;
  b.sweeps = unlimited_sweeps;
  if (fixed_sweeps() > 0) b = Budget{}.with_sweeps(fixed_sweeps());
  std::int64_t e = 0;
  double s = seconds;
  if (v == Variant::anneal_ref) {
    e = plain_anneal(m, seed, seconds);
  } else if (v == Variant::auto_fill) {
    const auto sol = solve_auto(m, seed, 0, budget);
    e = sol.energy;
    s = sol.seconds;
  } else if (v == Variant::auto_polish) {
    // solve_auto for 80 % of the time, then the breakout search from its best for the rest.
    const auto first = solve_auto(m, seed, 0, Budget{}.with_time_limit(0.8 * seconds, cpu_clock()));
    BreakoutSearch<Model> bo(m, BreakoutParams{}, seed);
    bo.warm_start(first.spins.data(), seed, 0);
    Budget rest = Budget{}.with_time_limit(seconds - first.seconds, cpu_clock());
    rest.sweeps = unlimited_sweeps;
    bo.advance(rest);
    e = bo.best().energy;
  } else if (v == Variant::dense) {
    const auto d = DenseModel<Form::ising, std::int32_t>::from(m).value();
    e = breakout(d, BreakoutParams{}, seed, 0, b).energy;
  } else if (v == Variant::tabu || v == Variant::tabu_hundredth) {
    const auto sol = tabu_walk(m, tabu_params(v), seed, 0, b);
    e = sol.energy;
    s = sol.seconds;
  } else {
    const auto sol = breakout(m, breakout_params(m, v), seed, 0, b);
    e = sol.energy;
    s = sol.seconds;
  }
  if (used != nullptr) *used = s;
  return e;
}

std::map<std::string, std::vector<double>>& ratios_of(const std::string& group) {
  static std::map<std::string, std::map<std::string, std::vector<double>>> r;
  return r[group];
}

void bm_gset(benchmark::State& state, std::string name, Variant v) {
  const Model m = test_support::load_maxcut<std::int32_t>(name);
  const std::int64_t reference = test_support::reference_cut(test_support::maxcut_path("reference.csv"), name);
  const std::int64_t w = total_weight(m);
  std::string cuts;
  std::vector<double> r;
  for (auto _ : state) {
    for (int seed = 1; seed <= run_seeds(); ++seed) {
      const std::int64_t cut = cut_from_energy(w, run_variant(m, v, static_cast<std::uint64_t>(seed), run_seconds()));
      // The cut recomputed edge by edge would need the spins; the energy of the returned state is
      // recomputed from the model by solution() (kernels/solution.hpp).
      cuts += (cuts.empty() ? "" : " ") + std::to_string(cut);
      r.push_back(static_cast<double>(cut) / static_cast<double>(reference));
    }
  }
  ratios_of(std::string("gset/") + name_of(v))[name] = r;
  state.SetLabel(name + " best_known " + std::to_string(reference) + " cuts " + cuts);
  state.counters["ratio_min"] = *std::min_element(r.begin(), r.end());
  double mean = 0;
  for (double x : r) mean += x / static_cast<double>(r.size());
  state.counters["ratio_mean"] = mean;
}

void bm_summary(benchmark::State& state, std::string group) {
  for (auto _ : state) {
  }
  double sum = 0;
  double lowest = std::numeric_limits<double>::infinity();
  std::size_t count = 0;
  for (const auto& [name, r] : ratios_of(group)) {
    double mean = 0;
    for (double x : r) {
      mean += std::min(x, 1.0) / static_cast<double>(r.size());
      lowest = std::min(lowest, x);
    }
    sum += mean;
    ++count;
  }
  state.SetLabel(group + " graphs " + std::to_string(count));
  state.counters["mean_ratio_capped"] = count > 0 ? sum / static_cast<double>(count) : 0.0;
  state.counters["min_ratio"] = count > 0 ? lowest : 0.0;
}

void bm_qubo(benchmark::State& state, std::string name, Variant v) {
  const Model m = test_support::load_maxcut<std::int32_t>(name);
  const std::int64_t reference = test_support::reference_cut(test_support::maxcut_path("reference.csv"), name);
  const std::int64_t w = total_weight(m);
  const double target = static_cast<double>(energy_from_cut(w, reference));
  std::string times;
  int reached = 0;
  double worst = 0;
  for (auto _ : state) {
    for (int seed = 1; seed <= run_seeds(); ++seed) {
      Budget b = Budget{}.with_time_limit(qubo_cap(), cpu_clock()).with_target(target);
      b.sweeps = unlimited_sweeps;
      Solution<std::int64_t> s;
      if (v == Variant::tabu || v == Variant::tabu_hundredth) {
        s = tabu_walk(m, tabu_params(v), static_cast<std::uint64_t>(seed), 0, b);
      } else if (v == Variant::dense) {
        const auto d = DenseModel<Form::ising, std::int32_t>::from(m).value();
        s = breakout(d, BreakoutParams{}, static_cast<std::uint64_t>(seed), 0, b);
      } else {
        s = breakout(m, breakout_params(m, v), static_cast<std::uint64_t>(seed), 0, b);
      }
      const bool ok = cut_from_energy(w, s.energy) >= reference;
      reached += ok ? 1 : 0;
      worst = std::max(worst, ok ? s.seconds : std::numeric_limits<double>::infinity());
      char buf[32];
      std::snprintf(buf, sizeof buf, "%.3f", s.seconds);
      times += (times.empty() ? "" : " ") +
               (ok ? std::string(buf) : std::string("miss:") + std::to_string(cut_from_energy(w, s.energy)));
    }
  }
  state.SetLabel(name + " reference " + std::to_string(reference) + " cpu_s " + times);
  state.counters["reached"] = reached;
  state.counters["cpu_s_max"] = worst;
}

struct Family {
  const char* name;
  std::uint32_t n;
  int kind;  // 0 random, 1 planar-type, 2 toroidal
  double density;
  std::uint32_t rows;
  EdgeWeights w;
};

const Family families[] = {
    {"random800_w1", 800, 0, 0.06, 0, EdgeWeights::ones},
    {"random2000_pm1", 2000, 0, 0.01, 0, EdgeWeights::plus_minus_one},
    {"planar800_pm1", 800, 1, 0, 0, EdgeWeights::plus_minus_one},
    {"planar2000_pm1", 2000, 1, 0, 0, EdgeWeights::plus_minus_one},
    {"planar2000_w1", 2000, 1, 0, 0, EdgeWeights::ones},
    {"torus14000_pm1", 14000, 2, 0, 100, EdgeWeights::plus_minus_one},
    {"torus20000_pm1", 20000, 2, 0, 100, EdgeWeights::plus_minus_one},
    // More sizes of the same families (as the G-set has them): random graphs of weight 1 at 5000
    // and 10,000 nodes, +-1 tori of 2000 and 9000 nodes.
    {"random5000_w1", 5000, 0, 0.001, 0, EdgeWeights::ones},
    {"random10000_w1", 10000, 0, 0.0002, 0, EdgeWeights::ones},
    {"torus2000_pm1", 2000, 2, 0, 40, EdgeWeights::plus_minus_one},
    {"torus9000_pm1", 9000, 2, 0, 100, EdgeWeights::plus_minus_one},
};

Model build_family(const Family& f, std::uint64_t seed) {
  std::vector<WeightedEdge<std::int32_t>> edges;
  if (f.kind == 0) edges = random_graph(f.n, f.density, f.w, seed);
  if (f.kind == 1) edges = planar_type_graph(f.n, f.w, seed);
  if (f.kind == 2) edges = toroidal_graph(f.rows, f.n / f.rows, f.w, seed);
  return MaxCutProblem<std::int32_t>::encode(f.n, edges).value().model();
}

void bm_gen(benchmark::State& state, const Family* f, Variant v) {
  const Model m = build_family(*f, static_cast<std::uint64_t>(graph_seed()));
  const std::int64_t w = total_weight(m);
  std::string cuts;
  for (auto _ : state) {
    for (int seed = 1; seed <= run_seeds(); ++seed) {
      const std::int64_t cut = cut_from_energy(w, run_variant(m, v, static_cast<std::uint64_t>(seed), run_seconds()));
      cuts += (cuts.empty() ? "" : " ") + std::to_string(cut);
    }
  }
  state.SetLabel(std::string(f->name) + " N=" + std::to_string(m.num_spins()) + " M=" + std::to_string(m.num_pairs()) +
                 " cuts " + cuts);
}

const bool registered = [] {
  const char* gset[] = {"G1", "G11", "G14", "G20", "G22", "G30", "G40", "G43", "G48", "G55", "G62", "G65", "G70"};
  const char* qubo[] = {"bqp250-1",  "bqp250-2",  "bqp250-3",  "bqp250-4",  "bqp250-5",  "bqp500-1",
                        "bqp500-2",  "bqp500-3",  "be100.1",   "be100.2",   "be100.3",   "be120.3.1",
                        "be120.3.2", "be120.3.3", "be120.8.1", "be120.8.2", "be120.8.3", "be150.3.1",
                        "be150.3.2", "be150.3.3", "be150.8.1", "be150.8.2", "be150.8.3"};
  const Variant variants[] = {Variant::breakout,       Variant::fixed_jump,        Variant::random_jump,
                              Variant::tabu,           Variant::anneal_ref,        Variant::auto_fill,
                              Variant::auto_polish,    Variant::tabu_hundredth,    Variant::breakout_hundredth};
  for (const Variant v : {Variant::breakout, Variant::fixed_jump, Variant::random_jump, Variant::dense, Variant::tabu,
                          Variant::tabu_hundredth, Variant::breakout_hundredth})
    for (const char* q : qubo)
      benchmark::RegisterBenchmark((std::string("qubo/") + q + "/" + name_of(v)).c_str(), bm_qubo, std::string(q), v)
          ->Iterations(1)
          ->Unit(benchmark::kSecond);
  for (const Variant v : variants) {
    for (const char* g : gset)
      benchmark::RegisterBenchmark((std::string("gset/") + g + "/" + name_of(v)).c_str(), bm_gset, std::string(g), v)
          ->Iterations(1)
          ->Unit(benchmark::kSecond);
    const std::string group = std::string("gset/") + name_of(v);
    benchmark::RegisterBenchmark((group + "/summary").c_str(), bm_summary, group)->Iterations(1);
  }
  for (const Family& f : families)
    for (const Variant v : variants)
      benchmark::RegisterBenchmark((std::string("gen/") + f.name + "/" + name_of(v)).c_str(), bm_gen, &f, v)
          ->Iterations(1)
          ->Unit(benchmark::kSecond);
  return true;
}();

}  // namespace

BENCHMARK_MAIN();
