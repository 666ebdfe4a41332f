// Restarts over MPI ranks (parallel/mpi.hpp) give the very answer of one process: run under
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
#include <spinwright/parallel/restarts.hpp>

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
