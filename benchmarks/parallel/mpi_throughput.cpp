// Throughput of restarts over MPI ranks (parallel/mpi.hpp): G43 (1000 nodes), int32, 64
// restarts x 500 sweeps of annealing, one thread per rank. Run it under mpirun with 1 and with 2
// ranks and compare restarts per second (docs/scale-out.md):
//   mpirun -np 1 build/bench/benchmarks/mpi_throughput
//   mpirun -np 2 build/bench/benchmarks/mpi_throughput
// Every rank times the same collective call; the reported time is the slowest rank's (the
// job's wall time), set as manual time. Rank 0 prints; the others report to nowhere.
#include <benchmark/benchmark.h>
#include <mpi.h>
#include <spinwright/io/edge_list.hpp>
#include <spinwright/kernels/anneal.hpp>
#include <spinwright/parallel/mpi.hpp>

#include <cstdint>
#include <string>

namespace {

namespace sw = spinwright;

void BM_MpiRestarts(benchmark::State& state) {
  static const auto model = sw::io::read_edge_list<std::int32_t>(std::string(SPINWRIGHT_DATA_DIR) + "/maxcut/G43.txt");
  if (!sw::mpi::agree(MPI_COMM_WORLD, model.ok())) {
    state.SkipWithError("cannot read G43.txt from the shared data folder");
    return;
  }
  const auto restarts = static_cast<std::uint64_t>(state.range(0));
  sw::AnnealParams params;
  params.sweeps = 500;
  double energy = 0;
  for (auto _ : state) {
    MPI_Barrier(MPI_COMM_WORLD);
    const double start = MPI_Wtime();
    auto tally = sw::mpi::distributed_restarts<std::int64_t>(
        MPI_COMM_WORLD, restarts, 1, [&](std::uint64_t r) { return sw::anneal(model.value(), params, 11, r); });
    double mine = MPI_Wtime() - start;
    double slowest = 0;
    MPI_Allreduce(&mine, &slowest, 1, MPI_DOUBLE, MPI_MAX, MPI_COMM_WORLD);
    state.SetIterationTime(slowest);
    if (!tally.empty()) energy = static_cast<double>(tally.best().energy);
  }
  const auto place = sw::mpi::place_in(MPI_COMM_WORLD);
  state.counters["ranks"] = place.ranks;
  state.counters["best_energy"] = energy;
  state.counters["restarts_per_s"] =
      benchmark::Counter(static_cast<double>(restarts), benchmark::Counter::kIsIterationInvariantRate);
}
BENCHMARK(BM_MpiRestarts)->Arg(64)->UseManualTime()->Unit(benchmark::kMillisecond)->MinTime(2.0);

class NullReporter : public benchmark::BenchmarkReporter {
 public:
  bool ReportContext(const Context&) override { return true; }
  void ReportRuns(const std::vector<Run>&) override {}
};

}  // namespace

int main(int argc, char** argv) {
  MPI_Init(&argc, &argv);
  benchmark::Initialize(&argc, argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (rank == 0) {
    benchmark::RunSpecifiedBenchmarks();
  } else {
    NullReporter quiet;
    benchmark::RunSpecifiedBenchmarks(&quiet);
  }
  benchmark::Shutdown();
  MPI_Finalize();
  return 0;
}
