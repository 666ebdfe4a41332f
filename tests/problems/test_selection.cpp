// Cardinality-constrained mean-variance selection: minimise lambda x^T C x - mu^T x subject to
// sum x = K through the k-hot penalty. Checked by enumerating the encoded model and, in
// the original domain, every subset of exactly K items.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/problems/selection.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <cmath>
#include <cstdint>
#include <vector>

#include "support/problems_brute.hpp"

using namespace spinwright;

namespace {

// Best objective over every subset of exactly k items, using only the problem's checker.
template <class Problem>
typename Problem::energy_type best_selection(const Problem& p, std::uint64_t n, Selection& argmin) {
  bool any = false;
  typename Problem::energy_type best{};
  problems_test::for_each_bits(static_cast<std::uint32_t>(n), [&](const std::uint8_t* x) {
    const Selection s = Selection::from_bits(x, n);
    const auto r = p.check(s);
    if (!r.valid) return;
    if (!any || r.objective < best) {
      best = r.objective;
      argmin = s;
    }
    any = true;
  });
  return best;
}

}  // namespace

// Invented scenario (our own data, for illustration only): a workshop picks exactly 3 of 8
// candidate tool suppliers. mu is an invented expected saving per supplier; C an invented
// covariance of the savings (suppliers 0-2 share a region and move together, 5 and 6 hedge
// each other). Built as C = B B^T + diag so that it is symmetric positive semi-definite.
TEST_CASE("selection: invented supplier scenario, ground state = best 3-subset") {
  const std::size_t n = 8;
  const std::vector<double> mu{0.9, 1.1, 1.0, 0.6, 0.8, 1.3, 1.2, 0.4};
  const double loadings[8][2] = {{0.8, 0.1}, {0.9, 0.0}, {0.7, 0.2},  {0.1, 0.3},
                                 {0.2, 0.2}, {0.3, 0.9}, {0.2, -0.8}, {0.0, 0.1}};
  std::vector<double> cov(n * n);
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = 0; j < n; ++j) {
      cov[i * n + j] = loadings[i][0] * loadings[j][0] + loadings[i][1] * loadings[j][1] + (i == j ? 0.05 : 0.0);
    }
  }
  for (const double lambda : {0.0, 0.5, 2.0}) {
    auto p = SelectionProblem<double>::encode(mu, cov, lambda, 3);
    REQUIRE(p.ok());
    CHECK(p->count() == 3);
    auto ex = solve_exact(p->model());
    REQUIRE(ex.ok());
    const auto chosen = p->decode(ex->spins.data());
    const auto r = p->check(chosen);
    Selection best_set;
    const double best = best_selection(*p, n, best_set);
    CHECK(r.valid);
    CHECK(r.count == 3);
    CHECK(p->feasibility(ex->spins.data()).feasible);
    CHECK(r.objective == doctest::Approx(best).epsilon(1e-12));
    CHECK(chosen.items == best_set.items);
    CHECK(ex->energy == doctest::Approx(r.objective).epsilon(1e-12));
    CHECK(r.objective == doctest::Approx(lambda * r.variance - r.expected_return).epsilon(1e-12));
  }
  // lambda = 0: the three largest expected savings, suppliers 5, 6, 1.
  auto p0 = SelectionProblem<double>::encode(mu, cov, 0.0, 3);
  REQUIRE(p0.ok());
  auto e0 = solve_exact(p0->model());
  REQUIRE(e0.ok());
  CHECK(p0->decode(e0->spins.data()).items == std::vector<std::uint64_t>{1, 5, 6});
}

TEST_CASE_TEMPLATE("selection: random integer and real instances, no infeasible state below the optimum", Value,
                   std::int64_t, double) {
  Xoshiro256 rng(1234);
  for (int trial = 0; trial < 12; ++trial) {
    const std::size_t n = 7;
    const std::uint64_t k = 1 + rng.below(5);
    std::vector<Value> mu(n);
    std::vector<Value> cov(n * n);
    for (auto& v : mu) v = static_cast<Value>(rng.below(10));
    for (std::size_t i = 0; i < n; ++i) {
      for (std::size_t j = i; j < n; ++j) {
        const auto c = static_cast<Value>(static_cast<int>(rng.below(7)) - (i == j ? 0 : 3));
        cov[i * n + j] = c;
        cov[j * n + i] = c;
      }
    }
    const Value lambda = static_cast<Value>(1 + rng.below(2));
    auto p = SelectionProblem<Value>::encode(mu, cov, lambda, k);
    REQUIRE(p.ok());
    Selection best_set;
    const auto best = best_selection(*p, n, best_set);
    energy_t<Value> best_infeasible{};
    bool any = false;
    problems_test::for_each_state(p->model(), [&](const std::int8_t* s, const std::uint8_t*, energy_t<Value> e) {
      if (p->feasibility(s).feasible) {
        CHECK(static_cast<double>(e) >= static_cast<double>(best) - 1e-9);
        return;
      }
      if (!any || e < best_infeasible) best_infeasible = e;
      any = true;
    });
    CHECK(best_infeasible > best);
    auto ex = solve_exact(p->model());
    REQUIRE(ex.ok());
    CHECK(p->check(p->decode(ex->spins.data())).objective == doctest::Approx(static_cast<double>(best)));
  }
}

TEST_CASE("selection: refused input") {
  CHECK(SelectionProblem<double>::encode({1, 2}, {1, 0, 0}, 1.0, 1).status().code == StatusCode::invalid_argument);
  CHECK(SelectionProblem<double>::encode({1, 2}, {1, 0.5, 0.4, 1}, 1.0, 1).status().code ==
        StatusCode::invalid_argument);
  CHECK(SelectionProblem<double>::encode({1, 2}, {1, 0, 0, 1}, 1.0, 3).status().code == StatusCode::invalid_argument);
  CHECK(SelectionProblem<double>::encode({1, 2}, {1, 0, 0, 1}, -1.0, 1).status().code == StatusCode::invalid_argument);
  CHECK(SelectionProblem<std::int32_t>::encode({1, 2}, {1, 2000000000, 2000000000, 1}, 1, 1).status().code ==
        StatusCode::value_out_of_range);
}
