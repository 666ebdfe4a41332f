// Annealing against max-cut values from outside the project (REFERENCES.md section 5 and
// shared/data/maxcut/reference.csv). Max-cut is our Ising form with J_ij = w_ij, h = 0:
// cut = (W - E) / 2 (textbook identity; Barahona, Groetschel, Juenger, Reinelt, Oper. Res. 36,
// 493 (1988)). Budgets are sweep counts, never time.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/problems/max_cut.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <string>

using namespace spinwright;

namespace {

// Best cut over `restarts` restarts of `sweeps` sweeps each.
template <class Model>
long long best_cut(const Model& model, std::uint64_t sweeps, std::uint64_t restarts, std::uint64_t seed,
                   Acceptance rule = Acceptance::metropolis, SiteOrder order = SiteOrder::random) {
  AnnealParams p;
  p.sweeps = sweeps;
  p.acceptance = rule;
  p.order = order;
  const auto w = total_weight(model);
  long long best = -1;
  for (std::uint64_t r = 0; r < restarts; ++r) {
    const auto s = anneal(model, p, seed, r);
    CHECK(s.energy == model.energy(s.spins.data()));
    const auto cut = static_cast<long long>(cut_from_energy(w, s.energy));
    CHECK(cut == static_cast<long long>(cut_value(model, s.spins.data())));
    if (cut > best) best = cut;
  }
  return best;
}

}  // namespace

TEST_CASE("complete graphs: max cut floor(n^2/4)") {
  // K_n: floor(n^2 / 4) (Mantel/Turan bound, tight; common practice, REFERENCES.md section 5).
  for (std::uint32_t n = 2; n <= 14; ++n) {
    CAPTURE(n);
    const auto g = anneal_support::complete_graph(n);
    CHECK(best_cut(anneal_support::maxcut_model<std::int32_t>(g), 200, 2, 1) == (n * n) / 4);
    CHECK(best_cut(anneal_support::maxcut_model<double>(g), 200, 2, 2) == (n * n) / 4);
    const auto dense = DenseIsingModel<float>::from(anneal_support::maxcut_model<float>(g)).value();
    CHECK(best_cut(dense, 200, 2, 3, Acceptance::heat_bath) == (n * n) / 4);
  }
}

TEST_CASE("cycles: max cut n (even) or n - 1 (odd)") {
  // C_n: n for even n, n - 1 for odd n (common practice, REFERENCES.md section 5).
  for (std::uint32_t n = 3; n <= 40; ++n) {
    CAPTURE(n);
    const auto g = anneal_support::cycle_graph(n);
    const long long expected = n % 2 == 0 ? n : n - 1;
    const auto model = anneal_support::maxcut_model<std::int64_t>(g);
    CHECK(best_cut(model, 500, 3, 4) == expected);
    // Heat-bath in sequential order works too (sequential Metropolis does not: see AnnealParams).
    CHECK(best_cut(model, 500, 3, 4, Acceptance::heat_bath, SiteOrder::sequential) == expected);
  }
}

TEST_CASE("Petersen graph: max cut 12") {
  // 10 vertices, 15 edges, max cut 12 (common practice, REFERENCES.md section 5).
  const auto g = anneal_support::petersen_graph();
  CHECK(best_cut(anneal_support::maxcut_model<std::int32_t>(g), 300, 3, 5) == 12);
  const auto dense = DenseIsingModel<double>::from(anneal_support::maxcut_model<double>(g)).value();
  CHECK(best_cut(dense, 300, 3, 6) == 12);
}

TEST_CASE("bqp250 instances: the proven optimum cut within a fixed sweep budget") {
  // Beasley's OR-Library bqp250 programs in max-cut form, proven optima listed in
  // shared/data/maxcut/reference.csv (Beasley 1998). Budget: 5 restarts of 5000 sweeps.
  struct Instance {
    const char* file;
    long long optimum;
  };
  for (const Instance inst :
       {Instance{"bqp250-1.txt", 45607}, Instance{"bqp250-2.txt", 44810}, Instance{"bqp250-3.txt", 49037},
        Instance{"bqp250-4.txt", 41274}, Instance{"bqp250-5.txt", 47961}}) {
    CAPTURE(inst.file);
    const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/" + inst.file);
    REQUIRE(g.ok);
    REQUIRE(g.n == 251);
    const auto model = anneal_support::maxcut_model<std::int32_t>(g);
    CHECK(best_cut(model, 5000, 5, 2026) == inst.optimum);
    CHECK(best_cut(model, 5000, 5, 2027, Acceptance::metropolis, SiteOrder::sequential) == inst.optimum);
  }
}

TEST_CASE("same seed, same result; different restarts differ in stream") {
  const auto g = anneal_support::read_edge_list(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/bqp250-1.txt");
  REQUIRE(g.ok);
  const auto model = anneal_support::maxcut_model<double>(g);
  AnnealParams p;
  p.sweeps = 100;
  const auto a = anneal(model, p, 99, 3);
  const auto b = anneal(model, p, 99, 3);
  CHECK(a.spins == b.spins);
  CHECK(a.energy == b.energy);
  CHECK(a.accepted == b.accepted);
  CHECK(a.attempted == 100u * 251u);
  CHECK(a.restart == 3u);
  // The stepping object gives the same run as the one-call function.
  Annealer<IsingModel<double>> stepper(model, p, 99, 3);
  for (int k = 0; k < 100; ++k) stepper.step(1);
  CHECK(stepper.best().energy == a.energy);
  CHECK(stepper.solution().spins == a.spins);
  // reset() replays the run exactly.
  stepper.reset(99, 3);
  stepper.step(100);
  CHECK(stepper.solution().spins == a.spins);
  CHECK(stepper.accepted() == a.accepted);
}
