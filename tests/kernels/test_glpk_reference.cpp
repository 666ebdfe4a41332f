// Exact enumeration against an outside solver: GLPK's branch and bound on the linearised
// QUBO (tests/support/glpk_qubo.hpp), on 20 random sparse QUBOs of 20-26 variables with fixed
// seeds. Then annealing, tempering and tabu search must reach that optimum on each.
#include <doctest/doctest.h>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/kernels/tabu.hpp>
#include <spinwright/kernels/temper.hpp>
#include <spinwright/parallel/exact_threads.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>

#include "support/glpk_qubo.hpp"

using namespace spinwright;

namespace {

// Sparse random QUBO (instance data invented for this test): about 2n pairs, integer
// coefficients in [-20, 20], written as raw terms with some pairs repeated, some reversed
// (j, i) and some on the diagonal (i, i); the library model is built from the same terms.
test_support::RawQubo random_sparse_terms(std::uint32_t n, std::uint64_t seed) {
  Xoshiro256 rng(seed);
  test_support::RawQubo raw;
  raw.n = static_cast<int>(n);
  raw.offset = static_cast<double>(rng.below(11)) - 5;
  for (std::uint32_t i = 0; i < n; ++i)
    raw.unary.push_back({static_cast<int>(i), 0, static_cast<double>(rng.below(41)) - 20});
  for (std::uint32_t k = 0; k < 2 * n; ++k) {
    const int i = static_cast<int>(rng.below(n));
    const int j = static_cast<int>(rng.below(n));
    raw.pairs.push_back({i, j, static_cast<double>(rng.below(41)) - 20});
    if (k % 5 == 0) raw.pairs.push_back({j, i, static_cast<double>(rng.below(41)) - 20});  // reversed repeat
  }
  return raw;
}

QuboModel<std::int32_t> build(const test_support::RawQubo& raw) {
  QuboBuilder<std::int32_t> qb(static_cast<std::uint64_t>(raw.n));
  qb.add_offset(static_cast<std::int32_t>(raw.offset));
  for (const auto& t : raw.unary) qb.add_unary(static_cast<std::uint64_t>(t.i), static_cast<std::int32_t>(t.v));
  for (const auto& t : raw.pairs) {
    qb.add_pair(static_cast<std::uint64_t>(t.i), static_cast<std::uint64_t>(t.j), static_cast<std::int32_t>(t.v));
  }
  return qb.build().value();
}

}  // namespace

TEST_CASE("20 random sparse QUBOs: exact enumeration equals GLPK, and every kernel reaches the optimum") {
  for (std::uint64_t k = 0; k < 20; ++k) {
    const std::uint32_t n = 20 + static_cast<std::uint32_t>(k % 7);
    const auto raw = random_sparse_terms(n, 1000 + k);
    const auto q = build(raw);
    CAPTURE(k);
    CAPTURE(n);
    const auto glpk = test_support::glpk_qubo_minimum(raw);
    REQUIRE(glpk.optimal);
    const auto exact = solve_exact_threads(q, ExactParams{}, 2);
    REQUIRE(exact.ok());
    CHECK(static_cast<double>(exact->energy) == glpk.objective);
    // GLPK's own assignment has the optimal energy, term by term and through the model; the
    // library's ground state has it term by term.
    CHECK(raw.energy(glpk.bits) == glpk.objective);
    std::vector<std::int8_t> s(n);
    for (std::uint32_t i = 0; i < n; ++i) s[i] = glpk.bits[i] ? -1 : 1;
    CHECK(static_cast<double>(q.energy(s.data())) == glpk.objective);
    std::vector<std::uint8_t> x(n);
    for (std::uint32_t i = 0; i < n; ++i) x[i] = exact->spins[i] < 0 ? 1 : 0;
    CHECK(raw.energy(x) == glpk.objective);

    const double target = static_cast<double>(exact->energy);
    AnnealParams ap;
    ap.sweeps = 1000;
    std::int64_t best_anneal = anneal(q, ap, 7, 0).energy;
    for (std::uint64_t r = 1; r < 4 && best_anneal > exact->energy; ++r) {
      const auto e = anneal(q, ap, 7, r).energy;
      best_anneal = e < best_anneal ? e : best_anneal;
    }
    CHECK(best_anneal == exact->energy);  // best of at most 4 restarts of 1000 sweeps

    TemperParams tp;
    const auto t = temper(q, tp, 7, 0, Budget{}.with_sweeps(2000).with_target(target));
    CHECK(t.energy == exact->energy);

    TabuParams bp;
    const auto b = tabu_walk(q, bp, 7, 0, Budget{}.with_sweeps(500).with_target(target));
    CHECK(b.energy == exact->energy);
  }
}
