// The automatic kernel choice: the documented rule, and strong results without tuning.
#include <doctest/doctest.h>
#include <spinwright/kernels/auto.hpp>
#include <spinwright/spinwright.hpp>

#include <cstdint>
#include <fstream>
#include <string>

#include "support/enumerate.hpp"

using namespace spinwright;

namespace {
IsingModel<std::int32_t> ring(std::uint32_t n, std::int32_t w) {
  IsingBuilder<std::int32_t> b(n);
  for (std::uint32_t i = 0; i < n; ++i) b.add_coupling(i, (i + 1) % n, w);
  return std::move(b.build().value());
}
}  // namespace

TEST_CASE("choose_kernel follows the documented rule") {
  CHECK(choose_kernel(ring(20, 1)).kernel == KernelKind::exact);
  CHECK(choose_kernel(ring(30, 1)).kernel == KernelKind::anneal);
  CHECK(choose_kernel(ring(30, 1)).sweeps == 4000);
  CHECK(choose_kernel(ring(21, 1)).kernel == KernelKind::tabu);  // 21 pairs of 210: density 0.10
  // K_30: density 1.
  IsingBuilder<double> b(30);
  for (std::uint32_t i = 0; i < 30; ++i)
    for (std::uint32_t j = i + 1; j < 30; ++j) b.add_coupling(i, j, 1.0);
  const auto k30 = b.build().value();
  CHECK(choose_kernel(k30).kernel == KernelKind::tabu);
  CHECK(choose_kernel(DenseIsingModel<std::int32_t>::from(ring(40, 1)).value()).kernel == KernelKind::tabu);
}

TEST_CASE("solve_auto: exact ground state of a small frustrated model matches enumeration") {
  Xoshiro256 rng(2024);
  QuboBuilder<std::int32_t> b(16);
  for (int k = 0; k < 60; ++k) b.add_pair(rng.below(16), rng.below(16), static_cast<std::int32_t>(rng.below(21)) - 10);
  for (std::uint32_t i = 0; i < 16; ++i) b.add_unary(i, static_cast<std::int32_t>(rng.below(11)) - 5);
  const auto m = b.build().value();
  std::int64_t ground = INT64_MAX;
  test_support::for_each_assignment(16, [&](const std::int8_t* s) { ground = std::min(ground, m.energy(s)); });
  const auto s = solve_auto(m, 1);
  CHECK(s.energy == ground);
  CHECK(m.energy(s.spins.data()) == ground);
}

TEST_CASE("solve_auto: odd antiferromagnetic ring of 101 spins reaches its ground energy") {
  // An odd cycle C_n has max cut n - 1 (common practice), so E_min = W - 2 (n - 1) = -(n - 2).
  const auto m = ring(101, 1);
  const auto s = solve_auto(m, 7);
  CHECK(s.energy == -99);
  CHECK(cut_value(m, s.spins.data()) == 100);
}

TEST_CASE("solve_auto: K_40 max cut is floor(n^2/4) = 400") {
  // Max cut of K_n is floor(n^2 / 4) (Mantel/Turan; common practice).
  IsingBuilder<std::int32_t> b(40);
  for (std::uint32_t i = 0; i < 40; ++i)
    for (std::uint32_t j = i + 1; j < 40; ++j) b.add_coupling(i, j, 1);
  const auto m = b.build().value();
  const auto s = solve_auto(m, 3);
  CHECK(cut_value(m, s.spins.data()) == 400);
}

#include <spinwright/io/edge_list.hpp>
#include <spinwright/parallel/restarts.hpp>

TEST_CASE("solve_auto reaches the proven optimum of bqp250-1 and bqp250-3 without tuning") {
  // Beasley's OR-Library bqp250 instances (J. E. Beasley, J. Oper. Res. Soc. 41, 1990; optima
  // in Beasley 1998), in the shared max-cut form with one extra node: the max cut equals the
  // published optimum (45607 and 49037, shared/data/maxcut/reference.csv).
  const struct { const char* file; std::int64_t cut; } cases[] = {{"bqp250-1.txt", 45607}, {"bqp250-3.txt", 49037}};
  for (const auto& c : cases) {
    auto m = io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + c.file);
    REQUIRE(m.ok());
    const auto w = total_weight(*m);
    Budget budget;
    budget.with_target(static_cast<double>(energy_from_cut<std::int64_t>(w, c.cut)));
    const auto tally = run_restarts<std::int64_t>(4, 2, [&](std::uint64_t r) { return solve_auto(*m, 11, r, budget); });
    CHECK(cut_value(*m, tally.best().spins.data()) == c.cut);
  }
}
