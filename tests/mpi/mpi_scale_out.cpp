// Restarts over MPI ranks (parallel/mpi.hpp) give the very answer of one process, and the
// tempering ladder spread over ranks (parallel/mpi_tempering.hpp) is the same run for any rank
// count and samples the Boltzmann distribution of each rung: run under
// `mpirun -np K` for K = 1, 2, 3 (tests/mpi/CMakeLists.txt). Every rank runs every test case in
// the same order, so the collective calls inside them match up; the checks run on the root.
// The reference is run_restarts (parallel/restarts.hpp) in this same process, which the rest of
// the suite checks against published values; here the property is bit-identity, not quality.
#define DOCTEST_CONFIG_IMPLEMENT
#include <doctest/doctest.h>
#include <mpi.h>
#include <spinwright/io/edge_list.hpp>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/model.hpp>
#include <spinwright/parallel/mpi.hpp>
#include <spinwright/parallel/mpi_tempering.hpp>
#include <spinwright/parallel/restarts.hpp>

#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

namespace sw = spinwright;

namespace {

template <class Energy>
void check_same(const sw::Tally<Energy>& got, const sw::Tally<Energy>& want) {
  REQUIRE(got.restarts() == want.restarts());
  CHECK(got.energies() == want.energies());
  CHECK(got.total_sweeps() == want.total_sweeps());
  CHECK(got.best().energy == want.best().energy);
  CHECK(got.best().restart == want.best().restart);
  CHECK(got.best().spins == want.best().spins);
  CHECK(got.best().sweeps == want.best().sweeps);
  CHECK(got.best().attempted == want.best().attempted);
  CHECK(got.best().accepted == want.best().accepted);
}

}  // namespace

TEST_CASE("shares: contiguous blocks that cover every restart once, owner_of agrees") {
  for (int ranks = 1; ranks <= 7; ++ranks) {
    for (std::uint64_t restarts : {0ull, 1ull, 2ull, 5ull, 64ull, 1001ull}) {
      std::uint64_t covered = 0;
      for (int k = 0; k < ranks; ++k) {
        CHECK(sw::mpi::share_begin(k, restarts, ranks) == covered);
        const std::uint64_t n = sw::mpi::share_size(k, restarts, ranks);
        CHECK(n >= restarts / static_cast<std::uint64_t>(ranks));      // no rank starves...
        CHECK(n <= restarts / static_cast<std::uint64_t>(ranks) + 1);  // ...or takes more than one extra
        for (std::uint64_t r = covered; r < covered + n; ++r) CHECK(sw::mpi::owner_of(r, restarts, ranks) == k);
        covered += n;
      }
      CHECK(covered == restarts);
    }
  }
}

TEST_CASE("agree and any_of are collective verdicts") {
  const auto place = sw::mpi::place_in(MPI_COMM_WORLD);
  CHECK(sw::mpi::agree(MPI_COMM_WORLD, true));
  CHECK(sw::mpi::agree(MPI_COMM_WORLD, place.rank != place.ranks - 1) == false);
  CHECK(sw::mpi::any_of(MPI_COMM_WORLD, false) == false);
  CHECK(sw::mpi::any_of(MPI_COMM_WORLD, place.rank == place.ranks - 1));
}

TEST_CASE("G43 restarts over ranks: the tally of one process, bit for bit") {
  // G43 (1000 nodes) from the shared G-set copy; 8 restarts x 300 sweeps, seed 11.
  auto read = sw::io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G43.txt");
  REQUIRE(sw::mpi::agree(MPI_COMM_WORLD, read.ok()));
  const auto& model = read.value();
  sw::AnnealParams params;
  params.sweeps = 300;
  auto one = [&](std::uint64_t r) { return sw::anneal(model, params, 11, r); };
  for (unsigned threads : {1u, 2u}) {
    for (std::uint64_t restarts : {8ull, 3ull, 1ull}) {
      auto got = sw::mpi::distributed_restarts<std::int64_t>(MPI_COMM_WORLD, restarts, threads, one);
      if (sw::mpi::place_in(MPI_COMM_WORLD).is_root()) {
        const auto want = sw::run_restarts<std::int64_t>(restarts, 1, one);
        check_same(got, want);
      } else {
        CHECK(got.empty());
      }
    }
  }
}

TEST_CASE("Deliver::every_rank: the same tally on every rank") {
  auto read = sw::io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G43.txt");
  REQUIRE(sw::mpi::agree(MPI_COMM_WORLD, read.ok()));
  sw::AnnealParams params;
  params.sweeps = 100;
  auto one = [&](std::uint64_t r) { return sw::anneal(read.value(), params, 4, r); };
  auto got = sw::mpi::distributed_restarts<std::int64_t>(MPI_COMM_WORLD, 5, 1, one, 0, sw::mpi::Deliver::every_rank);
  check_same(got, sw::run_restarts<std::int64_t>(5, 1, one));
}

TEST_CASE("distributed_shares: a runner of whole shares gives the same tally") {
  auto read = sw::io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G43.txt");
  REQUIRE(sw::mpi::agree(MPI_COMM_WORLD, read.ok()));
  sw::AnnealParams params;
  params.sweeps = 100;
  auto one = [&](std::uint64_t r) { return sw::anneal(read.value(), params, 9, r); };
  auto share = [&](std::uint64_t first, std::uint64_t count) {
    std::vector<sw::Solution<std::int64_t>> out;
    for (std::uint64_t r = first; r < first + count; ++r) out.push_back(one(r));
    return out;
  };
  for (std::uint64_t restarts : {7ull, 2ull, 0ull}) {
    auto got = sw::mpi::distributed_shares<std::int64_t>(MPI_COMM_WORLD, restarts, share);
    if (sw::mpi::place_in(MPI_COMM_WORLD).is_root()) check_same(got, sw::run_restarts<std::int64_t>(restarts, 1, one));
  }
}

TEST_CASE("ties go to the lowest restart index, whichever rank holds it") {
  // Two spins, one antiferromagnetic bond: every restart ends at energy -1 in one of two states.
  sw::IsingBuilder<double> b(2);
  b.add_coupling(0, 1, 1.0);
  auto built = b.build();
  REQUIRE(built.ok());
  const auto& model = built.value();
  sw::AnnealParams params;
  params.sweeps = 50;
  auto one = [&](std::uint64_t r) { return sw::anneal(model, params, 3, r); };
  auto got = sw::mpi::distributed_restarts<double>(MPI_COMM_WORLD, 9, 1, one);
  if (sw::mpi::place_in(MPI_COMM_WORLD).is_root()) {
    check_same(got, sw::run_restarts<double>(9, 1, one));
    CHECK(got.best().restart == 0);
    CHECK(got.best().energy == -1.0);
  }
}

TEST_CASE("zero restarts: an empty tally everywhere, no hang") {
  sw::IsingBuilder<double> b(2);
  auto built = b.build();
  REQUIRE(built.ok());
  const auto& model = built.value();
  auto one = [&](std::uint64_t r) { return sw::anneal(model, sw::AnnealParams{}, 1, r); };
  auto got = sw::mpi::distributed_restarts<double>(MPI_COMM_WORLD, 0, 1, one);
  CHECK(got.empty());
}

namespace {

// The 4x4 periodic ferromagnet, H = -sum_<ij> s_i s_j (32 bonds).
sw::IsingModel<std::int32_t> torus4() {
  sw::IsingBuilder<std::int32_t> b(16);
  for (int y = 0; y < 4; ++y) {
    for (int x = 0; x < 4; ++x) {
      const int i = 4 * y + x;
      b.add_coupling(static_cast<std::uint64_t>(i), static_cast<std::uint64_t>(4 * y + (x + 1) % 4), -1);
      b.add_coupling(static_cast<std::uint64_t>(i), static_cast<std::uint64_t>(4 * ((y + 1) % 4) + x), -1);
    }
  }
  return b.build().value();
}

// A 10-spin glass with fields and no symmetry (a frozen spin would show): couplings and fields
// from a fixed generator, values in {-3..3}.
sw::IsingModel<std::int32_t> glass10() {
  sw::IsingBuilder<std::int32_t> b(10);
  auto rng = sw::Xoshiro256::for_restart(2026, 0);
  for (std::uint64_t i = 0; i < 10; ++i) {
    b.add_field(i, static_cast<std::int32_t>(rng.below(7)) - 3);
    for (std::uint64_t j = i + 1; j < 10; ++j) {
      if (rng.below(2) == 0) b.add_coupling(i, j, static_cast<std::int32_t>(rng.below(7)) - 3);
    }
  }
  return b.build().value();
}

// <E> at beta by summing all 2^N states in the test (independent of the library's kernels;
// the energy of each state from the model's own energy function, which the suite checks).
double exact_mean_energy(const sw::IsingModel<std::int32_t>& m, double beta) {
  const std::size_t n = m.num_spins();
  std::vector<std::int8_t> s(n);
  double z = 0, ez = 0, e0 = 0;
  bool first = true;
  for (std::uint64_t code = 0; code < (std::uint64_t{1} << n); ++code) {
    for (std::size_t i = 0; i < n; ++i) s[i] = (code >> i) & 1 ? -1 : 1;
    const double e = static_cast<double>(m.energy(s.data()));
    if (first) e0 = e, first = false;
    const double w = std::exp(-beta * (e - e0));
    z += w;
    ez += w * e;
  }
  return ez / z;
}

// Rung means over `sweeps` after `burn` sweeps.
template <class Model>
std::vector<double> rung_means(sw::mpi::RankLadder<Model>& ladder, std::uint64_t burn, std::uint64_t sweeps) {
  ladder.run(burn);
  std::vector<double> sum(ladder.rungs(), 0.0);
  for (std::uint64_t t = 0; t < sweeps; ++t) {
    ladder.sweep();
    for (std::size_t k = 0; k < ladder.rungs(); ++k) sum[k] += static_cast<double>(ladder.energy_on_rung(k));
  }
  for (auto& v : sum) v /= static_cast<double>(sweeps);
  return sum;
}

}  // namespace

TEST_CASE("tempering over ranks: the same run for any rank count") {
  // The same ladder on this process alone (MPI_COMM_SELF) and over every rank: identical rung
  // energies after every sweep, identical best state.
  const auto model = glass10();
  const std::vector<double> betas = {0.1, 0.3, 0.6, 1.0, 1.6};
  sw::mpi::RankLadder<sw::IsingModel<std::int32_t>> world(MPI_COMM_WORLD, model, betas, 5);
  sw::mpi::RankLadder<sw::IsingModel<std::int32_t>> alone(MPI_COMM_SELF, model, betas, 5);
  REQUIRE(world.valid() == (sw::mpi::place_in(MPI_COMM_WORLD).ranks <= 5));
  REQUIRE(alone.valid());
  bool same = true;
  for (int t = 0; t < 200; ++t) {
    world.sweep();
    alone.sweep();
    for (std::size_t k = 0; k < betas.size(); ++k) same = same && world.energy_on_rung(k) == alone.energy_on_rung(k);
  }
  CHECK(same);
  for (std::size_t k = 0; k + 1 < betas.size(); ++k) CHECK(world.swap_acceptance(k) == alone.swap_acceptance(k));
  const auto a = world.solution();
  const auto b = alone.solution();
  if (sw::mpi::place_in(MPI_COMM_WORLD).is_root()) {
    CHECK(a.energy == b.energy);
    CHECK(a.spins == b.spins);
    CHECK(a.restart == b.restart);
  }
}

TEST_CASE("tempering over ranks: rung energies of the 4x4 torus at the exact values") {
  // Exact <E>/N of the 4x4 periodic ferromagnet from its density of states (Beale, Phys. Rev.
  // Lett. 76, 78 (1996); the values as listed in REFERENCES section 3): T = 2.5, 2.0, 1.5.
  const auto model = torus4();
  sw::mpi::RankLadder<sw::IsingModel<std::int32_t>> ladder(MPI_COMM_WORLD, model, {0.4, 0.5, 1 / 1.5}, 17);
  REQUIRE(ladder.valid());
  const auto mean = rung_means(ladder, 2000, 60000);
  // sigma of u at 6e4 sweeps is about 4e-3 (1e-3 at 1e6 sweeps, scaled); 0.02 is 5 sigma, while
  // a wrong swap rule or a frozen site moves the means by 0.1 or more.
  CHECK(std::abs(mean[0] / 16 - -1.37911648226) < 0.02);
  CHECK(std::abs(mean[1] / 16 - -1.75538028878) < 0.02);
  CHECK(std::abs(mean[2] / 16 - -1.95064256146) < 0.02);
  for (std::size_t k = 0; k + 1 < ladder.rungs(); ++k) CHECK(ladder.swap_acceptance(k) > 0.05);
}

TEST_CASE("tempering over ranks: a glass with fields against exact enumeration") {
  const auto model = glass10();
  const std::vector<double> betas = {0.2, 0.5, 1.0};
  sw::mpi::RankLadder<sw::IsingModel<std::int32_t>> ladder(MPI_COMM_WORLD, model, betas, 23);
  REQUIRE(ladder.valid());
  const auto mean = rung_means(ladder, 2000, 60000);
  for (std::size_t k = 0; k < betas.size(); ++k) {
    const double exact = exact_mean_energy(model, betas[k]);
    CHECK(std::abs(mean[k] - exact) < 0.03 * (1 + std::abs(exact)));
  }
  const auto best = ladder.solution();
  if (sw::mpi::place_in(MPI_COMM_WORLD).is_root()) {
    REQUIRE(best.spins.size() == 10);
    CHECK(best.energy == model.energy(best.spins.data()));
  }
}

TEST_CASE("tempering over ranks: refuses a bad ladder on every rank, and a stop ends every rank") {
  const auto model = torus4();
  CHECK_FALSE(sw::mpi::RankLadder<sw::IsingModel<std::int32_t>>(MPI_COMM_WORLD, model, {}, 1).valid());
  CHECK_FALSE(sw::mpi::RankLadder<sw::IsingModel<std::int32_t>>(MPI_COMM_WORLD, model, {0.5, 0.4, 0.3}, 1).valid());
  CHECK_FALSE(sw::mpi::RankLadder<sw::IsingModel<std::int32_t>>(MPI_COMM_WORLD, model, {-0.1, 0.4, 0.5}, 1).valid());
  CHECK_FALSE(sw::mpi::RankLadder<sw::IsingModel<std::int32_t>>(MPI_COMM_WORLD, model, {0.1, NAN, 0.5}, 1).valid());
  sw::mpi::RankLadder<sw::IsingModel<std::int32_t>> ladder(MPI_COMM_WORLD, model, {0.2, 0.4, 0.6}, 1);
  sw::StopToken stop;
  if (sw::mpi::place_in(MPI_COMM_WORLD).rank == sw::mpi::place_in(MPI_COMM_WORLD).ranks - 1) stop.request_stop();
  CHECK(ladder.run(100, &stop) == 0);  // the last rank's token stops all of them before the first sweep
  CHECK(ladder.sweeps() == 0);
}

int main(int argc, char** argv) {
  MPI_Init(&argc, &argv);
  doctest::Context context(argc, argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (rank != 0) context.setOption("out", "/dev/null");
  int failed = context.run();
  int any = 0;
  MPI_Allreduce(&failed, &any, 1, MPI_INT, MPI_LOR, MPI_COMM_WORLD);
  MPI_Finalize();
  return any ? 1 : 0;
}
