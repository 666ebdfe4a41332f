// Descent: results are local minima of the move's neighbourhood, polishing never raises the
// energy, and on complete graphs every single-flip local minimum is a maximum cut.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/problems/max_cut.hpp>
#include <spinwright/moves/count_keeping_swap.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <string>
#include <vector>

using namespace spinwright;

namespace {

// True when no single flip lowers the energy of `spins` (recomputed from a fresh state).
template <class Model>
bool is_single_flip_minimum(const Model& model, const std::vector<std::int8_t>& spins, double tolerance = 0) {
  SpinState<Model> s(model);
  s.set_spins(spins.data());
  for (std::size_t i = 0; i < model.num_spins(); ++i) {
    if (static_cast<double>(s.delta(static_cast<typename Model::index_type>(i))) < -tolerance) return false;
  }
  return true;
}

template <class Value>
QuboModel<Value> random_qubo(std::uint32_t n, std::uint64_t seed) {
  Xoshiro256 rng(seed);
  QuboBuilder<Value> b(n);
  for (std::uint32_t i = 0; i < n; ++i) {
    b.add_unary(i, static_cast<Value>(static_cast<int>(rng.below(41)) - 20));
    for (std::uint32_t j = i + 1; j < n; ++j) {
      if (rng.below(4) == 0) b.add_pair(i, j, static_cast<Value>(static_cast<int>(rng.below(41)) - 20));
    }
  }
  return b.build().value();
}

}  // namespace

TEST_CASE("descent ends at a single-flip local minimum, both rules, every model kind") {
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/bqp250-1.txt");
  REQUIRE(g.ok);
  const auto bqp = anneal_support::maxcut_model<std::int32_t>(g);
  const auto cubic = anneal_support::maxcut_model<double>(anneal_support::random_cubic(2000, 7));
  const auto qubo = random_qubo<float>(60, 3);
  const auto dense = DenseQuboModel<float>::from(qubo).value();
  for (const DescentRule rule : {DescentRule::steepest, DescentRule::first_improvement}) {
    CAPTURE(static_cast<int>(rule));
    DescentParams p;
    p.rule = rule;
    for (std::uint64_t r = 0; r < 3; ++r) {
      const auto a = descend(bqp, p, 1, r);
      CHECK(is_single_flip_minimum(bqp, a.spins));
      CHECK(a.energy == bqp.energy(a.spins.data()));
      const auto b = descend(cubic, p, 2, r);
      CHECK(is_single_flip_minimum(cubic, b.spins, 1e-9));
      const auto c = descend(qubo, p, 3, r);
      CHECK(is_single_flip_minimum(qubo, c.spins, 1e-9));
      const auto d = descend(dense, p, 3, r);
      CHECK(is_single_flip_minimum(dense, d.spins, 1e-9));
      CHECK(d.spins == c.spins);  // same start, same enumeration order, same path
    }
  }
}

TEST_CASE("on K_n every single-flip local minimum is a maximum cut") {
  // K_n (unit weights): moving one vertex from a side of size a changes the cut by
  // n - 2a + 1, so a cut is a local maximum exactly when it is balanced, and balanced cuts
  // reach floor(n^2/4), the max cut of K_n (Mantel/Turan; common practice, REFERENCES.md s.5).
  for (std::uint32_t n = 2; n <= 30; ++n) {
    CAPTURE(n);
    const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::complete_graph(n));
    const auto w = total_weight(model);
    for (const DescentRule rule : {DescentRule::steepest, DescentRule::first_improvement}) {
      DescentParams p;
      p.rule = rule;
      const auto s = descend(model, p, 5, n);
      CHECK(cut_from_energy(w, s.energy) == (n * n) / 4);
    }
  }
}

TEST_CASE("polishing never raises the energy") {
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/bqp250-2.txt");
  REQUIRE(g.ok);
  const auto model = anneal_support::maxcut_model<std::int64_t>(g);
  const auto fmodel = anneal_support::maxcut_model<double>(g);
  AnnealParams ap;
  for (const std::uint64_t sweeps : {1u, 3u, 10u, 100u}) {
    ap.sweeps = sweeps;
    for (std::uint64_t r = 0; r < 4; ++r) {
      const auto s = anneal(model, ap, 8, r);
      for (const DescentRule rule : {DescentRule::steepest, DescentRule::first_improvement}) {
        const auto p = polish(model, s, rule);
        CHECK(p.energy <= s.energy);
        CHECK(is_single_flip_minimum(model, p.spins));
        CHECK(p.sweeps >= s.sweeps);
        CHECK(p.restart == s.restart);
        // Polishing a local minimum changes nothing.
        const auto again = polish(model, p, rule);
        CHECK(again.spins == p.spins);
        CHECK(again.energy == p.energy);
      }
      const auto fs = anneal(fmodel, ap, 8, r);
      CHECK(polish(fmodel, fs).energy <= fs.energy);
    }
  }
}

TEST_CASE("the stepping form equals the one-call form; same seed, same result; budgets") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(500, 11));
  DescentParams p;
  const auto one = descend(model, p, 42, 1);
  CHECK(one.spins == descend(model, p, 42, 1).spins);
  Descender<IsingModel<std::int32_t>> d(model, p, 42, 1);
  std::uint64_t moves = 0;
  while (!d.done()) moves += d.step(1);
  CHECK(d.solution().spins == one.spins);
  CHECK(moves == one.accepted);
  CHECK(d.energy() == one.energy);
  // A budget of one pass stops after one pass.
  Descender<IsingModel<std::int32_t>> e(model, p, 42, 1);
  const auto cut_short = e.run(Budget{}.with_sweeps(1));
  CHECK(cut_short.sweeps == 1u);
  CHECK(cut_short.energy >= one.energy);
  // A target at or above the start stops at once.
  Descender<IsingModel<std::int32_t>> f(model, p, 42, 1);
  const auto at_target = f.run(Budget{}.with_target(1e18));
  CHECK(at_target.reason == StopReason::target_reached);
  CHECK(at_target.sweeps == 0u);
}

TEST_CASE("exchange descent keeps the cardinality and ends at an exchange local minimum") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(200, 3));
  std::vector<std::int8_t> start(200, 1);
  for (std::size_t i = 0; i < 200; i += 4) start[i] = -1;  // 50 spins at -1
  DescentParams p;
  p.initial = start.data();
  for (const DescentRule rule : {DescentRule::steepest, DescentRule::first_improvement}) {
    p.rule = rule;
    Descender<IsingModel<std::int32_t>, CountKeepingSwap<IsingModel<std::int32_t>>> d(model, p, 1);
    const auto s = d.run();
    int down = 0;
    for (auto v : s.spins) down += v < 0;
    CHECK(down == 50);
    SpinState<IsingModel<std::int32_t>> st(model);
    st.set_spins(s.spins.data());
    for (std::uint32_t i = 0; i < 200; ++i)
      for (std::uint32_t j = 0; j < 200; ++j)
        if (st.spin(i) > 0 && st.spin(j) < 0) CHECK(st.delta_swap(i, j) >= 0);
  }
}
