// Breakout local search (kernels/breakout.hpp) and the tabu walk's hooks it runs on: ground
// states against exact enumeration, energies recomputed term by term, the tabu tenure,
// determinism, and published optima and best-known cuts reached within a fixed sweep budget.
#include <doctest/doctest.h>
#include <spinwright/kernels/breakout.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/parallel/breakout_threads.hpp>
#include <spinwright/problems/graph_families.hpp>
#include <spinwright/problems/max_cut.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <string>
#include <vector>

#include "support/temper_graph.hpp"

using namespace spinwright;

namespace {

struct Term {
  std::uint32_t i;
  std::uint32_t j;  // == i: a unary term
  std::int32_t q;
};

// The QUBO energy sum_terms q x_i x_j, x = (1 - s) / 2, counted term by term (common practice).
std::int64_t qubo_energy(const std::vector<Term>& terms, const std::vector<std::int8_t>& s) {
  std::int64_t e = 0;
  for (const auto& t : terms) {
    const int xi = s[t.i] < 0 ? 1 : 0;
    const int xj = s[t.j] < 0 ? 1 : 0;
    e += static_cast<std::int64_t>(t.q) * xi * xj;
  }
  return e;
}

std::vector<Term> random_terms(std::uint32_t n, std::uint32_t pairs, Xoshiro256& rng) {
  std::vector<Term> t;
  for (std::uint32_t i = 0; i < n; ++i) t.push_back({i, i, static_cast<int>(rng.below(41)) - 20});
  for (std::uint32_t k = 0; k < pairs; ++k) {
    const std::uint32_t i = rng.below(n);
    const std::uint32_t j = rng.below(n);
    if (i != j) t.push_back({i, j, static_cast<int>(rng.below(41)) - 20});
  }
  return t;
}

QuboModel<std::int32_t> qubo_of(std::uint32_t n, const std::vector<Term>& terms) {
  QuboBuilder<std::int32_t> b(n);
  for (const auto& t : terms) {
    if (t.i == t.j) {
      b.add_unary(t.i, t.q);
    } else {
      b.add_pair(t.i, t.j, t.q);
    }
  }
  return b.build().value();
}

// Cut weight of a spin state counted edge by edge on the graph (common practice).
std::int64_t cut_of(const std::vector<WeightedEdge<std::int32_t>>& edges, const std::vector<std::int8_t>& s) {
  std::int64_t c = 0;
  for (const auto& e : edges)
    if (s[e.u] != s[e.v]) c += e.weight;
  return c;
}

}  // namespace

// Ground energies by exhaustive enumeration (kernels/exact.hpp, itself checked against brute force).
TEST_CASE("random QUBOs, sparse and dense storage: breakout reaches the exact ground energy") {
  Xoshiro256 rng(4242);
  for (int trial = 0; trial < 6; ++trial) {
    const std::uint32_t n = 14 + rng.below(7);
    const auto terms = random_terms(n, trial % 2 == 0 ? 2 * n : n * (n - 1) / 2, rng);
    const auto q = qubo_of(n, terms);
    const auto exact = solve_exact(q);
    REQUIRE(exact.ok());
    BreakoutParams p;
    p.sweeps = 300;
    const auto s = breakout(q, p, 7, static_cast<std::uint64_t>(trial));
    CHECK(s.energy == exact->energy);
    CHECK(qubo_energy(terms, s.spins) == s.energy);
    const auto dq = DenseQuboModel<std::int32_t>::from(q).value();
    const auto sd = breakout(dq, p, 7, static_cast<std::uint64_t>(trial));
    CHECK(sd.energy == exact->energy);
    CHECK(qubo_energy(terms, sd.spins) == sd.energy);
  }
}

// Max cut of small +-1 planar-type and toroidal graphs against enumeration.
TEST_CASE("small +-1 graphs of the generated families: the exact maximum cut") {
  for (std::uint64_t seed = 1; seed <= 3; ++seed) {
    const auto torus = toroidal_graph(4, 5, EdgeWeights::plus_minus_one, seed);
    const auto planar = planar_type_graph(18, EdgeWeights::plus_minus_one, seed);
    for (const auto* edges : {&torus, &planar}) {
      const std::uint32_t n = edges == &torus ? 20 : 18;
      const auto problem = MaxCutProblem<std::int32_t>::encode(n, *edges).value();
      const auto exact = solve_exact(problem.model());
      REQUIRE(exact.ok());
      BreakoutParams p;
      p.sweeps = 300;
      const auto s = breakout(problem.model(), p, seed);
      CHECK(s.energy == exact->energy);
      CHECK(cut_of(*edges, s.spins) == cut_from_energy(problem.total_weight(), exact->energy));
    }
  }
}

TEST_CASE("graph families: sizes and weights as documented") {
  const auto t = toroidal_graph(10, 12, EdgeWeights::ones, 3);
  CHECK(t.size() == 240);  // 2 rows cols edges
  const auto r = random_graph(100, 0.1, EdgeWeights::plus_minus_one, 3);
  CHECK(r.size() == 495);  // round(0.1 * 100 * 99 / 2)
  int plus = 0;
  for (const auto& e : r) {
    CHECK((e.weight == 1 || e.weight == -1));
    plus += e.weight > 0;
  }
  CHECK(plus > 200);
  CHECK(plus < 295);
  const auto p = planar_type_graph(200, EdgeWeights::ones, 3);
  CHECK(p.size() > 3 * 200);             // two near-maximal planar graphs, merged
  CHECK(p.size() <= 2 * (3 * 200 - 6));  // each planar: at most 3 n - 6 edges (Euler's formula)
  CHECK(random_graph(100, 0.1, EdgeWeights::ones, 9).size() == 495);
  CHECK(planar_type_graph(200, EdgeWeights::ones, 3).size() == p.size());  // same seed, same graph
}

// Tabu rule (F. Glover, ORSA J. Comput. 1(3), 1989): a flipped spin is not flipped back for the
// next `tenure` moves unless that gives a new best (aspiration).
TEST_CASE("tabu hooks: the tenure is honoured, aspiration aside") {
  IsingBuilder<std::int32_t> b(10);
  b.add_field(0, 10);  // E = sum h s: spin 0 wants -1; spins 1..9 are free (delta 0)
  const auto m = b.build().value();
  TabuParams tp;
  tp.tenure = 4;
  tp.stagnation = ~std::uint64_t{0};
  std::vector<std::int8_t> start(10, 1);
  start[0] = -1;
  tp.initial = start.data();
  TabuWalker<IsingModel<std::int32_t>> w(m, tp, 1);
  REQUIRE(w.tenure() == 4);
  REQUIRE(w.best_energy() == -10);
  w.forced_move(0);  // now +1: flipping back is the best move (delta -20), but tabu
  CHECK(w.state().spin(0) == 1);
  CHECK(w.least_delta() == -20);
  for (int k = 0; k < 4; ++k) {
    CHECK(w.is_tabu(0));
    w.tabu_move();
    CHECK(w.state().spin(0) == 1);
  }
  CHECK(!w.is_tabu(0));
  w.tabu_move();
  CHECK(w.state().spin(0) == -1);
  CHECK(w.state().energy() == m.energy(w.state().spins()));
  // Descent ignores the tabu list and stops at a local minimum.
  w.forced_move(0);
  CHECK(w.descent_move());
  CHECK(w.state().spin(0) == -1);
  CHECK(!w.descent_move());
}

TEST_CASE("determinism for a seed, exact state, counters") {
  const auto edges = planar_type_graph(300, EdgeWeights::plus_minus_one, 5);
  const auto problem = MaxCutProblem<std::int32_t>::encode(300, edges).value();
  const auto& m = problem.model();
  BreakoutParams p;
  p.sweeps = 50;
  BreakoutSearch<IsingModel<std::int32_t>> a(m, p, 11);
  BreakoutSearch<IsingModel<std::int32_t>> c(m, p, 11);
  a.advance();
  c.advance();
  CHECK(a.sweeps_done() == 50);
  CHECK(a.moves_done() == 50 * 300);
  CHECK(a.local_minima() > 0);
  CHECK(a.directed_jumps() + a.random_jumps() == a.local_minima());
  CHECK(a.jump_length() >= a.least_jump());
  CHECK(a.jump_length() <= a.largest_jump());
  const auto sa = a.solution();
  const auto sc = c.solution();
  CHECK(sa.spins == sc.spins);
  CHECK(sa.energy == sc.energy);
  CHECK(problem.total_weight() - 2 * cut_of(edges, sa.spins) == sa.energy);
  const auto check = a.state().check();
  CHECK(check.energy_error == 0);
  // Another seed takes another path.
  BreakoutSearch<IsingModel<std::int32_t>> d(m, p, 12);
  d.advance();
  CHECK(d.solution().spins != sa.spins);
  // reset() after the same history gives the same run again.
  a.reset(11, 2);
  c.reset(11, 2);
  a.advance();
  c.advance();
  CHECK(a.solution().spins == c.solution().spins);
  CHECK(a.solution().restart == 2);
  // Arena constructor: the same run in caller memory.
  std::vector<unsigned char> mem(BreakoutSearch<IsingModel<std::int32_t>>::bytes_needed(m, p) + 256);
  Arena arena(mem.data(), mem.size());
  BreakoutSearch<IsingModel<std::int32_t>> e(m, p, arena, 11);
  REQUIRE(e.valid());
  e.advance();
  CHECK(e.best().energy == sa.energy);
}

// Published values: Beasley's bqp500 best-known objectives (OR-Library, J. E. Beasley 1998) and
// the G11 best-known cut of Benlic & Hao (Eng. Appl. Artif. Intell. 26, 2013), read from
// shared/data/maxcut/reference.csv; reached within fixed sweep budgets (seed 1).
TEST_CASE("published values within a sweep budget") {
  struct Case {
    const char* name;
    std::uint64_t sweeps;
  };
  for (const Case c : {Case{"bqp500-1", 400}, Case{"bqp500-2", 400}, Case{"bqp500-3", 400}, Case{"G11", 20000}}) {
    const auto m = test_support::load_maxcut<std::int32_t>(c.name);
    const std::int64_t ref = test_support::reference_cut(test_support::maxcut_path("reference.csv"), c.name);
    const std::int64_t w = total_weight(m);
    Budget budget = Budget{}.with_target(static_cast<double>(energy_from_cut(w, ref)));
    budget.sweeps = c.sweeps;
    const auto s = breakout(m, BreakoutParams{}, 1, 0, budget);
    INFO(std::string(c.name));
    CHECK(s.reason == StopReason::target_reached);
    CHECK(cut_value(m, s.spins.data()) == ref);
  }
}

// The automatic-choice predicate as documented in kernels/breakout.hpp (densities of the shared
// instances: bqp500-1 12871 pairs of 125250, G11 1600 of 319600).
TEST_CASE("breakout_fits and breakout_auto") {
  const auto bqp = test_support::load_maxcut<std::int32_t>("bqp500-1");
  const auto g11 = test_support::load_maxcut<std::int32_t>("G11");
  CHECK(breakout_fits(bqp));
  CHECK(!breakout_fits(g11));
  Xoshiro256 rng(3);
  const auto small = qubo_of(20, random_terms(20, 190, rng));
  CHECK(!breakout_fits(small));  // exact enumeration's size
  const auto big = qubo_of(40, random_terms(40, 10, rng));
  CHECK(!breakout_fits(big));
  CHECK(breakout_fits(DenseQuboModel<std::int32_t>::from(big).value()));
  // A time limit with no sweep count fills the time: a clock that advances 1 ms per reading.
  struct Ticks {
    double now = 0;
    static double read(void* self) {
      auto* t = static_cast<Ticks*>(self);
      t->now += 0.001;
      return t->now;
    }
  } ticks;
  const auto s = breakout_auto(g11, 1, 0, Budget{}.with_time_limit(0.05, Clock{&Ticks::read, &ticks}));
  CHECK(s.reason == StopReason::deadline);
  CHECK(s.sweeps >= 40);
  CHECK(cut_value(g11, s.spins.data()) == cut_from_energy(total_weight(g11), s.energy));
  const auto f = breakout_auto(g11, 1, 0, Budget{}.with_sweeps(3));
  CHECK(f.sweeps == 3);
}

// Cooperating searches (parallel/breakout_threads.hpp): the same result for the same (seed,
// threads) under a sweep budget; every thread count reaches the bqp500-3 best-known value
// (Beasley's OR-Library, 1998) within a sweep budget; the energy is that of the returned spins.
TEST_CASE("breakout threads: determinism for (seed, threads) and a published value") {
  const auto edges = planar_type_graph(400, EdgeWeights::plus_minus_one, 8);
  const auto problem = MaxCutProblem<std::int32_t>::encode(400, edges).value();
  CooperationParams cp;
  cp.round_sweeps = 5;
  cp.patience = 1;
  const auto a = breakout_threads(problem.model(), cp, 2, 3, Budget{}.with_sweeps(40));
  const auto b = breakout_threads(problem.model(), cp, 2, 3, Budget{}.with_sweeps(40));
  CHECK(a.spins == b.spins);
  CHECK(a.sweeps == 40);
  CHECK(a.attempted == 2 * 40 * 400);
  CHECK(problem.total_weight() - 2 * cut_of(edges, a.spins) == a.energy);
  const auto bqp = test_support::load_maxcut<std::int32_t>("bqp500-3");
  const std::int64_t ref = test_support::reference_cut(test_support::maxcut_path("reference.csv"), "bqp500-3");
  const std::int64_t w = total_weight(bqp);
  for (unsigned threads : {1u, 2u, 3u}) {
    Budget budget = Budget{}.with_target(static_cast<double>(energy_from_cut(w, ref)));
    budget.sweeps = 400;
    const auto s = breakout_threads(bqp, CooperationParams{}, threads, 1, budget);
    CHECK(s.reason == StopReason::target_reached);
    CHECK(cut_value(bqp, s.spins.data()) == ref);
  }
}
