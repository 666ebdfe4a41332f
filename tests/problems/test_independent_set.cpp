// Maximum independent set and minimum vertex cover as QUBOs (A. Lucas, Front. Phys. 2:5, 2014,
// sections 4.2-4.3 [section numbers from memory]). Outside facts: the Petersen graph has
// independence number 4 (common practice), so its minimum vertex cover has 10 - 4 = 6
// vertices (Gallai: complements of independent sets are covers, common practice); C_n has
// independence number floor(n/2) and K_n has 1 (common practice).
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/independent_set.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <cstring>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

namespace {

// Best feasible weight over every subset of the original vertex set, using the checker only.
template <class Problem>
typename Problem::energy_type best_over_subsets(const Problem& p, std::uint64_t n, bool maximise) {
  bool any = false;
  typename Problem::energy_type best{};
  problems_test::for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
    const auto r = p.check(Selection::from_bits(x, n));
    if (!r.valid) return;
    if (!any || (maximise ? r.weight > best : r.weight < best)) best = r.weight;
    any = true;
  });
  return best;
}

}  // namespace

TEST_CASE("independent set and vertex cover: Petersen graph 4 and 6, cycles, complete graphs") {
  struct Case {
    std::uint64_t n;
    std::vector<Edge> edges;
    std::int64_t alpha;
  };
  std::vector<Case> cases{{10, problems_test::petersen_graph(), 4}};
  for (std::uint64_t n = 3; n <= 9; ++n)
    cases.push_back({n, problems_test::cycle_graph(n), static_cast<std::int64_t>(n / 2)});
  for (std::uint64_t n = 2; n <= 7; ++n) cases.push_back({n, problems_test::complete_graph(n), 1});
  for (const auto& c : cases) {
    auto mis = encode_independent_set<std::int32_t>(c.n, c.edges);
    auto vc = encode_vertex_cover<std::int32_t>(c.n, c.edges);
    REQUIRE(mis.ok());
    REQUIRE(vc.ok());
    CHECK(mis->penalty_weight() == 2);
    const auto gi = problems_test::ground_states(mis->model());
    const auto gc = problems_test::ground_states(vc->model());
    CHECK(gi.energy == -c.alpha);
    CHECK(gc.energy == static_cast<std::int64_t>(c.n) - c.alpha);
    CHECK(best_over_subsets(*mis, c.n, true) == c.alpha);
    CHECK(best_over_subsets(*vc, c.n, false) == static_cast<std::int64_t>(c.n) - c.alpha);
    // Every ground state is feasible, optimal, and the two sets are complements.
    CHECK(gi.states.size() == gc.states.size());
    for (const auto& s : gi.states) {
      CHECK(mis->feasibility(s.data()).feasible);
      const auto r = mis->check(mis->decode(s.data()));
      CHECK(r.valid);
      CHECK(r.size == static_cast<std::uint64_t>(c.alpha));
      std::vector<std::int8_t> flipped(s);
      for (auto& v : flipped) v = static_cast<std::int8_t>(-v);
      CHECK(vc->check(vc->decode(flipped.data())).valid);
      CHECK(vc->model().energy(flipped.data()) == gc.energy);
    }
  }
}

TEST_CASE_TEMPLATE("weighted independent set and vertex cover against enumeration of subsets", Value, std::int32_t,
                   double) {
  Xoshiro256 rng(8080);
  for (int trial = 0; trial < 15; ++trial) {
    const std::uint64_t n = 8;
    std::vector<Edge> edges;
    for (std::uint64_t i = 0; i < n; ++i) {
      for (std::uint64_t j = i + 1; j < n; ++j) {
        if (rng.below(3) == 0) edges.push_back({i, j});
      }
    }
    std::vector<Value> w(n);
    for (auto& v : w) v = static_cast<Value>(1 + rng.below(9));
    for (const bool cover : {false, true}) {
      auto p = cover ? encode_vertex_cover<Value>(n, edges, w) : encode_independent_set<Value>(n, edges, w);
      REQUIRE(p.ok());
      auto ex = solve_exact(p->model());
      REQUIRE(ex.ok());
      const auto r = p->check(p->decode(ex->spins.data()));
      CHECK(r.valid);
      CHECK(p->feasibility(ex->spins.data()).feasible);
      const auto best = best_over_subsets(*p, n, !cover);
      CHECK(r.weight == best);
      CHECK(ex->energy == (cover ? best : -best));
    }
  }
}

TEST_CASE("independent set: the feasibility check names the edge inside the set") {
  auto p = encode_independent_set<std::int32_t>(10, problems_test::petersen_graph());
  REQUIRE(p.ok());
  std::vector<std::int8_t> s(10, 1);
  s[0] = -1;
  s[5] = -1;  // spoke 0 -- 5 is edge number 2 in petersen_graph()
  const auto f = p->feasibility(s.data());
  CHECK_FALSE(f.feasible);
  CHECK(f.kind == ConstraintKind::pairwise_exclusion);
  CHECK(f.label.tag == 2);
  CHECK(std::strcmp(f.label.text, "edge inside the set") == 0);
  CHECK(f.violated_count == 1);
  const auto r = p->check(p->decode(s.data()));
  CHECK_FALSE(r.valid);
  CHECK(r.violations == 1);
  auto vc = encode_vertex_cover<std::int32_t>(3, {{0, 1}, {1, 2}});
  REQUIRE(vc.ok());
  std::vector<std::int8_t> t{-1, 1, 1};
  const auto g = vc->feasibility(t.data());
  CHECK(g.kind == ConstraintKind::pair_cover);
  CHECK(g.label.tag == 1);
}

TEST_CASE("independent set: refused input") {
  CHECK(encode_independent_set<std::int32_t>(3, {{0, 1}}, {1, 2}).status().code == StatusCode::invalid_argument);
  CHECK(encode_independent_set<std::int32_t>(3, {{0, 1}}, {1, 0, 1}).status().code == StatusCode::invalid_argument);
  CHECK(encode_independent_set<std::int32_t>(3, {{0, 1}}, {1, 5, 1}, 5).status().code == StatusCode::invalid_argument);
  CHECK(encode_vertex_cover<std::int32_t>(3, {{0, 0}}).status().code == StatusCode::invalid_argument);
  auto ok = encode_independent_set<std::int32_t>(3, {{0, 1}}, {1, 5, 1}, 6);
  REQUIRE(ok.ok());
  CHECK(ok->penalty_weight() == 6);
  CHECK_FALSE(ok->check(Selection{3, {0, 0}}).valid);  // repeated vertex
}
