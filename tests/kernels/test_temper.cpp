// Replica-exchange tempering: ground states against exact enumeration and published facts,
// swap acceptance reporting, adaptive ladder, Houdayer moves, determinism, stop and target.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/spinwright.hpp>

#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

#include "support/anneal_graph.hpp"
#include "support/enumerate.hpp"
#include "support/temper_graph.hpp"

using namespace spinwright;
using test_support::Graph;

namespace {

template <class Model>
Model model_of(const Graph& g) {
  using V = typename Model::value_type;
  if constexpr (Model::is_dense) {
    return Model::from(test_support::ising_of<V>(g)).value();
  } else {
    return test_support::ising_of<V, typename Model::index_type>(g);
  }
}

// 2D +-J spin glass on an L x L torus (optimisation form), bonds drawn with a fixed seed.
Graph pm_torus(std::uint32_t L, std::uint64_t seed) {
  Graph g = test_support::torus(L, 1);
  Xoshiro256 rng(seed);
  for (auto& e : g.edges) e.w = rng.coin() ? 1 : -1;
  return g;
}

double spread(const std::vector<double>& a) {
  double lo = a[0];
  double hi = a[0];
  for (double x : a) {
    lo = x < lo ? x : lo;
    hi = x > hi ? x : hi;
  }
  return hi - lo;
}

}  // namespace

// The 4x4 ferromagnetic torus has ground energy -32 (reference sheet section 3: g(-32) = 2;
// P. D. Beale, Phys. Rev. Lett. 76, 78 (1996) [memory]).
TEST_CASE_TEMPLATE("4x4 ferromagnet: every model type reaches E = -32", Model, IsingModel<std::int32_t>,
                   IsingModel<std::int64_t>, IsingModel<double>, IsingModel<float>, DenseIsingModel<std::int32_t>,
                   DenseIsingModel<double>, IsingModel<std::int64_t, std::uint16_t>) {
  const Model model = model_of<Model>(test_support::torus(4, -1));
  TemperParams p;
  p.sweeps = 300;
  auto s = temper(model, p, 11);
  CHECK(static_cast<double>(s.energy) == -32.0);
  CHECK(static_cast<double>(model.energy(s.spins.data())) == -32.0);
  REQUIRE(s.swap_acceptance.size() == s.betas.size() - 1);
  // One attempt per pair after every sweep (header comment); each rate is a count over them.
  CHECK(s.swap_attempts == 300);
  for (double a : s.swap_acceptance) {
    const double accepted = a * static_cast<double>(s.swap_attempts);
    CHECK(accepted == doctest::Approx(std::round(accepted)).epsilon(1e-9));
    CHECK(accepted >= 1);  // geometric ladder on 16 spins: every pair swaps now and then
  }
  for (std::size_t k = 0; k + 1 < s.betas.size(); ++k) CHECK(s.betas[k] < s.betas[k + 1]);
}

// Each rung samples its own Boltzmann distribution: the mean energy of the replica on rung k
// equals the exact average at beta_k from enumerating all 2^16 states of the 4x4 torus
// (checked against REFERENCES.md section 3 in kernels/test_anneal_sampling.cpp; Hukushima &
// Nemoto, J. Phys. Soc. Jpn. 65, 1604 (1996): swaps keep every rung at equilibrium). With the
// uniform path and with the hazard path of integer Metropolis forced; tolerance 4 standard
// errors from 100 bins.
TEST_CASE("4x4 torus: every rung reproduces the exact mean energy, uniform and hazard paths") {
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  const double betas[] = {0.2, 0.35, 1.0 / 2.269, 0.55, 1.0 / 1.5};
  for (const double hazard_below : {0.0, 2.0}) {
    CAPTURE(hazard_below);
    TemperParams p;
    p.ladder.shape = LadderShape::listed;
    p.ladder.temperatures = 5;
    p.ladder.betas = betas;
    p.order = SiteOrder::random;
    p.hazard_below = hazard_below;
    Tempering<IsingModel<std::int32_t>> t(model, p, 71);
    t.step(1000);
    const std::size_t bins = 100, per = 1000;
    std::vector<std::vector<double>> bin_means(5, std::vector<double>(bins, 0.0));
    for (std::size_t b = 0; b < bins; ++b) {
      for (std::size_t k = 0; k < per; ++k) {
        t.step(1);
        for (std::size_t r = 0; r < 5; ++r) bin_means[r][b] += static_cast<double>(t.state(r).energy()) / per;
      }
    }
    for (std::size_t r = 0; r < 5; ++r) {
      CAPTURE(r);
      double mean = 0, var = 0;
      for (double m : bin_means[r]) mean += m / bins;
      for (double m : bin_means[r]) var += (m - mean) * (m - mean) / (bins - 1);
      const double error = std::sqrt(var / bins);
      const double exact = anneal_support::exact_mean_energy(model, betas[r]);
      CAPTURE(mean);
      CAPTURE(exact);
      CAPTURE(error);
      CHECK(std::abs(mean - exact) <= 4 * error);
    }
  }
}

// Ground states of random models (Ising with fields, QUBO, sparse and dense) equal exact
// enumeration's.
TEST_CASE_TEMPLATE("random models: tempering reaches the exact ground energy", Value, std::int32_t, std::int64_t,
                   double, float) {
  Xoshiro256 rng(314);
  for (int trial = 0; trial < 6; ++trial) {
    const std::uint32_t n = 14 + rng.below(6);
    QuboBuilder<Value> qb(n);
    for (std::uint32_t i = 0; i < n; ++i) qb.add_unary(i, static_cast<Value>(static_cast<int>(rng.below(21)) - 10));
    for (std::uint32_t k = 0; k < 3 * n; ++k) {
      qb.add_pair(rng.below(n), rng.below(n), static_cast<Value>(static_cast<int>(rng.below(21)) - 10));
    }
    const auto q = qb.build().value();
    const auto exact = solve_exact(q);
    REQUIRE(exact.ok());
    TemperParams p;
    p.sweeps = 400;
    const auto s = temper(q, p, 5, static_cast<std::uint64_t>(trial));
    CHECK(static_cast<double>(s.energy) == doctest::Approx(static_cast<double>(exact->energy)));
    const auto dq = DenseQuboModel<Value>::from(q).value();
    const auto sd = temper(dq, p, 5, static_cast<std::uint64_t>(trial));
    CHECK(static_cast<double>(sd.energy) == doctest::Approx(static_cast<double>(exact->energy)));
    // Houdayer moves on a QUBO (the pair's energy is conserved whatever the unary terms).
    TemperParams ph = p;
    ph.houdayer = true;
    Tempering<QuboModel<Value>> th(q, ph, 5, static_cast<std::uint64_t>(trial));
    th.step(1);
    for (std::size_t k = 0; k < th.temperatures(); ++k) {
      const double before = static_cast<double>(th.state(k, 0).energy()) + static_cast<double>(th.state(k, 1).energy());
      th.houdayer_move(k);
      const double after = static_cast<double>(th.state(k, 0).energy()) + static_cast<double>(th.state(k, 1).energy());
      CHECK(after == doctest::Approx(before));
    }
    const auto sh = th.run();
    CHECK(sh.cluster_moves > 0);
    CHECK(static_cast<double>(sh.energy) == doctest::Approx(static_cast<double>(exact->energy)));
    for (std::size_t k = 0; k < th.temperatures(); ++k) {
      CHECK(th.state(k, 0).check().max_field_error < 1e-6);
      CHECK(th.state(k, 1).check().max_field_error < 1e-6);
    }
  }
}

// Max-cut facts (common practice; reference sheet section 5): K_n floor(n^2/4), C_n n or n-1,
// Petersen 12; cut = (W - E) / 2.
TEST_CASE("max-cut facts") {
  auto cut_of = [](const Graph& g) {
    const auto m = test_support::ising_of<std::int32_t>(g);
    TemperParams p;
    p.sweeps = 500;
    const auto s = temper(m, p, 3);
    return cut_value(m, s.spins.data());
  };
  for (std::uint32_t n = 3; n <= 16; ++n) CHECK(cut_of(test_support::complete(n)) == (n * n) / 4);
  for (std::uint32_t n = 3; n <= 21; ++n) CHECK(cut_of(test_support::cycle(n)) == (n % 2 == 0 ? n : n - 1));
  CHECK(cut_of(test_support::petersen()) == 12);
}

TEST_CASE("a fixed seed gives the same run; another seed gives another trajectory") {
  const auto m = test_support::ising_of<double>(pm_torus(6, 99));
  TemperParams p;
  p.sweeps = 200;
  const auto a = temper(m, p, 42, 1);
  const auto b = temper(m, p, 42, 1);
  CHECK(a.spins == b.spins);
  CHECK(a.energy == b.energy);
  CHECK(a.accepted == b.accepted);
  CHECK(a.swap_acceptance == b.swap_acceptance);
  const auto c = temper(m, p, 43, 1);
  CHECK(c.accepted != a.accepted);
}

TEST_CASE("stepping object: replicas stay exact, best() matches the model") {
  const auto m = test_support::ising_of<std::int32_t>(pm_torus(5, 7));
  TemperParams p;
  Tempering<IsingModel<std::int32_t>> t(m, p, 1);
  t.step(50);
  CHECK(t.sweeps_done() == 50);
  for (std::size_t k = 0; k < t.temperatures(); ++k) CHECK(t.state(k).check().exact);
  const auto best = t.best();
  CHECK(m.energy(best.spins) == best.energy);
  CHECK(t.state().size() == 25);
}

// Houdayer moves: both replicas of a rung stay exact, the pair's total energy is conserved by
// each cluster move, and the ground energy of a 5x5 +-J glass is reached (checked by
// enumeration).
TEST_CASE("Houdayer cluster moves on a 2D +-J glass") {
  const auto m = test_support::ising_of<std::int32_t>(pm_torus(5, 2024));
  const auto exact = solve_exact(m);
  REQUIRE(exact.ok());
  TemperParams p;
  p.houdayer = true;
  p.sweeps = 600;
  Tempering<IsingModel<std::int32_t>> t(m, p, 9);
  CHECK(t.replicas() == 2 * t.temperatures());
  t.step(20);
  std::size_t flipped = 0;
  for (int round = 0; round < 10; ++round) {
    for (std::size_t k = 0; k < t.temperatures(); ++k) {
      const std::int64_t before = t.state(k, 0).energy() + t.state(k, 1).energy();
      flipped += t.houdayer_move(k);
      CHECK(t.state(k, 0).energy() + t.state(k, 1).energy() == before);
    }
  }
  CHECK(flipped > 0);
  for (std::size_t k = 0; k < t.temperatures(); ++k) {
    CHECK(t.state(k, 0).check().exact);
    CHECK(t.state(k, 1).check().exact);
  }
  const auto s = t.run();
  CHECK(s.cluster_moves > 0);
  CHECK(s.cluster_sites >= s.cluster_moves);
  CHECK(s.energy == exact->energy);
  // Both replica sets attempt every pair after every sweep, pooled (TemperSolution comment).
  CHECK(s.swap_attempts % 2 == 0);
  for (double a : s.swap_acceptance) {
    const double accepted = a * static_cast<double>(s.swap_attempts);
    CHECK(accepted == doctest::Approx(std::round(accepted)).epsilon(1e-9));
    CHECK(accepted >= 1);
  }
}

// The adaptive ladder evens out the swap acceptances. Test lattice: the 16x16 ferromagnetic
// torus over beta 0.1 .. 1.0 with 10 rungs; its specific-heat peak near beta_c = 0.4407
// (Onsager 1944) makes the geometric ladder's acceptances very uneven.
TEST_CASE("adaptive ladder: more even swap acceptance than the geometric ladder") {
  const auto m = test_support::ising_of<std::int32_t>(test_support::torus(16, -1));
  TemperParams p;
  p.ladder.temperatures = 10;
  p.ladder.beta_min = 0.1;
  p.ladder.beta_max = 1.0;
  p.ladder.adapt_rounds = 12;
  p.ladder.adapt_sweeps = 100;
  const std::uint64_t warm = p.ladder.adapt_rounds * p.ladder.adapt_sweeps;
  const std::uint64_t measure = 1500;

  Tempering<IsingModel<std::int32_t>> geo(m, p, 21);
  geo.step(warm + measure);
  const auto a_geo = geo.swap_acceptance();

  p.ladder.adaptive = true;
  Tempering<IsingModel<std::int32_t>> ada(m, p, 21);
  ada.step(warm);
  CHECK_FALSE(ada.adapting());
  ada.step(measure);
  const auto a_ada = ada.swap_acceptance();
  const auto s = ada.solution();
  CHECK(s.betas.front() == doctest::Approx(0.1));
  CHECK(s.betas.back() == doctest::Approx(1.0));
  for (std::size_t k = 0; k + 1 < s.betas.size(); ++k) CHECK(s.betas[k] < s.betas[k + 1]);
  MESSAGE("geometric spread " << spread(a_geo) << ", adaptive spread " << spread(a_ada));
  CHECK(spread(a_ada) < 0.5 * spread(a_geo));
  double lowest = 1;
  for (double a : a_ada) lowest = a < lowest ? a : lowest;
  CHECK(lowest > 0.05);
}

namespace {
struct StopAt {
  StopToken* token;
  std::uint64_t at;
  std::uint64_t seen = 0;
  void on_progress(std::uint64_t sweep, double) {
    seen = sweep;
    if (sweep == at) token->request_stop();
  }
};
}  // namespace

TEST_CASE("stop token and target stop a run") {
  const auto m = test_support::ising_of<std::int32_t>(pm_torus(6, 5));
  TemperParams p;
  p.sweeps = 100000;
  p.progress_every = 1;
  StopToken token;
  StopAt obs{&token, 7};
  Budget b;
  b.with_stop(token);
  const auto s = temper(m, p, 1, 0, b, obs);
  CHECK(s.reason == StopReason::stopped);
  CHECK(s.sweeps == 7);

  token.request_stop();
  const auto s0 = temper(m, p, 1, 0, Budget{}.with_stop(token));
  CHECK(s0.reason == StopReason::stopped);
  CHECK(s0.sweeps == 0);

  const auto ferro = test_support::ising_of<std::int32_t>(test_support::torus(6, -1));
  const auto t = temper(ferro, p, 1, 0, Budget{}.with_target(-72));
  CHECK(t.reason == StopReason::target_reached);
  CHECK(t.energy == -72);
  CHECK(t.sweeps < 100000);
}

// OR-Library bqp250 instances in max-cut form (J. E. Beasley, J. Oper. Res. Soc. 41, 1069-1072,
// 1990; instances from Beasley 1998); proven optima from shared/data/maxcut/reference.csv.
// A generous fixed budget of 5000 sweeps (the run stops early at the optimum).
TEST_CASE("bqp250 instances: tempering reaches the proven optimum cut") {
  for (int k = 1; k <= 5; ++k) {
    const std::string name = "bqp250-" + std::to_string(k);
    const auto m = test_support::load_maxcut<std::int32_t>(name);
    const std::int64_t ref = test_support::reference_cut(test_support::maxcut_path("reference.csv"), name);
    REQUIRE(ref > 0);
    const std::int64_t w = total_weight(m);
    TemperParams p;
    const auto s =
        temper(m, p, 2026, 0, Budget{}.with_sweeps(5000).with_target(static_cast<double>(energy_from_cut(w, ref))));
    CHECK(cut_value(m, s.spins.data()) == ref);
    CHECK(cut_from_energy(w, s.energy) == ref);
  }
}

namespace {

// A 12-spin glass with double couplings and fields: fields break the global flip symmetry that
// hides a frozen spin on the zero-field ferromagnet, and non-integer energies take the uniform
// sweep (no hazard path). Couplings on a ring plus random chords, all drawn with a fixed seed.
IsingModel<double> double_glass_12() {
  IsingBuilder<double> b(12);
  Xoshiro256 rng(1212);
  for (std::uint32_t i = 0; i < 12; ++i) {
    b.add_coupling(i, (i + 1) % 12, 2 * rng.uniform() - 1);
    b.add_field(i, 1.5 * (2 * rng.uniform() - 1));
  }
  for (int k = 0; k < 18; ++k) {
    const std::uint32_t i = rng.below(12), j = rng.below(12);
    if (i != j) b.add_coupling(i, j, 2 * rng.uniform() - 1);
  }
  return b.build().value();
}

// Exact equilibrium swap acceptance of the pair (beta_a, beta_b): E over independent
// E_a ~ P_beta_a, E_b ~ P_beta_b of min(1, exp((beta_a - beta_b)(E_a - E_b))) (the replica-exchange
// rule of Hukushima & Nemoto, J. Phys. Soc. Jpn. 65, 1604 (1996)), from all 2^n states.
template <class Model>
double exact_swap_acceptance(const Model& model, double beta_a, double beta_b) {
  const std::size_t n = model.num_spins();
  std::vector<double> e(std::size_t{1} << n);
  std::vector<std::int8_t> s(n);
  double ground = 0;
  for (std::uint64_t code = 0; code < e.size(); ++code) {
    for (std::size_t k = 0; k < n; ++k) s[k] = ((code >> k) & 1) ? -1 : 1;
    e[code] = static_cast<double>(model.energy(s.data()));
    if (code == 0 || e[code] < ground) ground = e[code];
  }
  // Distinct levels with their weights at each beta (the integer torus has few levels).
  std::vector<double> levels;
  std::vector<double> count;
  for (double x : e) {
    std::size_t j = 0;
    while (j < levels.size() && levels[j] != x) ++j;
    if (j == levels.size()) {
      levels.push_back(x);
      count.push_back(0);
    }
    count[j] += 1;
  }
  std::vector<double> pa(levels.size()), pb(levels.size());
  double za = 0, zb = 0;
  for (std::size_t j = 0; j < levels.size(); ++j) {
    pa[j] = count[j] * std::exp(-beta_a * (levels[j] - ground));
    pb[j] = count[j] * std::exp(-beta_b * (levels[j] - ground));
    za += pa[j];
    zb += pb[j];
  }
  double acc = 0;
  for (std::size_t i = 0; i < levels.size(); ++i) {
    for (std::size_t j = 0; j < levels.size(); ++j) {
      const double x = (beta_a - beta_b) * (levels[i] - levels[j]);
      acc += pa[i] / za * pb[j] / zb * (x >= 0 ? 1.0 : std::exp(x));
    }
  }
  return acc;
}

}  // namespace

// Every rung of a model with fields samples its Boltzmann distribution. Reference: the exact
// mean energy from enumerating all 2^12 states through model.energy (Boltzmann average,
// common practice; an enumeration independent of the tempering kernel). The ground energy of
// the same enumeration is checked against solve_exact's (a second, separate enumeration).
// A sweep that never visits one site, or swaps with the wrong sign, moves the rung means by
// many standard errors. Tolerance 4 standard errors from 100 bins; both site orders.
TEST_CASE("12-spin glass with fields: every rung reproduces the exact mean energy") {
  const auto model = double_glass_12();
  const double betas[] = {0.3, 0.6, 1.2, 2.5};
  const auto exact = solve_exact(model);
  REQUIRE(exact.ok());
  double ground = 0;
  test_support::for_each_assignment(12, [&](const std::int8_t* s) {
    const double e = model.energy(s);
    ground = e < ground ? e : ground;
  });
  CHECK(exact->energy == doctest::Approx(ground).epsilon(1e-12));
  for (const SiteOrder order : {SiteOrder::random, SiteOrder::sequential}) {
    CAPTURE(static_cast<int>(order));
    TemperParams p;
    p.ladder.shape = LadderShape::listed;
    p.ladder.temperatures = 4;
    p.ladder.betas = betas;
    p.order = order;
    Tempering<IsingModel<double>> t(model, p, 29);
    t.step(500);
    const std::size_t bins = 100, per = 400;
    std::vector<std::vector<double>> bin_means(4, std::vector<double>(bins, 0.0));
    for (std::size_t b = 0; b < bins; ++b) {
      for (std::size_t k = 0; k < per; ++k) {
        t.step(1);
        for (std::size_t r = 0; r < 4; ++r) bin_means[r][b] += t.state(r).energy() / per;
      }
    }
    double previous = 0;
    for (std::size_t r = 0; r < 4; ++r) {
      CAPTURE(r);
      double mean = 0, var = 0;
      for (double m : bin_means[r]) mean += m / bins;
      for (double m : bin_means[r]) var += (m - mean) * (m - mean) / (bins - 1);
      const double error = std::sqrt(var / bins);
      const double want = anneal_support::exact_mean_energy(model, betas[r]);
      CAPTURE(mean);
      CAPTURE(want);
      CAPTURE(error);
      CHECK(std::abs(mean - want) <= 4 * error);
      // d<E>/d beta = -Var(E) < 0 (common practice): colder rungs sit lower, by more than
      // the noise (the exact means of neighbouring rungs differ by far more than 8 errors).
      if (r > 0) CHECK(mean < previous);
      previous = mean;
    }
  }
}

// Swap acceptance of a two-rung ladder against the exact equilibrium value (exact_swap_acceptance
// above, from all 2^16 states of the 4x4 ferromagnetic torus). Independent runs give the
// standard error; tolerance 4 standard errors. A swap with the wrong sign, or counters that
// count the wrong event, move the rate far outside.
TEST_CASE("two rungs: the swap acceptance equals the exact equilibrium value") {
  const auto model = anneal_support::square_lattice<std::int32_t>(4, -1);
  const double betas[] = {0.3, 0.4};
  const double want = exact_swap_acceptance(model, betas[0], betas[1]);
  CAPTURE(want);
  REQUIRE(want > 0.2);
  REQUIRE(want < 0.95);
  const int runs = 24;
  double mean = 0, sq = 0;
  for (int r = 0; r < runs; ++r) {
    TemperParams p;
    p.ladder.shape = LadderShape::listed;
    p.ladder.temperatures = 2;
    p.ladder.betas = betas;
    p.sweeps = 3000;
    const auto s = temper(model, p, 77, static_cast<std::uint64_t>(r));
    REQUIRE(s.swap_acceptance.size() == 1);
    CHECK(s.swap_attempts == 3000);  // one attempt per pair after every sweep (header comment)
    mean += s.swap_acceptance[0] / runs;
    sq += s.swap_acceptance[0] * s.swap_acceptance[0] / runs;
  }
  const double error = std::sqrt((sq - mean * mean) * runs / (runs - 1) / runs);
  CAPTURE(mean);
  CAPTURE(error);
  CHECK(std::abs(mean - want) <= 4 * error);
}

// The best state on the same glass is the exact ground state (solve_exact), at a fixed budget
// and the default ladder (a wrong swap sign is caught by the rung means and the two-rung rate).
TEST_CASE("12-spin glass with fields: tempering finds the exact ground state") {
  const auto model = double_glass_12();
  const auto exact = solve_exact(model);
  REQUIRE(exact.ok());
  for (std::uint64_t seed = 1; seed <= 5; ++seed) {
    TemperParams p;
    p.sweeps = 200;
    const auto s = temper(model, p, seed);
    CHECK(s.energy == doctest::Approx(exact->energy).epsilon(1e-12));
  }
}
