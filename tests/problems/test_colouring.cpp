// Graph colouring with k colours: one-hot per vertex plus a penalty per monochromatic edge.
// Outside facts: chromatic numbers of odd cycles (3), complete graphs K_n (n) and the
// Petersen graph (3) (common practice), and the chromatic polynomial of the cycle,
// P(C_n, k) = (k - 1)^n + (-1)^n (k - 1) (common practice; e.g. Bondy & Murty, Graph Theory,
// 2008), which counts proper colourings and hence the ground states of the encoding.
#include <doctest/doctest.h>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/colouring.hpp>

#include <cstdint>
#include <cstring>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

namespace {

// Fewest monochromatic edges over all k^n colourings, using only the problem's checker.
template <class Problem>
std::uint64_t fewest_conflicts(const Problem& p, std::uint64_t n, std::uint32_t k) {
  std::vector<std::uint32_t> c(n, 0);
  std::uint64_t best = ~std::uint64_t{0};
  while (true) {
    const auto r = p.check(Colouring{c});
    if (r.conflicts < best) best = r.conflicts;
    std::uint64_t i = 0;
    while (i < n && ++c[i] == k) c[i++] = 0;
    if (i == n) break;
  }
  return best;
}

// Smallest k with a proper colouring, searched over the original domain.
std::uint32_t chromatic_number(std::uint64_t n, const std::vector<Edge>& edges) {
  for (std::uint32_t k = 1;; ++k) {
    auto p = ColouringProblem<std::int32_t>::encode(n, edges, k);
    REQUIRE(p.ok());
    if (fewest_conflicts(*p, n, k) == 0) return k;
  }
}

}  // namespace

TEST_CASE("colouring: chromatic numbers of odd cycles, K_n and the Petersen graph") {
  for (std::uint64_t n = 3; n <= 9; n += 2) CHECK(chromatic_number(n, problems_test::cycle_graph(n)) == 3);
  for (std::uint64_t n = 4; n <= 8; n += 2) CHECK(chromatic_number(n, problems_test::cycle_graph(n)) == 2);
  for (std::uint64_t n = 2; n <= 6; ++n) CHECK(chromatic_number(n, problems_test::complete_graph(n)) == n);
  CHECK(chromatic_number(10, problems_test::petersen_graph()) == 3);
}

// Exhaustive enumeration of the encoded model: the ground energy is A times the fewest
// conflicts, and with k colours enough the ground states are exactly the proper colourings.
TEST_CASE("colouring: encoded ground states are the proper colourings (chromatic polynomial of C_n)") {
  for (std::uint64_t n = 3; n <= 5; ++n) {
    for (std::uint32_t k = 2; k <= 3; ++k) {
      const auto edges = problems_test::cycle_graph(n);
      auto p = ColouringProblem<std::int32_t>::encode(n, edges, k, 2);
      REQUIRE(p.ok());
      const auto g = problems_test::ground_states(p->model());
      const std::int64_t km1 = k - 1;
      std::int64_t proper = 1;
      for (std::uint64_t i = 0; i < n; ++i) proper *= km1;
      proper += (n % 2 == 0 ? 1 : -1) * km1;
      if (proper > 0) {
        CHECK(g.energy == 0);
        CHECK(static_cast<std::int64_t>(g.states.size()) == proper);
        for (const auto& s : g.states) {
          CHECK(p->feasibility(s.data()).feasible);
          const auto r = p->check(p->decode(s.data()));
          CHECK(r.valid);
          CHECK(r.conflicts == 0);
        }
      } else {
        // Odd cycle with 2 colours: one conflict at least, each costing A = 2.
        CHECK(fewest_conflicts(*p, n, k) == 1);
        CHECK(g.energy == 2);
        for (const auto& s : g.states) CHECK_FALSE(p->feasibility(s.data()).feasible);
      }
    }
  }
}

TEST_CASE("colouring: K_4 needs 4 colours (16 bits enumerated)") {
  auto p3 = ColouringProblem<std::int32_t>::encode(4, problems_test::complete_graph(4), 3);
  auto p4 = ColouringProblem<std::int32_t>::encode(4, problems_test::complete_graph(4), 4);
  REQUIRE(p3.ok());
  REQUIRE(p4.ok());
  auto e3 = solve_exact(p3->model());
  auto e4 = solve_exact(p4->model());
  REQUIRE(e3.ok());
  REQUIRE(e4.ok());
  CHECK(e3->energy == 1);  // one conflict (or one vertex left uncoloured) is unavoidable
  CHECK(e4->energy == 0);
  CHECK(e4->ground_states == 24);  // 4! proper colourings of K_4
  CHECK(p4->check(p4->decode(e4->spins.data())).valid);
  CHECK(p4->check(p4->decode(e4->spins.data())).colours_used == 4);
}

TEST_CASE("colouring: Petersen graph with 2 colours, ground energy = fewest conflicts (20 bits)") {
  auto p = ColouringProblem<std::int32_t>::encode(10, problems_test::petersen_graph(), 2);
  REQUIRE(p.ok());
  auto ex = solve_exact(p->model());
  REQUIRE(ex.ok());
  const std::uint64_t fewest = fewest_conflicts(*p, 10, 2);
  // 15 edges minus the maximum cut 12 (project reference sheet, section 5).
  CHECK(fewest == 3);
  CHECK(ex->energy == static_cast<std::int64_t>(fewest));
  // Leaving a vertex uncoloured costs A as a conflict does, so a ground state may do either;
  // its decoded answer has exactly `fewest` defects in total.
  const auto r = p->check(p->decode(ex->spins.data()));
  CHECK(r.conflicts + r.uncoloured == fewest);
  CHECK_FALSE(r.valid);
}

TEST_CASE("colouring: a proper 3-colouring of the Petersen graph has energy 0, a spoiled one does not") {
  auto p = ColouringProblem<std::int64_t>::encode(10, problems_test::petersen_graph(), 3, 5);
  REQUIRE(p.ok());
  // Find one proper colouring over the original domain (3^10 colourings).
  std::vector<std::uint32_t> c(10, 0);
  bool found = false;
  while (!found) {
    if (p->check(Colouring{c}).valid) {
      found = true;
      break;
    }
    std::size_t i = 0;
    while (i < 10 && ++c[i] == 3) c[i++] = 0;
    if (i == 10) break;
  }
  REQUIRE(found);
  auto bits = p->encode_answer(Colouring{c});
  CHECK(p->model().energy_of_bits(bits.data()) == 0);
  CHECK(p->decode_bits(bits.data()).colour == c);
  // Vertex 4 loses its colour: the first violated constraint is its one-hot group.
  bits[p->variable(4, c[4])] = 0;
  std::vector<std::int8_t> s(bits.size());
  for (std::size_t i = 0; i < bits.size(); ++i) s[i] = bits[i] ? -1 : 1;
  const auto f = p->feasibility(s.data());
  CHECK_FALSE(f.feasible);
  CHECK(f.kind == ConstraintKind::one_hot);
  CHECK(f.label.tag == 4);
  CHECK(std::strcmp(f.label.text, "one colour per vertex") == 0);
  CHECK(f.amount == 1);
  CHECK(p->model().energy_of_bits(bits.data()) == 5);
  CHECK(p->check(p->decode(s.data())).uncoloured == 1);
  // Vertex 4 takes the colour of its neighbour 0: the named constraint is an edge conflict.
  bits[p->variable(4, c[0])] = 1;
  for (std::size_t i = 0; i < bits.size(); ++i) s[i] = bits[i] ? -1 : 1;
  const auto g = p->feasibility(s.data());
  CHECK(g.kind == ConstraintKind::pairwise_exclusion);
  CHECK(std::strcmp(g.label.text, "edge endpoints share a colour") == 0);
  CHECK(p->check(p->decode(s.data())).conflicts >= 1);
}

TEST_CASE("colouring: refused input") {
  CHECK(ColouringProblem<std::int32_t>::encode(3, {{0, 1}}, 0).status().code == StatusCode::invalid_argument);
  CHECK(ColouringProblem<std::int32_t>::encode(3, {{0, 5}}, 2).status().code == StatusCode::index_out_of_range);
  CHECK(ColouringProblem<std::int32_t, std::uint16_t>::encode(40000, {}, 2).status().code == StatusCode::size_limit);
  CHECK(ColouringProblem<std::int32_t>::encode(3, {{0, 1}}, 2, -1).status().code == StatusCode::invalid_argument);
}

// Beyond enumeration here (30 bits): annealing on the encoded model reaches energy 0, and the
// decoded answer is a proper 3-colouring of the Petersen graph by the graph's own check.
TEST_CASE("colouring: annealing finds a proper 3-colouring of the Petersen graph") {
  auto p = ColouringProblem<std::int32_t>::encode(10, problems_test::petersen_graph(), 3);
  REQUIRE(p.ok());
  AnnealParams params;
  params.sweeps = 2000;
  bool found = false;
  for (std::uint64_t r = 0; r < 8 && !found; ++r) {
    const auto sol = anneal(p->model(), params, 2026, r);
    if (sol.energy != 0) continue;
    found = true;
    CHECK(p->feasibility(sol.spins.data()).feasible);
    const auto rep = p->check(p->decode(sol.spins.data()));
    CHECK(rep.valid);
    CHECK(rep.colours_used == 3);
  }
  CHECK(found);
}
