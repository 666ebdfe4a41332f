// spinwright — replica-exchange tempering with the replicas spread over MPI ranks (opt-in
// header; needs MPI). Replica k lives on one rank for the whole run and has its own random
// stream (seed, k); swaps exchange betas, not states, so a swap costs one small collective
// (every rank learns every replica's energy) and the whole run is the same for any rank count.
// Layout, messages and their cost: docs/scale-out.md.
#ifndef SPINWRIGHT_PARALLEL_MPI_TEMPERING_HPP
#define SPINWRIGHT_PARALLEL_MPI_TEMPERING_HPP

#include "../control/stop_token.hpp"
#include "../kernels/acceptance.hpp"
#include "../kernels/solution.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "mpi.hpp"

#include <mpi.h>

#include <cmath>        // std::exp, std::isfinite
#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t
#include <type_traits>  // std::is_trivially_copyable
#include <utility>      // std::move
#include <vector>       // std::vector

namespace spinwright {
namespace mpi {

// Betas are given in increasing order (rung 0 is the hottest). Every sweep: each replica makes
// one Metropolis sweep in random site order at its rung's beta (its own stream), the energies
// are shared (MPI_Allgatherv), and every rank makes the same swap pass over neighbouring rungs
// — even pairs after even sweeps, odd pairs after odd ones — with a swap stream (seed, T) that
// every rank holds a copy of. A swap of rungs k, k+1 is accepted with probability
// min(1, exp((beta_{k+1} - beta_k)(E_{k+1} - E_k))) (Hukushima & Nemoto, J. Phys. Soc. Jpn. 65,
// 1604 (1996)).
template <class Model>
class RankLadder {
 public:
  using state_type = SpinState<Model>;
  using energy_type = typename state_type::energy_type;
  using index_type = typename Model::index_type;
  static_assert(std::is_trivially_copyable<energy_type>::value, "energies travel as bytes");

  // Collective: every rank of `comm` constructs it with the same model, betas and seed.
  // valid() is false (on every rank) when the betas are empty, not increasing, negative or not
  // finite, or when there are fewer replicas than ranks.
  RankLadder(MPI_Comm comm, const Model& model, std::vector<double> betas, std::uint64_t seed)
      : comm_(comm), model_(&model), betas_(std::move(betas)), place_(place_in(comm)) {
    const std::size_t t = betas_.size();
    bool ok = t > 0 && t >= static_cast<std::size_t>(place_.ranks);
    for (std::size_t k = 0; ok && k < t; ++k) {
      ok = std::isfinite(betas_[k]) && betas_[k] >= 0 && (k == 0 || betas_[k] > betas_[k - 1]);
    }
    valid_ = ok;
    if (!valid_) return;
    first_ = share_begin(place_.rank, t, place_.ranks);
    const std::uint64_t mine = share_size(place_.rank, t, place_.ranks);
    for (std::uint64_t k = 0; k < mine; ++k) {
      const std::uint64_t replica = first_ + k;
      local_.emplace_back(model);
      streams_.push_back(Xoshiro256::for_restart(seed, replica));
      local_.back().randomize(streams_.back());
      // The project's acceptance (threshold table for integer models: no exp per attempt),
      // retuned only when the replica's rung changes.
      acceptors_.push_back(make_acceptor(model, Acceptance::metropolis));
      acceptor_rung_.push_back(t);  // no rung yet
    }
    swap_rng_ = Xoshiro256::for_restart(seed, t);
    rung_of_.resize(t);
    replica_on_.resize(t);
    for (std::size_t k = 0; k < t; ++k) rung_of_[k] = replica_on_[k] = k;
    energies_.resize(t);
    counts_.resize(static_cast<std::size_t>(place_.ranks));
    offsets_.resize(static_cast<std::size_t>(place_.ranks));
    for (int r = 0; r < place_.ranks; ++r) {
      counts_[static_cast<std::size_t>(r)] = static_cast<int>(share_size(r, t, place_.ranks) * sizeof(energy_type));
      offsets_[static_cast<std::size_t>(r)] = static_cast<int>(share_begin(r, t, place_.ranks) * sizeof(energy_type));
    }
    tried_.assign(t - 1, 0);
    done_.assign(t - 1, 0);
    best_ = local_.empty() ? std::vector<std::int8_t>()
                           : std::vector<std::int8_t>(local_[0].spins(), local_[0].spins() + model.num_spins());
    best_energy_ = local_.empty() ? energy_type{} : local_[0].energy();
    for (std::size_t k = 0; k < local_.size(); ++k) note_best(k);
    share_energies();
  }

  RankLadder(MPI_Comm, const Model&&, std::vector<double>, std::uint64_t) = delete;

  bool valid() const noexcept { return valid_; }
  std::size_t rungs() const noexcept { return betas_.size(); }
  std::uint64_t sweeps() const noexcept { return sweeps_; }
  // Energy of the replica now on rung k (the same on every rank after each sweep).
  energy_type energy_on_rung(std::size_t k) const { return energies_[replica_on_[k]]; }
  // Acceptance of swaps between rungs k and k+1 so far (0 before any attempt).
  double swap_acceptance(std::size_t k) const {
    return tried_[k] == 0 ? 0.0 : static_cast<double>(done_[k]) / static_cast<double>(tried_[k]);
  }

  // One sweep of every replica and one swap pass. Collective.
  void sweep() {
    if (!valid_) return;
    for (std::size_t k = 0; k < local_.size(); ++k) {
      const std::size_t rung = rung_of_[first_ + k];
      if (acceptor_rung_[k] != rung) {
        acceptors_[k].set_beta(betas_[rung]);
        acceptor_rung_[k] = rung;
      }
      metropolis(local_[k], streams_[k], acceptors_[k]);
      note_best(k);
    }
    share_energies();
    swap_pass(sweeps_ % 2);
    ++sweeps_;
  }

  // Up to `count` sweeps; stops early (on every rank at the same sweep) when any rank's token
  // is set. Returns the sweeps done. Collective.
  std::uint64_t run(std::uint64_t count, const StopToken* stop = nullptr) {
    std::uint64_t done = 0;
    for (; done < count; ++done) {
      if (any_of(comm_, stop != nullptr && stop->stop_requested())) break;
      sweep();
    }
    return done;
  }

  // The lowest-energy state any replica has visited (ties: the lowest replica index, then the
  // earliest sweep), on `root`; an empty Solution elsewhere. Collective.
  Solution<energy_type> solution(int root = 0) const {
    struct Best {
      energy_type energy;
      std::uint64_t replica;
    };
    Best mine{best_energy_, best_replica_};
    const int have = local_.empty() ? 0 : 1;
    std::vector<Best> all(static_cast<std::size_t>(place_.ranks));
    std::vector<int> has(static_cast<std::size_t>(place_.ranks));
    MPI_Allgather(&mine, static_cast<int>(sizeof(Best)), MPI_BYTE, all.data(), static_cast<int>(sizeof(Best)), MPI_BYTE,
                  comm_);
    MPI_Allgather(&have, 1, MPI_INT, has.data(), 1, MPI_INT, comm_);
    int winner = -1;
    for (int r = 0; r < place_.ranks; ++r) {
      const auto& b = all[static_cast<std::size_t>(r)];
      if (!has[static_cast<std::size_t>(r)]) continue;
      const auto& w = all[static_cast<std::size_t>(winner < 0 ? 0 : winner)];
      if (winner < 0 || b.energy < w.energy || (b.energy == w.energy && b.replica < w.replica)) winner = r;
    }
    Solution<energy_type> s;
    if (winner < 0) return s;
    std::vector<std::int8_t> spins = place_.rank == winner ? best_ : std::vector<std::int8_t>(model_->num_spins());
    if (winner != root) {
      if (place_.rank == winner) MPI_Send(spins.data(), static_cast<int>(spins.size()), MPI_INT8_T, root, 2, comm_);
      if (place_.rank == root)
        MPI_Recv(spins.data(), static_cast<int>(spins.size()), MPI_INT8_T, winner, 2, comm_, MPI_STATUS_IGNORE);
    }
    if (place_.rank != root) return s;
    s.spins = std::move(spins);
    s.energy = all[static_cast<std::size_t>(winner)].energy;
    s.sweeps = sweeps_;
    s.restart = all[static_cast<std::size_t>(winner)].replica;
    return s;
  }

 private:
  void metropolis(state_type& s, Xoshiro256& rng, const Acceptor<energy_type>& acc) {
    const auto n = static_cast<std::uint32_t>(model_->num_spins());
    for (std::uint32_t a = 0; a < n; ++a) {
      const auto i = static_cast<index_type>(rng.below(n));
      const energy_type d = s.delta(i);
      if (acc.accept(d, rng)) s.flip_with_delta(i, d);
    }
  }

  void note_best(std::size_t k) {
    const energy_type e = local_[k].energy();
    const std::uint64_t replica = first_ + k;
    if (e < best_energy_ || (e == best_energy_ && replica < best_replica_) || !has_best_) {
      best_energy_ = e;
      best_replica_ = replica;
      has_best_ = true;
      best_.assign(local_[k].spins(), local_[k].spins() + model_->num_spins());
    }
  }

  void share_energies() {
    std::vector<energy_type> mine(local_.size());
    for (std::size_t k = 0; k < local_.size(); ++k) mine[k] = local_[k].energy();
    MPI_Allgatherv(mine.data(), static_cast<int>(mine.size() * sizeof(energy_type)), MPI_BYTE, energies_.data(),
                   counts_.data(), offsets_.data(), MPI_BYTE, comm_);
  }

  // The same decisions on every rank: same energies, same swap stream.
  void swap_pass(std::uint64_t parity) {
    for (std::size_t k = static_cast<std::size_t>(parity); k + 1 < betas_.size(); k += 2) {
      const std::size_t a = replica_on_[k];
      const std::size_t b = replica_on_[k + 1];
      const double x = (betas_[k + 1] - betas_[k]) * static_cast<double>(energies_[b] - energies_[a]);
      ++tried_[k];
      const double u = swap_rng_.uniform();  // drawn always, so the stream does not depend on x
      if (x >= 0 || u < std::exp(x)) {
        replica_on_[k] = b;
        replica_on_[k + 1] = a;
        rung_of_[a] = k + 1;
        rung_of_[b] = k;
        ++done_[k];
      }
    }
  }

  MPI_Comm comm_;
  const Model* model_;
  std::vector<double> betas_;
  Place place_;
  bool valid_ = false;
  std::uint64_t first_ = 0;  // index of this rank's first replica
  std::vector<state_type> local_;
  std::vector<Xoshiro256> streams_;
  std::vector<Acceptor<energy_type>> acceptors_;  // one per local replica
  std::vector<std::size_t> acceptor_rung_;        // the rung each acceptor is tuned to
  Xoshiro256 swap_rng_{};
  std::vector<std::size_t> rung_of_;     // replica -> rung
  std::vector<std::size_t> replica_on_;  // rung -> replica
  std::vector<energy_type> energies_;    // per replica, all ranks
  std::vector<int> counts_, offsets_;    // bytes per rank in energies_
  std::vector<std::uint64_t> tried_, done_;
  std::uint64_t sweeps_ = 0;
  std::vector<std::int8_t> best_;
  energy_type best_energy_{};
  std::uint64_t best_replica_ = 0;
  bool has_best_ = false;
};

}  // namespace mpi
}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_MPI_TEMPERING_HPP
