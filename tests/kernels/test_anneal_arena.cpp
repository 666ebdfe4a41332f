// Annealing and descent with their workspace in a caller-supplied Arena (the no-heap path):
// same runs as the heap versions, bytes_needed() is enough, a short arena is reported.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/moves.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <vector>

using namespace spinwright;

using Model = IsingModel<std::int32_t>;

TEST_CASE("an arena-built annealer runs exactly like a heap-built one") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(300, 8));
  AnnealParams p;
  p.sweeps = 150;
  const std::size_t bytes = Annealer<Model>::bytes_needed(model, p);
  std::vector<unsigned char> memory(bytes);
  Arena arena(memory.data(), memory.size());
  Annealer<Model> a(model, p, arena, 11, 2);
  REQUIRE(a.valid());
  CHECK(arena.used() <= bytes);
  NoObserver none;
  const StopReason why = a.advance(Budget{}, none);
  CHECK(why == StopReason::budget_exhausted);
  const auto heap = anneal(model, p, 11, 2);
  CHECK(a.best().energy == heap.energy);
  CHECK(std::vector<std::int8_t>(a.best().spins, a.best().spins + a.best().size) == heap.spins);

  Arena short_arena(memory.data(), bytes / 2);
  Annealer<Model> b(model, p, short_arena, 11, 2);
  CHECK_FALSE(b.valid());
}

TEST_CASE("arena-built moves and descent") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(120, 9));
  const std::size_t n = model.num_spins();
  AnnealParams p;
  p.sweeps = 100;
  std::vector<std::int8_t> start(n, 1);
  for (std::size_t i = 0; i < n; i += 3) start[i] = -1;
  p.initial = start.data();
  std::vector<unsigned char> memory(Annealer<Model, CountKeepingSwap<Model>>::bytes_needed(model, p) +
                                    CountKeepingSwap<Model>::bytes_needed(n) + Descender<Model>::bytes_needed(model));
  Arena arena(memory.data(), memory.size());
  CountKeepingSwap<Model> ex(n, arena);
  REQUIRE(ex.valid());
  Annealer<Model, CountKeepingSwap<Model>> a(model, p, std::move(ex), arena, 4);
  REQUIRE(a.valid());
  a.step(100);
  int down = 0;
  for (std::size_t i = 0; i < n; ++i) down += a.state().spins()[i] < 0;
  CHECK(down == 40);
  DescentParams dp;
  Descender<Model> d(model, dp, SingleFlip<Model>{}, arena, 4);
  REQUIRE(d.valid());
  NoObserver none;
  d.advance(Budget{}, none);
  CHECK(d.done());
  CHECK(d.energy() == descend(model, dp, 4).energy);
  CHECK_FALSE(arena.failed());

  // Groups read in place from caller arrays.
  const std::size_t starts[] = {0, 3, 5};
  const std::uint32_t members[] = {0, 1, 2, 7, 9};
  GroupFlip<Model> view(starts, members, 2);
  GroupFlip<Model> copied(std::vector<std::vector<int>>{{0, 1, 2}, {7, 9}});
  SpinState<Model> s(model);
  CHECK(view.delta(s, 0) == copied.delta(s, 0));
  CHECK(view.delta(s, 1) == copied.delta(s, 1));
}
