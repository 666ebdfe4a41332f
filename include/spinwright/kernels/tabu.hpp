// spinwright — tabu search over one-flip moves: a one-call function tabu_walk() and a
// stepping object TabuWalker for embedding.
//
// Method: F. Glover, "Tabu search — Part I", ORSA J. Comput. 1(3), 190-206 (1989), and
// "Tabu search — Part II", ORSA J. Comput. 2(1), 4-32 (1990). Each move flips the spin whose flip
// lowers the energy most (or raises it least) among the spins that are not tabu; a spin flipped
// at move m is tabu for the next `tenure` moves. Aspiration: a tabu spin may still be flipped when
// that flip gives an energy below the best found so far. After `stagnation` moves without a new
// best, the search restarts from the best state with a random fraction of its spins flipped
// (perturbation), with an empty tabu list and a freshly drawn tenure (tenure + a random extra in
// [0, tenure_spread]).
//
// Move selection without a scan: two tournament trees (complete binary trees over the spins, each
// internal node holding the leaf of least delta below it; ties go to the leftmost leaf), one over the
// deltas of the free spins and one over the deltas of the tabu spins (the other entries hold +inf).
// The best free move and the best tabu move are read at the roots in O(1). Flipping spin i changes
// the deltas of i and of its neighbours, so each flip updates deg(i) + 1 leaves of both trees in
// O((deg(i) + 1) log N); when that exceeds the cost of rebuilding both trees bottom-up (O(N), as on
// dense models) the trees are rebuilt instead. Spins sit on the leaves in a random order drawn
// afresh at every cycle (start and perturbation), so ties between equal deltas (frequent with
// small integer weights) are broken at random rather than always towards low indices. Releasing a spin from the tabu
// list (at most one per move: the list is a FIFO of flip times) is two leaf updates, O(log N). A move therefore costs
// O(min((deg + 1) log N, N)) on top of SpinState::flip's O(deg).
//
// One sweep is N moves (so a Budget's sweeps mean the same amount of flipping as for annealing).
// Best state: tracked at every move; the spins are copied only when the search leaves a best state,
// so a run of improving moves copies nothing.
//
// Allocation: the constructor allocates (state, trees, tabu list, best copy, permutation);
// step(), reset() and warm_start() allocate nothing.
#ifndef SPINWRIGHT_KERNELS_TABU_HPP
#define SPINWRIGHT_KERNELS_TABU_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "detail/min_tree.hpp"
#include "solution.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t
#include <cstring>  // std::memcpy
#include <limits>   // std::numeric_limits
#include <vector>   // std::vector (allocated at construction only)

namespace spinwright {

struct TabuParams {
  std::uint64_t sweeps = 1000;           // default budget of run(): sweeps of N moves each
  std::size_t tenure = 0;                // 0: automatic, max(N / 10, min(N / 4, 10)), at least 1
  std::size_t tenure_spread = 0;         // random extra tenure per cycle in [0, spread]; 0: automatic tenure / 2
  std::uint64_t stagnation = 0;          // moves without a new best before a perturbation; 0: max(1000, 20 N)
  double perturb_fraction = 0.1;         // fraction of spins flipped at a perturbation (at least 1 spin)
  const std::int8_t* initial = nullptr;  // warm start (n spins); random spins otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
};

template <class Model>
class TabuWalker {
 public:
  using model_type = Model;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  TabuWalker(const Model& model, const TabuParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        n_(model.num_spins()),
        state_(model),
        free_(model.num_spins()),
        tabu_(model.num_spins()),
        best_spins_(model.num_spins(), 1),
        tabu_until_(model.num_spins(), 0),
        order_(model.num_spins(), 0),
        leaf_of_(model.num_spins(), 0),
        spin_at_(free_.leaves(), 0) {
    base_tenure_ = params.tenure;
    if (base_tenure_ == 0) {
      // Tuned on the bqp250 and G-set max-cut instances (docs/time-to-target.md): short tenures
      // cycle on graphs with many equal deltas.
      base_tenure_ = n_ / 4 < 10 ? n_ / 4 : 10;
      if (n_ / 10 > base_tenure_) base_tenure_ = n_ / 10;
    }
    if (base_tenure_ < 1) base_tenure_ = 1;
    spread_ = params.tenure_spread == 0 && params.tenure == 0 ? base_tenure_ / 2 : params.tenure_spread;
    // At least one spin must stay free: tenure + spread <= N - 1 (0 for N <= 1).
    const std::size_t cap = n_ > 1 ? n_ - 1 : 0;
    if (base_tenure_ > cap) base_tenure_ = cap;
    if (base_tenure_ + spread_ > cap) spread_ = cap - base_tenure_;
    ring_spin_.assign(base_tenure_ + spread_ + 2, 0);
    ring_stamp_.assign(base_tenure_ + spread_ + 2, 0);
    stagnation_ = params.stagnation != 0 ? params.stagnation : (20 * n_ > 1000 ? 20 * n_ : 1000);
    perturb_count_ = static_cast<std::size_t>(params.perturb_fraction * static_cast<double>(n_));
    if (perturb_count_ < 1) perturb_count_ = 1;
    if (perturb_count_ > n_) perturb_count_ = n_;
    for (std::size_t i = 0; i < n_; ++i) {
      order_[i] = static_cast<index_type>(i);
      leaf_of_[i] = static_cast<std::uint32_t>(i);
      spin_at_[i] = static_cast<index_type>(i);
    }
    point_cost_limit_ = free_.leaves();
    log_leaves_ = 1;
    for (std::size_t l = free_.leaves(); l > 1; l /= 2) ++log_leaves_;
    if (params.initial != nullptr) {
      warm_start(params.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  /// Restart: new RNG stream (seed, restart), random spins, counters and best cleared.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.randomize(rng_);
    start();
  }

  /// Restart from given spins. No allocation.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.set_spins(spins);
    start();
  }

  /// n sweeps of N moves each. No allocation.
  void step(std::uint64_t n_sweeps = 1) {
    for (std::uint64_t k = 0; k < n_sweeps; ++k) sweep_once();
  }

  /// n single moves (a sweep is N of them); the sweep counter is not advanced. No allocation.
  void step_moves(std::uint64_t n_moves) {
    for (std::uint64_t k = 0; k < n_moves && n_ > 0; ++k) move_once();
  }

  template <class Observer>
  Solution<energy_type> run(const Budget& budget, Observer& observer) {
    const std::uint64_t limit = budget.sweeps != 0 ? budget.sweeps : params_.sweeps;
    BudgetGuard guard(budget);
    guard.start();
    StopReason why = StopReason::budget_exhausted;
    const std::uint64_t first = sweeps_;
    while (!guard.should_stop(sweeps_ - first, limit, static_cast<double>(best_energy_), why)) {
      if (sweep_once()) notify_improvement(observer, sweeps_, static_cast<double>(best_energy_));
      if (params_.progress_every != 0 && sweeps_ % params_.progress_every == 0) {
        notify_progress(observer, sweeps_, static_cast<double>(best_energy_));
      }
    }
    Solution<energy_type> s = solution();
    s.reason = why;
    s.seconds = guard.elapsed();
    return s;
  }
  Solution<energy_type> run(const Budget& budget = Budget{}) {
    NoObserver none;
    return run(budget, none);
  }

  BestView<energy_type> best() const noexcept {
    sync_best();
    return {best_spins_.data(), best_spins_.size(), best_energy_, best_sweep_};
  }

  Solution<energy_type> solution() const {
    sync_best();
    Solution<energy_type> s;
    s.spins.assign(best_spins_.begin(), best_spins_.end());
    s.energy = model_->energy(best_spins_.data());
    s.sweeps = sweeps_;
    s.attempted = moves_;
    s.accepted = moves_;
    s.restart = restart_;
    return s;
  }

  const state_type& state() const noexcept { return state_; }
  const Model& model() const noexcept { return *model_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t moves_done() const noexcept { return moves_; }
  std::uint64_t perturbations() const noexcept { return perturbations_; }
  std::size_t tenure() const noexcept { return tenure_; }

 private:
  static constexpr energy_type inf = detail::MinTree<energy_type>::infinity();

  void start() {
    sweeps_ = moves_ = perturbations_ = 0;
    best_energy_ = state_.energy();
    std::memcpy(best_spins_.data(), state_.spins(), n_);
    at_best_ = false;
    best_sweep_ = 0;
    begin_cycle();
  }

  // Empty tabu list, new tenure, trees rebuilt from the current state.
  void begin_cycle() {
    for (std::size_t i = 0; i < n_; ++i) tabu_until_[i] = 0;
    ring_head_ = ring_size_ = 0;
    tenure_ = base_tenure_ + (spread_ > 0 ? rng_.below(static_cast<std::uint32_t>(spread_ + 1)) : 0);
    since_best_ = 0;
    // New random placement of the spins on the leaves (Fisher-Yates).
    for (std::size_t k = n_; k > 1; --k) {
      const std::size_t r = rng_.below(static_cast<std::uint32_t>(k));
      const std::uint32_t tmp = leaf_of_[k - 1];
      leaf_of_[k - 1] = leaf_of_[r];
      leaf_of_[r] = tmp;
    }
    for (std::size_t i = 0; i < n_; ++i) spin_at_[leaf_of_[i]] = static_cast<index_type>(i);
    rebuild_trees();
  }

  void rebuild_trees() noexcept {
    for (std::size_t i = 0; i < n_; ++i) {
      const energy_type d = state_.delta(static_cast<index_type>(i));
      const bool tabu = tabu_until_[i] > moves_;
      free_.put(leaf_of_[i], tabu ? inf : d);
      tabu_.put(leaf_of_[i], tabu ? d : inf);
    }
    free_.rebuild();
    tabu_.rebuild();
  }

  void refresh(index_type j) noexcept {
    const energy_type d = state_.delta(j);
    const bool tabu = tabu_until_[j] > moves_;
    free_.set(leaf_of_[j], tabu ? inf : d);
    tabu_.set(leaf_of_[j], tabu ? d : inf);
  }

  void sync_best() const noexcept {
    if (at_best_) {
      std::memcpy(best_spins_.data(), state_.spins(), n_);
      at_best_ = false;
    }
  }

  void perturb() {
    sync_best();
    state_.set_spins(best_spins_.data());
    // Partial Fisher-Yates: the first perturb_count_ entries of order_ become a random subset.
    for (std::size_t k = 0; k < perturb_count_; ++k) {
      const std::size_t r = k + rng_.below(static_cast<std::uint32_t>(n_ - k));
      const index_type tmp = order_[k];
      order_[k] = order_[r];
      order_[r] = tmp;
      state_.flip(order_[k]);
    }
    ++perturbations_;
    begin_cycle();
  }

  // One move; true when it reached a new best.
  bool move_once() {
    // Release the spin whose tenure ends now (the FIFO front), if it was not flipped again since.
    if (ring_size_ > 0) {
      const std::size_t cap = ring_spin_.size();
      const std::size_t front = ring_head_;
      if (ring_stamp_[front] + tenure_ + 1 <= moves_) {
        const index_type r = ring_spin_[front];
        ring_head_ = (front + 1) % cap;
        --ring_size_;
        if (tabu_until_[r] == ring_stamp_[front] + tenure_ + 1) {
          tabu_until_[r] = 0;
          refresh(r);
        }
      }
    }
    const energy_type e = state_.energy();
    const energy_type d_free = free_.top_key();
    const energy_type d_tabu = tabu_.top_key();
    index_type i;
    energy_type d;
    if (d_tabu != inf && d_tabu < d_free && e + d_tabu < best_energy_) {
      i = spin_at_[tabu_.top()];  // aspiration
      d = d_tabu;
    } else if (d_free != inf) {
      i = spin_at_[free_.top()];
      d = d_free;
    } else {
      i = spin_at_[tabu_.top()];
      d = d_tabu;
    }
    if (at_best_ && !(d < 0)) sync_best();  // leaving a best state: keep a copy
    state_.flip_with_delta(i, d);
    const std::uint64_t m = moves_;
    tabu_until_[i] = m + tenure_ + 1;
    {
      const std::size_t cap = ring_spin_.size();
      const std::size_t back = (ring_head_ + ring_size_) % cap;
      ring_spin_[back] = i;
      ring_stamp_[back] = m;
      ++ring_size_;
    }
    ++moves_;
    // Deltas of i and of its neighbours changed.
    const std::size_t deg = model_->degree(i);
    if ((deg + 1) * log_leaves_ > point_cost_limit_) {
      rebuild_trees();
    } else {
      refresh(i);
      model_->for_each_neighbour(i, [this](index_type j, typename Model::value_type) { refresh(j); });
    }
    if (state_.energy() < best_energy_) {
      best_energy_ = state_.energy();
      at_best_ = true;
      since_best_ = 0;
      return true;
    }
    if (++since_best_ >= stagnation_) perturb();
    return false;
  }

  bool sweep_once() {
    bool improved = false;
    if (n_ == 0) {
      ++sweeps_;
      return false;
    }
    for (std::size_t k = 0; k < n_; ++k) improved = move_once() || improved;
    ++sweeps_;
    if (improved) best_sweep_ = sweeps_;
    return improved;
  }

  const Model* model_;
  TabuParams params_;
  std::size_t n_;
  state_type state_;
  detail::MinTree<energy_type> free_;
  detail::MinTree<energy_type> tabu_;
  mutable std::vector<std::int8_t> best_spins_;
  std::vector<std::uint64_t> tabu_until_;  // spin i is tabu while moves_ < tabu_until_[i]
  std::vector<index_type> order_;
  std::vector<std::uint32_t> leaf_of_;  // spin -> leaf of the trees
  std::vector<index_type> spin_at_;     // leaf -> spin (padding leaves hold 0 and +inf keys)
  std::vector<index_type> ring_spin_;   // FIFO of flipped spins and their move numbers
  std::vector<std::uint64_t> ring_stamp_;
  std::size_t ring_head_ = 0;
  std::size_t ring_size_ = 0;
  std::size_t base_tenure_ = 1;
  std::size_t spread_ = 0;
  std::size_t tenure_ = 1;
  std::uint64_t stagnation_ = 1000;
  std::size_t perturb_count_ = 1;
  std::size_t point_cost_limit_ = 1;
  std::size_t log_leaves_ = 1;
  Xoshiro256 rng_{};
  energy_type best_energy_{};
  mutable bool at_best_ = false;
  std::uint64_t best_sweep_ = 0;
  std::uint64_t since_best_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t moves_ = 0;
  std::uint64_t perturbations_ = 0;
  std::uint64_t restart_ = 0;
};

/// One tabu search run (restart `restart` of `seed`).
template <class Model>
Solution<typename Model::energy_type> tabu_walk(const Model& model, const TabuParams& params, std::uint64_t seed,
                                                std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  TabuWalker<Model> t(model, params, seed, restart);
  return t.run(budget);
}

/// The same with an observer (on_improvement / on_progress, see control/control.hpp).
template <class Model, class Observer>
Solution<typename Model::energy_type> tabu_walk(const Model& model, const TabuParams& params, std::uint64_t seed,
                                                std::uint64_t restart, const Budget& budget, Observer& observer) {
  TabuWalker<Model> t(model, params, seed, restart);
  return t.run(budget, observer);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_TABU_HPP
