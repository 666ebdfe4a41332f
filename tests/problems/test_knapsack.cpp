// 0-1 knapsack with slack bits: ground states of the encoded model are optimal packings,
// checked against enumeration of every subset of items.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/knapsack.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <cstring>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

namespace {

template <class Problem>
typename Problem::energy_type best_packing(const Problem& p, std::uint64_t n) {
  typename Problem::energy_type best{0};
  problems_test::for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
    const auto r = p.check(Selection::from_bits(x, n));
    if (r.feasible && r.total_value > best) best = r.total_value;
  });
  return best;
}

}  // namespace

// A small instance that circulates widely as an illustration of the problem (common practice,
// value from memory): weights 12, 2, 1, 1, 4, values 4, 2, 1, 2, 10, capacity 15; the best
// packing takes the last four items, weight 8, value 15.
TEST_CASE("knapsack: five-item illustration, capacity 15, optimum 15") {
  auto p = KnapsackProblem<std::int64_t>::encode({12, 2, 1, 1, 4}, {4, 2, 1, 2, 10}, 15);
  REQUIRE(p.ok());
  CHECK(p->slack_weights() == std::vector<std::int64_t>{1, 2, 4, 8});
  CHECK(p->penalty_weight() == 4 + 2 + 1 + 2 + 10 + 1);
  CHECK(p->model().num_spins() == 9);
  auto ex = solve_exact(p->model());
  REQUIRE(ex.ok());
  CHECK(ex->energy == -15);
  const auto chosen = p->decode(ex->spins.data());
  CHECK(chosen.items == std::vector<std::uint64_t>{1, 2, 3, 4});
  const auto r = p->check(chosen);
  CHECK(r.feasible);
  CHECK(r.total_weight == 8);
  CHECK(r.total_value == 15);
  CHECK(best_packing(*p, 5) == 15);
  // Over capacity: all five items weigh 20 > 15; the check names the capacity constraint.
  std::vector<std::int8_t> s(p->model().num_spins(), 1);
  for (int i = 0; i < 5; ++i) s[static_cast<std::size_t>(i)] = -1;
  const auto f = p->feasibility(s.data());
  CHECK_FALSE(f.feasible);
  CHECK(f.kind == ConstraintKind::sum_at_most);
  CHECK(std::strcmp(f.label.text, "total weight within capacity") == 0);
  CHECK(f.lhs == 20);
  CHECK(f.amount == 5);
  CHECK_FALSE(p->check(p->decode(s.data())).feasible);
}

TEST_CASE_TEMPLATE("knapsack: random instances, ground state = best packing over all subsets", Value, std::int64_t,
                   std::int32_t, double) {
  Xoshiro256 rng(2718);
  for (int trial = 0; trial < 20; ++trial) {
    const std::size_t n = 3 + rng.below(5);
    std::vector<std::int64_t> w(n);
    std::vector<Value> v(n);
    std::int64_t total = 0;
    for (std::size_t i = 0; i < n; ++i) {
      w[i] = 1 + rng.below(12);
      v[i] = static_cast<Value>(rng.below(20));
      total += w[i];
    }
    const std::int64_t cap = static_cast<std::int64_t>(rng.below(static_cast<std::uint32_t>(total + 1)));
    auto p = KnapsackProblem<Value>::encode(w, v, cap);
    REQUIRE(p.ok());
    REQUIRE(p->model().num_spins() <= 20);
    auto ex = solve_exact(p->model());
    REQUIRE(ex.ok());
    const auto r = p->check(p->decode(ex->spins.data()));
    const auto best = best_packing(*p, n);
    CHECK(r.feasible);
    CHECK(p->feasibility(ex->spins.data()).feasible);
    CHECK(r.total_value == best);
    CHECK(ex->energy == -best);
  }
}

// Below the bound the encoding can prefer an overfull knapsack: one item of weight 2 and
// value 10, capacity 1, A = 1 -> packing it costs -10 + 1 * (2 - 1)^2 = -9 < 0.
TEST_CASE("knapsack: a penalty weight below the bound lets an overfull packing win") {
  auto weak = KnapsackProblem<std::int64_t>::encode({2}, {10}, 1, 1);
  REQUIRE(weak.ok());
  auto ex = solve_exact(weak->model());
  REQUIRE(ex.ok());
  CHECK_FALSE(weak->check(weak->decode(ex->spins.data())).feasible);
  auto strong = KnapsackProblem<std::int64_t>::encode({2}, {10}, 1);
  REQUIRE(strong.ok());
  auto ex2 = solve_exact(strong->model());
  REQUIRE(ex2.ok());
  CHECK(strong->check(strong->decode(ex2->spins.data())).feasible);
  CHECK(ex2->energy == 0);
}

TEST_CASE("knapsack: refused input") {
  CHECK(KnapsackProblem<std::int64_t>::encode({1, 2}, {1}, 3).status().code == StatusCode::invalid_argument);
  CHECK(KnapsackProblem<std::int64_t>::encode({1, -2}, {1, 1}, 3).status().code == StatusCode::invalid_argument);
  CHECK(KnapsackProblem<std::int64_t>::encode({1, 2}, {1, 1}, -1).status().code == StatusCode::invalid_argument);
  CHECK(KnapsackProblem<std::int64_t>::encode({1, 2}, {1, 1}, 3, -4).status().code == StatusCode::invalid_argument);
}
