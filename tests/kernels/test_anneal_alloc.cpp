// step(), reset() and warm_start() of annealing and descent allocate nothing: global
// operator new is replaced (tests/support/alloc_counter.hpp) and calls are counted.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/moves.hpp>

#include "support/alloc_counter.hpp"
#include "support/anneal_graph.hpp"

#include <cstdint>
#include <vector>

using namespace spinwright;

namespace {

template <class Model, class Move>
void check_annealer(const Model& model, Move move, Acceptance rule, SiteOrder order) {
  AnnealParams p;
  p.sweeps = 200;
  p.acceptance = rule;
  p.order = order;
  Annealer<Model, Move> a(model, p, move, 5);
  std::vector<std::int8_t> warm(model.num_spins(), 1);
  for (std::size_t i = 0; i < warm.size(); i += 2) warm[i] = -1;
  alloc_counter::start();
  a.step(100);  // hot to cold: acceptance tables refilled, best copied
  a.reset(6, 1);
  a.step(50);
  a.warm_start(warm.data(), 7, 2);
  a.step(200);
  const auto b = a.best();
  const std::size_t allocations = alloc_counter::stop();
  CHECK(allocations == 0);
  CHECK(b.energy <= a.state().energy());
}

template <class Model, class Move>
void check_descender(const Model& model, Move move, DescentRule rule) {
  DescentParams p;
  p.rule = rule;
  Descender<Model, Move> d(model, p, move, 5);
  std::vector<std::int8_t> warm(model.num_spins(), 1);
  for (std::size_t i = 0; i < warm.size(); i += 2) warm[i] = -1;
  alloc_counter::start();
  while (!d.done()) d.step(1);
  d.reset(9, 1);
  d.step(3);
  d.warm_start(warm.data(), 9);
  d.step(1000);
  const std::size_t allocations = alloc_counter::stop();
  CHECK(allocations == 0);
}

}  // namespace

TEST_CASE("the counter counts") {
  alloc_counter::start();
  std::vector<int>* v = new std::vector<int>(10);
  delete v;
  CHECK(alloc_counter::stop() == 2);
}

TEST_CASE("annealing step/reset/warm_start do not allocate") {
  const auto g = anneal_support::random_cubic(500, 3);
  const auto mi = anneal_support::maxcut_model<std::int32_t>(g);
  const auto md = anneal_support::maxcut_model<double>(g);
  const auto mf = anneal_support::maxcut_model<float>(g);
  const auto ml = anneal_support::maxcut_model<std::int64_t>(g);
  const auto dense = DenseIsingModel<std::int32_t>::from(
                         anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(60, 2)))
                         .value();
  for (const Acceptance rule : {Acceptance::metropolis, Acceptance::heat_bath}) {
    for (const SiteOrder order : {SiteOrder::sequential, SiteOrder::random}) {
      check_annealer(mi, SingleFlip<IsingModel<std::int32_t>>(order), rule, order);
      check_annealer(md, SingleFlip<IsingModel<double>>(order), rule, order);
      check_annealer(mf, SingleFlip<IsingModel<float>>(order), rule, order);
      check_annealer(ml, SingleFlip<IsingModel<std::int64_t>>(order), rule, order);
      check_annealer(dense, SingleFlip<DenseIsingModel<std::int32_t>>(order), rule, order);
    }
    check_annealer(mi, CountKeepingSwap<IsingModel<std::int32_t>>{}, rule, SiteOrder::random);
    const std::vector<std::vector<std::uint32_t>> groups = {{0, 1, 2}, {3, 4}, {10, 200, 300}};
    check_annealer(md, GroupFlip<IsingModel<double>>(groups), rule, SiteOrder::random);
  }
}

TEST_CASE("descent step/reset/warm_start do not allocate") {
  const auto g = anneal_support::random_cubic(300, 4);
  const auto mi = anneal_support::maxcut_model<std::int32_t>(g);
  const auto md = anneal_support::maxcut_model<double>(g);
  for (const DescentRule rule : {DescentRule::steepest, DescentRule::first_improvement}) {
    check_descender(mi, SingleFlip<IsingModel<std::int32_t>>{}, rule);
    check_descender(md, SingleFlip<IsingModel<double>>{}, rule);
    check_descender(mi, CountKeepingSwap<IsingModel<std::int32_t>>{}, rule);
  }
}
