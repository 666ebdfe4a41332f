// Builders: merging, folding, zero dropping, validation, compressed rows, summaries.
#include <doctest/doctest.h>
#include <spinwright/spinwright.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "support/enumerate.hpp"

using namespace spinwright;

TEST_CASE("IsingBuilder merges (i,j) with (j,i), folds s_i s_i into the offset, drops exact zeros") {
  IsingBuilder<std::int32_t> b;
  b.add_coupling(0, 1, 3).add_coupling(1, 0, 4);   // one pair, J = 7
  b.add_coupling(2, 2, 5);                         // s_2 s_2 = 1 -> offset 5
  b.add_coupling(1, 2, 6).add_coupling(2, 1, -6);  // cancels exactly -> dropped
  b.add_field(3, 2).add_field(3, -2);              // cancels -> zero field, spin 3 still exists
  b.add_offset(-1);
  auto m = b.build();
  REQUIRE(m.ok());
  CHECK(m->num_spins() == 4);
  CHECK(m->num_pairs() == 1);
  CHECK(m->coupling(0, 1) == 7);
  CHECK(m->coupling(1, 0) == 7);
  CHECK(m->coupling(1, 2) == 0);
  CHECK(m->find(1, 2) == IsingModel<std::int32_t>::npos);
  CHECK(m->offset() == 4);
  CHECK(m->field(3) == 0);
  const auto s = m->summary();
  CHECK(s.num_spins == 4);
  CHECK(s.num_pairs == 1);
  CHECK(s.num_site_terms == 0);
  CHECK(s.min_degree == 0);
  CHECK(s.max_degree == 1);
  CHECK(s.largest_magnitude == 7.0);
  CHECK(s.smallest_magnitude == 7.0);
}

TEST_CASE("QuboBuilder folds x_i x_i into the unary term") {
  QuboBuilder<double> b(3);
  b.add_pair(1, 1, 2.5).add_unary(1, 0.5).add_pair(0, 2, -1).add_pair(2, 0, -1);
  auto m = b.build();
  REQUIRE(m.ok());
  CHECK(m->unary(1) == 3.0);
  CHECK(m->pair(0, 2) == -2.0);
  CHECK(m->offset() == 0.0);
  // E(x) on every assignment equals the definition with the folded term (common practice: x^2 = x).
  test_support::for_each_assignment(3, [&](const std::int8_t* s) {
    const double x0 = s[0] < 0, x1 = s[1] < 0, x2 = s[2] < 0;
    CHECK(m->energy(s) == 2.5 * x1 * x1 + 0.5 * x1 - 2.0 * x0 * x2);
  });
}

TEST_CASE("Compressed rows are sorted and hold both directions of every pair") {
  Xoshiro256 rng(7);
  IsingBuilder<double, std::uint16_t> b(50);
  std::map<std::pair<int, int>, double> truth;
  for (int k = 0; k < 400; ++k) {
    const int i = static_cast<int>(rng.below(50)), j = static_cast<int>(rng.below(50));
    const double v = static_cast<double>(static_cast<int>(rng.below(9)) - 4);
    b.add_coupling(static_cast<std::uint64_t>(i), static_cast<std::uint64_t>(j), v);
    if (i != j) truth[{std::min(i, j), std::max(i, j)}] += v;
  }
  auto m = b.build();
  REQUIRE(m.ok());
  std::size_t expected_pairs = 0;
  for (const auto& kv : truth) expected_pairs += kv.second != 0.0;
  CHECK(m->num_pairs() == expected_pairs);
  for (std::uint16_t i = 0; i < 50; ++i) {
    const auto nb = m->neighbours(i);
    for (std::size_t k = 1; k < nb.size(); ++k) CHECK(nb[k - 1] < nb[k]);
    m->for_each_neighbour(i, [&](std::uint16_t j, double v) {
      CHECK(v != 0.0);
      CHECK(m->pair(j, i) == v);
      CHECK(truth[{std::min<int>(i, j), std::max<int>(i, j)}] == v);
    });
  }
}

// Reference: the definition itself, written the plain way (common practice): for each pair
// (i, j), i < j, the sum of its terms in the order they were given, kept when not exactly
// zero; row i lists its partners in ascending order. Floating terms of very different sizes
// make the sum depend on the order, so a builder that reorders equal pairs fails here. Rows
// of up to ~120 partners, given in random order, cover both row sorts of the builder.
TEST_CASE("Compressed rows equal the plain definition: ascending partners, duplicates summed in the order given") {
  Xoshiro256 rng(4242);
  const double sizes[] = {1e16, 1.0, 0.1, -1e16, 3.0, -0.7};
  for (int trial = 0; trial < 30; ++trial) {
    const std::uint32_t n = 2 + rng.below(trial < 20 ? 12 : 150);
    const std::uint32_t terms = rng.below(6 * n + 1) + (trial >= 25 ? 40 * n : 0);
    IsingBuilder<double> b(n);
    std::map<std::pair<std::uint32_t, std::uint32_t>, double> want;
    for (std::uint32_t t = 0; t < terms; ++t) {
      const std::uint32_t i = rng.below(n), j = rng.below(n);
      if (i == j) continue;
      const double v = sizes[rng.below(6)];
      b.add_coupling(i, j, v);
      want[{std::min(i, j), std::max(i, j)}] += v;  // in the order given
    }
    const auto m = b.build().value();
    std::vector<std::vector<std::pair<std::uint32_t, double>>> rows(n);
    for (const auto& [ij, v] : want) {
      if (v == 0.0) continue;
      rows[ij.first].push_back({ij.second, v});
      rows[ij.second].push_back({ij.first, v});
    }
    for (auto& r : rows) std::sort(r.begin(), r.end());
    for (std::uint32_t i = 0; i < n; ++i) {
      std::vector<std::pair<std::uint32_t, double>> got;
      m.for_each_neighbour(i, [&](std::uint32_t j, double v) { got.push_back({j, v}); });
      CAPTURE(trial);
      CAPTURE(i);
      CHECK(got == rows[i]);  // same partners in the same order, bit-equal values
    }
  }
}

TEST_CASE("Builders refuse non-finite values and name the offending term") {
  IsingBuilder<double> b;
  b.add_field(0, 1.0);
  b.add_coupling(0, 1, 2.0);
  b.add_coupling(3, 4, std::numeric_limits<double>::quiet_NaN());  // term 2
  b.add_coupling(0, 2, std::numeric_limits<double>::infinity());   // later terms do not replace the first error
  auto m = b.build();
  REQUIRE_FALSE(m.ok());
  CHECK(m.status().code == StatusCode::non_finite_value);
  CHECK(m.status().term == 2);
  CHECK(m.status().i == 3);
  CHECK(m.status().j == 4);

  QuboBuilder<float> q;
  q.add_offset(std::numeric_limits<double>::infinity());
  CHECK(q.build().status().code == StatusCode::non_finite_value);
}

TEST_CASE("Builders refuse indices beyond the index type or the declared size") {
  IsingBuilder<std::int32_t, std::uint16_t> b;
  b.add_coupling(1, 65535, 1);  // 65535 is beyond the last addressable index 65534
  auto m = b.build();
  REQUIRE_FALSE(m.ok());
  CHECK(m.status().code == StatusCode::index_out_of_range);
  CHECK(m.status().term == 0);
  CHECK(m.status().i == 1);  // the caller's (i, j) order, whichever index is refused
  CHECK(m.status().j == 65535);

  IsingBuilder<std::int32_t> fixed(10);
  fixed.add_field(9, 1).add_field(10, 1);
  auto f = fixed.build();
  REQUIRE_FALSE(f.ok());
  CHECK(f.status().code == StatusCode::index_out_of_range);
  CHECK(f.status().term == 1);

  IsingBuilder<std::int32_t, std::uint16_t> too_big(70000);
  CHECK(too_big.build().status().code == StatusCode::index_out_of_range);
}

TEST_CASE("Errors keep the caller's (i, j) order and say \"negative\" for negative indices") {
  IsingBuilder<std::int32_t> fixed(5);
  fixed.add_coupling(3, 10, 1);  // j is the refused one
  auto a = fixed.build();
  REQUIRE_FALSE(a.ok());
  CHECK(a.status().i == 3);
  CHECK(a.status().j == 10);
  IsingBuilder<std::int32_t> first(5);
  first.add_coupling(10, 3, 1);  // i is the refused one
  CHECK(first.build().status().i == 10);
  CHECK(first.build().status().j == 3);

  IsingBuilder<std::int32_t> neg;
  neg.add_coupling(0, 1, 1).add_coupling(2, -1, 1);
  auto n = neg.build();
  REQUIRE_FALSE(n.ok());
  CHECK(n.status().code == StatusCode::index_out_of_range);
  CHECK(n.status().term == 1);
  CHECK(std::string(n.status().message).find("negative") != std::string::npos);
  CHECK(n.status().i == 2);
  QuboBuilder<double> qneg;
  qneg.add_unary(static_cast<std::int64_t>(-3), 1.0);
  CHECK(std::string(qneg.build().status().message).find("negative") != std::string::npos);
  // A large unsigned index is "too large", not "negative".
  IsingBuilder<std::int32_t> big;
  big.add_field(std::uint64_t{1} << 40, 1);
  CHECK(std::string(big.build().status().message).find("negative") == std::string::npos);
}

TEST_CASE("Integer builders refuse a coefficient that does not convert exactly, never truncating it") {
  SUBCASE("a fraction into int32") {
    IsingBuilder<std::int32_t> b;
    b.add_coupling(0, 1, 2.7);
    auto m = b.build();
    REQUIRE_FALSE(m.ok());
    CHECK(m.status().code == StatusCode::value_out_of_range);
    CHECK(std::string(m.status().message).find("fractional") != std::string::npos);
    CHECK(m.status().term == 0);
    CHECK(m.status().i == 0);
    CHECK(m.status().j == 1);
  }
  SUBCASE("an int64 5e9 into int32") {
    IsingBuilder<std::int32_t> b;
    b.add_field(0, std::int64_t{5000000000});
    CHECK(b.build().status().code == StatusCode::value_out_of_range);
    QuboBuilder<std::int32_t> q;
    q.add_pair(0, 1, std::uint64_t{1} << 31);  // 2^31: one beyond INT32_MAX
    CHECK(q.build().status().code == StatusCode::value_out_of_range);
    QuboBuilder<std::int32_t> edge;
    edge.add_pair(0, 1, std::int64_t{2147483647}).add_unary(0, std::int64_t{-2147483647} - 1);
    auto e = edge.build();
    REQUIRE(e.ok());  // the extremes themselves convert exactly
    CHECK(e->pair(0, 1) == 2147483647);
  }
  SUBCASE("doubles beyond the range, non-finite, and whole doubles") {
    IsingBuilder<std::int32_t> b;
    b.add_coupling(0, 1, 2147483648.0);
    CHECK(b.build().status().code == StatusCode::value_out_of_range);
    IsingBuilder<std::int64_t> w;
    w.add_field(0, 9.3e18);  // beyond INT64_MAX (about 9.22e18)
    CHECK(w.build().status().code == StatusCode::value_out_of_range);
    IsingBuilder<std::int32_t> f;
    f.add_field(0, std::numeric_limits<double>::quiet_NaN());
    CHECK(f.build().status().code == StatusCode::non_finite_value);
    IsingBuilder<std::int32_t> whole;
    whole.add_coupling(0, 1, 3.0).add_field(1, -2.0f).add_offset(5.0);
    auto m = whole.build();
    REQUIRE(m.ok());
    CHECK(m->coupling(0, 1) == 3);
    CHECK(m->field(1) == -2);
    CHECK(m->offset() == 5);
  }
  SUBCASE("a fractional offset into an integer builder") {
    QuboBuilder<std::int64_t> q;
    q.add_unary(0, 1).add_offset(0.5);
    auto m = q.build();
    REQUIRE_FALSE(m.ok());
    CHECK(m.status().code == StatusCode::value_out_of_range);
    CHECK(m.status().term == 1);
  }
  SUBCASE("floating builders round to nearest, and refuse beyond float's range") {
    IsingBuilder<float> b;
    b.add_coupling(0, 1, 0.1);
    auto m = b.build();
    REQUIRE(m.ok());
    CHECK(m->coupling(0, 1) == 0.1f);
    IsingBuilder<float> over;
    over.add_field(0, 1e300);
    CHECK(over.build().status().code == StatusCode::value_out_of_range);
  }
}

TEST_CASE("One spin limit for builders and views: uint16_t addresses 65535 spins") {
  IsingBuilder<std::int32_t, std::uint16_t> at_limit(65535);
  at_limit.add_coupling(0, 65534, 1);
  auto m = at_limit.build();
  REQUIRE(m.ok());
  CHECK(m->num_spins() == 65535);
  // A view over the same arrays is accepted too (it used to refuse 65535).
  std::vector<std::int32_t> linear(65535, 0);
  std::vector<std::size_t> rows(65536, 0);
  for (std::size_t i = 1; i <= 65535; ++i) rows[i] = 1;
  rows[65535] = 2;  // row 0 holds 65534, row 65534 holds 0
  const std::uint16_t nbr[2] = {65534, 0};
  const std::int32_t val[2] = {1, 1};
  auto v = IsingModelView<std::int32_t, std::uint16_t>::over(65535, linear.data(), rows.data(), nbr, val);
  REQUIRE(v.ok());
  CHECK(v->energy(std::vector<std::int8_t>(65535, 1).data()) == m->energy(std::vector<std::int8_t>(65535, 1).data()));
  // One more spin is refused by both.
  IsingBuilder<std::int32_t, std::uint16_t> beyond(65536);
  CHECK(beyond.build().status().code == StatusCode::index_out_of_range);
  linear.push_back(0);
  rows.push_back(2);
  CHECK(IsingModelView<std::int32_t, std::uint16_t>::over(65536, linear.data(), rows.data(), nbr, val).status().code ==
        StatusCode::index_out_of_range);
}

TEST_CASE("Merged coefficients that leave the value type are refused") {
  IsingBuilder<std::int32_t> b;
  b.add_coupling(0, 1, std::numeric_limits<std::int32_t>::max()).add_coupling(1, 0, 1);
  auto m = b.build();
  REQUIRE_FALSE(m.ok());
  CHECK(m.status().code == StatusCode::value_out_of_range);
  CHECK(m.status().i == 0);
  CHECK(m.status().j == 1);

  QuboBuilder<float> f;
  f.add_unary(0, std::numeric_limits<float>::max()).add_unary(0, std::numeric_limits<float>::max());
  CHECK(f.build().status().code == StatusCode::value_out_of_range);
}

TEST_CASE("Integer models whose energy range could overflow int64 are refused when built") {
  // Each term fits int64, the sum of magnitudes passes INT64_MAX / 4.
  const std::int64_t big = std::numeric_limits<std::int64_t>::max() / 8 + 1;
  IsingBuilder<std::int64_t> b;
  b.add_coupling(0, 1, big).add_coupling(1, 2, big);
  auto m = b.build();
  REQUIRE_FALSE(m.ok());
  CHECK(m.status().code == StatusCode::energy_overflow);

  IsingBuilder<std::int64_t> ok;
  ok.add_coupling(0, 1, big - 1).add_field(2, 1);
  auto good = ok.build();
  REQUIRE(good.ok());
  CHECK(good->energy_bound() <= static_cast<double>(integer_energy_limit));
}

TEST_CASE("Empty builder gives an empty model") {
  auto m = IsingBuilder<double>().build();
  REQUIRE(m.ok());
  CHECK(m->num_spins() == 0);
  CHECK(m->energy(nullptr) == 0.0);
}

TEST_CASE("Dense models match their sparse source on every assignment") {
  Xoshiro256 rng(99);
  IsingBuilder<std::int32_t> b(8);
  for (int k = 0; k < 30; ++k) b.add_coupling(rng.below(8), rng.below(8), static_cast<std::int32_t>(rng.below(11)) - 5);
  for (int i = 0; i < 8; ++i) b.add_field(static_cast<std::uint64_t>(i), static_cast<std::int32_t>(rng.below(7)) - 3);
  b.add_offset(11);
  auto m = b.build();
  REQUIRE(m.ok());
  auto d = DenseIsingModel<std::int32_t>::from(*m);
  REQUIRE(d.ok());
  CHECK(d->num_pairs() == m->num_pairs());
  CHECK(d->summary().max_degree == m->summary().max_degree);
  test_support::for_each_assignment(8, [&](const std::int8_t* s) { CHECK(d->energy(s) == m->energy(s)); });
  CHECK(DenseQuboModel<double>::zeros(dense_max_spins + 1).status().code == StatusCode::size_limit);
}

TEST_CASE("Max-cut: cut = (W - E) / 2 on the weighted 4-node graph") {
  // Weighted 4-node graph (0,1,3),(1,2,1),(2,3,4),(3,0,2),(0,2,5): max cut 12 with {0,3} | {1,2},
  // W = 15, E_min = -9. Source: the project's reference sheet, "Max-cut facts" (computed by
  // enumeration); the identity cut = (W - E)/2 is common practice (Barahona et al. 1988).
  IsingBuilder<std::int32_t> b;
  b.add_coupling(0, 1, 3).add_coupling(1, 2, 1).add_coupling(2, 3, 4).add_coupling(3, 0, 2).add_coupling(0, 2, 5);
  auto m = b.build();
  REQUIRE(m.ok());
  const auto w = total_weight(*m);
  CHECK(w == 15);
  std::int64_t best_cut = 0, best_e = 1 << 30;
  test_support::for_each_assignment(4, [&](const std::int8_t* s) {
    const auto e = m->energy(s);
    const auto c = cut_value(*m, s);
    CHECK(c == cut_from_energy(w, e));
    CHECK(e == energy_from_cut(w, c));
    best_cut = std::max<std::int64_t>(best_cut, c);
    best_e = std::min<std::int64_t>(best_e, e);
  });
  CHECK(best_cut == 12);
  CHECK(best_e == -9);
  const std::int8_t side[4] = {1, -1, -1, 1};
  CHECK(cut_value(*m, side) == 12);
}

TEST_CASE("floating energy bound survives an edit that removes a dominant term") {
  // Found by the builder fuzzer: 1e290 is absorbed by rounding next to 4e307; removing the
  // large term must give it back (compensated summation, Neumaier 1974).
  IsingBuilder<double> b(2);
  b.add_field(0, 4e307).add_field(1, 1e290);
  auto m = b.build();
  REQUIRE(m.ok());
  REQUIRE(m->set_site_term(0, 0.0).ok());
  CHECK(m->energy_bound() == doctest::Approx(1e290).epsilon(1e-12));
  auto d = DenseIsingModel<double>::from(*m);
  REQUIRE(d.ok());
  CHECK(d->energy_bound() == doctest::Approx(1e290).epsilon(1e-12));
  REQUIRE(m->set_site_term(0, 4e307).ok());
  REQUIRE(m->set_site_term(0, -2.0).ok());
  CHECK(m->energy_bound() == doctest::Approx(1e290).epsilon(1e-12));
}
