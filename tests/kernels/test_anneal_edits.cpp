// Re-solving after in-place coefficient edits: a stepping kernel reused across edits behaves
// exactly like a fresh one built on the edited model (the trading-engine loop).
#include <doctest/doctest.h>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <vector>

using namespace spinwright;

namespace {
// Every coefficient a multiple of 4, so every flip delta is a multiple of 8 at construction.
IsingModel<std::int32_t> coarse_glass() {
  Xoshiro256 rng(99);
  IsingBuilder<std::int32_t> b(64);
  for (std::uint32_t i = 0; i < 64; ++i) {
    b.add_coupling(i, (i + 1) % 64, rng.coin() ? 4 : -4);
    b.add_coupling(i, (i + 8) % 64, rng.coin() ? 8 : -4);
    b.add_field(i, rng.coin() ? 4 : 0);
  }
  return std::move(b.build().value());
}
}  // namespace

TEST_CASE("Annealer: warm start after edits that make deltas finer equals a fresh annealer") {
  auto model = coarse_glass();
  AnnealParams params;
  params.sweeps = 200;
  params.schedule = Schedule::geometric(0.05, 2.0);  // fixed, so both runs share the schedule
  Annealer<IsingModel<std::int32_t>> reused(model, params, 5);
  reused.step(200);
  std::vector<std::int8_t> start(reused.state().spins(), reused.state().spins() + 64);

  // Odd edits: deltas are now multiples of 2 only.
  SpinState<IsingModel<std::int32_t>> book(model);
  book.set_spins(start.data());
  REQUIRE(edit_site_term(model, book, 3, 1).ok());
  REQUIRE(edit_pair(model, book, 10, 11, -3).ok());
  CHECK(book.check().exact);

  reused.warm_start(start.data(), 6);
  reused.step(200);
  Annealer<IsingModel<std::int32_t>> fresh(model, params, 6);
  fresh.warm_start(start.data(), 6);
  fresh.step(200);
  CHECK(reused.best().energy == fresh.best().energy);
  CHECK(reused.state().energy() == fresh.state().energy());
  CHECK(reused.accepted() == fresh.accepted());
  CHECK(std::vector<std::int8_t>(reused.state().spins(), reused.state().spins() + 64) ==
        std::vector<std::int8_t>(fresh.state().spins(), fresh.state().spins() + 64));
  CHECK(reused.best().energy == model.energy(reused.best().spins));
}

TEST_CASE("Tempering: warm start after odd edits equals a fresh run on the edited model") {
  auto model = coarse_glass();
  TemperParams params;
  params.sweeps = 50;
  params.ladder.temperatures = 6;
  params.ladder.beta_min = 0.1;
  params.ladder.beta_max = 2.0;
  Tempering<IsingModel<std::int32_t>> reused(model, params, 5);
  reused.step(20);
  std::vector<std::int8_t> start(model.num_spins(), 1);
  SpinState<IsingModel<std::int32_t>> book(model);
  REQUIRE(edit_site_term(model, book, 7, -1).ok());
  reused.warm_start(start.data(), 9);
  reused.step(50);
  Tempering<IsingModel<std::int32_t>> fresh(model, params, 9);
  fresh.warm_start(start.data(), 9);
  fresh.step(50);
  CHECK(reused.best().energy == fresh.best().energy);
  CHECK(reused.best().energy == model.energy(reused.best().spins));
}
