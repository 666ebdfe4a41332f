// SparseModelView: a model over caller-owned arrays, checked when made, usable by states.
#include <doctest/doctest.h>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <limits>
#include <vector>

#include "support/enumerate.hpp"

using namespace spinwright;

TEST_CASE("a view of a built model has the model's energies and local fields") {
  Xoshiro256 rng(8);
  QuboBuilder<std::int32_t, std::uint16_t> b(12);
  for (int k = 0; k < 40; ++k) b.add_pair(rng.below(12), rng.below(12), static_cast<std::int32_t>(rng.below(15)) - 7);
  for (std::uint32_t i = 0; i < 12; ++i) b.add_unary(i, static_cast<std::int32_t>(rng.below(9)) - 4);
  b.add_offset(5);
  const auto m = b.build().value();
  const auto v = view_of(m);
  CHECK(v.num_spins() == m.num_spins());
  CHECK(v.num_pairs() == m.num_pairs());
  CHECK(v.energy_bound() == m.energy_bound());
  test_support::for_each_assignment(12, [&](const std::int8_t* s) { CHECK(v.energy(s) == m.energy(s)); });
  SpinState<QuboModelView<std::int32_t, std::uint16_t>> sv(v);
  SpinState<QuboModel<std::int32_t, std::uint16_t>> sm(m);
  for (int k = 0; k < 200; ++k) {
    const auto i = static_cast<std::uint16_t>(rng.below(12));
    CHECK(sv.delta(i) == sm.delta(i));
    sv.flip(i);
    sm.flip(i);
  }
  CHECK(sv.energy() == sm.energy());
  CHECK(sv.check().exact);
}

TEST_CASE("over() refuses malformed arrays and names the entry") {
  // Triangle 0-1-2 with J = 1, stored both ways.
  const double linear[3] = {0, 0, 0};
  const std::size_t rows[4] = {0, 2, 4, 6};
  const std::uint32_t nbr[6] = {1, 2, 0, 2, 0, 1};
  const double val[6] = {1, 1, 1, 1, 1, 1};
  auto ok = IsingModelView<double>::over(3, linear, rows, nbr, val);
  REQUIRE(ok.ok());
  const std::int8_t s[3] = {1, -1, 1};
  CHECK(ok->energy(s) == -1.0);

  const double asym[6] = {1, 1, 2, 1, 1, 1};  // J_01 = 1 but J_10 = 2
  auto a = IsingModelView<double>::over(3, linear, rows, nbr, asym);
  CHECK(a.status().code == StatusCode::invalid_argument);
  CHECK(a.status().i == 0);
  CHECK(a.status().j == 1);

  const std::uint32_t unsorted[6] = {2, 1, 0, 2, 0, 1};
  CHECK(IsingModelView<double>::over(3, linear, rows, unsorted, val).status().code == StatusCode::invalid_argument);

  const std::uint32_t self[6] = {0, 2, 0, 2, 0, 1};
  CHECK(IsingModelView<double>::over(3, linear, rows, self, val).status().code == StatusCode::invalid_argument);

  const std::uint32_t beyond[6] = {1, 3, 0, 2, 0, 1};
  CHECK(IsingModelView<double>::over(3, linear, rows, beyond, val).status().code == StatusCode::index_out_of_range);

  const double nan_field[3] = {0, std::numeric_limits<double>::quiet_NaN(), 0};
  auto n = IsingModelView<double>::over(3, nan_field, rows, nbr, val);
  CHECK(n.status().code == StatusCode::non_finite_value);
  CHECK(n.status().i == 1);

  const std::int64_t big = std::numeric_limits<std::int64_t>::max() / 8 + 1;
  const std::int64_t lin64[3] = {big, big, 0};
  const std::int64_t val64[6] = {1, 1, 1, 1, 1, 1};
  CHECK(IsingModelView<std::int64_t>::over(3, lin64, rows, nbr, val64).status().code == StatusCode::energy_overflow);
}

TEST_CASE("states over an arena: no heap, and refusal when the arena is too small") {
  const std::int32_t linear[4] = {1, 0, 0, -1};
  const std::size_t rows[5] = {0, 1, 3, 5, 6};
  const std::uint16_t nbr[6] = {1, 0, 2, 1, 3, 2};
  const std::int32_t val[6] = {-2, -2, 3, 3, -1, -1};
  const auto v = IsingModelView<std::int32_t, std::uint16_t>::over(4, linear, rows, nbr, val).value();
  using State = SpinState<IsingModelView<std::int32_t, std::uint16_t>>;
  StaticArena<State::bytes_needed(4)> arena;
  State st(v, arena);
  REQUIRE(st.valid());
  CHECK(arena.used() <= arena.capacity());
  CHECK(st.energy() == v.energy(st.spins()));
  st.flip(2);
  CHECK(st.check().exact);

  StaticArena<8> small;
  State none(v, small);
  CHECK_FALSE(none.valid());
  CHECK(small.failed());
}
