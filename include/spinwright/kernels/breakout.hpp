// spinwright — breakout local search: steepest descent to a local minimum, then a jump of L
// flips out of it, the jump's size and kind adapted to how long the search has stagnated; a
// one-call function breakout() and a stepping object BreakoutSearch. Rule and measurements in
// docs/quality.md.
//
// Method: U. Benlic and J.-K. Hao, "Breakout local search for the max-cut problem", Eng. Appl.
// Artif. Intell. 26, 1162-1173 (2013). After each descent ends at a local minimum C:
//   * omega counts local minima in a row that brought no new best (0 after a new best);
//   * the jump length L is L0 after a local minimum different from the last one, L + 1 when the
//     descent fell back into the same one (equal energy), and Lmax once omega exceeds the
//     stagnation limit T (omega then restarts from 0, and that strong jump is random);
//   * otherwise the jump is directed with probability P = max(exp(-omega / T), P0): L tabu moves
//     (the best non-tabu flip, or a tabu flip that gives a new best), else random: L flips of
//     spins drawn uniformly.
// Every flip (descent, directed or random) makes its spin tabu for the walk's tenure. The
// paper draws the tenure for every move in [3, N / 10]; here it is drawn in that range once per
// cycle (start and strong jump), as the tabu walk does, so that its FIFO of releases stays exact.
//
// Machinery: the tabu walk of kernels/tabu.hpp (its tournament trees give the steepest-descent
// move, the best non-tabu move and the local-minimum test in O(1) and update a flip in
// O(min((deg + 1) log N, N))); this kernel adds only the breakout rule on top of its hooks.
// One sweep is N flips. Allocation: the constructor (the walk's workspace); nothing after.
#ifndef SPINWRIGHT_KERNELS_BREAKOUT_HPP
#define SPINWRIGHT_KERNELS_BREAKOUT_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../control.hpp"
#include "detail/drive.hpp"
#include "solution.hpp"
#include "tabu.hpp"

#include <cmath>    // std::exp
#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t
#include <limits>   // std::numeric_limits

namespace spinwright {

struct BreakoutParams {
  std::uint64_t sweeps = 1000;    // default budget of run(): sweeps of N flips each
  double jump_min = 0.01;         // L0 as a fraction of N (at least 1 flip)
  double jump_max = 0.1;          // Lmax as a fraction of N (at least L0, and at least min(N, 10))
  std::uint64_t stagnation = 0;   // T: local minima without a new best before a strong jump; 0: min(1000, max(50, N))
  double directed_floor = 0.8;    // P0: least probability of a directed jump
  bool adaptive_jump = true;      // false: every ordinary jump is L0 long (for measurements)
  bool directed = true;           // false: every jump is random (for measurements)
  bool reshuffle = false;         // true: also a new cycle (tenure, order of equal deltas) every N flips
  std::size_t tenure = 3;         // least tabu tenure (at least 1)
  std::size_t tenure_spread = 0;  // random extra tenure per cycle; 0: automatic, N / 10 - tenure
  const std::int8_t* initial = nullptr;  // warm start (n spins); random spins otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
};

template <class Model>
class BreakoutSearch : public detail::Drive<BreakoutSearch<Model>> {
 public:
  using model_type = Model;
  using walk_type = TabuWalker<Model>;
  using state_type = typename walk_type::state_type;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  BreakoutSearch(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Random start state from (seed, restart), or params.initial; the workspace on the heap.
  BreakoutSearch(const Model& model, const BreakoutParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : params_(params),
        plan_(plan_for(model.num_spins(), params)),
        walk_(model, walk_params(model, params), seed, restart) {
    start(restart);
  }
#endif

  /// The same with the workspace carved from a caller-supplied arena; check valid().
  BreakoutSearch(const Model& model, const BreakoutParams& params, Arena& arena, std::uint64_t seed,
                 std::uint64_t restart = 0)
      : params_(params),
        plan_(plan_for(model.num_spins(), params)),
        walk_(model, walk_params(model, params), arena, seed, restart) {
    if (valid()) start(restart);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const BreakoutParams& params) {
    return walk_type::bytes_needed(model, walk_params(model, params));
  }

  bool valid() const noexcept { return walk_.valid(); }

  /// Restart: new RNG stream (seed, restart), random spins, counters and best cleared.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    walk_.reset(seed, restart);
    start(restart);
  }

  /// Restart from given spins (+1/-1). No allocation.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    walk_.warm_start(spins, seed, restart);
    start(restart);
  }

  /// n single flips (a sweep is N of them); the sweep counter is not advanced. No allocation.
  void step_moves(std::uint64_t n_moves) {
    for (std::uint64_t k = 0; k < n_moves && n_ > 0; ++k) move_once();
  }

  BestView<energy_type> best() const noexcept {
    BestView<energy_type> b = walk_.best();
    b.sweep = best_sweep_;
    return b;
  }

#if !SPINWRIGHT_NO_HEAP
  /// The best state as a Solution (allocates its spin vector); the energy is recomputed.
  Solution<energy_type> solution() const {
    Solution<energy_type> s = walk_.solution();
    s.sweeps = sweeps_;
    s.restart = restart_;
    return s;
  }
#endif

  const state_type& state() const noexcept { return walk_.state(); }
  const Model& model() const noexcept { return walk_.model(); }
  const walk_type& walk() const noexcept { return walk_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t moves_done() const noexcept { return walk_.moves_done(); }
  std::uint64_t local_minima() const noexcept { return local_minima_; }
  std::uint64_t directed_jumps() const noexcept { return directed_jumps_; }
  std::uint64_t random_jumps() const noexcept { return random_jumps_; }
  std::uint64_t strong_jumps() const noexcept { return strong_jumps_; }
  std::size_t jump_length() const noexcept { return jump_; }
  std::size_t least_jump() const noexcept { return plan_.jump_min; }
  std::size_t largest_jump() const noexcept { return plan_.jump_max; }

  // The drive loop's questions (kernels/detail/drive.hpp).
  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(walk_.best_energy()); }

 private:
  friend class detail::Drive<BreakoutSearch>;

  struct Plan {
    std::size_t jump_min = 1;
    std::size_t jump_max = 1;
    std::uint64_t stagnation = 1000;
  };

  static std::size_t fraction_of(double f, std::size_t n) noexcept {
    const double x = f * static_cast<double>(n);
    std::size_t k = x >= 1.0 ? static_cast<std::size_t>(x) : 1;
    return k > n && n > 0 ? n : k;
  }

  static Plan plan_for(std::size_t n, const BreakoutParams& params) noexcept {
    Plan p;
    p.jump_min = fraction_of(params.jump_min, n);
    p.jump_max = fraction_of(params.jump_max, n);
    const std::size_t floor = n < 10 ? n : 10;  // small models: a strong jump must leave the basin
    if (p.jump_max < floor) p.jump_max = floor;
    if (p.jump_max < p.jump_min) p.jump_max = p.jump_min;
    p.stagnation = params.stagnation;
    if (p.stagnation == 0) p.stagnation = n < 50 ? 50 : (n > 1000 ? 1000 : n);
    return p;
  }

  static TabuParams walk_params(const Model& model, const BreakoutParams& params) noexcept {
    const std::size_t n = model.num_spins();
    TabuParams t;
    t.tenure = params.tenure < 1 ? 1 : params.tenure;
    t.tenure_spread = params.tenure_spread;
    if (t.tenure_spread == 0 && n / 10 > t.tenure) t.tenure_spread = n / 10 - t.tenure;
    t.stagnation = ~std::uint64_t{0};  // the breakout rule decides every jump
    t.initial = params.initial;
    return t;
  }

  void start(std::uint64_t restart) {
    n_ = walk_.model().num_spins();
    restart_ = restart;
    sweeps_ = local_minima_ = directed_jumps_ = random_jumps_ = strong_jumps_ = 0;
    best_sweep_ = 0;
    omega_ = 0;
    jump_ = plan_.jump_min;
    left_ = 0;
    directed_now_ = false;
    have_last_ = false;
    last_minimum_ = energy_type{};
    best_at_last_ = walk_.best_energy();
    cycle_start_ = 0;
  }

  // At a local minimum: the breakout rule picks the next jump's length and kind.
  void plan_jump() {
    ++local_minima_;
    const energy_type e = walk_.state().energy();
    const energy_type best = walk_.best_energy();
    if (best < best_at_last_) {
      omega_ = 0;
    } else {
      ++omega_;
    }
    best_at_last_ = best;
    bool strong = false;
    if (omega_ > plan_.stagnation) {
      jump_ = plan_.jump_max;
      omega_ = 0;
      strong = true;
    } else if (params_.adaptive_jump && have_last_ && e == last_minimum_) {
      if (jump_ < plan_.jump_max) ++jump_;
    } else {
      jump_ = plan_.jump_min;
    }
    last_minimum_ = e;
    have_last_ = true;
    left_ = jump_;
    if (strong || (params_.reshuffle && walk_.moves_done() - cycle_start_ >= n_)) {
      // A fresh cycle (tenure drawn anew, tabu list emptied, new random order of equal deltas)
      // at a strong jump, and after every N flips: O(N), so at most once per N flips.
      walk_.new_cycle();
      cycle_start_ = walk_.moves_done();
    }
    if (strong) {
      directed_now_ = false;
      ++strong_jumps_;
    } else if (params_.directed) {
      double p = std::exp(-static_cast<double>(omega_) / static_cast<double>(plan_.stagnation));
      if (p < params_.directed_floor) p = params_.directed_floor;
      directed_now_ = walk_.random().uniform() < p;
    } else {
      directed_now_ = false;
    }
    if (directed_now_) {
      ++directed_jumps_;
    } else {
      ++random_jumps_;
    }
  }

  // One flip; true when it reached a new best.
  bool move_once() {
    if (left_ == 0) {
      const energy_type before = walk_.best_energy();
      if (walk_.descent_move()) return walk_.best_energy() < before;
      plan_jump();
    }
    --left_;
    if (directed_now_) return walk_.tabu_move();
    return walk_.forced_move(static_cast<index_type>(walk_.random().below(static_cast<std::uint32_t>(n_))));
  }

  bool sweep_once() {
    bool improved = false;
    for (std::size_t k = 0; k < n_; ++k) improved = move_once() || improved;
    ++sweeps_;
    if (improved) best_sweep_ = sweeps_;
    return improved;
  }

  BreakoutParams params_;
  Plan plan_;
  walk_type walk_;
  std::size_t n_ = 0;
  std::size_t jump_ = 1;
  std::size_t left_ = 0;  // flips left in the current jump (0: descending)
  bool directed_now_ = false;
  bool have_last_ = false;
  energy_type last_minimum_{};
  energy_type best_at_last_{};
  std::uint64_t omega_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t best_sweep_ = 0;
  std::uint64_t local_minima_ = 0;
  std::uint64_t directed_jumps_ = 0;
  std::uint64_t random_jumps_ = 0;
  std::uint64_t strong_jumps_ = 0;
  std::uint64_t restart_ = 0;
  std::uint64_t cycle_start_ = 0;
};

#if !SPINWRIGHT_NO_HEAP
/// One breakout local search (restart `restart` of `seed`).
template <class Model>
Solution<typename Model::energy_type> breakout(const Model& model, const BreakoutParams& params, std::uint64_t seed,
                                               std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  BreakoutSearch<Model> b(model, params, seed, restart);
  return b.run(budget);
}

/// The same with an observer (on_improvement / on_progress, see control/observer.hpp).
template <class Model, class Observer>
Solution<typename Model::energy_type> breakout(const Model& model, const BreakoutParams& params, std::uint64_t seed,
                                               std::uint64_t restart, const Budget& budget, Observer& observer) {
  BreakoutSearch<Model> b(model, params, seed, restart);
  return b.run(budget, observer);
}

/// Where the breakout search is the measured choice of an automatic rule (docs/quality.md):
/// dense models, and sparse ones whose pair density pairs / (N (N - 1) / 2) is at least 0.10
/// (the 0-1 quadratic programs of the bqp and Billionnet-Elloumi sets, in either form). On sparser
/// graphs (the G-set) annealing and tempering were better at equal time. Models of 20 spins or
/// fewer are left to exact enumeration.
template <class Model>
bool breakout_fits(const Model& model) noexcept {
  const std::size_t n = model.num_spins();
  if (n <= 20) return false;
  if constexpr (Model::is_dense) {
    return true;
  } else {
    const double all_pairs = 0.5 * static_cast<double>(n) * static_cast<double>(n - 1);
    return static_cast<double>(model.num_pairs()) >= 0.10 * all_pairs;
  }
}

/// The breakout search with the default parameters as an automatic rule runs it: with a time
/// limit and no sweep count (Budget::sweeps == 0), it fills the time (no sweep limit); otherwise
/// the Budget's sweeps, or BreakoutParams::sweeps.
template <class Model>
Solution<typename Model::energy_type> breakout_auto(const Model& model, std::uint64_t seed, std::uint64_t restart = 0,
                                                    const Budget& budget = Budget{}) {
  Budget b = budget;
  if (b.sweeps == 0 && b.clock.valid() && b.seconds < std::numeric_limits<double>::infinity())
    b.sweeps = unlimited_sweeps;
  return breakout(model, BreakoutParams{}, seed, restart, b);
}
#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_BREAKOUT_HPP
