// Number partitioning as Ising: H = A (sum n_i s_i)^2, J_ij = 2 A n_i n_j, h = 0,
// c = A sum n_i^2 (A. Lucas, "Ising formulations of many NP problems", Front. Phys. 2:5, 2014,
// section 2). Facts from the project's reference sheet, section 7 (computed there by
// enumeration; S. Mertens, Theor. Comput. Sci. 265, 2001 for the problem).
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/partition.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <set>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

TEST_CASE("partition: coefficients are Lucas's J = 2 A n_i n_j, c = A sum n^2") {
  auto p = PartitionProblem<std::int64_t>::encode({4, 5, 6, 7, 8}, 3);
  REQUIRE(p.ok());
  const auto& m = p->model();
  CHECK(m.offset() == 3 * 190);
  CHECK(m.coupling(0, 1) == 2 * 3 * 4 * 5);
  CHECK(m.coupling(3, 4) == 2 * 3 * 7 * 8);
  for (std::uint32_t i = 0; i < 5; ++i) CHECK(m.field(i) == 0);
}

TEST_CASE("partition: {4,5,6,7,8} is perfect, 2 ground states ({4,5,6} | {7,8})") {
  auto p = PartitionProblem<std::int64_t>::encode({4, 5, 6, 7, 8});
  REQUIRE(p.ok());
  auto ex = solve_exact(p->model());
  REQUIRE(ex.ok());
  CHECK(ex->energy == 0);
  CHECK(ex->ground_states == 2);
  auto g = problems_test::ground_states(p->model());
  REQUIRE(g.states.size() == 2);
  for (const auto& s : g.states) {
    const auto sides = p->decode(s.data());
    const auto r = p->check(sides);
    CHECK(r.valid);
    CHECK(r.difference == 0);
    CHECK(r.sum_zero == 15);
    CHECK(r.sum_one == 15);
    // {4,5,6} on one side, {7,8} on the other.
    CHECK(sides.side[0] == sides.side[1]);
    CHECK(sides.side[1] == sides.side[2]);
    CHECK(sides.side[3] == sides.side[4]);
    CHECK(sides.side[0] != sides.side[3]);
  }
}

TEST_CASE("partition: {1,2,4} has residue 1, spectrum {1, 9, 25, 49}") {
  auto p = PartitionProblem<std::int64_t>::encode({1, 2, 4});
  REQUIRE(p.ok());
  std::set<std::int64_t> spectrum;
  problems_test::for_each_state(p->model(), [&](const std::int8_t* s, const std::uint8_t*, std::int64_t e) {
    spectrum.insert(e);
    const auto r = p->check(p->decode(s));
    CHECK(e == r.difference * r.difference);
  });
  CHECK(spectrum == std::set<std::int64_t>{1, 9, 25, 49});
  auto ex = solve_exact(p->model());
  REQUIRE(ex.ok());
  CHECK(ex->energy == 1);
  const auto r = p->check(p->decode(ex->spins.data()));
  CHECK(r.difference == 1);
  CHECK((r.sum_zero == 3 || r.sum_one == 3));
}

TEST_CASE("partition: {3,1,1,2,2,1} has 10 perfect ground states") {
  auto p = PartitionProblem<std::int64_t>::encode({3, 1, 1, 2, 2, 1});
  REQUIRE(p.ok());
  auto ex = solve_exact(p->model());
  REQUIRE(ex.ok());
  CHECK(ex->energy == 0);
  CHECK(ex->ground_states == 10);
  for (const auto& s : problems_test::ground_states(p->model()).states)
    CHECK(p->check(p->decode(s.data())).difference == 0);
}

TEST_CASE_TEMPLATE("partition: ground state decodes to the smallest residue over all subsets", Value, std::int32_t,
                   std::int64_t, double) {
  Xoshiro256 rng(555);
  for (int trial = 0; trial < 20; ++trial) {
    std::vector<Value> numbers(3 + rng.below(8));
    for (auto& v : numbers) v = static_cast<Value>(1 + rng.below(40));
    const Value a = static_cast<Value>(1 + rng.below(3));
    auto p = PartitionProblem<Value>::encode(numbers, a);
    REQUIRE(p.ok());
    // Smallest |sum_A - sum_B| over every subset, from the numbers alone.
    energy_t<Value> best{-1};
    problems_test::for_each_bits(static_cast<std::uint32_t>(numbers.size()), [&](const std::uint8_t* x) {
      energy_t<Value> d{0};
      for (std::size_t i = 0; i < numbers.size(); ++i) d += (x[i] ? -1 : 1) * static_cast<energy_t<Value>>(numbers[i]);
      if (d < 0) d = -d;
      if (best < 0 || d < best) best = d;
    });
    auto ex = solve_exact(p->model());
    REQUIRE(ex.ok());
    const auto r = p->check(p->decode(ex->spins.data()));
    CHECK(r.difference == best);
    CHECK(ex->energy == static_cast<energy_t<Value>>(a) * best * best);
  }
}

TEST_CASE("partition: refused input") {
  CHECK(PartitionProblem<std::int32_t>::encode({1, 2}, 0).status().code == StatusCode::invalid_argument);
  // 2 * 100000 * 100000 does not fit int32.
  CHECK(PartitionProblem<std::int32_t>::encode({100000, 100000}).status().code == StatusCode::value_out_of_range);
}
