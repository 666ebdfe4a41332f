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
  for (double a : s.swap_acceptance) {
    CHECK(a >= 0.0);
    CHECK(a <= 1.0);
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
  for (double a : s.swap_acceptance) {
    CHECK(a >= 0.0);
    CHECK(a <= 1.0);
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
