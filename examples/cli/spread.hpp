// spinwright command-line program — where restarts run. The plain program (`spinwright`) runs
// them on the threads of this process; `spinwright-mpi` (built with SPINWRIGHT_CLI_MPI=1) spreads
// them over the ranks of MPI_COMM_WORLD as well, with the same tally for the same seed
// (parallel/mpi.hpp; docs/scale-out.md). Every rank runs the whole command; rank 0 reports.
#ifndef SPINWRIGHT_CLI_SPREAD_HPP
#define SPINWRIGHT_CLI_SPREAD_HPP

#include <spinwright/parallel/restarts.hpp>

#ifndef SPINWRIGHT_CLI_MPI
#define SPINWRIGHT_CLI_MPI 0  // spinwright-mpi's build sets it to 1
#endif

#include <cstdint>  // std::uint64_t
#include <utility>  // std::forward

#if SPINWRIGHT_CLI_MPI
#include <spinwright/parallel/mpi.hpp>
#endif

namespace spinwright_cli {

// Ranks in the job (1 for the plain program).
inline int job_ranks() {
#if SPINWRIGHT_CLI_MPI
  return spinwright::mpi::place_in(MPI_COMM_WORLD).ranks;
#else
  return 1;
#endif
}

// True on every rank only if `ok` holds on every rank (the plain program: `ok`). Called where
// ranks could part ways (a file one rank cannot read), so that none waits for the others.
inline bool job_agree(bool ok) {
#if SPINWRIGHT_CLI_MPI
  return spinwright::mpi::agree(MPI_COMM_WORLD, ok);
#else
  return ok;
#endif
}

// Only rank 0 writes reports and files (the plain program: always true).
inline bool is_report_rank() {
#if SPINWRIGHT_CLI_MPI
  return spinwright::mpi::place_in(MPI_COMM_WORLD).rank == 0;
#else
  return true;
#endif
}

// Restarts 0 .. restarts - 1, `threads` per rank; the full tally on every rank.
template <class Energy, class RunOne>
spinwright::Tally<Energy> spread_restarts(std::uint64_t restarts, unsigned threads, RunOne&& run_one) {
#if SPINWRIGHT_CLI_MPI
  return spinwright::mpi::distributed_restarts<Energy>(MPI_COMM_WORLD, restarts, threads, std::forward<RunOne>(run_one),
                                                       0, spinwright::mpi::Deliver::every_rank);
#else
  return spinwright::run_restarts<Energy>(restarts, threads, std::forward<RunOne>(run_one));
#endif
}

// The same for a runner of whole shares: run_share(begin, count) -> the Solutions of restarts
// begin .. begin + count - 1 in order (e.g. restarts in lockstep lanes), each depending on
// (seed, r) only.
// With block > 1, shares start at multiples of block (bit-sliced words of 64 restarts).
template <class Energy, class RunShare>
spinwright::Tally<Energy> spread_shares(std::uint64_t restarts, RunShare&& run_share, std::uint64_t block = 1) {
#if SPINWRIGHT_CLI_MPI
  return spinwright::mpi::distributed_shares<Energy>(MPI_COMM_WORLD, restarts, std::forward<RunShare>(run_share), 0,
                                                     spinwright::mpi::Deliver::every_rank, block);
#else
  (void)block;
  spinwright::Tally<Energy> tally;
  if (restarts == 0) return tally;
  for (auto& s : run_share(std::uint64_t{0}, restarts)) tally.add(std::move(s));
  return tally;
#endif
}

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_SPREAD_HPP
