// The move concept: built-in moves keep their promises, a user-written move works through
// the template parameter, and the trait rejects incomplete types.
#include <doctest/doctest.h>

#include <spinwright/kernels/anneal.hpp>
#include <spinwright/kernels/descent.hpp>
#include <spinwright/model/builder.hpp>
#include <spinwright/model/dense_model.hpp>
#include <spinwright/moves.hpp>

#include "support/anneal_graph.hpp"

#include <cstdint>
#include <vector>

using namespace spinwright;

namespace {

using IntModel = IsingModel<std::int32_t>;

// A user-written single-flip move, written only from docs/moves.md.
template <class Model>
struct MySingleFlip {
  using proposal_type = typename Model::index_type;
  std::size_t moves_per_sweep(const SpinState<Model>& s) const { return s.size(); }
  proposal_type propose(const SpinState<Model>& s, Xoshiro256& rng) {
    return static_cast<proposal_type>(rng.below(static_cast<std::uint32_t>(s.size())));
  }
  typename Model::energy_type delta(const SpinState<Model>& s, const proposal_type& i) const { return s.delta(i); }
  void apply(SpinState<Model>& s, const proposal_type& i, typename Model::energy_type d) { s.flip_with_delta(i, d); }
};

// A user move that flips two adjacent sites of a ring together (delta via delta_group).
template <class Model>
struct NeighbourPairFlip {
  using proposal_type = typename Model::index_type;
  std::size_t moves_per_sweep(const SpinState<Model>& s) const { return s.size(); }
  proposal_type propose(const SpinState<Model>& s, Xoshiro256& rng) {
    return static_cast<proposal_type>(rng.below(static_cast<std::uint32_t>(s.size())));
  }
  typename Model::energy_type delta(const SpinState<Model>& s, const proposal_type& i) const {
    const proposal_type g[2] = {i, static_cast<proposal_type>((i + 1) % s.size())};
    return s.delta_group(g, 2);
  }
  void apply(SpinState<Model>& s, const proposal_type& i, typename Model::energy_type) {
    const proposal_type g[2] = {i, static_cast<proposal_type>((i + 1) % s.size())};
    s.flip_group(g, 2);
  }
};

struct MissingApply {
  using proposal_type = std::uint32_t;
  std::size_t moves_per_sweep(const SpinState<IntModel>&) const { return 0; }
  proposal_type propose(const SpinState<IntModel>&, Xoshiro256&) { return 0; }
  std::int64_t delta(const SpinState<IntModel>&, const proposal_type&) const { return 0; }
};

struct NoProposalType {};

}  // namespace

static_assert(is_move_generator_v<SingleFlip<IntModel>, IntModel>);
static_assert(is_move_generator_v<CountKeepingSwap<IntModel>, IntModel>);
static_assert(is_move_generator_v<GroupFlip<IntModel>, IntModel>);
static_assert(is_move_generator_v<SingleFlip<DenseQuboModel<float>>, DenseQuboModel<float>>);
static_assert(is_enumerable_move_v<SingleFlip<IntModel>, IntModel>);
static_assert(is_enumerable_move_v<CountKeepingSwap<IntModel>, IntModel>);
static_assert(is_enumerable_move_v<GroupFlip<IntModel>, IntModel>);
static_assert(is_move_generator_v<MySingleFlip<IntModel>, IntModel>);
static_assert(!is_enumerable_move_v<MySingleFlip<IntModel>, IntModel>);
static_assert(!is_move_generator_v<MissingApply, IntModel>);
static_assert(!is_move_generator_v<NoProposalType, IntModel>);

TEST_CASE("a user-written single flip gives exactly the built-in random-order run") {
  const auto model = anneal_support::maxcut_model<std::int32_t>(anneal_support::random_cubic(1000, 5));
  AnnealParams p;
  p.sweeps = 300;
  p.order = SiteOrder::random;
  // The built-in move's hazard path (one exponential per accepted uphill flip) is its own
  // shortcut; with it off, the built-in and a user move draw the same stream.
  p.hazard_below = 0;
  const auto builtin = anneal(model, p, 77, 2);
  const auto mine = anneal_with(model, p, MySingleFlip<IntModel>{}, 77, 2);
  CHECK(mine.spins == builtin.spins);
  CHECK(mine.energy == builtin.energy);
  CHECK(mine.accepted == builtin.accepted);
}

TEST_CASE("a user-written pair move drives annealing on a ring to its ground state") {
  // Ferromagnetic ring (our J = -1), 64 spins: ground energy -64 (all aligned; common practice).
  // Pair flips of neighbours alone cannot change the parity of the number of -1 spins, so
  // start from an even count; the ground states (all +1 or all -1) both have an even count.
  const auto model = anneal_support::ring<std::int32_t>(64, -1);
  std::vector<std::int8_t> start(64, 1);
  for (std::size_t i = 0; i < 64; i += 3) start[i] = -1;
  for (std::size_t i = 1; i < 64; i += 7) start[i] = -1;
  int down = 0;
  for (auto v : start) down += v < 0;
  if (down % 2 != 0) start[2] = static_cast<std::int8_t>(-start[2]);
  AnnealParams p;
  p.sweeps = 3000;
  p.initial = start.data();
  Annealer<IntModel, NeighbourPairFlip<IntModel>> a(model, p, NeighbourPairFlip<IntModel>{}, 3);
  const auto s = a.run();
  CHECK(s.energy == -64);
  CHECK(a.state().check().exact);
}

TEST_CASE("exchange keeps the cardinality; annealing finds the minimum bisection of a ring") {
  // A balanced bisection of the cycle C_n cuts at least 2 edges and two cuts suffice
  // (common practice), so the ferromagnetic ring (our J = -1) with exactly n/2 spins at -1
  // has ground energy -n + 4.
  const std::uint32_t n = 100;
  const auto model = anneal_support::ring<std::int32_t>(n, -1);
  std::vector<std::int8_t> start(n);
  for (std::uint32_t i = 0; i < n; ++i) start[i] = (i % 2 == 0) ? 1 : -1;  // worst start: all cut
  AnnealParams p;
  p.sweeps = 20000;
  p.initial = start.data();
  Annealer<IntModel, CountKeepingSwap<IntModel>> a(model, p, CountKeepingSwap<IntModel>{}, 9);
  for (int chunk = 0; chunk < 40; ++chunk) {
    a.step(500);
    int down = 0;
    for (std::uint32_t i = 0; i < n; ++i) down += a.state().spin(i) < 0;
    CHECK(down == static_cast<int>(n / 2));
    CHECK(a.move().count_up() == n / 2);
  }
  CHECK(a.best().energy == -static_cast<std::int64_t>(n) + 4);
  CHECK(a.state().check().exact);
}

TEST_CASE("group flip deltas equal energy differences, on sparse and dense models") {
  const auto sparse = anneal_support::maxcut_model<double>(anneal_support::random_cubic(60, 9));
  const auto dense = DenseIsingModel<double>::from(sparse).value();
  std::vector<std::vector<std::uint32_t>> groups = {{0, 1, 2}, {5, 17}, {30, 31, 32, 33, 59}, {7}};
  GroupFlip<IsingModel<double>> gs(groups);
  GroupFlip<DenseIsingModel<double>> gd(groups);
  SpinState<IsingModel<double>> ss(sparse);
  SpinState<DenseIsingModel<double>> sd(dense);
  Xoshiro256 rng(4);
  for (int t = 0; t < 200; ++t) {
    const auto k = gs.propose(ss, rng);
    const double before = sparse.energy(ss.spins());
    const double d = gs.delta(ss, k);
    CHECK(gd.delta(sd, k) == doctest::Approx(d));
    gs.apply(ss, k, d);
    gd.apply(sd, k, d);
    CHECK(sparse.energy(ss.spins()) - before == doctest::Approx(d));
  }
  AnnealParams p;
  p.sweeps = 50;
  Annealer<IsingModel<double>, GroupFlip<IsingModel<double>>> a(sparse, p, gs, 1);
  a.step(50);
  CHECK(a.attempted() == 50u * groups.size());
  CHECK(a.state().check().max_field_error < 1e-9);
}
