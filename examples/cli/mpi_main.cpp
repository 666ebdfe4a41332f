// spinwright-mpi — the command-line program over MPI ranks: the same subcommands and options as
// `spinwright`; restarts are spread over the ranks of MPI_COMM_WORLD (spread.hpp) and rank 0
// writes the report and every file. Run it as `mpirun -np K spinwright-mpi solve FILE ...`.
#include "commands.hpp"

#include <mpi.h>

#include <cstdio>  // std::freopen

int main(int argc, char** argv) {
  int provided = 0;
  // Threads inside a rank run restarts; only the main thread makes MPI calls.
  MPI_Init_thread(&argc, &argv, MPI_THREAD_FUNNELED, &provided);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (rank != 0) {  // one report, one set of messages: rank 0's
    if (std::freopen("/dev/null", "w", stdout) == nullptr) return 1;
    if (std::freopen("/dev/null", "w", stderr) == nullptr) return 1;
  }
  const int code = spinwright_cli::run_command_line(argc, argv);
  // The exit code of the job is rank 0's (mpirun reports the first non-zero one it sees).
  int shared = code;
  MPI_Bcast(&shared, 1, MPI_INT, 0, MPI_COMM_WORLD);
  MPI_Finalize();
  return shared;
}
