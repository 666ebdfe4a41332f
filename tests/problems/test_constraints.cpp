// Constraint records and the feasibility check: the first violated constraint is named by
// position, kind, label and amount, for bits and spins alike.
#include <doctest/doctest.h>
#include <spinwright/model.hpp>
#include <spinwright/problems/constraints.hpp>
#include <spinwright/problems/penalty.hpp>

#include <cstdint>
#include <cstring>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

TEST_CASE("violation by relation") {
  Constraint c;
  c.bound = 3;
  c.relation = Relation::equal;
  CHECK(c.violation(3) == 0);
  CHECK(c.violation(1) == 2);
  CHECK(c.violation(7) == 4);
  c.relation = Relation::at_most;
  CHECK(c.violation(3) == 0);
  CHECK(c.violation(-5) == 0);
  CHECK(c.violation(5) == 2);
  c.relation = Relation::at_least;
  CHECK(c.violation(9) == 0);
  CHECK(c.violation(1) == 2);
}

TEST_CASE("the check names the first violated constraint, for bits and spins") {
  // Variables 0..5; slack bits of the inequality follow.
  QuboBuilder<std::int64_t> b;
  ConstraintSet set(6);
  REQUIRE(add_one_hot(b, set, {0, 1, 2}, std::int64_t{4}, {"one shift per nurse", 11}).ok());          // #0
  REQUIRE(add_k_hot(b, set, {3, 4, 5}, 2, std::int64_t{4}, {"two on call", 12}).ok());                 // #1
  REQUIRE(add_sum_at_most(b, set, {0, 3, 4}, {3, 2, 2}, 4, std::int64_t{4}, {"hours cap", 13}).ok());  // #2
  REQUIRE(add_pairwise_exclusion(b, set, {1, 5}, std::int64_t{4}, {"not both", 14}).ok());             // #3
  REQUIRE(add_sum_equal(b, set, {2, 5}, {1, -1}, 0, std::int64_t{4}, {"tied", 15}).ok());              // #4
  REQUIRE(set.size() == 5);
  CHECK(set[2].slack_begin == 6);
  CHECK(set.num_decision_variables() == 6);
  CHECK(set.num_variables() == 6 + set[2].slack_weights.size());

  auto check_both = [&](std::vector<std::uint8_t> x) {
    x.resize(set.num_variables(), 0);
    std::vector<std::int8_t> s(x.size());
    for (std::size_t i = 0; i < x.size(); ++i) s[i] = x[i] ? -1 : 1;
    const Feasibility fb = set.check_bits(x.data());
    const Feasibility fs = set.check_spins(s.data());
    CHECK(fb.feasible == fs.feasible);
    CHECK(fb.first == fs.first);
    CHECK(fb.amount == fs.amount);
    CHECK(fb.violated_count == fs.violated_count);
    return fb;
  };

  // Feasible: x2 = 1 (one shift); x3 = x5 = 1 (two on call, hours 2 <= 4, x5 tied to x2).
  auto f = check_both({0, 0, 1, 1, 0, 1});
  CHECK(f.feasible);
  CHECK(static_cast<bool>(f));
  CHECK(f.violated_count == 0);

  // Two shifts for the nurse (#0) and hours 3 + 2 = 5 > 4 (#2): #0 is named first.
  f = check_both({1, 0, 1, 1, 0, 1});
  CHECK_FALSE(f.feasible);
  CHECK(f.first == 0);
  CHECK(f.kind == ConstraintKind::one_hot);
  CHECK(std::strcmp(f.label.text, "one shift per nurse") == 0);
  CHECK(f.label.tag == 11);
  CHECK(f.lhs == 2);
  CHECK(f.bound == 1);
  CHECK(f.amount == 1);
  CHECK(f.violated_count == 2);

  // Only the inequality: x0 = 1 alone, x3 = x4 = 1 gives 7 > 4; x5 = 0 ties with x2 = 0.
  f = check_both({1, 0, 0, 1, 1, 0});
  CHECK(f.first == 2);
  CHECK(f.kind == ConstraintKind::sum_at_most);
  CHECK(std::strcmp(to_string(f.kind), "weighted sum at most a bound") == 0);
  CHECK(f.amount == 3);
  CHECK(f.violated_count == 1);

  // x1 = x5 = 1 breaks pairwise-exclusion (#3); the tie x2 = x5 (#4) then fails too, since x2 = 1
  // would give the nurse two shifts. #3 is named first.
  f = check_both({0, 1, 0, 1, 0, 1});
  CHECK(f.first == 3);
  CHECK(f.kind == ConstraintKind::pairwise_exclusion);
  CHECK(f.amount == 1);
  CHECK(f.violated_count == 2);

  // Only the equality: x2 = 1, x5 = 0, with two on call from x3, x4 (hours 4).
  f = check_both({0, 0, 1, 1, 1, 0});
  CHECK(f.first == 4);
  CHECK(f.kind == ConstraintKind::sum_equal);
  CHECK(f.label.tag == 15);
  CHECK(f.lhs == 1);
  CHECK(f.amount == 1);

  // Slack bits never affect feasibility.
  std::vector<std::uint8_t> x{0, 0, 1, 1, 0, 1};
  x.resize(set.num_variables(), 1);
  CHECK(set.check_bits(x.data()).feasible);
}

TEST_CASE("energy 0 exactly on feasible states (with their best slack), >= the weight otherwise") {
  QuboBuilder<std::int64_t> b;
  ConstraintSet set(5);
  REQUIRE(add_k_hot(b, set, {0, 1, 2, 3}, 2, std::int64_t{3}).ok());
  REQUIRE(add_sum_at_most(b, set, {1, 2, 4}, {4, -1, 3}, 3, std::int64_t{3}).ok());
  auto m = b.build();
  REQUIRE(m.ok());
  REQUIRE(m->num_spins() == set.num_variables());
  std::vector<std::int64_t> best(32, -1);
  problems_test::for_each_state(*m, [&](const std::int8_t*, const std::uint8_t* x, std::int64_t e) {
    std::size_t code = 0;
    for (std::size_t i = 0; i < 5; ++i) code |= static_cast<std::size_t>(x[i]) << i;
    if (best[code] < 0 || e < best[code]) best[code] = e;
  });
  int feasible = 0;
  for (std::size_t code = 0; code < 32; ++code) {
    std::uint8_t x[5];
    for (std::size_t i = 0; i < 5; ++i) x[i] = static_cast<std::uint8_t>((code >> i) & 1);
    std::vector<std::uint8_t> padded(x, x + 5);
    padded.resize(set.num_variables(), 0);
    const bool ok = set.check_bits(padded.data()).feasible;
    feasible += ok ? 1 : 0;
    if (ok) CHECK(best[code] == 0);
    if (!ok) CHECK(best[code] >= 3);
  }
  CHECK(feasible > 0);
  CHECK(feasible < 32);
}
