// Annealing under a Budget (sweeps, deadline on an injected clock, stop token, target energy),
// observers, warm starts, schedules, and QUBO / dense models against exact enumeration.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/dense_model.hpp>

#include "support/anneal_graph.hpp"
#include "support/enumerate.hpp"

#include <cmath>
#include <cstdint>
#include <limits>
#include <vector>

using namespace spinwright;

namespace {

// A fake clock that advances by `tick` seconds at every read.
struct TickClock {
  double now = 0;
  double tick = 0;
  static double read(void* self) {
    auto* c = static_cast<TickClock*>(self);
    c->now += c->tick;
    return c->now;
  }
};

struct Recorder {
  std::vector<double> improvements;
  std::vector<std::uint64_t> improvement_sweeps;
  std::uint64_t progress_calls = 0;
  const StopToken* token_to_set = nullptr;
  StopToken* stop = nullptr;
  std::uint64_t stop_at = 0;
  void on_improvement(std::uint64_t sweep, double energy) {
    improvements.push_back(energy);
    improvement_sweeps.push_back(sweep);
  }
  void on_progress(std::uint64_t sweep, double) {
    ++progress_calls;
    if (stop != nullptr && sweep >= stop_at) stop->request_stop();
  }
};

template <class Model>
double exact_ground(const Model& model) {
  double best = std::numeric_limits<double>::infinity();
  test_support::for_each_assignment(static_cast<std::uint32_t>(model.num_spins()), [&](const std::int8_t* s) {
    const double e = static_cast<double>(model.energy(s));
    if (e < best) best = e;
  });
  return best;
}

template <class Value>
QuboModel<Value> random_qubo(std::uint32_t n, std::uint64_t seed) {
  Xoshiro256 rng(seed);
  QuboBuilder<Value> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_unary(i, static_cast<Value>(static_cast<int>(rng.below(201)) - 100));
    for (std::uint32_t j = i + 1; j < n; ++j) {
      if (rng.below(3) == 0) b.add_pair(i, j, static_cast<Value>(static_cast<int>(rng.below(201)) - 100));
    }
  }
  b.add_offset(static_cast<energy_t<Value>>(7));
  return b.build().value();
}

}  // namespace

TEST_CASE("budget: sweeps, deadline, stop token and target") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(400, 1));
  AnnealParams p;
  p.sweeps = 500;
  p.progress_every = 10;

  SUBCASE("the budget's sweeps override the parameters") {
    const auto s = anneal(model, p, 1, 0, Budget{}.with_sweeps(37));
    CHECK(s.sweeps == 37u);
    CHECK(s.attempted == 37u * 400u);
    CHECK(s.reason == StopReason::budget_exhausted);
  }
  SUBCASE("deadline on an injected clock, read once per sweep") {
    TickClock clock{0, 1.0};  // every read advances one second
    const Clock c{&TickClock::read, &clock};
    const auto s = anneal(model, p, 1, 0, Budget{}.with_time_limit(10.5, c));
    CHECK(s.reason == StopReason::deadline);
    // The limit counts from anneal()'s entry (read 1); advance() reads at its start (2) and
    // before every sweep; each sweep "takes" one second, so the sweep begun at 9 ends at 10, and
    // the one that would begin at 10 would end at 11 > 10.5: 8 sweeps (at 2, 3, ..., 9).
    CHECK(s.sweeps == 8u);
    CHECK(s.seconds > 10.0);
    CHECK(s.seconds <= 12.0);  // two reads after the last check: advance's end, the result
  }
  SUBCASE("a stop token set from an observer stops the run within one sweep") {
    StopToken token;
    Recorder rec;
    rec.stop = &token;
    rec.stop_at = 50;
    const auto s = anneal(model, p, 1, 0, Budget{}.with_stop(token), rec);
    CHECK(s.reason == StopReason::stopped);
    CHECK(s.sweeps == 50u);
    CHECK(rec.progress_calls == 5u);
  }
  SUBCASE("target energy: stops at the first sweep end at or below it") {
    const auto full = anneal(model, p, 1);
    const double target = static_cast<double>(full.energy) + 20;
    Recorder rec;
    const auto s = anneal(model, p, 1, 0, Budget{}.with_target(target), rec);
    CHECK(s.reason == StopReason::target_reached);
    CHECK(static_cast<double>(s.energy) <= target);
    CHECK(s.sweeps < full.sweeps);
    REQUIRE(!rec.improvements.empty());
    CHECK(rec.improvements.back() == static_cast<double>(s.energy));
    for (std::size_t k = 1; k < rec.improvements.size(); ++k) CHECK(rec.improvements[k] < rec.improvements[k - 1]);
    CHECK(rec.improvement_sweeps.back() == s.sweeps);
  }
}

TEST_CASE("schedules: geometric, linear, constant and a user function") {
  const auto model = anneal_support::maxcut_model<double>(anneal_support::random_cubic(100, 2));
  AnnealParams p;
  p.sweeps = 11;
  p.schedule = Schedule::geometric(0.1, 10.0);
  Annealer<IsingModel<double>> a(model, p, 1);
  CHECK(a.beta() == doctest::Approx(0.1));
  a.step(5);
  CHECK(a.beta() == doctest::Approx(1.0));  // f = 5/10: sqrt(0.1 * 10)
  a.step(5);
  CHECK(a.beta() == doctest::Approx(10.0));
  a.step(3);
  CHECK(a.beta() == doctest::Approx(10.0));  // past the end: stays at the end
  p.schedule = Schedule::linear(1.0, 3.0);
  Annealer<IsingModel<double>> b(model, p, 1);
  b.step(5);
  CHECK(b.beta() == doctest::Approx(2.0));
  auto cubic_ramp = [](double f) { return 0.5 + 4 * f * f * f; };
  p.schedule = Schedule::from(cubic_ramp);
  Annealer<IsingModel<double>> c(model, p, 1);
  c.step(5);
  CHECK(c.beta() == doctest::Approx(1.0));
  // Automatic range: documented rule.
  p.schedule = Schedule{};
  Annealer<IsingModel<double>> d(model, p, 1);
  const BetaSpan r = d.beta_span();
  CHECK(r.beta_start == doctest::Approx(std::log(2.0) / r.hot_delta));
  CHECK(r.beta_end == doctest::Approx(std::log(1000.0) / r.cold_delta));
  CHECK(r.cold_delta == doctest::Approx(2.0));  // Ising, smallest |J| = 1
  CHECK(d.beta() == doctest::Approx(r.beta_start));
}

TEST_CASE("warm start: the best is never worse than the start, and cold annealing keeps a ground state") {
  const auto model = anneal_support::square_lattice<std::int32_t>(16, -1);
  std::vector<std::int8_t> ground(256, -1);
  AnnealParams p;
  p.sweeps = 200;
  p.initial = ground.data();
  p.schedule = Schedule::constant(5.0);
  // The best includes the warm start, so it says nothing about the sweeps: the final state
  // must be checked too. At beta = 5 every uphill flip from the aligned state costs 8 and is
  // accepted with probability e^-40 < 1e-17 per attempt (Metropolis et al., J. Chem. Phys. 21,
  // 1087 (1953)): over 200 x 256 attempts the state stays where it started.
  Annealer<IsingModel<std::int32_t>> cold(model, p, 3);
  const auto s = cold.run();
  CHECK(s.energy == -512);  // all aligned: 2 bonds per spin, each -1 (common practice)
  CHECK(cold.state().energy() == -512);
  for (std::size_t i = 0; i < 256; ++i) CHECK(cold.state().spins()[i] == -1);
  // The default schedule starts hot (beta_start = ln 2 / hot_delta), melts the warm start and
  // cools to beta_end = ln 1000 / cold_delta, where an uphill flip of 8 is accepted with
  // probability 1e-12: the final state is a ground state or a stripe state (two straight walls
  // winding the torus, E = -512 + 2 * 2 * 16 = -448; common practice for quenched tori). A
  // kernel that does not cool ends near E = 0; one that never heats keeps -512 exactly (the
  // energy after the first sweep shows the melt).
  p.schedule = Schedule{};
  for (std::uint64_t seed = 3; seed < 7; ++seed) {
    CAPTURE(seed);
    Annealer<IsingModel<std::int32_t>> warm(model, p, seed);
    warm.step(1);
    const std::int64_t melted = warm.state().energy();
    CHECK(melted > -400);  // after one hot sweep (beta_start = ln 2 / 8): far from aligned
    const auto t = warm.run();
    CHECK(t.energy <= -512);
    CHECK(warm.state().energy() <= -448);
    CHECK(warm.state().check().exact);
  }
}

TEST_CASE("QUBO and dense models: annealing finds the exact ground state (enumeration)") {
  for (std::uint64_t seed = 1; seed <= 4; ++seed) {
    CAPTURE(seed);
    const auto q = random_qubo<std::int32_t>(18, seed);
    const double ground = exact_ground(q);
    AnnealParams p;
    p.sweeps = 2000;
    for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
      p.acceptance = rule;
      double best = std::numeric_limits<double>::infinity();
      for (std::uint64_t r = 0; r < 3; ++r) best = std::fmin(best, static_cast<double>(anneal(q, p, seed, r).energy));
      CHECK(best == ground);
      const auto dq = DenseQuboModel<double>::from(random_qubo<double>(18, seed)).value();
      best = std::numeric_limits<double>::infinity();
      for (std::uint64_t r = 0; r < 3; ++r) best = std::fmin(best, anneal(dq, p, seed, r).energy);
      CHECK(best == doctest::Approx(ground));
      const auto fq = random_qubo<float>(18, seed);
      best = std::numeric_limits<double>::infinity();
      for (std::uint64_t r = 0; r < 3; ++r) best = std::fmin(best, anneal(fq, p, seed, r).energy);
      CHECK(best == doctest::Approx(ground));
    }
  }
}

TEST_CASE("a tiny acceptance table falls back to the log comparison with the same statistics") {
  // The 4x4 periodic ferromagnet at T = 2.5: exact u = -1.37911648226 (REFERENCES.md section 3,
  // from the exact density of states). A table of 2 entries forces the fallback for |delta| > 4.
  const auto model = anneal_support::square_lattice<std::int64_t>(4, -1);
  AnnealParams p;
  p.schedule = Schedule::constant(1 / 2.5);
  p.table_limit = 2;
  p.sweeps = 200000;
  Annealer<IsingModel<std::int64_t>> a(model, p, 5);
  a.step(1000);
  const int bins = 100, per = 2000;
  std::vector<double> means(bins, 0.0);
  for (std::size_t b = 0; b < means.size(); ++b) {
    for (int k = 0; k < per; ++k) {
      a.step(1);
      means[b] += static_cast<double>(a.state().energy()) / 16.0;
    }
    means[b] /= per;
  }
  double mean = 0, var = 0;
  for (double m : means) mean += m / bins;
  for (double m : means) var += (m - mean) * (m - mean) / (bins - 1);
  const double err = std::sqrt(var / bins);
  CAPTURE(mean);
  CAPTURE(err);
  CHECK(std::fabs(mean - (-1.37911648226)) <= 4 * err);
}
