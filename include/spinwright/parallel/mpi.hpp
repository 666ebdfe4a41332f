// spinwright — restarts over MPI ranks (opt-in header; needs an MPI library, e.g. Open MPI).
// The core never includes it. Restart r is still run by run_one(r), seeded from (seed, r) only,
// so the tally and the best state are bit-identical for any number of ranks and threads.
// The layout, the messages and their cost are in docs/scale-out.md.
#ifndef SPINWRIGHT_PARALLEL_MPI_HPP
#define SPINWRIGHT_PARALLEL_MPI_HPP

#include "../config.hpp"
#include "../stats/tally.hpp"

#include <mpi.h>

#include <atomic>       // std::atomic
#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t, std::int8_t
#include <thread>       // std::thread
#include <type_traits>  // std::is_trivially_copyable
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {
namespace mpi {

// Where this process sits in a communicator.
struct Place {
  int rank = 0;
  int ranks = 1;
  bool is_root(int root = 0) const noexcept { return rank == root; }
};

inline Place place_in(MPI_Comm comm) {
  Place p;
  MPI_Comm_rank(comm, &p.rank);
  MPI_Comm_size(comm, &p.ranks);
  return p;
}

// Restarts are dealt in contiguous blocks: rank k runs [share_begin(k), share_begin(k + 1)).
// The first (restarts mod ranks) ranks take one more. Block order keeps the gathered records in
// restart order with no sort.
inline std::uint64_t share_begin(int rank, std::uint64_t restarts, int ranks) noexcept {
  const auto k = static_cast<std::uint64_t>(rank);
  const auto n = static_cast<std::uint64_t>(ranks);
  const std::uint64_t base = restarts / n;
  const std::uint64_t extra = restarts % n;
  return k * base + (k < extra ? k : extra);
}

inline std::uint64_t share_size(int rank, std::uint64_t restarts, int ranks) noexcept {
  return share_begin(rank + 1, restarts, ranks) - share_begin(rank, restarts, ranks);
}

// The rank that runs restart r.
inline int owner_of(std::uint64_t r, std::uint64_t restarts, int ranks) noexcept {
  int lo = 0;
  int hi = ranks - 1;
  while (lo < hi) {  // the last rank whose block starts at or before r
    const int mid = lo + (hi - lo + 1) / 2;
    if (share_begin(mid, restarts, ranks) <= r) {
      lo = mid;
    } else {
      hi = mid - 1;
    }
  }
  return lo;
}

// A collective verdict: true on every rank only if `ok` is true on every rank. Every rank must
// call it at the same point; a rank that failed (say, could not read its file) still calls it,
// so nobody waits for a message that never comes.
inline bool agree(MPI_Comm comm, bool ok) {
  int mine = ok ? 1 : 0;
  int all = 0;
  MPI_Allreduce(&mine, &all, 1, MPI_INT, MPI_LAND, comm);
  return all != 0;
}

// A logical OR over ranks (e.g. "some rank was interrupted").
inline bool any_of(MPI_Comm comm, bool flag) {
  int mine = flag ? 1 : 0;
  int any = 0;
  MPI_Allreduce(&mine, &any, 1, MPI_INT, MPI_LOR, comm);
  return any != 0;
}

namespace detail {

// What travels to the root per restart: everything of a Solution except its spins.
template <class Energy>
struct RestartRecord {
  Energy energy{};
  std::uint64_t sweeps = 0;
  std::uint64_t attempted = 0;
  std::uint64_t accepted = 0;
  double seconds = 0;
  std::uint64_t restart = 0;
  std::int32_t reason = 0;
};

template <class Energy>
RestartRecord<Energy> record_of(const Solution<Energy>& s) {
  RestartRecord<Energy> r;
  r.energy = s.energy;
  r.sweeps = s.sweeps;
  r.attempted = s.attempted;
  r.accepted = s.accepted;
  r.seconds = s.seconds;
  r.restart = s.restart;
  r.reason = static_cast<std::int32_t>(s.reason);
  return r;
}

template <class Energy>
Solution<Energy> solution_of(const RestartRecord<Energy>& r) {
  Solution<Energy> s;
  s.energy = r.energy;
  s.sweeps = r.sweeps;
  s.attempted = r.attempted;
  s.accepted = r.accepted;
  s.seconds = r.seconds;
  s.restart = r.restart;
  s.reason = static_cast<StopReason>(r.reason);
  return s;
}

// Lower is better; ties go to the lower restart index (the order Tally uses).
template <class Energy>
bool better(const RestartRecord<Energy>& a, const RestartRecord<Energy>& b) {
  return a.energy < b.energy || (a.energy == b.energy && a.restart < b.restart);
}

}  // namespace detail

// Where distributed_restarts delivers the tally: on the root only (other ranks get an empty
// tally), or on every rank (one more broadcast of the records and of the best state), for
// programs whose every rank goes on with the answer, such as spinwright-mpi.
enum class Deliver : std::uint8_t { root, every_rank };

namespace detail {

// The common end of distributed_restarts and distributed_shares: this rank's records (its
// share, in restart order), its best record and state (best_spins_local: null when the share is
// empty), gathered to the root in rank order = restart order.
template <class Energy>
Tally<Energy> gather_share(MPI_Comm comm, const Place& place, const std::vector<RestartRecord<Energy>>& records,
                           bool have_local, const RestartRecord<Energy>& best_local,
                           const std::vector<std::int8_t>* best_spins_local, int root, Deliver deliver) {
  using Record = RestartRecord<Energy>;
  // Gather the records (as bytes) to the root, in rank order = restart order.
  const int bytes = static_cast<int>(records.size() * sizeof(Record));
  std::vector<int> counts(place.is_root(root) ? static_cast<std::size_t>(place.ranks) : 0);
  MPI_Gather(&bytes, 1, MPI_INT, counts.data(), 1, MPI_INT, root, comm);
  std::vector<int> offsets(counts.size());
  std::vector<Record> all;
  if (place.is_root(root)) {
    int at = 0;
    for (std::size_t k = 0; k < counts.size(); ++k) {
      offsets[k] = at;
      at += counts[k];
    }
    all.resize(static_cast<std::size_t>(at) / sizeof(Record));
  }
  MPI_Gatherv(records.data(), bytes, MPI_BYTE, all.data(), counts.data(), offsets.data(), MPI_BYTE, root, comm);

  // Each rank's best travels too (small), so the root knows whose state to ask for.
  std::vector<Record> bests(place.is_root(root) ? static_cast<std::size_t>(place.ranks) : 0);
  std::vector<int> has(place.is_root(root) ? static_cast<std::size_t>(place.ranks) : 0);
  const int have = have_local ? 1 : 0;
  MPI_Gather(&best_local, static_cast<int>(sizeof(Record)), MPI_BYTE, bests.data(), static_cast<int>(sizeof(Record)),
             MPI_BYTE, root, comm);
  MPI_Gather(&have, 1, MPI_INT, has.data(), 1, MPI_INT, root, comm);
  int winner = -1;
  if (place.is_root(root)) {
    for (int k = 0; k < place.ranks; ++k) {
      const auto kk = static_cast<std::size_t>(k);
      if (has[kk] && (winner < 0 || detail::better(bests[kk], bests[static_cast<std::size_t>(winner)]))) winner = k;
    }
  }
  MPI_Bcast(&winner, 1, MPI_INT, root, comm);

  Tally<Energy> out;
  std::vector<std::int8_t> best_spins;
  if (winner >= 0) {
    if (place.rank == winner) best_spins = *best_spins_local;
    if (winner != root) {
      if (place.rank == winner) {
        const auto n = static_cast<std::uint64_t>(best_spins.size());
        MPI_Send(&n, 1, MPI_UINT64_T, root, 0, comm);
        MPI_Send(best_spins.data(), static_cast<int>(n), MPI_INT8_T, root, 1, comm);
      } else if (place.is_root(root)) {
        std::uint64_t n = 0;
        MPI_Recv(&n, 1, MPI_UINT64_T, winner, 0, comm, MPI_STATUS_IGNORE);
        best_spins.resize(static_cast<std::size_t>(n));
        MPI_Recv(best_spins.data(), static_cast<int>(n), MPI_INT8_T, winner, 1, comm, MPI_STATUS_IGNORE);
      }
    }
  }
  if (deliver == Deliver::every_rank) {
    std::uint64_t sizes[2] = {static_cast<std::uint64_t>(all.size()), static_cast<std::uint64_t>(best_spins.size())};
    MPI_Bcast(sizes, 2, MPI_UINT64_T, root, comm);
    all.resize(static_cast<std::size_t>(sizes[0]));
    best_spins.resize(static_cast<std::size_t>(sizes[1]));
    MPI_Bcast(all.data(), static_cast<int>(all.size() * sizeof(Record)), MPI_BYTE, root, comm);
    MPI_Bcast(best_spins.data(), static_cast<int>(best_spins.size()), MPI_INT8_T, root, comm);
    bests.resize(static_cast<std::size_t>(place.ranks));
    MPI_Bcast(bests.data(), static_cast<int>(bests.size() * sizeof(Record)), MPI_BYTE, root, comm);
  } else if (!place.is_root(root)) {
    return out;
  }

  const Record& best = bests[static_cast<std::size_t>(winner < 0 ? 0 : winner)];
  for (const Record& r : all) {
    Solution<Energy> s = detail::solution_of(r);
    if (winner >= 0 && r.restart == best.restart) s.spins = best_spins;
    out.add(std::move(s));
  }
  return out;
}

}  // namespace detail

// Runs restarts 0 .. restarts - 1 over the ranks of `comm` (threads per rank, as run_restarts;
// 0 = one per hardware thread)
// and returns on `root` the Tally run_restarts would return in one process: same energies in
// restart order, same best state. Other ranks return an empty Tally unless `deliver` is
// Deliver::every_rank. Collective: every rank of
// `comm` calls it with the same restarts and root. Records are shipped as bytes, so every rank
// must share one architecture (the usual cluster). Messages: one gather of the per-rank counts,
// one gather of fixed-size records (sizeof(RestartRecord) per restart), one broadcast of the
// best restart index and one point-to-point message with the best state (N bytes).
template <class Energy, class RunOne>
Tally<Energy> distributed_restarts(MPI_Comm comm, std::uint64_t restarts, unsigned threads, RunOne&& run_one,
                                   int root = 0, Deliver deliver = Deliver::root) {
  static_assert(std::is_trivially_copyable<Energy>::value, "energies travel as bytes");
  using Record = detail::RestartRecord<Energy>;
  const Place place = place_in(comm);
  const std::uint64_t begin = share_begin(place.rank, restarts, place.ranks);
  const std::uint64_t mine = share_size(place.rank, restarts, place.ranks);

  // This rank's share on `threads` threads: a record per restart, the full Solution only for
  // each thread's best (so memory stays at one state per thread, not one per restart).
  std::vector<Record> records(static_cast<std::size_t>(mine));
  unsigned workers = threads == 0 ? std::thread::hardware_concurrency() : threads;
  if (workers == 0) workers = 1;
  if (workers > mine) workers = static_cast<unsigned>(mine == 0 ? 1 : mine);
  std::vector<Solution<Energy>> thread_best(workers);
  std::vector<char> thread_has(workers, 0);
  std::atomic<std::uint64_t> next{0};
  auto worker = [&](unsigned t) {
    for (std::uint64_t k = next.fetch_add(1); k < mine; k = next.fetch_add(1)) {
      Solution<Energy> s = run_one(begin + k);
      s.restart = begin + k;
      records[static_cast<std::size_t>(k)] = detail::record_of(s);
      if (!thread_has[t] || detail::better(records[static_cast<std::size_t>(k)], detail::record_of(thread_best[t]))) {
        thread_best[t] = std::move(s);
        thread_has[t] = 1;
      }
    }
  };
  if (workers <= 1) {
    worker(0);
  } else {
    std::vector<std::thread> pool;
    pool.reserve(workers);
    for (unsigned t = 0; t < workers; ++t) pool.emplace_back(worker, t);
    for (auto& th : pool) th.join();
  }
  int local_best = -1;
  for (unsigned t = 0; t < workers; ++t) {
    if (thread_has[t] &&
        (local_best < 0 || detail::better(detail::record_of(thread_best[t]),
                                          detail::record_of(thread_best[static_cast<std::size_t>(local_best)])))) {
      local_best = static_cast<int>(t);
    }
  }
  const bool have_local = local_best >= 0;
  Record best_local{};
  if (have_local) best_local = detail::record_of(thread_best[static_cast<std::size_t>(local_best)]);
  return detail::gather_share<Energy>(comm, place, records, have_local, best_local,
                                      have_local ? &thread_best[static_cast<std::size_t>(local_best)].spins : nullptr,
                                      root, deliver);
}

// The same, for programs that run a whole share at once (e.g. restarts in lockstep lanes):
// run_share(begin, count) -> std::vector<Solution<Energy>> for restarts begin .. begin + count - 1
// in order, each depending on (seed, r) only. Same result and messages as distributed_restarts.
// With block > 1 every share starts at a multiple of `block` (whole blocks are dealt to the
// ranks), for kernels whose restarts come in groups (64 to a word in bit-sliced annealing).
template <class Energy, class RunShare>
Tally<Energy> distributed_shares(MPI_Comm comm, std::uint64_t restarts, RunShare&& run_share, int root = 0,
                                 Deliver deliver = Deliver::root, std::uint64_t block = 1) {
  static_assert(std::is_trivially_copyable<Energy>::value, "energies travel as bytes");
  using Record = detail::RestartRecord<Energy>;
  const Place place = place_in(comm);
  if (block == 0) block = 1;
  const std::uint64_t units = (restarts + block - 1) / block;
  const std::uint64_t unit_begin = share_begin(place.rank, units, place.ranks);
  const std::uint64_t unit_end = unit_begin + share_size(place.rank, units, place.ranks);
  const std::uint64_t begin = unit_begin * block < restarts ? unit_begin * block : restarts;
  const std::uint64_t end = unit_end * block < restarts ? unit_end * block : restarts;
  const std::uint64_t mine = end - begin;
  std::vector<Solution<Energy>> share;
  if (mine > 0) share = run_share(begin, mine);
  std::vector<Record> records(share.size());
  std::size_t best = 0;
  for (std::size_t k = 0; k < share.size(); ++k) {
    share[k].restart = begin + k;
    records[k] = detail::record_of(share[k]);
    if (detail::better(records[k], records[best])) best = k;
  }
  const bool have_local = !share.empty();
  return detail::gather_share<Energy>(comm, place, records, have_local, have_local ? records[best] : Record{},
                                      have_local ? &share[best].spins : nullptr, root, deliver);
}

}  // namespace mpi
}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_MPI_HPP
