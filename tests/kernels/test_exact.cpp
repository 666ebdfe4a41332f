// Exact enumeration: published densities of states, number partitioning and max-cut facts,
// an independent brute force, thread-count independence, size limits.
#include <doctest/doctest.h>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/parallel/exact_threads.hpp>
#include <spinwright/spinwright.hpp>

#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <string>
#include <thread>
#include <vector>

#include "support/enumerate.hpp"
#include "support/temper_graph.hpp"

using namespace spinwright;
using test_support::Graph;

namespace {

template <class Model>
Model model_of(const Graph& g) {
  using V = typename Model::value_type;
  if constexpr (Model::is_dense) {
    return Model::from(test_support::ising_of<V>(g)).value();
  } else {
    return test_support::ising_of<V, typename Model::index_type>(g);
  }
}

// Number partitioning as Ising: H = A (sum n_i s_i)^2 with A = 1, i.e. J_ij = 2 n_i n_j,
// h = 0, c = sum n_i^2 (A. Lucas, "Ising formulations of many NP problems", Front. Phys.
// 2:5, 2014, Sec. 2).
IsingModel<std::int64_t> partition_model(const std::vector<std::int64_t>& numbers) {
  IsingBuilder<std::int64_t> b(numbers.size());
  std::int64_t c = 0;
  for (std::size_t i = 0; i < numbers.size(); ++i) {
    c += numbers[i] * numbers[i];
    for (std::size_t j = i + 1; j < numbers.size(); ++j) b.add_coupling(i, j, 2 * numbers[i] * numbers[j]);
  }
  b.add_offset(c);
  return b.build().value();
}

}  // namespace

// Density of states of the 4x4 periodic square-lattice ferromagnet (physics form J = 1, so
// optimisation form J = -1 here): g(-32) = 2, g(-24) = 32, g(-20) = 64, g(-16) = 424,
// g(-12) = 1728, g(-8) = 6688. Exact finite-lattice densities of states: P. D. Beale, Phys.
// Rev. Lett. 76, 78 (1996) [journal reference from memory]; values as listed in the project's
// reference sheet, section 3.
TEST_CASE_TEMPLATE("4x4 torus ferromagnet: lowest levels and degeneracies", Model, IsingModel<std::int32_t>,
                   IsingModel<std::int64_t>, IsingModel<double>, IsingModel<float>, DenseIsingModel<std::int32_t>,
                   DenseIsingModel<double>, IsingModel<std::int32_t, std::uint16_t>) {
  const Model model = model_of<Model>(test_support::torus(4, -1));
  ExactParams p;
  p.levels = 6;
  for (bool symmetry : {true, false}) {
    p.flip_symmetry = symmetry;
    auto r = solve_exact(model, p);
    REQUIRE(r.ok());
    CHECK(r->used_flip_symmetry == symmetry);
    const double energies[] = {-32, -24, -20, -16, -12, -8};
    const std::uint64_t counts[] = {2, 32, 64, 424, 1728, 6688};
    REQUIRE(r->levels.size() == 6);
    for (std::size_t k = 0; k < 6; ++k) {
      CHECK(static_cast<double>(r->levels[k].energy) == doctest::Approx(energies[k]));
      CHECK(r->levels[k].count == counts[k]);
    }
    CHECK(r->ground_states == 2);
    CHECK(static_cast<double>(r->energy) == -32.0);
    CHECK(r->solution().energy == r->energy);
    CHECK(r->solution().spins == r->spins);
    CHECK(r->solution().attempted == r->states);
    CHECK(r->states == (symmetry ? 32768u : 65536u));
    // The lowest canonical index of the two ground states is all spins +1 (index 0).
    CHECK(r->levels[0].first_index == 0);
    for (auto s : r->spins) CHECK(s == 1);
  }
}

// The whole density of states of the 4x4 periodic ferromagnet (same source as above: Beale,
// Phys. Rev. Lett. 76, 78 (1996) [memory]; reference sheet section 3, where the symmetric half
// is listed) with a large non-dyadic coupling, J = -1234567.89: every level is a sum of 32
// rounded terms of size 1.2e6, so states of one level differ by rounding far above an
// absolute 1e-9 and far below the relative tolerance of ExactParams. Each level must come
// out whole, with the published count.
TEST_CASE("4x4 torus with J = -1234567.89: every level whole, with the published degeneracy") {
  const double J = -1234567.89;
  IsingBuilder<double> b(16);
  for (std::uint32_t y = 0; y < 4; ++y) {
    for (std::uint32_t x = 0; x < 4; ++x) {
      b.add_coupling(y * 4 + x, y * 4 + (x + 1) % 4, J);
      b.add_coupling(y * 4 + x, ((y + 1) % 4) * 4 + x, J);
    }
  }
  const auto model = b.build().value();
  const double bonds[] = {-32, -24, -20, -16, -12, -8, -4, 0, 4, 8, 12, 16, 20, 24, 32};
  const std::uint64_t counts[] = {2, 32, 64, 424, 1728, 6688, 13568, 20524, 13568, 6688, 1728, 424, 64, 32, 2};
  for (bool symmetry : {true, false}) {
    CAPTURE(symmetry);
    ExactParams p;
    p.levels = 20;
    p.flip_symmetry = symmetry;
    const auto r = solve_exact(model, p);
    REQUIRE(r.ok());
    REQUIRE(r->levels.size() == 15);
    for (std::size_t k = 0; k < 15; ++k) {
      CAPTURE(k);
      CHECK(std::abs(r->levels[k].energy - -J * bonds[k]) <= 1e-12 * 32 * -J);  // E = J sum s_i s_j
      CHECK(r->levels[k].count == counts[k]);
    }
  }
}

// 3x3 periodic ferromagnet, the whole spectrum: -18:2, -10:18, -6:48, -2:198, 2:144, 6:102
// (sum 512). Reference sheet, section 3 (computed there by enumeration and the exact torus
// formula of Kaufman, Phys. Rev. 76, 1232 (1949) [memory]).
TEST_CASE("3x3 torus ferromagnet: complete density of states") {
  const auto model = test_support::ising_of<std::int32_t>(test_support::torus(3, -1));
  ExactParams p;
  p.levels = 10;
  auto r = solve_exact(model, p);
  REQUIRE(r.ok());
  const std::int64_t energies[] = {-18, -10, -6, -2, 2, 6};
  const std::uint64_t counts[] = {2, 18, 48, 198, 144, 102};
  REQUIRE(r->levels.size() == 6);
  std::uint64_t total = 0;
  for (std::size_t k = 0; k < 6; ++k) {
    CHECK(r->levels[k].energy == energies[k]);
    CHECK(r->levels[k].count == counts[k]);
    total += r->levels[k].count;
  }
  CHECK(total == 512);
}

// Number partitioning (Lucas 2014, Sec. 2; S. Mertens, Theor. Comput. Sci. 265, 79-108, 2001);
// the facts below are from the reference sheet, section 7, computed there by enumeration.
TEST_CASE("number partitioning facts") {
  SUBCASE("{4,5,6,7,8}: perfect partition, exactly 2 ground states") {
    auto r = solve_exact(partition_model({4, 5, 6, 7, 8}));
    REQUIRE(r.ok());
    CHECK(r->energy == 0);
    CHECK(r->ground_states == 2);
    // {4,5,6} | {7,8}: the sheet's s = (+,+,+,-,-) and its global flip (-,-,-,+,+); the flip
    // has the lower canonical index (1 + 2 + 4 = 7 against 8 + 16 = 24), so it is reported.
    const std::int8_t expect[] = {-1, -1, -1, 1, 1};
    CHECK(std::memcmp(r->spins.data(), expect, 5) == 0);
  }
  SUBCASE("{1,2,4}: H_min = 1 and spectrum {1, 9, 25, 49}") {
    ExactParams p;
    p.levels = 8;
    auto r = solve_exact(partition_model({1, 2, 4}), p);
    REQUIRE(r.ok());
    REQUIRE(r->levels.size() == 4);
    const std::int64_t spectrum[] = {1, 9, 25, 49};
    for (std::size_t k = 0; k < 4; ++k) {
      CHECK(r->levels[k].energy == spectrum[k]);
      CHECK(r->levels[k].count == 2);  // each partition and its global flip
    }
  }
  SUBCASE("{3,1,1,2,2,1}: 10 ground states") {
    auto r = solve_exact(partition_model({3, 1, 1, 2, 2, 1}));
    REQUIRE(r.ok());
    CHECK(r->energy == 0);
    CHECK(r->ground_states == 10);
  }
}

// Max-cut facts (common practice, reference sheet section 5): K_n has floor(n^2/4), C_n has
// n (even) or n - 1 (odd), the Petersen graph has 12. cut = (W - E_min) / 2.
TEST_CASE("max-cut facts through the ground energy") {
  auto max_cut = [](const Graph& g) {
    const auto model = test_support::ising_of<std::int32_t>(g);
    auto r = solve_exact(model);
    REQUIRE(r.ok());
    CHECK(cut_value(model, r->spins.data()) == cut_from_energy(total_weight(model), r->energy));
    return cut_from_energy(total_weight(model), r->energy);
  };
  for (std::uint32_t n = 2; n <= 12; ++n) CHECK(max_cut(test_support::complete(n)) == (n * n) / 4);
  for (std::uint32_t n = 3; n <= 14; ++n) CHECK(max_cut(test_support::cycle(n)) == (n % 2 == 0 ? n : n - 1));
  CHECK(max_cut(test_support::petersen()) == 12);
}

// QUBO worked example (reference sheet section 6): unique minimum -3 at x = (1, 0, 1).
TEST_CASE_TEMPLATE("QUBO worked example: unique minimum", Model, QuboModel<std::int32_t>, QuboModel<double>,
                   DenseQuboModel<std::int64_t>, DenseQuboModel<float>) {
  using V = typename Model::value_type;
  QuboBuilder<V> qb(3);
  qb.add_unary(0, V(-1))
      .add_unary(1, V(-2))
      .add_unary(2, V(1))
      .add_pair(0, 1, V(2))
      .add_pair(0, 2, V(-3))
      .add_pair(1, 2, V(1));
  auto sparse = qb.build().value();
  Model model;
  if constexpr (Model::is_dense) {
    model = Model::from(sparse).value();
  } else {
    model = sparse;
  }
  ExactParams p;
  p.levels = 8;
  auto r = solve_exact(model, p);
  REQUIRE(r.ok());
  CHECK(static_cast<double>(r->energy) == -3.0);
  CHECK(r->ground_states == 1);
  CHECK(r->bits() == std::vector<std::uint8_t>{1, 0, 1});
  CHECK_FALSE(r->used_flip_symmetry);
  // Every energy of the table: 0, 1, -2, 0, -1, -3, -1, -2 -> levels -3:1, -2:2, -1:2, 0:2, 1:1.
  REQUIRE(r->levels.size() == 5);
  const std::uint64_t counts[] = {1, 2, 2, 2, 1};
  for (std::size_t k = 0; k < 5; ++k) CHECK(r->levels[k].count == counts[k]);
}

// Oracle: an independent brute force in binary order, energies from the model directly.
TEST_CASE("random models: levels and lowest-index ground state agree with a plain brute force") {
  Xoshiro256 rng(2024);
  for (int trial = 0; trial < 12; ++trial) {
    const std::uint32_t n = 6 + rng.below(9);
    IsingBuilder<std::int32_t> b(n);
    const bool with_fields = trial % 2 == 0;
    for (std::uint32_t i = 0; i < n && with_fields; ++i) b.add_field(i, static_cast<std::int32_t>(rng.below(5)) - 2);
    for (int k = 0; k < 3 * static_cast<int>(n); ++k)
      b.add_coupling(rng.below(n), rng.below(n), static_cast<std::int32_t>(rng.below(7)) - 3);
    const auto model = b.build().value();
    ExactParams p;
    p.levels = 3;
    auto r = solve_exact(model, p);
    REQUIRE(r.ok());
    // Brute force.
    std::vector<std::int64_t> all;
    std::int64_t best = 0;
    std::uint64_t best_index = 0;
    std::uint64_t code = 0;
    test_support::for_each_assignment(n, [&](const std::int8_t* s) {
      const std::int64_t e = model.energy(s);
      if (code == 0 || e < best) {
        best = e;
        best_index = code;
      }
      all.push_back(e);
      ++code;
    });
    std::sort(all.begin(), all.end());
    std::vector<std::pair<std::int64_t, std::uint64_t>> levels;
    for (auto e : all) {
      if (levels.empty() || levels.back().first != e) {
        levels.push_back({e, 1});
      } else {
        ++levels.back().second;
      }
    }
    CHECK(r->energy == best);
    CHECK(r->levels[0].first_index == best_index);
    CHECK(r->used_flip_symmetry == !with_fields);
    REQUIRE(r->levels.size() == std::min<std::size_t>(3, levels.size()));
    for (std::size_t k = 0; k < r->levels.size(); ++k) {
      CHECK(r->levels[k].energy == levels[k].first);
      CHECK(r->levels[k].count == levels[k].second);
    }
  }
}

TEST_CASE_TEMPLATE("thread count does not change the result", Value, std::int64_t, double, float) {
  Xoshiro256 rng(77);
  QuboBuilder<Value> b(20);
  for (std::uint32_t i = 0; i < 20; ++i)
    b.add_unary(i, static_cast<Value>(static_cast<double>(rng.below(2001)) / 100.0 - 10.0));
  for (int k = 0; k < 60; ++k) {
    b.add_pair(rng.below(20), rng.below(20), static_cast<Value>(static_cast<double>(rng.below(2001)) / 100.0 - 10.0));
  }
  const auto model = b.build().value();
  ExactParams p;
  p.levels = 4;
  auto one = solve_exact(model, p);
  REQUIRE(one.ok());
  for (unsigned threads : {1u, 2u, 3u, 5u}) {
    auto r = solve_exact_threads(model, p, threads);
    REQUIRE(r.ok());
    CHECK(r->energy == one->energy);
    CHECK(r->spins == one->spins);
    CHECK(r->ground_states == one->ground_states);
    REQUIRE(r->levels.size() == one->levels.size());
    for (std::size_t k = 0; k < r->levels.size(); ++k) {
      CHECK(r->levels[k].energy == one->levels[k].energy);
      CHECK(r->levels[k].count == one->levels[k].count);
      CHECK(r->levels[k].first_index == one->levels[k].first_index);
    }
  }
}

TEST_CASE("size limits and bad parameters are refused with a clear status") {
  IsingBuilder<std::int32_t> big(41);
  big.add_coupling(0, 40, 1);
  const auto m41 = big.build().value();
  ExactParams p;
  p.max_spins = 64;
  auto r = solve_exact(m41, p);
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code == StatusCode::size_limit);
  CHECK(std::string(r.status().message).find("40") != std::string::npos);

  IsingBuilder<std::int32_t> mid(31);
  mid.add_coupling(0, 30, 1);
  const auto m31 = mid.build().value();
  auto r31 = solve_exact(m31);
  REQUIRE_FALSE(r31.ok());
  CHECK(r31.status().code == StatusCode::size_limit);
  CHECK(std::string(r31.status().message).find("30") != std::string::npos);
  auto t31 = solve_exact_threads(m31, ExactParams{}, 2);
  CHECK(t31.status().code == StatusCode::size_limit);

  ExactParams zero;
  zero.levels = 0;
  CHECK(solve_exact(partition_model({1, 2}), zero).status().code == StatusCode::invalid_argument);
}

TEST_CASE("a stop token ends the enumeration with StatusCode::stopped; an unused one changes nothing") {
  const auto small = partition_model({3, 1, 4, 1, 5, 9, 2, 6, 5, 3});
  StopToken idle;
  ExactParams with_idle;
  with_idle.stop = &idle;
  const auto plain = solve_exact(small);
  const auto watched = solve_exact(small, with_idle);
  REQUIRE(plain.ok());
  REQUIRE(watched.ok());
  CHECK(watched.value().energy == plain.value().energy);
  CHECK(watched.value().ground_states == plain.value().ground_states);
  CHECK(watched.value().spins == plain.value().spins);

  StopToken early;
  early.request_stop();
  ExactParams stopped;
  stopped.stop = &early;
  CHECK(solve_exact(small, stopped).status().code == StatusCode::stopped);
  CHECK(solve_exact_threads(small, stopped, 2).status().code == StatusCode::stopped);

  // A stop requested while a 2^34-state enumeration runs (minutes of work): it returns soon
  // after, on one thread and on two. Without the poll this test would run for minutes and
  // hit the ctest time-out.
  IsingBuilder<std::int32_t> b(34);
  for (std::uint32_t i = 0; i < 34; ++i) b.add_coupling(i, (i + 1) % 34, 1).add_field(i, 1);
  const auto big = b.build().value();
  for (const unsigned threads : {1u, 2u}) {
    CAPTURE(threads);
    StopToken token;
    ExactParams p;
    p.max_spins = 34;
    p.stop = &token;
    std::thread stopper([&token] {
      std::this_thread::sleep_for(std::chrono::milliseconds(50));
      token.request_stop();
    });
    const auto r = threads == 1 ? solve_exact(big, p) : solve_exact_threads(big, p, threads);
    stopper.join();
    CHECK(r.status().code == StatusCode::stopped);
  }
}

TEST_CASE("empty and one-spin models") {
  IsingBuilder<double> b;
  b.add_offset(2.5);
  auto r = solve_exact(b.build().value());
  REQUIRE(r.ok());
  CHECK(r->energy == 2.5);
  CHECK(r->ground_states == 1);
  CHECK(r->spins.empty());

  QuboBuilder<std::int32_t> q(1);
  q.add_unary(0, -4);
  auto r1 = solve_exact(q.build().value());
  REQUIRE(r1.ok());
  CHECK(r1->energy == -4);
  CHECK(r1->bits() == std::vector<std::uint8_t>{1});
}

TEST_CASE("a floating level merged within the tolerance keeps its lowest energy") {
  // Two spins, J = -1, h_0 = 0.01: E(+,+) = -0.99, E(-,-) = -1.01, E(+,-) = 1.01, E(-,+) = 0.99
  // (by hand). With a tolerance of 0.05 (times max(1, energy bound)) the two aligned states are
  // one level, whose energy is the lower one, -1.01, whatever order they are visited in; the
  // same for the two anti-aligned states (0.99).
  spinwright::IsingBuilder<double> b(2);
  b.add_coupling(0, 1, -1.0);
  b.add_field(0, 0.01);
  const auto m = b.build().value();
  spinwright::ExactParams params;
  params.tolerance = 0.05;
  params.levels = 2;
  const auto r = spinwright::solve_exact(m, params);
  REQUIRE(r.ok());
  REQUIRE(r->levels.size() == 2);
  CHECK(r->levels[0].energy == doctest::Approx(-1.01).epsilon(1e-12));
  CHECK(r->levels[0].count == 2);
  CHECK(r->levels[1].energy == doctest::Approx(0.99).epsilon(1e-12));
  CHECK(r->levels[1].count == 2);
  // The reported ground state is the level's state of lowest canonical index, (+, +), and its
  // energy is that state's own (docs/kernels.md, exact enumeration).
  CHECK(r->spins == std::vector<std::int8_t>{1, 1});
  CHECK(r->energy == doctest::Approx(m.energy(r->spins.data())).epsilon(1e-12));
}
