// spinwright — descent to a local minimum, steepest or first improvement, over any enumerable
// move (moves/move.hpp): alone, from random or given spins, or to polish another kernel's
// Solution; a one-call function descend() / polish() and a stepping object Descender. The rules,
// the floating tolerance and what allocates: docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_DESCENT_HPP
#define SPINWRIGHT_KERNELS_DESCENT_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../detail/buffer.hpp"
#include "../moves/move.hpp"
#include "../moves/single_flip.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "detail/drive.hpp"
#include "solution.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t, std::uint8_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move

namespace spinwright {

enum class DescentRule : std::uint8_t {
  steepest,           // the most improving move of the neighbourhood, O(neighbourhood) per move
  first_improvement,  // the next improving move in cyclic order
};

struct DescentParams {
  DescentRule rule = DescentRule::first_improvement;
  const std::int8_t* initial = nullptr;  // start spins (+1/-1); random from (seed, restart) otherwise
};

template <class Model, class Move = SingleFlip<Model>>
class Descender : public detail::Drive<Descender<Model, Move>> {
  static_assert(is_enumerable_move_v<Move, Model>,
                "Move cannot drive descent: it needs a nested proposal_type and the members "
                "delta(state, proposal), apply(state, proposal, delta), neighbourhood_size(state) and "
                "proposal_at(state, k); see docs/moves.md");

 public:
  using model_type = Model;
  using move_type = Move;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  Descender(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  Descender(const Model& model, const DescentParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : Descender(model, params, Move{}, seed, restart) {}

  Descender(const Model& model, const DescentParams& params, Move move, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model), rule_(params.rule), state_(model, DeferredStart{}), move_(std::move(move)) {
    init(params, seed, restart);  // the start (random or given spins) computes the fields once
  }
#endif

  /// The same with the state carved from a caller-supplied arena (no heap); check valid().
  Descender(const Model& model, const DescentParams& params, Arena& arena, std::uint64_t seed,
            std::uint64_t restart = 0)
      : Descender(model, params, Move{}, arena, seed, restart) {}

  Descender(const Model& model, const DescentParams& params, Move move, Arena& arena, std::uint64_t seed,
            std::uint64_t restart = 0)
      : model_(&model), rule_(params.rule), state_(model, arena, DeferredStart{}), move_(std::move(move)) {
    if (valid()) init(params, seed, restart);
  }

  /// Arena bytes the arena constructors need (the move's own storage not included).
  static std::size_t bytes_needed(const Model& model, const DescentParams& = {}) {
    return state_type::bytes_needed(model.num_spins());
  }
  bool valid() const noexcept { return state_.valid(); }

  /// Random spins from Xoshiro256::for_restart(seed, restart). No allocation.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    Xoshiro256 rng = Xoshiro256::for_restart(seed, restart);
    state_.randomize(rng);
    restart_ = restart;
    start();
  }

  /// Start from given spins. Descent draws no random numbers, so `seed` only keeps the surface
  /// of every kernel. No allocation (beyond a move's first prepare()).
  void warm_start(const std::int8_t* spins, std::uint64_t /*seed*/, std::uint64_t restart = 0) {
    state_.set_spins(spins);
    restart_ = restart;
    start();
  }

  /// Restart from a caller's state over the same model, exact for the model as it is now (a
  /// SpinState kept through edit_site_term / edit_pair): spins, local fields and energy are
  /// copied in O(N) instead of recomputed from the model. No allocation.
  void warm_start(const state_type& from, std::uint64_t /*seed*/, std::uint64_t restart = 0) {
    state_.assign(from);
    restart_ = restart;
    start();
  }

  /// Up to `passes` passes over the neighbourhood; returns the improving moves made.
  /// Stops early at a local minimum (done() is then true). No allocation.
  std::uint64_t step(std::uint64_t passes = 1) {
    std::uint64_t moves = 0;
    for (std::uint64_t p = 0; p < passes && !done_; ++p) moves += pass();
    return moves;
  }

  /// The rule of the next passes (steepest or first improvement). No allocation.
  void set_rule(DescentRule rule) noexcept { rule_ = rule; }

  /// True once a whole neighbourhood has been seen without an improving move.
  bool done() const noexcept { return done_; }
  const state_type& state() const noexcept { return state_; }
  energy_type energy() const noexcept { return state_.energy(); }
  Move& move() noexcept { return move_; }
  std::uint64_t passes() const noexcept { return passes_; }
  std::uint64_t sweeps_done() const noexcept { return passes_; }

  /// The current state, which descent never raises: the best so far.
  BestView<energy_type> best() const noexcept { return {state_.spins(), state_.size(), state_.energy(), passes_}; }

  // The drive loop's questions (kernels/detail/drive.hpp): budget sweeps are passes, and a
  // Budget without sweeps runs to a local minimum.
  std::uint64_t default_sweeps() const noexcept { return unlimited_sweeps; }
  std::uint64_t progress_every() const noexcept { return 0; }
  double best_for_target() const noexcept { return static_cast<double>(state_.energy()); }
  std::uint64_t attempted() const noexcept { return attempted_; }
  std::uint64_t accepted() const noexcept { return accepted_; }

#if !SPINWRIGHT_NO_HEAP
  /// The current state (descent never goes up, so it is the best) as a Solution; allocates.
  Solution<energy_type> solution() const {
    Solution<energy_type> s;
    s.spins.assign(state_.spins(), state_.spins() + state_.size());
    s.energy = model_->energy(state_.spins());
    s.sweeps = passes_;
    s.attempted = attempted_;
    s.accepted = accepted_;
    s.restart = restart_;
    return s;
  }
#endif

 private:
  friend class detail::Drive<Descender>;
  bool settled() const noexcept { return done_; }
  bool sweep_once() { return pass() != 0; }
  void watch_deadline(const detail::SweepDeadline* d) noexcept { watch_ = d; }
  // True when a pass of unknown duration has reached the drive's deadline (read every
  // detail::sweep_watch_every evaluations): the pass ends there.
  bool cut_at(std::size_t k) const noexcept {
    return watch_ != nullptr && k != 0 && k % detail::sweep_watch_every == 0 && watch_->passed();
  }

  void init(const DescentParams& params, std::uint64_t seed, std::uint64_t restart) {
    if constexpr (std::is_integral_v<energy_type>) {
      tolerance_ = 0;
    } else {
      tolerance_ = 1e-12 * (1 + model_->energy_bound());
    }
    if (params.initial != nullptr) {
      warm_start(params.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  void start() {
    detail::move_prepare(move_, state_);
    cursor_ = 0;
    since_improvement_ = 0;
    passes_ = attempted_ = accepted_ = 0;
    done_ = false;
  }

  bool improving(energy_type d) const noexcept {
    if constexpr (std::is_integral_v<energy_type>) {
      return d < 0;
    } else {
      return d < -tolerance_;
    }
  }

  std::uint64_t pass() {
    const std::size_t size = move_.neighbourhood_size(state_);
    ++passes_;
    if (size == 0) {
      done_ = true;
      return 0;
    }
    if (rule_ == DescentRule::steepest) {
      std::size_t best_k = 0;
      energy_type best_d{};
      for (std::size_t k = 0; k < size; ++k) {
        if (cut_at(k)) {  // a partial scan makes no move: the deadline ends the run
          attempted_ += k;
          return 0;
        }
        const energy_type d = move_.delta(state_, move_.proposal_at(state_, k));
        if (k == 0 || d < best_d) {
          best_d = d;
          best_k = k;
        }
      }
      attempted_ += size;
      if (!improving(best_d)) {
        done_ = true;
        return 0;
      }
      move_.apply(state_, move_.proposal_at(state_, best_k), best_d);
      ++accepted_;
      return 1;
    }
    std::uint64_t moves = 0;
    for (std::size_t e = 0; e < size; ++e) {
      if (cut_at(e)) break;
      if (cursor_ >= size) cursor_ = 0;
      const auto p = move_.proposal_at(state_, cursor_);
      const energy_type d = move_.delta(state_, p);
      ++attempted_;
      ++cursor_;
      if (improving(d)) {
        move_.apply(state_, p, d);
        ++moves;
        since_improvement_ = 0;
      } else if (++since_improvement_ >= size) {
        done_ = true;
        break;
      }
    }
    accepted_ += moves;
    return moves;
  }

  const Model* model_;
  DescentRule rule_;
  state_type state_;
  Move move_;
  double tolerance_ = 0;
  std::size_t cursor_ = 0;
  std::size_t since_improvement_ = 0;
  std::uint64_t passes_ = 0;
  std::uint64_t attempted_ = 0;
  std::uint64_t accepted_ = 0;
  std::uint64_t restart_ = 0;
  bool done_ = false;
  const detail::SweepDeadline* watch_ = nullptr;  // set by the drive for a pass of unknown duration
};

#if !SPINWRIGHT_NO_HEAP
namespace detail {
// advance() and the Solution of a one-call descent. Integer models report the tracked energy
// (exact: no pass over the model after the deadline); floating ones recompute it.
template <class Model, class Move>
Solution<typename Model::energy_type> descent_call(Descender<Model, Move>& d, std::uint64_t restart,
                                                   const Budget& budget) {
  double seconds = 0;
  const StopReason why = d.advance(budget, &seconds);
  Solution<typename Model::energy_type> s;
  s.spins.assign(d.state().spins(), d.state().spins() + d.state().size());
  if constexpr (std::is_integral_v<typename Model::energy_type>) {
    s.energy = d.energy();
  } else {
    s.energy = d.state().model().energy(d.state().spins());
  }
  s.sweeps = d.passes();
  s.attempted = d.attempted();
  s.accepted = d.accepted();
  s.restart = restart;
  s.reason = why;
  s.seconds = call_seconds(budget, seconds);
  return s;
}
}  // namespace detail

/// Descent from random spins (seed, restart) or params.initial, to a local minimum. A time
/// limit bounds the whole call (the workspace and the result count against it).
template <class Model>
Solution<typename Model::energy_type> descend(const Model& model, const DescentParams& params, std::uint64_t seed,
                                              std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  const Budget call = budget.stamped();
  Descender<Model> d(model, params, seed, restart);
  return detail::descent_call(d, restart, call);
}

/// Single-flip descent from another kernel's Solution: never raises the energy. The counters
/// (sweeps, attempted, accepted) of the descent are added to the input's, and so are its
/// seconds unless the budget has a start (then `seconds` counts from it: the whole call of a
/// caller that stamped it). The budget bounds the descent (a deadline or stop token ends it
/// early, still never above the input; its reason is then reported); otherwise the input's
/// stop reason is kept. A budget with a start whose deadline has already passed returns the
/// input at once, with StopReason::deadline (no workspace is built).
template <class Model>
Solution<typename Model::energy_type> polish(const Model& model, const Solution<typename Model::energy_type>& from,
                                             DescentRule rule = DescentRule::first_improvement,
                                             const Budget& budget = Budget{}) {
  SPINWRIGHT_ASSERT(from.spins.size() == model.num_spins(), "the solution belongs to another model");
  if (budget.has_start && budget.remaining() <= 0) {
    // The deadline has passed already: no workspace is built, the input is returned as cut.
    Solution<typename Model::energy_type> s = from;
    s.reason = StopReason::deadline;
    s.seconds = detail::call_seconds(budget, 0.0);
    return s;
  }
  DescentParams params;
  params.rule = rule;
  params.initial = from.spins.data();
  Descender<Model> d(model, params, 0, from.restart);
  Solution<typename Model::energy_type> s = detail::descent_call(d, from.restart, budget);
  s.sweeps += from.sweeps;
  s.attempted += from.attempted;
  s.accepted += from.accepted;
  if (!budget.has_start) s.seconds += from.seconds;
  const bool cut = !d.done() && (s.reason == StopReason::deadline || s.reason == StopReason::stopped);
  if (!cut && s.reason != StopReason::target_reached) s.reason = from.reason;
  return s;
}

#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DESCENT_HPP
