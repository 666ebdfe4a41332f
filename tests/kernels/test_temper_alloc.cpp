// step(), reset() and warm_start() of tempering and tabu search allocate nothing: global
// operator new is replaced (tests/support/alloc_counter.hpp) and calls are counted.
#include <doctest/doctest.h>

#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/model/dense_model.hpp>

#include "support/alloc_counter.hpp"
#include "support/temper_graph.hpp"

#include <cstdint>
#include <vector>

using namespace spinwright;

TEST_CASE_TEMPLATE("tempering: no allocation after construction", Value, std::int32_t, double) {
  const auto m = test_support::ising_of<Value>(test_support::torus(6, -1));
  std::vector<std::int8_t> warm(m.num_spins(), 1);
  for (bool houdayer : {false, true}) {
    TemperParams p;
    p.houdayer = houdayer;
    p.ladder.adaptive = true;
    p.ladder.adapt_rounds = 3;
    p.ladder.adapt_sweeps = 10;
    Tempering<IsingModel<Value>> t(m, p, 5);
    alloc_counter::start();
    t.step(60);  // covers the adaptive rounds, swaps and cluster moves
    t.reset(6, 1);
    t.step(5);
    t.warm_start(warm.data(), 7);
    t.step(5);
    const auto best = t.best();
    CHECK(alloc_counter::stop() == 0);
    CHECK(best.size == m.num_spins());
  }
}

TEST_CASE("tabu search: no allocation after construction, sparse and dense") {
  const auto m = test_support::ising_of<std::int64_t>(test_support::torus(8, 1));
  const auto d = DenseIsingModel<std::int64_t>::from(m).value();
  std::vector<std::int8_t> warm(m.num_spins(), -1);
  TabuParams p;
  p.stagnation = 200;  // perturbations happen inside the counted steps
  TabuWalker<IsingModel<std::int64_t>> ts(m, p, 5);
  TabuWalker<DenseIsingModel<std::int64_t>> td(d, p, 5);
  alloc_counter::start();
  ts.step(30);
  td.step(30);
  ts.reset(9);
  ts.warm_start(warm.data(), 3);
  ts.step(3);
  ts.step_moves(17);
  const auto b = ts.best();
  const std::size_t allocations = alloc_counter::stop();
  CHECK(allocations == 0);
  CHECK(ts.perturbations() + td.perturbations() > 0);
  CHECK(b.size == m.num_spins());
}
