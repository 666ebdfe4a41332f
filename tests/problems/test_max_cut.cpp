// Max-cut encoder: J = w, h = 0; ground states decode to maximum cuts, checked against the
// project's reference sheet (section 5) and against enumeration over the graph's own cuts.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/max_cut.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cstdint>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

namespace {

std::vector<WeightedEdge<std::int32_t>> unit(const std::vector<Edge>& edges) {
  std::vector<WeightedEdge<std::int32_t>> w;
  for (const auto& e : edges) w.push_back({e.u, e.v, 1});
  return w;
}

// The largest cut by enumeration over side vectors, using only the problem's checker.
template <class Problem>
typename Problem::energy_type best_cut(const Problem& p, std::uint64_t n) {
  typename Problem::energy_type best{0};
  problems_test::for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
    const auto r = p.check(Bipartition::from_sides(std::vector<std::uint8_t>(x, x + n)));
    if (r.cut_weight > best) best = r.cut_weight;
  });
  return best;
}

}  // namespace

// Facts: K_n max cut floor(n^2/4) (Mantel/Turan, common practice); C_n: n even n, n odd n-1
// (common practice); Petersen graph 12 with 5 optimal cuts up to complement (common practice;
// project reference sheet section 5).
TEST_CASE("max-cut: published maximum cuts of K_n, C_n and the Petersen graph") {
  struct Case {
    std::uint64_t n;
    std::vector<Edge> edges;
    std::int64_t max_cut;
    std::uint64_t optimal_states;  // 0: not checked
  };
  std::vector<Case> cases;
  for (std::uint64_t n = 3; n <= 8; ++n)
    cases.push_back({n, problems_test::complete_graph(n), static_cast<std::int64_t>(n * n / 4), 0});
  for (std::uint64_t n = 3; n <= 9; ++n)
    cases.push_back({n, problems_test::cycle_graph(n), static_cast<std::int64_t>(n % 2 == 0 ? n : n - 1), 0});
  cases.push_back({10, problems_test::petersen_graph(), 12, 10});
  for (const auto& c : cases) {
    auto p = MaxCutProblem<std::int32_t>::encode(c.n, unit(c.edges));
    REQUIRE(p.ok());
    CHECK(p->total_weight() == static_cast<std::int64_t>(c.edges.size()));
    auto ex = solve_exact(p->model());
    REQUIRE(ex.ok());
    const auto sides = p->decode(ex->spins.data());
    const auto report = p->check(sides);
    CHECK(report.valid);
    CHECK(report.cut_weight == c.max_cut);
    CHECK(report.cut_weight == (p->total_weight() - ex->energy) / 2);
    CHECK(best_cut(*p, c.n) == c.max_cut);
    CHECK(sides.zero.size() + sides.one.size() == c.n);
    if (c.optimal_states != 0) CHECK(ex->ground_states == c.optimal_states);
  }
}

// Weighted example from the project's reference sheet, section 5: edges (0,1,3), (1,2,1),
// (2,3,4), (3,0,2), (0,2,5): maximum cut 12 with {0,3} | {1,2}, W = 15, E_min = -9.
TEST_CASE("max-cut: weighted four-vertex example") {
  auto p = MaxCutProblem<std::int32_t>::encode(4, {{0, 1, 3}, {1, 2, 1}, {2, 3, 4}, {3, 0, 2}, {0, 2, 5}});
  REQUIRE(p.ok());
  auto g = problems_test::ground_states(p->model());
  CHECK(g.energy == -9);
  CHECK(g.states.size() == 2);
  for (const auto& s : g.states) {
    const auto sides = p->decode(s.data());
    CHECK(p->check(sides).cut_weight == 12);
    CHECK(sides.side[0] == sides.side[3]);
    CHECK(sides.side[1] == sides.side[2]);
    CHECK(sides.side[0] != sides.side[1]);
  }
}

TEST_CASE("max-cut: cut = (W - E) / 2 on every state of random weighted graphs") {
  Xoshiro256 rng(31);
  for (int trial = 0; trial < 10; ++trial) {
    const std::uint64_t n = 7;
    std::vector<WeightedEdge<double>> edges;
    for (std::uint64_t i = 0; i < n; ++i) {
      for (std::uint64_t j = i + 1; j < n; ++j) {
        if (rng.below(2)) edges.push_back({i, j, static_cast<double>(rng.below(9)) - 3.0});
      }
    }
    auto p = MaxCutProblem<double>::encode(n, edges);
    REQUIRE(p.ok());
    problems_test::for_each_state(p->model(), [&](const std::int8_t* s, const std::uint8_t* x, double e) {
      CHECK(p->check(p->decode(s)).cut_weight == (p->total_weight() - e) / 2);
      CHECK(p->decode_bits(x).side == p->decode(s).side);
    });
  }
}

TEST_CASE("max-cut: refused graphs and malformed answers") {
  CHECK(MaxCutProblem<std::int32_t>::encode(3, {{0, 3, 1}}).status().code == StatusCode::index_out_of_range);
  CHECK(MaxCutProblem<std::int32_t>::encode(3, {{1, 1, 1}}).status().code == StatusCode::invalid_argument);
  auto p = MaxCutProblem<std::int32_t>::encode(3, {{0, 1, 1}});
  REQUIRE(p.ok());
  CHECK_FALSE(p->check(Bipartition::from_sides({0, 1})).valid);
}

// A triangle with unit edges plus a self-loop of weight 5 at vertex 0, by hand: the self-loop
// folds into the offset (5), so W = 5 + 3 = 8; a self-loop is never cut, so the largest cut
// is 2 (two of the triangle's edges), at E = 8 - 2 * 2 = 4. For every assignment the cut from
// the energy, (W - E) / 2, equals the cut counted on the raw edge list (common practice:
// cut(s) = (W - E(s)) / 2 with W the total weight, Barahona et al., Oper. Res. 36, 1988).
TEST_CASE("total_weight counts a self-loop's offset: triangle plus a loop of weight 5, by hand") {
  IsingBuilder<std::int32_t> b(3);
  b.add_coupling(0, 1, 1).add_coupling(1, 2, 1).add_coupling(0, 2, 1).add_coupling(0, 0, 5);
  const auto m = b.build().value();
  CHECK(m.offset() == 5);
  CHECK(total_weight(m) == 8);
  const int raw[3][2] = {{0, 1}, {1, 2}, {0, 2}};
  std::int64_t best = -1;
  for (int code = 0; code < 8; ++code) {
    const std::int8_t s[3] = {static_cast<std::int8_t>(code & 1 ? -1 : 1), static_cast<std::int8_t>(code & 2 ? -1 : 1),
                              static_cast<std::int8_t>(code & 4 ? -1 : 1)};
    std::int64_t by_hand = 0;
    for (const auto& e : raw) by_hand += s[e[0]] != s[e[1]] ? 1 : 0;
    CAPTURE(code);
    CHECK(cut_from_energy(total_weight(m), m.energy(s)) == by_hand);
    CHECK(cut_value(m, s) == by_hand);
    best = by_hand > best ? by_hand : best;
  }
  CHECK(best == 2);
  const auto ground = solve_exact(m);
  REQUIRE(ground.ok());
  CHECK(ground->energy == 4);
  CHECK(cut_from_energy(total_weight(m), ground->energy) == 2);
}
