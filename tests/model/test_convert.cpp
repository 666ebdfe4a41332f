// Exact Ising <-> QUBO conversion, offset included.
#include <doctest/doctest.h>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <vector>

#include "support/enumerate.hpp"

using namespace spinwright;

// Worked example: Q_11 = -1, Q_22 = -2, Q_33 = 1, Q_12 = 2, Q_13 = -3, Q_23 = 1 gives
// h = (3/4, 1/4, 0), J_12 = 1/2, J_13 = -3/4, J_23 = 1/4, c = -1, and the energy table below
// with the unique minimum -3 at x = 101. Source: the project's reference sheet, section
// "QUBO <-> Ising", derived by substitution x_i x_j = (1 - s_i - s_j + s_i s_j)/4 and
// computed in exact rational arithmetic (common practice).
TEST_CASE("QUBO to Ising: published worked example, every assignment") {
  QuboBuilder<std::int32_t> qb(3);
  qb.add_unary(0, -1).add_unary(1, -2).add_unary(2, 1).add_pair(0, 1, 2).add_pair(0, 2, -3).add_pair(1, 2, 1);
  auto q = qb.build();
  REQUIRE(q.ok());
  auto is = ising_from(*q);
  REQUIRE(is.ok());
  const auto& m = *is;
  CHECK(m.field(0) == 0.75);
  CHECK(m.field(1) == 0.25);
  CHECK(m.field(2) == 0.0);
  CHECK(m.coupling(0, 1) == 0.5);
  CHECK(m.coupling(0, 2) == -0.75);
  CHECK(m.coupling(1, 2) == 0.25);
  CHECK(m.offset() == -1.0);
  // x = 000 .. 111 (x_1 is the most significant bit in the table) and E_Q = E_I.
  const int table[8] = {0, 1, -2, 0, -1, -3, -1, -2};
  for (int code = 0; code < 8; ++code) {
    std::int8_t s[3];
    for (int k = 0; k < 3; ++k) s[k] = ((code >> (2 - k)) & 1) ? -1 : 1;
    CHECK(q->energy(s) == table[code]);
    CHECK(m.energy(s) == static_cast<double>(table[code]));
  }
  auto back = qubo_from(m);
  REQUIRE(back.ok());
  CHECK(back->unary(0) == -1.0);
  CHECK(back->pair(0, 2) == -3.0);
  CHECK(back->offset() == 0.0);
}

TEST_CASE("Ising to QUBO and back: equal energies on every assignment of random integer models") {
  Xoshiro256 rng(12345);
  for (int trial = 0; trial < 50; ++trial) {
    const std::uint32_t n = 2 + rng.below(9);
    IsingBuilder<std::int64_t> b(n);
    for (std::uint32_t i = 0; i < n; ++i) b.add_field(i, static_cast<std::int64_t>(rng.below(21)) - 10);
    for (int k = 0; k < 20; ++k)
      b.add_coupling(rng.below(n), rng.below(n), static_cast<std::int64_t>(rng.below(41)) - 20);
    b.add_offset(static_cast<std::int64_t>(rng.below(100)) - 50);
    auto m = b.build();
    REQUIRE(m.ok());
    auto q = qubo_from(*m);
    REQUIRE(q.ok());
    auto back = ising_from(*q);
    REQUIRE(back.ok());
    test_support::for_each_assignment(n, [&](const std::int8_t* s) {
      const auto e = m->energy(s);
      CHECK(q->energy(s) == e);
      CHECK(back->energy(s) == static_cast<double>(e));
    });
  }
}

// A second path for the conversion offset: exact enumeration (kernels/exact.hpp) of the Ising
// model and of its QUBO form must give the same lowest levels with the same degeneracies and
// the same ground assignment (the substitution s = 1 - 2x is a bijection of assignments that
// keeps every energy, offset included; common practice). Field-free models too, where the
// Ising side halves its work by the flip symmetry and the QUBO side cannot.
TEST_CASE("Ising to QUBO: both forms have the same exact spectrum, offset included") {
  Xoshiro256 rng(2718);
  for (int trial = 0; trial < 8; ++trial) {
    CAPTURE(trial);
    const std::uint32_t n = 10 + rng.below(6);
    IsingBuilder<std::int32_t> b(n);
    const bool fields = trial % 2 == 0;
    for (std::uint32_t i = 0; i < n && fields; ++i) b.add_field(i, static_cast<int>(rng.below(13)) - 6);
    for (std::uint32_t k = 0; k < 3 * n; ++k)
      b.add_coupling(rng.below(n), rng.below(n), static_cast<int>(rng.below(13)) - 6);
    b.add_offset(static_cast<int>(rng.below(41)) - 20);
    const auto ising = b.build().value();
    const auto qubo = qubo_from(ising).value();
    const auto back = ising_from(qubo).value();
    ExactParams p;
    p.levels = 6;
    const auto ei = solve_exact(ising, p);
    const auto eq = solve_exact(qubo, p);
    const auto eb = solve_exact(back, p);
    REQUIRE(ei.ok());
    REQUIRE(eq.ok());
    REQUIRE(eb.ok());
    REQUIRE(ei->levels.size() == eq->levels.size());
    REQUIRE(ei->levels.size() == eb->levels.size());
    for (std::size_t k = 0; k < ei->levels.size(); ++k) {
      CAPTURE(k);
      CHECK(eq->levels[k].energy == ei->levels[k].energy);
      CHECK(eq->levels[k].count == ei->levels[k].count);
      CHECK(eb->levels[k].energy == static_cast<double>(ei->levels[k].energy));
      CHECK(eb->levels[k].count == ei->levels[k].count);
    }
    CHECK(eq->levels[0].first_index == ei->levels[0].first_index);
  }
}

// with_value_type against the builder: the model built directly with the new value type from
// the same terms has the same arrays (pattern, row order, values), offset and energy bound,
// and the same energy on every assignment; values that would change are refused by term.
TEST_CASE("with_value_type: the same model with another value type, or a refusal naming the term") {
  Xoshiro256 rng(777);
  for (int trial = 0; trial < 40; ++trial) {
    const std::uint32_t n = 2 + rng.below(9);
    IsingBuilder<std::int64_t> wide(n);
    IsingBuilder<std::int32_t> narrow(n);
    QuboBuilder<std::int64_t> qwide(n);
    QuboBuilder<double> qreal(n);
    for (std::uint32_t i = 0; i < n; ++i) {
      const std::int64_t h = static_cast<std::int64_t>(rng.below(21)) - 10;
      wide.add_field(i, h);
      narrow.add_field(i, static_cast<std::int32_t>(h));
      qwide.add_unary(i, h);
      qreal.add_unary(i, static_cast<double>(h));
    }
    for (int k = 0; k < 20; ++k) {
      const std::uint32_t i = rng.below(n), j = rng.below(n);
      const std::int64_t v = static_cast<std::int64_t>(rng.below(41)) - 20;
      wide.add_coupling(i, j, v);
      narrow.add_coupling(i, j, static_cast<std::int32_t>(v));
      qwide.add_pair(i, j, v);
      qreal.add_pair(i, j, static_cast<double>(v));
    }
    wide.add_offset(-37);
    narrow.add_offset(-37);
    qwide.add_offset(5);
    qreal.add_offset(5);
    const auto m64 = wide.build().value();
    const auto want32 = narrow.build().value();
    const auto got32 = with_value_type<std::int32_t>(m64);
    REQUIRE(got32.ok());
    CHECK(got32->row_starts() == want32.row_starts());
    CHECK(got32->neighbour_array() == want32.neighbour_array());
    CHECK(got32->value_array() == want32.value_array());
    CHECK(got32->site_term_array() == want32.site_term_array());
    CHECK(got32->offset() == want32.offset());
    CHECK(got32->energy_bound() == want32.energy_bound());
    const auto q64 = qwide.build().value();
    const auto wantd = qreal.build().value();
    const auto gotd = with_value_type<double>(q64);
    REQUIRE(gotd.ok());
    CHECK(gotd->value_array() == wantd.value_array());
    CHECK(gotd->neighbour_array() == wantd.neighbour_array());
    CHECK(gotd->energy_bound() == wantd.energy_bound());
    const auto back = with_value_type<std::int64_t>(*gotd);  // integer-valued doubles convert back
    REQUIRE(back.ok());
    test_support::for_each_assignment(n, [&](const std::int8_t* s) {
      CHECK(got32->energy(s) == m64.energy(s));
      CHECK(gotd->energy(s) == static_cast<double>(q64.energy(s)));
      CHECK(back->energy(s) == q64.energy(s));
    });
  }
  // Real values: the same value type gives the builder's model to the last bit of the bound.
  {
    IsingBuilder<double> real(40);
    for (std::uint32_t i = 0; i < 40; ++i) {
      real.add_field(i, 0.1 * (i % 7) - 0.25);
      for (std::uint32_t j = i + 1; j < 40; j += 3) real.add_coupling(i, j, 1.0 / (1.0 + i + 2.0 * j));
    }
    real.add_offset(0.3);
    const auto m = real.build().value();
    const auto same = with_value_type<double>(m);
    REQUIRE(same.ok());
    CHECK(same->energy_bound() == m.energy_bound());
    CHECK(same->value_array() == m.value_array());
    CHECK(same->offset() == m.offset());
  }
  // Refusals: a coupling beyond int32, a field that is not an integer.
  IsingBuilder<std::int64_t> big(3);
  big.add_coupling(0, 2, std::int64_t{5000000000});
  const auto too_big = with_value_type<std::int32_t>(big.build().value());
  REQUIRE_FALSE(too_big.ok());
  CHECK(too_big.status().code == StatusCode::value_out_of_range);
  CHECK(too_big.status().i == 0);
  CHECK(too_big.status().j == 2);
  IsingBuilder<double> half(2);
  half.add_field(1, 0.5);
  const auto not_integer = with_value_type<std::int64_t>(half.build().value());
  REQUIRE_FALSE(not_integer.ok());
  CHECK(not_integer.status().i == 1);
}
