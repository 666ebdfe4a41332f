// Penalty builders and the penalty-weight bound, checked by enumerating every assignment.
//
// The expansions checked here are the handbook identities for bits (x^2 = x):
//   (k - sum x)^2 = k^2 + (1 - 2k) sum x_i + 2 sum_{i<j} x_i x_j, and in general
//   (sum a x - b)^2 = b^2 + sum (a_i^2 - 2 b a_i) x_i + 2 sum_{i<j} a_i a_j x_i x_j
// (common practice; A. Lucas, Front. Phys. 2:5, 2014, sections 1-2; F. Glover,
// G. Kochenberger, Y. Du, 4OR 17, 2019). Each test compares the built model's energy with the
// penalty computed directly from its definition on every assignment.
#include <doctest/doctest.h>
#include <spinwright/model.hpp>
#include <spinwright/problems.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <limits>
#include <set>
#include <type_traits>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;
using problems_test::for_each_bits;

namespace {

std::int64_t lhs_of(const std::vector<std::uint64_t>& vars, const std::vector<std::int64_t>& a, const std::uint8_t* x) {
  std::int64_t s = 0;
  for (std::size_t k = 0; k < vars.size(); ++k) s += x[vars[k]] ? a[k] : 0;
  return s;
}

std::uint64_t floor_log2(std::uint64_t v) {
  std::uint64_t r = 0;
  while (v >>= 1) ++r;
  return r;
}

}  // namespace

TEST_CASE_TEMPLATE("one-hot and k-hot: A (k - sum x)^2 on every assignment", Value, std::int32_t, std::int64_t,
                   double) {
  const Value a = Value{3};
  for (std::uint64_t m = 1; m <= 5; ++m) {
    for (std::uint64_t k = 0; k <= m; ++k) {
      // The group is every other variable of 2m - 1 (the others stay free).
      const std::uint64_t n = 2 * m - 1;
      std::vector<std::uint64_t> group;
      for (std::uint64_t i = 0; i < m; ++i) group.push_back(2 * i);
      QuboBuilder<Value> b(n);
      ConstraintSet set(n);
      auto r = k == 1 ? add_one_hot(b, set, group, a) : add_k_hot(b, set, group, k, a);
      REQUIRE(r.ok());
      CHECK(*r == 0);
      CHECK(set[0].kind == (k == 1 ? ConstraintKind::one_hot : ConstraintKind::k_hot));
      auto model = b.build();
      REQUIRE(model.ok());
      for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
        std::int64_t ones = 0;
        for (const auto v : group) ones += x[v];
        const std::int64_t d = static_cast<std::int64_t>(k) - ones;
        const auto e = model->energy_of_bits(x);
        CHECK(e == static_cast<energy_t<Value>>(a) * static_cast<energy_t<Value>>(d * d));
        const bool feasible = d == 0;
        CHECK(set.check_bits(x).feasible == feasible);
        if (feasible) CHECK(e == 0);
        if (!feasible) CHECK(e >= static_cast<energy_t<Value>>(a));
      });
    }
  }
}

TEST_CASE_TEMPLATE("pairwise-exclusion: A sum_{i<j} x_i x_j is 0 exactly on <= 1 bit set", Value, std::int32_t,
                   double) {
  const Value a = Value{5};
  for (std::uint64_t m = 1; m <= 6; ++m) {
    std::vector<std::uint64_t> group;
    for (std::uint64_t i = 0; i < m; ++i) group.push_back(i);
    QuboBuilder<Value> b(m);
    ConstraintSet set(m);
    REQUIRE(add_pairwise_exclusion(b, set, group, a).ok());
    auto model = b.build();
    REQUIRE(model.ok());
    for_each_bits(static_cast<std::uint32_t>(m), [&](const std::uint8_t* x) {
      std::int64_t ones = 0;
      for (std::uint64_t i = 0; i < m; ++i) ones += x[i];
      const auto e = model->energy_of_bits(x);
      CHECK(e == static_cast<energy_t<Value>>(a) * static_cast<energy_t<Value>>(ones * (ones - 1) / 2));
      const auto f = set.check_bits(x);
      CHECK(f.feasible == (ones <= 1));
      if (ones > 1) {
        CHECK(e >= static_cast<energy_t<Value>>(a));
        CHECK(f.amount == ones - 1);
        CHECK(f.kind == ConstraintKind::pairwise_exclusion);
      }
    });
  }
}

TEST_CASE("pair-cover of two: A (1 - x_u)(1 - x_v)") {
  QuboBuilder<std::int32_t> b(3);
  ConstraintSet set(3);
  REQUIRE(add_pair_cover(b, set, 2, 0, std::int32_t{7}).ok());
  auto model = b.build();
  REQUIRE(model.ok());
  for_each_bits(3, [&](const std::uint8_t* x) {
    const bool feasible = x[0] || x[2];
    CHECK(model->energy_of_bits(x) == (feasible ? 0 : 7));
    const auto f = set.check_bits(x);
    CHECK(f.feasible == feasible);
    if (!feasible) {
      CHECK(f.kind == ConstraintKind::pair_cover);
      CHECK(f.amount == 1);
    }
  });
  CHECK(add_pair_cover(b, set, 1, 1, std::int32_t{7}).status().code == StatusCode::invalid_argument);
}

TEST_CASE_TEMPLATE("weighted sum equal: A (sum a x - b)^2 on random integer data", Value, std::int64_t, double) {
  Xoshiro256 rng(20261201);
  for (int trial = 0; trial < 40; ++trial) {
    const std::uint64_t n = 2 + rng.below(6);
    std::vector<std::uint64_t> vars;
    std::vector<std::int64_t> coef;
    for (std::uint64_t i = 0; i < n; ++i) {
      if (rng.below(4) == 0) continue;  // some variables stay out of the constraint
      vars.push_back(i);
      coef.push_back(static_cast<std::int64_t>(rng.below(19)) - 9);
    }
    const std::int64_t rhs = static_cast<std::int64_t>(rng.below(21)) - 10;
    const Value a = Value{2} + static_cast<Value>(rng.below(3));
    QuboBuilder<Value> b(n);
    ConstraintSet set(n);
    REQUIRE(add_sum_equal(b, set, vars, coef, rhs, a).ok());
    auto model = b.build();
    REQUIRE(model.ok());
    for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
      const std::int64_t d = lhs_of(vars, coef, x) - rhs;
      const auto e = model->energy_of_bits(x);
      CHECK(e == static_cast<energy_t<Value>>(a) * static_cast<energy_t<Value>>(d * d));
      const auto f = set.check_bits(x);
      CHECK(f.feasible == (d == 0));
      if (d != 0) {
        CHECK(f.amount == (d < 0 ? -d : d));
        CHECK(e >= static_cast<energy_t<Value>>(a));
      }
    });
  }
}

TEST_CASE("slack bits: powers of two with the last one capped, exactly 0..S") {
  CHECK(slack_weights(0).empty());
  CHECK(slack_weights(1) == std::vector<std::int64_t>{1});
  CHECK(slack_weights(5) == std::vector<std::int64_t>{1, 2, 2});
  CHECK(slack_weights(7) == std::vector<std::int64_t>{1, 2, 4});
  CHECK(slack_weights(8) == std::vector<std::int64_t>{1, 2, 4, 1});
  CHECK(slack_weights(15) == std::vector<std::int64_t>{1, 2, 4, 8});
  for (std::int64_t s = 1; s <= 300; ++s) {
    const auto w = slack_weights(s);
    // floor(log2 S) + 1 bits, as documented.
    REQUIRE(w.size() == floor_log2(static_cast<std::uint64_t>(s)) + 1);
    for (std::size_t m = 0; m + 1 < w.size(); ++m) CHECK(w[m] == (std::int64_t{1} << m));
    CHECK(w.back() == s - ((std::int64_t{1} << (w.size() - 1)) - 1));
    std::set<std::int64_t> reach;
    for_each_bits(static_cast<std::uint32_t>(w.size()), [&](const std::uint8_t* y) {
      std::int64_t v = 0;
      for (std::size_t m = 0; m < w.size(); ++m) v += y[m] ? w[m] : 0;
      reach.insert(v);
    });
    CHECK(reach.size() == static_cast<std::size_t>(s + 1));
    CHECK(*reach.begin() == 0);
    CHECK(*reach.rbegin() == s);
  }
}

TEST_CASE_TEMPLATE("weighted sum at most with slack: min over slack is A max(0, sum a x - b)^2", Value, std::int64_t,
                   double) {
  Xoshiro256 rng(77);
  for (int trial = 0; trial < 40; ++trial) {
    const std::uint64_t n = 2 + rng.below(4);
    std::vector<std::uint64_t> vars;
    std::vector<std::int64_t> coef;
    std::int64_t low = 0;
    std::int64_t high = 0;
    for (std::uint64_t i = 0; i < n; ++i) {
      vars.push_back(i);
      coef.push_back(static_cast<std::int64_t>(rng.below(15)) - 5);
      (coef.back() < 0 ? low : high) += coef.back();
    }
    const std::int64_t rhs = low + static_cast<std::int64_t>(rng.below(static_cast<std::uint32_t>(high - low + 3)));
    const Value a = Value{3};
    QuboBuilder<Value> b;
    ConstraintSet set(n);
    auto bits = slack_bit_count(coef, rhs);
    REQUIRE(bits.ok());
    auto r = add_sum_at_most(b, set, vars, coef, rhs, a);
    REQUIRE(r.ok());
    const Constraint& c = set[*r];
    CHECK(c.kind == ConstraintKind::sum_at_most);
    CHECK(c.slack_begin == n);
    CHECK(c.slack_weights == slack_weights(rhs - low));
    CHECK(c.slack_weights.size() == *bits);
    CHECK(set.num_variables() == n + *bits);
    auto model = b.build();
    REQUIRE(model.ok());
    REQUIRE(model->num_spins() <= set.num_variables());
    const auto total = static_cast<std::uint32_t>(set.num_variables());
    // Minimum over the slack bits for every decision assignment.
    std::vector<energy_t<Value>> best(std::size_t{1} << n);
    std::vector<bool> seen(best.size(), false);
    std::vector<std::uint8_t> padded(total);
    for_each_bits(total, [&](const std::uint8_t* x) {
      std::size_t code = 0;
      for (std::uint64_t i = 0; i < n; ++i) code |= static_cast<std::size_t>(x[i]) << i;
      padded.assign(x, x + total);
      padded.resize(model->num_spins());  // the builder grows to the highest index used
      const auto e = model->energy_of_bits(padded.data());
      if (!seen[code] || e < best[code]) best[code] = e;
      seen[code] = true;
      CHECK(e >= 0);
    });
    for (std::size_t code = 0; code < best.size(); ++code) {
      std::vector<std::uint8_t> x(n);
      for (std::uint64_t i = 0; i < n; ++i) x[i] = static_cast<std::uint8_t>((code >> i) & 1);
      const std::int64_t over = lhs_of(vars, coef, x.data()) - rhs;
      const std::int64_t v = over > 0 ? over : 0;
      CHECK(best[code] == static_cast<energy_t<Value>>(a) * static_cast<energy_t<Value>>(v * v));
      const auto f = set.check_bits(x.data());
      CHECK(f.feasible == (over <= 0));
      if (over > 0) {
        CHECK(f.amount == over);
        CHECK(best[code] >= static_cast<energy_t<Value>>(a));
      }
    }
  }
}

TEST_CASE("penalty builders refuse bad input and add nothing") {
  QuboBuilder<std::int32_t> b(4);
  ConstraintSet set(4);
  const auto terms = b.num_terms();
  CHECK(add_one_hot(b, set, {0, 1}, std::int32_t{0}).status().code == StatusCode::invalid_argument);
  CHECK(add_one_hot(b, set, {0, 1}, std::int32_t{-2}).status().code == StatusCode::invalid_argument);
  CHECK(add_one_hot(b, set, {}, std::int32_t{1}).status().code == StatusCode::invalid_argument);
  CHECK(add_one_hot(b, set, {0, 4}, std::int32_t{1}).status().code == StatusCode::index_out_of_range);
  CHECK(add_k_hot(b, set, {0, 1}, 3, std::int32_t{1}).status().code == StatusCode::invalid_argument);
  CHECK(add_sum_equal(b, set, {0, 1}, {1}, 1, std::int32_t{1}).status().code == StatusCode::invalid_argument);
  // sum a x <= -3 with a = (1, -2): the left-hand side is at least -2.
  CHECK(add_sum_at_most(b, set, {0, 1}, {1, -2}, -3, std::int32_t{1}).status().code == StatusCode::invalid_argument);
  // Coefficients whose penalty terms do not fit int32: 2 * 1 * 50000 * 50000 > 2^31.
  CHECK(add_sum_equal(b, set, {0, 1}, {50000, 50000}, 0, std::int32_t{1}).status().code ==
        StatusCode::value_out_of_range);
  CHECK(add_sum_equal(b, set, {0}, {constraint_data_limit}, 1, std::int32_t{1}).status().code ==
        StatusCode::value_out_of_range);
  QuboBuilder<double> bd(2);
  CHECK(add_one_hot(bd, set, {0, 1}, std::numeric_limits<double>::quiet_NaN()).status().code ==
        StatusCode::invalid_argument);
  CHECK(b.num_terms() == terms);
  CHECK(set.size() == 0);
  CHECK(set.num_variables() == 4);
  CHECK(b.status().ok());
}

// Penalty-weight bound: with every weight >= suggest_penalty_weight(f), no infeasible state
// has lower energy than the best feasible one, and the ground state decodes to the best
// feasible x (checked against enumeration of the decision variables alone).
TEST_CASE_TEMPLATE("suggested penalty weight: no infeasible state beats the best feasible one", Value, std::int32_t,
                   double) {
  Xoshiro256 rng(4242);
  for (int trial = 0; trial < 25; ++trial) {
    const std::uint64_t n = 6;
    // Random objective with integer-valued (or quarter-integer) coefficients in [-9, 9]. The
    // builder grows on demand, so that its copy accepts the slack bits.
    QuboBuilder<Value> obj;
    for (std::uint64_t i = 0; i < n; ++i) {
      obj.add_unary(i,
                    static_cast<Value>(static_cast<int>(rng.below(19)) - 9) / Value{std::is_integral_v<Value> ? 1 : 4});
      for (std::uint64_t j = i + 1; j < n; ++j) {
        if (rng.below(2) == 0) obj.add_pair(i, j, static_cast<Value>(static_cast<int>(rng.below(19)) - 9));
      }
    }
    auto f = obj.build();
    REQUIRE(f.ok());
    auto a = suggest_penalty_weight(*f);
    REQUIRE(a.ok());
    if constexpr (std::is_integral_v<Value>) CHECK(*a == objective_span(*f) + 1);
    if constexpr (!std::is_integral_v<Value>) CHECK(*a > objective_span(*f));
    // Constraints planted around a random x0, so the feasible set is not empty.
    std::vector<std::uint8_t> x0(n);
    for (auto& v : x0) v = static_cast<std::uint8_t>(rng.below(2));
    QuboBuilder<Value> full = obj;
    ConstraintSet set(n);
    const std::vector<std::uint64_t> g1{0, 1, 2, 3};
    REQUIRE(add_k_hot(full, set, g1, std::uint64_t{x0[0]} + x0[1] + x0[2] + x0[3], *a).ok());
    std::vector<std::int64_t> coef{
        static_cast<std::int64_t>(rng.below(7)) - 2, static_cast<std::int64_t>(rng.below(7)) - 2,
        static_cast<std::int64_t>(rng.below(7)) - 2, static_cast<std::int64_t>(rng.below(7)) - 2};
    const std::vector<std::uint64_t> g2{2, 3, 4, 5};
    REQUIRE(
        add_sum_at_most(full, set, g2, coef, lhs_of(g2, coef, x0.data()) + static_cast<std::int64_t>(rng.below(2)), *a)
            .ok());
    if (x0[4] + x0[5] + x0[0] <= 1) REQUIRE(add_pairwise_exclusion(full, set, {0, 4, 5}, *a).ok());
    auto model = full.build();
    REQUIRE(model.ok());
    const auto total = static_cast<std::uint32_t>(model->num_spins());
    REQUIRE(total == set.num_variables());
    bool have_feasible = false;
    bool have_infeasible = false;
    energy_t<Value> best_feasible{};
    energy_t<Value> best_infeasible{};
    std::vector<std::uint8_t> argmin;
    for_each_bits(total, [&](const std::uint8_t* x) {
      const auto e = model->energy_of_bits(x);
      if (set.check_bits(x).feasible) {
        if (!have_feasible || e < best_feasible) {
          best_feasible = e;
          argmin.assign(x, x + n);
        }
        have_feasible = true;
      } else {
        if (!have_infeasible || e < best_infeasible) best_infeasible = e;
        have_infeasible = true;
      }
    });
    REQUIRE(have_feasible);
    REQUIRE(have_infeasible);
    CHECK(best_infeasible > best_feasible);
    // The best feasible energy is the objective's optimum over feasible decision vectors.
    energy_t<Value> opt{};
    bool any = false;
    for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
      std::vector<std::uint8_t> padded(x, x + n);
      padded.resize(total, 0);
      if (!set.check_bits(padded.data()).feasible) return;
      const auto e = f->energy_of_bits(x);
      if (!any || e < opt) opt = e;
      any = true;
    });
    CHECK(best_feasible == opt);
  }
}

TEST_CASE("objective span bounds the objective's range (QUBO and Ising)") {
  Xoshiro256 rng(9);
  for (int trial = 0; trial < 10; ++trial) {
    QuboBuilder<std::int32_t> qb(6);
    IsingBuilder<std::int32_t> ib(6);
    for (std::uint64_t i = 0; i < 6; ++i) {
      qb.add_unary(i, static_cast<std::int32_t>(rng.below(21)) - 10);
      ib.add_field(i, static_cast<std::int32_t>(rng.below(21)) - 10);
      for (std::uint64_t j = i + 1; j < 6; ++j) {
        qb.add_pair(i, j, static_cast<std::int32_t>(rng.below(21)) - 10);
        ib.add_coupling(i, j, static_cast<std::int32_t>(rng.below(21)) - 10);
      }
    }
    auto q = qb.build();
    auto m = ib.build();
    REQUIRE(q.ok());
    REQUIRE(m.ok());
    for (int which = 0; which < 2; ++which) {
      std::int64_t lo = 0, hi = 0;
      bool first = true;
      problems_test::for_each_state(*q, [&](const std::int8_t* s, const std::uint8_t*, std::int64_t) {
        const std::int64_t e = which == 0 ? q->energy(s) : m->energy(s);
        if (first || e < lo) lo = e;
        if (first || e > hi) hi = e;
        first = false;
      });
      const std::int64_t span = which == 0 ? objective_span(*q) : objective_span(*m);
      CHECK(hi - lo <= span);
    }
  }
}

// A negative control: below the bound the ground state can be infeasible, so the checks
// above are not vacuous. Objective -10 x_0, constraint x_0 <= 0 (inequality, no slack bits):
// with A = 1 the infeasible x_0 = 1 has energy -10 + 1 < 0, the feasible x_0 = 0 has 0.
TEST_CASE("a fixed-size builder too small for the slack bits reports its refusal") {
  QuboBuilder<std::int32_t> b(2);
  ConstraintSet set(2);
  auto r = add_sum_at_most(b, set, {0, 1}, {2, 3}, 4, std::int32_t{1});
  CHECK(r.status().code == StatusCode::index_out_of_range);
  CHECK(set.size() == 0);
  CHECK(set.num_variables() == 2);
  CHECK(!b.build().ok());
}

TEST_CASE("penalty weight below the bound lets an infeasible state win") {
  for (const std::int32_t a : {1, 10, 11}) {
    QuboBuilder<std::int32_t> b(1);
    b.add_unary(0, -10);
    ConstraintSet set(1);
    REQUIRE(add_sum_at_most(b, set, {0}, {1}, 0, a).ok());
    CHECK(set[0].slack_weights.empty());
    auto m = b.build();
    REQUIRE(m.ok());
    REQUIRE(m->num_spins() == 1);
    const std::vector<std::uint8_t> one{1}, zero{0};
    const bool infeasible_wins = m->energy_of_bits(one.data()) < m->energy_of_bits(zero.data());
    CHECK(infeasible_wins == (a < 10));
  }
  QuboBuilder<std::int32_t> obj(1);
  obj.add_unary(0, -10);
  auto f = obj.build();
  REQUIRE(f.ok());
  CHECK(*suggest_penalty_weight(*f) == 11);
}
