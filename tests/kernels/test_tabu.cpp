// Tabu search: ground states against exact enumeration and published facts, the move rule
// (best non-tabu move, aspiration), determinism, stop and target.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <string>
#include <vector>

#include "support/temper_graph.hpp"

using namespace spinwright;
using test_support::Graph;

namespace {

Graph pm_torus(std::uint32_t L, std::uint64_t seed) {
  Graph g = test_support::torus(L, 1);
  Xoshiro256 rng(seed);
  for (auto& e : g.edges) e.w = rng.coin() ? 1 : -1;
  return g;
}

template <class Value>
QuboModel<Value> random_qubo(std::uint32_t n, std::uint32_t pairs, Xoshiro256& rng) {
  QuboBuilder<Value> qb(n);
  for (std::uint32_t i = 0; i < n; ++i) qb.add_unary(i, static_cast<Value>(static_cast<int>(rng.below(41)) - 20));
  for (std::uint32_t k = 0; k < pairs; ++k) {
    qb.add_pair(rng.below(n), rng.below(n), static_cast<Value>(static_cast<int>(rng.below(41)) - 20));
  }
  return qb.build().value();
}

}  // namespace

TEST_CASE_TEMPLATE("random QUBOs, sparse and dense: tabu reaches the exact ground energy", Value, std::int32_t,
                   std::int64_t, double, float) {
  Xoshiro256 rng(2718);
  for (int trial = 0; trial < 6; ++trial) {
    const std::uint32_t n = 14 + rng.below(7);
    const auto q = random_qubo<Value>(n, trial % 2 == 0 ? 2 * n : n * (n - 1) / 2, rng);
    const auto exact = solve_exact(q);
    REQUIRE(exact.ok());
    TabuParams p;
    p.sweeps = 200;
    const auto s = tabu_walk(q, p, 5, static_cast<std::uint64_t>(trial));
    CHECK(static_cast<double>(s.energy) == doctest::Approx(static_cast<double>(exact->energy)));
    CHECK(static_cast<double>(q.energy(s.spins.data())) == doctest::Approx(static_cast<double>(s.energy)));
    const auto dq = DenseQuboModel<Value>::from(q).value();
    const auto sd = tabu_walk(dq, p, 5, static_cast<std::uint64_t>(trial));
    CHECK(static_cast<double>(sd.energy) == doctest::Approx(static_cast<double>(exact->energy)));
    // Same seed, same model in the other storage: the same moves (ties go to the lower index in both).
    CHECK(sd.spins == s.spins);
  }
}

// Max-cut facts (common practice; reference sheet section 5).
TEST_CASE("max-cut facts") {
  auto cut_of = [](const Graph& g) {
    const auto m = test_support::ising_of<std::int32_t, std::uint16_t>(g);
    TabuParams p;
    p.sweeps = 200;
    const auto s = tabu_walk(m, p, 3);
    return cut_value(m, s.spins.data());
  };
  for (std::uint32_t n = 3; n <= 16; ++n) CHECK(cut_of(test_support::complete(n)) == (n * n) / 4);
  for (std::uint32_t n = 3; n <= 21; ++n) CHECK(cut_of(test_support::cycle(n)) == (n % 2 == 0 ? n : n - 1));
  CHECK(cut_of(test_support::petersen()) == 12);
}

// 4x4 and 6x6 ferromagnets (ground energy -2N; reference sheet section 3) and a 5x5 +-J glass
// against enumeration.
TEST_CASE("lattices") {
  const auto f4 = test_support::ising_of<double>(test_support::torus(4, -1));
  CHECK(tabu_walk(f4, TabuParams{}, 1).energy == -32.0);
  const auto f6 = test_support::ising_of<float>(test_support::torus(6, -1));
  CHECK(tabu_walk(f6, TabuParams{}, 1).energy == -72.0);
  const auto g = test_support::ising_of<std::int64_t>(pm_torus(5, 2024));
  const auto exact = solve_exact(g);
  REQUIRE(exact.ok());
  CHECK(tabu_walk(g, TabuParams{}, 1).energy == exact->energy);
}

// The move rule, checked move by move against a plain scan: the chosen spin has the least delta
// among the non-tabu spins (ties broken at random), unless a tabu spin gives a new best
// (aspiration), and the tabu list holds the last `tenure` flipped spins.
TEST_CASE("each move is the best admissible one-flip move") {
  Xoshiro256 rng(0);
  IsingBuilder<std::int32_t> b(24);
  for (int i = 0; i < 24; ++i) b.add_field(i, static_cast<int>(rng.below(11)) - 5);
  for (int k = 0; k < 80; ++k) b.add_coupling(rng.below(24), rng.below(24), static_cast<int>(rng.below(21)) - 10);
  const auto q = b.build().value();
  TabuParams p;
  p.tenure = 8;
  p.tenure_spread = 0;
  p.stagnation = 1000000;  // no perturbation during the check
  TabuWalker<IsingModel<std::int32_t>> t(q, p, 8);
  REQUIRE(t.tenure() == 8);
  std::vector<std::uint64_t> last(24, 0);  // 1 + move number of the last flip of each spin
  std::int64_t best = t.state().energy();
  int aspirations = 0;
  for (std::uint64_t m = 0; m < 3000; ++m) {
    const std::vector<std::int8_t> before(t.state().spins(), t.state().spins() + 24);
    const std::int64_t e = t.state().energy();
    std::int64_t best_free = 0;
    int i_free = -1;
    std::int64_t best_tabu = 0;
    int i_tabu = -1;
    for (std::size_t i = 0; i < 24; ++i) {
      const std::int64_t d = t.state().delta(static_cast<std::uint32_t>(i));
      const bool tabu = last[i] != 0 && m < last[i] - 1 + 8 + 1;
      if (tabu) {
        if (i_tabu < 0 || d < best_tabu) best_tabu = d, i_tabu = static_cast<int>(i);
      } else if (i_free < 0 || d < best_free) {
        best_free = d, i_free = static_cast<int>(i);
      }
    }
    bool aspiration = false;
    if (i_tabu >= 0 && (i_free < 0 || best_tabu < best_free) && e + best_tabu < best) {
      aspiration = true;
      ++aspirations;
    }
    std::vector<std::int64_t> deltas(24);
    for (std::size_t i = 0; i < 24; ++i) deltas[i] = t.state().delta(static_cast<std::uint32_t>(i));
    t.step_moves(1);
    std::size_t flipped = 0;  // read only once exactly one spin changed
    int changed = 0;
    for (std::size_t i = 0; i < 24; ++i) {
      if (t.state().spin(static_cast<std::uint32_t>(i)) != before[i]) {
        flipped = i;
        ++changed;
      }
    }
    REQUIRE(changed == 1);
    const bool was_tabu = last[flipped] != 0 && m < last[flipped] - 1 + 8 + 1;
    REQUIRE(was_tabu == aspiration);
    REQUIRE(deltas[flipped] == (aspiration ? best_tabu : best_free));
    REQUIRE(t.state().energy() == e + deltas[flipped]);
    last[flipped] = m + 1;
    if (t.state().energy() < best) best = t.state().energy();
  }
  CHECK(t.best().energy == best);
  CHECK(aspirations > 0);  // the rule was exercised
}

TEST_CASE("determinism, perturbations, state exactness") {
  const auto m = test_support::ising_of<double>(pm_torus(8, 3));
  TabuParams p;
  p.sweeps = 300;
  p.stagnation = 500;
  const auto a = tabu_walk(m, p, 42, 1);
  const auto b = tabu_walk(m, p, 42, 1);
  CHECK(a.spins == b.spins);
  CHECK(a.energy == b.energy);
  TabuWalker<IsingModel<double>> t(m, p, 42, 1);
  t.step(300);
  CHECK(t.perturbations() > 0);
  CHECK(t.moves_done() == 300 * 64);
  CHECK(t.state().check().max_field_error < 1e-9);
  CHECK(t.best().energy == a.energy);
  CHECK(m.energy(t.best().spins) == doctest::Approx(a.energy));
}

namespace {
struct StopAt {
  StopToken* token;
  std::uint64_t at;
  void on_progress(std::uint64_t sweep, double) {
    if (sweep == at) token->request_stop();
  }
};
}  // namespace

TEST_CASE("stop token and target stop a run") {
  const auto m = test_support::ising_of<std::int32_t>(pm_torus(6, 5));
  TabuParams p;
  p.sweeps = 100000;
  p.progress_every = 1;
  StopToken token;
  StopAt obs{&token, 4};
  const auto s = tabu_walk(m, p, 1, 0, Budget{}.with_stop(token), obs);
  CHECK(s.reason == StopReason::stopped);
  CHECK(s.sweeps == 4);

  const auto ferro = test_support::ising_of<std::int32_t>(test_support::torus(6, -1));
  const auto t = tabu_walk(ferro, p, 1, 0, Budget{}.with_target(-72));
  CHECK(t.reason == StopReason::target_reached);
  CHECK(t.energy == -72);
  CHECK(t.sweeps < 100000);
}

// OR-Library bqp250 instances in max-cut form (J. E. Beasley, J. Oper. Res. Soc. 41, 1069-1072,
// 1990; instances from Beasley 1998); proven optima from shared/data/maxcut/reference.csv.
// A generous fixed budget of 1000 sweeps (the run stops early at the optimum).
TEST_CASE("bqp250 instances: tabu search reaches the proven optimum cut") {
  for (int k = 1; k <= 5; ++k) {
    const std::string name = "bqp250-" + std::to_string(k);
    const auto m = test_support::load_maxcut<std::int32_t>(name);
    const std::int64_t ref = test_support::reference_cut(test_support::maxcut_path("reference.csv"), name);
    REQUIRE(ref > 0);
    const std::int64_t w = total_weight(m);
    TabuParams p;
    const auto s =
        tabu_walk(m, p, 2026, 0, Budget{}.with_sweeps(1000).with_target(static_cast<double>(energy_from_cut(w, ref))));
    CHECK(cut_value(m, s.spins.data()) == ref);
    CHECK(cut_from_energy(w, s.energy) == ref);
  }
}

// Properties of the trajectory alone, without re-deriving each choice (a second path beside
// the move-by-move check above). Tabu rule and aspiration as defined by F. Glover, ORSA J.
// Comput. 1, 190 (1989): a spin flipped at move m is tabu for the next `tenure` moves, unless
// flipping it gives an energy below the best found so far. So on the record of flips:
//  * a spin flipped again within `tenure` moves of its last flip reached a new best then;
//  * with 9 spins and tenure 8 one spin is free at a time, so the shortest gap of a plain re-flip is
//    exactly tenure + 1: neither tenure (one too short) nor tenure + 2 (one too long);
//  * on a random glass the search does use aspiration now and then.
TEST_CASE("tabu trajectory: re-flips inside the tenure only at new bests, shortest plain gap tenure + 1") {
  for (const std::uint32_t n : {9u, 24u}) {
    CAPTURE(n);
    Xoshiro256 rng(40 + n);
    IsingBuilder<std::int32_t> b(n);
    for (std::uint32_t i = 0; i < n; ++i) b.add_field(i, static_cast<int>(rng.below(11)) - 5);
    for (std::uint32_t k = 0; k < 4 * n; ++k) {
      // One draw per statement: the order of a call's arguments is unspecified (and differs
      // between GCC and Clang), and the model must be the same for every compiler.
      const int w = static_cast<int>(rng.below(21)) - 10;
      const std::uint32_t j = rng.below(n);
      const std::uint32_t i = rng.below(n);
      b.add_coupling(i, j, w);
    }
    const auto q = b.build().value();
    const std::size_t tenure = 8;
    TabuParams p;
    p.tenure = tenure;
    p.tenure_spread = 0;
    p.stagnation = 1000000;  // one cycle: no perturbation resets the list
    TabuWalker<IsingModel<std::int32_t>> t(q, p, 5);
    REQUIRE(t.tenure() == tenure);
    std::vector<std::uint64_t> last(n, 0);  // 1 + move of the last flip
    std::int64_t best = t.state().energy();
    std::uint64_t shortest_plain = ~std::uint64_t{0};
    int inside = 0;
    for (std::uint64_t m = 0; m < 4000; ++m) {
      std::vector<std::int8_t> before(t.state().spins(), t.state().spins() + n);
      t.step_moves(1);
      std::uint32_t flipped = n;
      for (std::uint32_t i = 0; i < n; ++i) {
        if (t.state().spin(i) != before[i]) flipped = i;
      }
      REQUIRE(flipped < n);
      const std::int64_t e = t.state().energy();
      const bool new_best = e < best;
      if (last[flipped] != 0) {
        const std::uint64_t gap = m + 1 - last[flipped];
        if (gap <= tenure) {
          CHECK(new_best);
          ++inside;
        } else if (gap < shortest_plain) {
          shortest_plain = gap;
        }
      }
      last[flipped] = m + 1;
      if (new_best) best = e;
    }
    CHECK(shortest_plain == tenure + 1);
    if (n == 24) CHECK(inside > 0);
  }
}

// The automatic tenures (TabuTenure, kernels/tabu.hpp), drawn once per cycle: tenth is
// max(N / 10, min(N / 4, 10)) plus [0, that / 2]; hundredth is N / 100 plus [1, 10]; by_density
// (the default) is hundredth from pair density 0.08 on, tenth below. Over many cycles every
// draw lies in its range and both ends are drawn; an explicit spread overrides the rule's, an
// explicit tenure overrides both.
TEST_CASE("automatic tabu tenures: the two rules and their ranges") {
  Xoshiro256 rng(3);
  const auto q = random_qubo<std::int32_t>(1000, 3000, rng);
  struct Case {
    TabuTenure rule;
    std::size_t spread;
    std::size_t low, high;
  };
  for (const Case c : {Case{TabuTenure::tenth, 0, 100, 150}, Case{TabuTenure::hundredth, 0, 11, 20},
                       Case{TabuTenure::hundredth, 4, 11, 15}, Case{TabuTenure::by_density, 0, 100, 150}}) {
    TabuParams p;
    p.tenure_rule = c.rule;
    p.tenure_spread = c.spread;
    TabuWalker<QuboModel<std::int32_t>> t(q, p, 5);
    std::size_t lo = t.tenure();
    std::size_t hi = t.tenure();
    for (int k = 0; k < 400; ++k) {
      t.new_cycle();
      CHECK(t.tenure() >= c.low);
      CHECK(t.tenure() <= c.high);
      lo = t.tenure() < lo ? t.tenure() : lo;
      hi = t.tenure() > hi ? t.tenure() : hi;
    }
    CHECK(lo == c.low);
    CHECK(hi == c.high);
  }
  CHECK(TabuParams{}.tenure_rule == TabuTenure::by_density);
  // Dense: 200 spins, 5000 random pairs (about 4400 distinct: density about 0.22, above 0.08).
  const auto dense = random_qubo<std::int32_t>(200, 5000, rng);
  REQUIRE(static_cast<double>(dense.num_pairs()) >= tabu_dense_threshold * 200 * 199 / 2);
  TabuWalker<QuboModel<std::int32_t>> d(dense, TabuParams{}, 7);
  std::size_t lo = d.tenure();
  std::size_t hi = d.tenure();
  for (int k = 0; k < 400; ++k, d.new_cycle()) {
    lo = d.tenure() < lo ? d.tenure() : lo;
    hi = d.tenure() > hi ? d.tenure() : hi;
  }
  CHECK(lo == 3);  // 200 / 100 + 1
  CHECK(hi == 12);
  TabuParams fixed;
  fixed.tenure_rule = TabuTenure::hundredth;
  fixed.tenure = 7;  // explicit: no spread unless given
  TabuWalker<QuboModel<std::int32_t>> t(q, fixed, 6);
  for (int k = 0; k < 20; ++k, t.new_cycle()) CHECK(t.tenure() == 7);
}
