// spinwright — tabu search over one-flip moves (Glover 1989, 1990): a one-call function
// tabu_walk() and a stepping object TabuWalker; move selection on two tournament trees (free and
// tabu spins) in O((deg + 1) log N), aspiration, perturbation after stagnation, and hooks for
// searches built on the walk (kernels/breakout.hpp). The method and its costs: docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_TABU_HPP
#define SPINWRIGHT_KERNELS_TABU_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../detail/buffer.hpp"
#include "../control.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "detail/drive.hpp"
#include "detail/min_tree.hpp"
#include "solution.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t
#include <cstring>  // std::memcpy
#include <limits>   // std::numeric_limits

namespace spinwright {

// The automatic tenure (TabuParams::tenure == 0), drawn once per cycle (start, perturbation) as
// base + a uniform extra in [0, spread], so that the FIFO of releases stays exact:
//   tenth:     base max(N / 10, min(N / 4, 10)), spread base / 2 (tuned here on the bqp250 and
//              G-set max-cut instances, docs/time-to-target.md: short tenures cycle on graphs
//              with many equal deltas, G11);
//   hundredth: base N / 100 + 1, spread 9: N / 100 plus a draw in [1, 10], the rule of the UBQP
//              tabu searches of Glover, Lu and Hao (Lu, Glover & Hao, Eur. J. Oper. Res. 207,
//              1254-1262, 2010; Glover, Lu & Hao, 4OR 8, 239-253, 2010), which draw it for every
//              move; the constants are from memory;
//   by_density (the default): hundredth on dense models (pair density >= tabu_dense_threshold,
//              or a DenseModel), tenth otherwise. Measured (docs/quality.md, "Tabu tenure"):
//              on the bqp and Billionnet-Elloumi instances hundredth reached the reference value
//              in all 69 runs within 0.09 s (tenth: 68 of 69 within 2 s; median times on bqp250
//              1.6-11 times shorter), while on the sparse G-set graphs it stayed about 4 % below
//              tenth at 500 sweeps and never reached G11's best cut, which tenth does in 0.06 s.
enum class TabuTenure : std::uint8_t { by_density, tenth, hundredth };

// Pair density (pairs / (N (N - 1) / 2)) from which TabuTenure::by_density takes hundredth:
// between the densest graph where tenth was measured better (G1, 0.060) and the sparsest
// instance where hundredth was (bqp250 as a QUBO, about 0.099; 0.103-0.106 in max-cut form).
inline constexpr double tabu_dense_threshold = 0.08;

struct TabuParams {
  std::uint64_t sweeps = 1000;           // default budget of run(): sweeps of N moves each
  std::size_t tenure = 0;                // 0: automatic, by tenure_rule (at least 1)
  std::size_t tenure_spread = 0;         // random extra tenure per cycle in [0, spread]; 0: the rule's (tenure == 0)
  TabuTenure tenure_rule = TabuTenure::by_density;  // the automatic tenure (above)
  std::uint64_t stagnation = 0;          // moves without a new best before a perturbation; 0: max(1000, 20 N)
  double perturb_fraction = 0.1;         // fraction of spins flipped at a perturbation (at least 1 spin)
  const std::int8_t* initial = nullptr;  // warm start (n spins); random spins otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
};

template <class Model>
class TabuWalker : public detail::Drive<TabuWalker<Model>> {
 public:
  using model_type = Model;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  TabuWalker(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Random start state from (seed, restart), or params.initial; the workspace on the heap.
  TabuWalker(const Model& model, const TabuParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        n_(model.num_spins()),
        plan_(plan_for(model, params)),
        state_(model),
        free_(n_),
        tabu_(n_),
        best_spins_(n_, 1),
        tabu_until_(n_, 0),
        order_(n_, 0),
        leaf_of_(n_, 0),
        spin_at_(free_.leaves(), 0),
        ring_spin_(plan_.ring, 0),
        ring_stamp_(plan_.ring, 0) {
    init(seed, restart);
  }
#endif

  /// The same with the workspace carved from a caller-supplied arena; check valid().
  TabuWalker(const Model& model, const TabuParams& params, Arena& arena, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        n_(model.num_spins()),
        plan_(plan_for(model, params)),
        state_(model, arena),
        free_(n_, arena),
        tabu_(n_, arena),
        best_spins_(n_, arena, 1),
        tabu_until_(n_, arena, 0),
        order_(n_, arena, 0),
        leaf_of_(n_, arena, 0),
        spin_at_(detail::MinTree<energy_type>::leaves_for(n_), arena, 0),
        ring_spin_(plan_.ring, arena, 0),
        ring_stamp_(plan_.ring, arena, 0) {
    if (valid()) init(seed, restart);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const TabuParams& params) {
    const std::size_t n = model.num_spins();
    const std::size_t ring = plan_for(model, params).ring;
    return state_type::bytes_needed(n) + 2 * detail::MinTree<energy_type>::bytes_needed(n) +
           arena_bytes<std::int8_t>(n) + arena_bytes<std::uint64_t>(n) + arena_bytes<index_type>(n) +
           arena_bytes<std::uint32_t>(n) + arena_bytes<index_type>(detail::MinTree<energy_type>::leaves_for(n)) +
           arena_bytes<index_type>(ring) + arena_bytes<std::uint64_t>(ring);
  }

  bool valid() const noexcept {
    return state_.valid() && free_.valid() && tabu_.valid() && best_spins_.valid() && tabu_until_.valid() &&
           order_.valid() && leaf_of_.valid() && spin_at_.valid() && ring_spin_.valid() && ring_stamp_.valid();
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

  /// Restart from a caller's state over the same model, exact for the model as it is now (a
  /// SpinState kept through edit_site_term / edit_pair): spins, local fields and energy are
  /// copied in O(N) instead of recomputed from the model. No allocation.
  void warm_start(const state_type& from, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.assign(from);
    start();
  }

  /// n single moves (a sweep is N of them); the sweep counter is not advanced. No allocation.
  void step_moves(std::uint64_t n_moves) {
    for (std::uint64_t k = 0; k < n_moves && n_ > 0; ++k) move_once();
  }

  BestView<energy_type> best() const noexcept {
    sync_best();
    return {best_spins_.data(), best_spins_.size(), best_energy_, best_sweep_};
  }

#if !SPINWRIGHT_NO_HEAP
  /// The best state as a Solution (allocates its spin vector); the energy is recomputed.
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
#endif

  // Hooks for searches built on the walk (kernels/breakout.hpp). Each move below keeps the
  // trees, the tabu list, the move counter and the best state exact; none runs the stagnation
  // rule (params.stagnation) and none advances the sweep counter.

  /// The least flip delta over every spin, tabu or not (O(1): the smaller tree root).
  energy_type least_delta() const noexcept {
    const energy_type a = free_.top_key();
    const energy_type b = tabu_.top_key();
    return b < a ? b : a;
  }
  /// One steepest-descent move that ignores tabu status: flips the spin of least delta when
  /// that delta is negative (the flip still enters the tabu list). False at a local minimum.
  bool descent_move() {
    if (n_ == 0) return false;
    release_due();
    const energy_type a = free_.top_key();
    const energy_type b = tabu_.top_key();
    if (!(a < 0) && !(b < 0)) return false;
    if (b < a) {
      apply_move(spin_at_[tabu_.top()], b);
    } else {
      apply_move(spin_at_[free_.top()], a);
    }
    return true;
  }
  /// One tabu move (the best non-tabu flip, or a tabu one by aspiration); true at a new best.
  bool tabu_move() {
    if (n_ == 0) return false;
    release_due();
    const energy_type e = state_.energy();
    const energy_type d_free = free_.top_key();
    const energy_type d_tabu = tabu_.top_key();
    if (d_tabu != inf && d_tabu < d_free && e + d_tabu < best_energy_) return apply_move(spin_at_[tabu_.top()], d_tabu);
    if (d_free != inf) return apply_move(spin_at_[free_.top()], d_free);
    return apply_move(spin_at_[tabu_.top()], d_tabu);
  }
  /// Flips spin i whatever its delta or tabu status (the flip enters the tabu list); true at a new best.
  bool forced_move(index_type i) {
    SPINWRIGHT_ASSERT(i < n_, "spin index out of range");
    release_due();
    return apply_move(i, state_.delta(i));
  }
  /// Empty tabu list, a freshly drawn tenure and leaf order, trees rebuilt (O(N)).
  void new_cycle() { begin_cycle(); }
  /// Moves the walk to the given spins (+1/-1) and begins a new cycle; the best so far is kept.
  void jump_to(const std::int8_t* spins) {
    sync_best();
    state_.set_spins(spins);
    if (state_.energy() < best_energy_) {
      best_energy_ = state_.energy();
      at_best_ = true;
    }
    begin_cycle();
  }
  /// The best energy so far (O(1), no copy of the spins).
  energy_type best_energy() const noexcept { return best_energy_; }
  /// The walk's random stream (drawn from by the hooks' callers as well).
  Xoshiro256& random() noexcept { return rng_; }
  /// Spin i is tabu now.
  bool is_tabu(index_type i) const noexcept { return tabu_until_[i] > moves_; }

  const state_type& state() const noexcept { return state_; }
  const Model& model() const noexcept { return *model_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t moves_done() const noexcept { return moves_; }
  std::uint64_t perturbations() const noexcept { return perturbations_; }
  std::size_t tenure() const noexcept { return tenure_; }

  // The drive loop's questions (kernels/detail/drive.hpp).
  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy_); }

 private:
  friend class detail::Drive<TabuWalker>;
  static constexpr energy_type inf = detail::MinTree<energy_type>::infinity();

  // Sizes fixed at construction: the tenure and its random spread, the FIFO of flips, the
  // stagnation limit and the size of a perturbation.
  struct Plan {
    std::size_t tenure = 1;
    std::size_t spread = 0;
    std::size_t ring = 2;
    std::uint64_t stagnation = 1000;
    std::size_t perturb = 1;
  };

  // The rule TabuTenure::by_density resolves to for this model.
  static TabuTenure tenure_rule_for(const Model& model, TabuTenure rule) noexcept {
    if (rule != TabuTenure::by_density) return rule;
    const std::size_t n = model.num_spins();
    const double all_pairs = 0.5 * static_cast<double>(n) * static_cast<double>(n > 0 ? n - 1 : 0);
    const bool dense =
        Model::is_dense || (all_pairs > 0 && static_cast<double>(model.num_pairs()) >= tabu_dense_threshold * all_pairs);
    return dense ? TabuTenure::hundredth : TabuTenure::tenth;
  }

  static Plan plan_for(const Model& model, const TabuParams& params) noexcept {
    const std::size_t n = model.num_spins();
    Plan p;
    p.tenure = params.tenure;
    std::size_t spread = params.tenure_spread;
    if (p.tenure == 0) {  // the automatic rules (TabuTenure, above)
      if (tenure_rule_for(model, params.tenure_rule) == TabuTenure::hundredth) {
        p.tenure = n / 100 + 1;
        if (spread == 0) spread = 9;
      } else {
        p.tenure = n / 4 < 10 ? n / 4 : 10;
        if (n / 10 > p.tenure) p.tenure = n / 10;
        if (p.tenure < 1) p.tenure = 1;
        if (spread == 0) spread = p.tenure / 2;
      }
    }
    if (p.tenure < 1) p.tenure = 1;
    p.spread = spread;
    // At least one spin must stay free: tenure + spread <= N - 1 (0 for N <= 1).
    const std::size_t cap = n > 1 ? n - 1 : 0;
    if (p.tenure > cap) p.tenure = cap;
    if (p.tenure + p.spread > cap) p.spread = cap - p.tenure;
    p.ring = p.tenure + p.spread + 2;
    p.stagnation = params.stagnation != 0 ? params.stagnation : (20 * n > 1000 ? 20 * n : 1000);
    p.perturb = static_cast<std::size_t>(params.perturb_fraction * static_cast<double>(n));
    if (p.perturb < 1) p.perturb = 1;
    if (p.perturb > n) p.perturb = n;
    return p;
  }

  void init(std::uint64_t seed, std::uint64_t restart) {
    base_tenure_ = plan_.tenure;
    spread_ = plan_.spread;
    stagnation_ = plan_.stagnation;
    perturb_count_ = plan_.perturb;
    for (std::size_t i = 0; i < n_; ++i) {
      order_[i] = static_cast<index_type>(i);
      leaf_of_[i] = static_cast<std::uint32_t>(i);
      spin_at_[i] = static_cast<index_type>(i);
    }
    point_cost_limit_ = free_.leaves();
    log_leaves_ = 1;
    for (std::size_t l = free_.leaves(); l > 1; l /= 2) ++log_leaves_;
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

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
    if (tabu_move()) return true;
    if (++since_best_ >= stagnation_) perturb();
    return false;
  }

  // Release the spin whose tenure ends now (the FIFO front), if it was not flipped again since.
  void release_due() noexcept {
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
  }

  // Flips spin i (delta d), makes it tabu, updates the trees; true when it reached a new best.
  bool apply_move(index_type i, energy_type d) {
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
  Plan plan_;
  state_type state_;
  detail::MinTree<energy_type> free_;
  detail::MinTree<energy_type> tabu_;
  mutable detail::Buffer<std::int8_t> best_spins_;
  detail::Buffer<std::uint64_t> tabu_until_;  // spin i is tabu while moves_ < tabu_until_[i]
  detail::Buffer<index_type> order_;
  detail::Buffer<std::uint32_t> leaf_of_;  // spin -> leaf of the trees
  detail::Buffer<index_type> spin_at_;     // leaf -> spin (padding leaves hold 0 and +inf keys)
  detail::Buffer<index_type> ring_spin_;   // FIFO of flipped spins and their move numbers
  detail::Buffer<std::uint64_t> ring_stamp_;
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

#if !SPINWRIGHT_NO_HEAP
/// One tabu walk (restart `restart` of `seed`). A time limit bounds the whole call.
template <class Model>
Solution<typename Model::energy_type> tabu_walk(const Model& model, const TabuParams& params, std::uint64_t seed,
                                                std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  NoObserver none;
  return tabu_walk(model, params, seed, restart, budget, none);
}

/// The same with an observer (on_improvement / on_progress, see control/control.hpp).
template <class Model, class Observer>
Solution<typename Model::energy_type> tabu_walk(const Model& model, const TabuParams& params, std::uint64_t seed,
                                                std::uint64_t restart, const Budget& budget, Observer& observer) {
  const Budget call = budget.stamped();  // the workspace and the result count against a time limit
  TabuWalker<Model> t(model, params, seed, restart);
  auto s = t.run(call, observer);
  s.seconds = detail::call_seconds(call, s.seconds);
  return s;
}
#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_TABU_HPP
