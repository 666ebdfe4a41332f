// spinwright — simulated annealing: a one-call function anneal() and a stepping object
// Annealer for embedding (construct once, call step(n) from your own loop, read best()).
// Schedules, acceptance, the best state and allocation: docs/kernels.md ("Simulated annealing").
#ifndef SPINWRIGHT_KERNELS_ANNEAL_HPP
#define SPINWRIGHT_KERNELS_ANNEAL_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../detail/buffer.hpp"
#include "../moves/move.hpp"
#include "../moves/single_flip.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "detail/drive.hpp"
#include "detail/flip_loop.hpp"
#include "detail/hazard_sweep.hpp"
#include "acceptance.hpp"
#include "beta_span.hpp"
#include "schedule.hpp"
#include "solution.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t
#include <cstring>      // std::memcpy
#include <type_traits>  // std::is_constructible_v, std::is_same_v
#include <utility>      // std::move

namespace spinwright {

struct AnnealParams {
  std::uint64_t sweeps = 1000;  // schedule length (a Budget's sweeps override it in run())
  Schedule schedule{};          // default: geometric over the beta span from the model
  Acceptance acceptance = Acceptance::metropolis;
  // Used by moves constructible from a SiteOrder (SingleFlip). Random is the default because
  // sequential Metropolis is not ergodic where zero-delta flips abound (rings, cycles: domain
  // walls ride along with the sweep and never meet); sequential is faster and fine with
  // heat-bath or on lattices away from that case. See docs/moves.md.
  SiteOrder order = SiteOrder::random;
  const std::int8_t* initial = nullptr;  // warm start (n spins, +1/-1); random spins otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
  std::size_t table_limit = 4096;        // entries of the integer acceptance table
  // Integer models with the built-in SingleFlip: a sweep takes the hazard path
  // (kernels/detail/hazard_sweep.hpp: one exponential draw per random acceptance instead of one
  // uniform per uncertain attempt) when the previous sweep accepted less than this fraction
  // of its attempts and the hazard table is cheap to fill for this beta (at most a quarter as
  // many entries as attempts, or already filled); the first sweep after a (re)start takes
  // the uniform path. Both paths sample the same chain; the choice changes speed and the
  // random stream, never the distribution. 0 disables the hazard path; any value above 1
  // forces it from the second sweep.
  double hazard_below = 0.125;
};

template <class Model, class Move = SingleFlip<Model>>
class Annealer : public detail::Drive<Annealer<Model, Move>> {
  static_assert(is_move_generator_v<Move, Model>,
                "Move does not model the move concept: it needs a nested proposal_type and the members "
                "moves_per_sweep(state), propose(state, rng), delta(state, proposal) and "
                "apply(state, proposal, delta); see docs/moves.md");

 public:
  using model_type = Model;
  using move_type = Move;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  Annealer(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Random start state from Xoshiro256::for_restart(seed, restart), or params.initial.
  /// Allocates the workspace on the heap.
  Annealer(const Model& model, const AnnealParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : Annealer(model, params, default_move(params), seed, restart) {}

  Annealer(const Model& model, const AnnealParams& params, Move move, std::uint64_t seed, std::uint64_t restart = 0)
      : Annealer(model, params, std::move(move), detail::scan_coefficients(model), seed, restart) {}
#endif

  /// The same with the workspace carved from a caller-supplied arena (no heap; firmware).
  /// Check valid(): false when the arena had less than bytes_needed(model, params) left.
  Annealer(const Model& model, const AnnealParams& params, Arena& arena, std::uint64_t seed, std::uint64_t restart = 0)
      : Annealer(model, params, default_move(params), arena, seed, restart) {}

  Annealer(const Model& model, const AnnealParams& params, Move move, Arena& arena, std::uint64_t seed,
           std::uint64_t restart = 0)
      : Annealer(model, params, std::move(move), arena, detail::scan_coefficients(model), seed, restart) {}

  /// Arena bytes the arena constructors need (the move's own storage not included).
  static std::size_t bytes_needed(const Model& model, const AnnealParams& params) {
    return state_type::bytes_needed(model.num_spins()) + arena_bytes<std::int8_t>(model.num_spins()) +
           acceptor_bytes(model, params.acceptance, params.table_limit, uses_hazard(params));
  }

  bool valid() const noexcept { return state_.valid() && acceptor_.valid() && best_spins_.valid(); }

  /// Restart: new RNG stream (seed, restart), random spins (params.initial is not reused),
  /// counters and best cleared. No allocation.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.randomize(rng_);
    start_from_state();
  }

  /// Restart from given spins (+1/-1, size() of them). No allocation.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.set_spins(spins);
    start_from_state();
  }

  /// Restart from a caller's state over the same model, exact for the model as it is now (a
  /// SpinState kept through edit_site_term / edit_pair): spins, local fields and energy are
  /// copied in O(N) instead of recomputed from the model. The acceptance tables still re-read
  /// the coefficients' common power of two (one pass over the values). No allocation.
  void warm_start(const state_type& from, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    state_.assign(from);
    start_from_state();
  }

  BestView<energy_type> best() const noexcept {
    return {best_spins_.data(), best_spins_.size(), best_energy_, best_sweep_};
  }
#if !SPINWRIGHT_NO_HEAP
  /// The best state as a Solution (allocates its spin vector); the energy is recomputed from
  /// the model, so floating models report no accumulated rounding.
  Solution<energy_type> solution() const {
    Solution<energy_type> s;
    s.spins.assign(best_spins_.begin(), best_spins_.end());
    s.energy = model_->energy(best_spins_.data());
    s.sweeps = sweeps_;
    s.attempted = attempted_;
    s.accepted = accepted_;
    s.restart = restart_;
    return s;
  }
#endif

  /// Energy of the best state recomputed from the model (no drift for floating models).
  energy_type best_energy_exact() const noexcept { return model_->energy(best_spins_.data()); }

  const state_type& state() const noexcept { return state_; }
  const Model& model() const noexcept { return *model_; }
  Move& move() noexcept { return move_; }
  const Move& move() const noexcept { return move_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t attempted() const noexcept { return attempted_; }
  std::uint64_t accepted() const noexcept { return accepted_; }
  /// Beta of the next sweep (of step(); advance() with a time limit may run it colder).
  double beta() const noexcept { return beta_at_sweep(sweeps_); }
  /// The schedule in use (automatic ranges filled in).
  const Schedule& schedule() const noexcept { return schedule_; }
  const BetaSpan& beta_span() const noexcept { return range_; }
  /// Change the schedule length used by step() (advance() sets it from its budget).
  void set_schedule_sweeps(std::uint64_t s) noexcept { schedule_sweeps_ = s; }

  // The drive loop's questions (kernels/detail/drive.hpp).
  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy_); }

 private:
  friend class detail::Drive<Annealer>;

  // The public constructors scan the coefficients once (kernels/acceptance.hpp,
  // detail::scan_coefficients) for the acceptance tables and the beta span; the state is
  // allocated without fields, which the start in init() computes once.
#if !SPINWRIGHT_NO_HEAP
  Annealer(const Model& model, const AnnealParams& params, Move move, const detail::CoefficientScan& scan,
           std::uint64_t seed, std::uint64_t restart)
      : model_(&model),
        params_(params),
        state_(model, DeferredStart{}),
        move_(std::move(move)),
        acceptor_(
            make_acceptor_from_scan<energy_type>(scan, params.acceptance, params.table_limit, uses_hazard(params))),
        best_spins_(model.num_spins(), 1) {
    init(scan, seed, restart);
  }
#endif
  Annealer(const Model& model, const AnnealParams& params, Move move, Arena& arena, const detail::CoefficientScan& scan,
           std::uint64_t seed, std::uint64_t restart)
      : model_(&model),
        params_(params),
        state_(model, arena, DeferredStart{}),
        move_(std::move(move)),
        acceptor_(make_acceptor_from_scan<energy_type>(scan, params.acceptance, params.table_limit, arena,
                                                       uses_hazard(params))),
        best_spins_(model.num_spins(), arena, 1) {
    if (valid()) init(scan, seed, restart);
  }

  // The schedule spans the budget's sweeps; with a time limit its position is also at least
  // the elapsed fraction of the limit, so a run cut by its deadline still ends cold.
  void begin_advance(std::uint64_t limit) noexcept {
    schedule_sweeps_ = limit;
    time_fraction_ = 0;
    prime_beta();
  }
  void before_sweep(double time_fraction) noexcept { time_fraction_ = time_fraction; }
  void watch_deadline(const detail::SweepDeadline* d) noexcept { watch_ = d; }

  void init(const detail::CoefficientScan& scan, std::uint64_t seed, std::uint64_t restart) {
    schedule_sweeps_ = params_.sweeps;
    schedule_ = params_.schedule;
    if (schedule_.automatic()) {
      range_ = detail::sample_beta_span_bounded(*model_, BetaSpanTargets{}, scan.cold_bound);
      schedule_.beta_start = range_.beta_start;
      schedule_.beta_end = range_.beta_end;
    } else {
      range_.beta_start = schedule_.beta_start;
      range_.beta_end = schedule_.beta_end;
    }
    tables_fresh_ = true;  // the acceptor was just built from this scan: no retune on the first start
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  // The hazard path applies to the built-in move on integer models.
  static constexpr bool hazard_capable =
      std::is_same_v<Move, SingleFlip<Model>> && Acceptor<energy_type>::has_hazard_path;
  static bool uses_hazard(const AnnealParams& params) noexcept { return hazard_capable && params.hazard_below > 0; }

  static Move default_move(const AnnealParams& params) {
    if constexpr (std::is_constructible_v<Move, SiteOrder>) {
      return Move(params.order);
    } else {
      return Move{};
    }
  }

  // Every restart re-reads the model (O(N + pairs), like the state's resync), so in-place
  // coefficient edits between re-solves are honoured exactly; the first start after
  // construction skips the acceptor's retune, built from the same coefficients a moment ago.
  void start_from_state() {
    if (!tables_fresh_) acceptor_.retune(*model_);
    tables_fresh_ = false;
    detail::move_prepare(move_, state_);
    std::memcpy(best_spins_.data(), state_.spins(), best_spins_.size());
    best_energy_ = state_.energy();
    best_sweep_ = 0;
    sweeps_ = attempted_ = accepted_ = 0;
    last_rate_ = 1;
    time_fraction_ = 0;
    prime_beta();
  }

  void prime_beta() noexcept { acceptor_.set_beta(beta_at_sweep(sweeps_)); }

  double beta_at_sweep(std::uint64_t k) const noexcept {
    const double f = schedule_sweeps_ > 1 ? static_cast<double>(k) / static_cast<double>(schedule_sweeps_ - 1) : 1.0;
    return schedule_.beta_at(f > time_fraction_ ? f : time_fraction_);
  }

  // One sweep at the schedule's current beta; true when it ended at a new best.
  bool sweep_once() {
    const double beta = beta_at_sweep(sweeps_);
    if (beta != acceptor_.beta()) acceptor_.set_beta(beta);
    Xoshiro256 rng = rng_;  // a local copy stays in registers across the spin writes
    detail::move_begin_sweep(move_, state_, rng);
    std::size_t m = move_.moves_per_sweep(state_);  // a watched sweep cut by the deadline: the attempts made
    const std::uint64_t accepted = watching(m)                                  ? watched_moves(rng, m)
                                   : acceptor_.rule() == Acceptance::metropolis ? sweep_moves<Acceptance::metropolis>(rng, m)
                                                                                : sweep_moves<Acceptance::heat_bath>(rng, m);
    rng_ = rng;
    attempted_ += m;
    accepted_ += accepted;
    last_rate_ = m != 0 ? static_cast<double>(accepted) / static_cast<double>(m) : 1.0;
    ++sweeps_;
    if (state_.energy() < best_energy_) {
      std::memcpy(best_spins_.data(), state_.spins(), best_spins_.size());
      best_energy_ = state_.energy();
      best_sweep_ = sweeps_;
      return true;
    }
    return false;
  }

  // The drive's deadline inside a sweep of unknown duration (kernels/detail/drive.hpp), on the
  // uniform path only: a sweep that would take the hazard path runs whole, as unwatched.
  bool watching(std::size_t m) const noexcept {
    if (watch_ == nullptr || m <= detail::sweep_watch_every) return false;
    if constexpr (hazard_capable) return !detail::take_hazard_path(acceptor_, last_rate_, params_.hazard_below, m);
    return true;
  }
  std::uint64_t watched_moves(Xoshiro256& rng, std::size_t& m) {
    return acceptor_.rule() == Acceptance::metropolis
               ? detail::watched_sweep(move_, state_, acceptor_.template fixed<Acceptance::metropolis>(), rng, m, *watch_)
               : detail::watched_sweep(move_, state_, acceptor_.template fixed<Acceptance::heat_bath>(), rng, m, *watch_);
  }

  // `stream` is copied into a local for the sweep: a generator reached through a reference
  // lives in memory, and every draw would then store and reload its state (a chain through
  // store forwarding, about a quarter of a rejected attempt's cost). The local's address
  // must never escape (not even to hazard_sweep, which makes its own copy), or the compiler
  // keeps it in memory for the whole function.
  template <Acceptance Rule>
  std::uint64_t sweep_moves(Xoshiro256& stream, std::size_t m) {
    if constexpr (hazard_capable) {
      if (detail::take_hazard_path(acceptor_, last_rate_, params_.hazard_below, m)) {
        return detail::hazard_sweep(state_, acceptor_, move_.order(), stream);
      }
    }
    Xoshiro256 rng = stream;
    std::uint64_t accepted = 0;
    const auto acceptor = acceptor_.template fixed<Rule>();
    if constexpr (std::is_same_v<Move, SingleFlip<Model>>) {
      // The built-in move, inlined by hand: spins and fields through local pointers, the site
      // order fixed outside the loop. Same proposals and RNG use as the generic path below
      // (the hazard path above is the built-in move's own).
      const std::int8_t* spins = state_.spins();
      const energy_type* fields = state_.local_fields();
      const auto n = static_cast<std::uint32_t>(m);
      detail::FlipLoop<Model> flips(state_);  // the flips with the arrays in registers
      auto visit = [&](std::uint32_t i) {
        const auto ii = static_cast<typename Model::index_type>(i);
        energy_type d;
        if constexpr (Model::form == Form::ising) {
          d = -2 * spins[i] * fields[i];
        } else {
          d = spins[i] * fields[i];
        }
        if (acceptor.accept(d, rng)) {
          flips.flip(ii, d);
          ++accepted;
        }
      };
      if (move_.order() == SiteOrder::sequential) {
        // A tight scan that only evaluates and rejects, leaving it for each accepted flip:
        // the common case (rejection at low temperature) keeps its values in registers.
        std::uint32_t i = 0;
        for (;;) {
          energy_type d{};
          for (; i < n; ++i) {
            if constexpr (Model::form == Form::ising) {
              d = -2 * spins[i] * fields[i];
            } else {
              d = spins[i] * fields[i];
            }
            if (acceptor.accept(d, rng)) break;
          }
          if (i >= n) break;
          flips.flip(static_cast<typename Model::index_type>(i), d);
          ++accepted;
          ++i;
        }
      } else {
        for (std::uint32_t k = 0; k < n; ++k) visit(rng.below(n));
      }
      flips.finish();
    } else {
      for (std::size_t k = 0; k < m; ++k) {
        const auto p = move_.propose(state_, rng);
        const energy_type d = move_.delta(state_, p);
        if (acceptor.accept(d, rng)) {
          move_.apply(state_, p, d);
          ++accepted;
        }
      }
    }
    stream = rng;
    return accepted;
  }

  const Model* model_;
  AnnealParams params_;
  state_type state_;
  Move move_;
  Acceptor<energy_type> acceptor_;
  Schedule schedule_{};
  BetaSpan range_{};
  Xoshiro256 rng_{};
  bool tables_fresh_ = false;  // acceptor_ matches the model as scanned (set by init only)
  detail::Buffer<std::int8_t> best_spins_;
  energy_type best_energy_{};
  std::uint64_t best_sweep_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t attempted_ = 0;
  std::uint64_t accepted_ = 0;
  std::uint64_t schedule_sweeps_ = 0;
  std::uint64_t restart_ = 0;
  double last_rate_ = 1;      // accepted / attempted in the previous sweep (hazard path choice)
  double time_fraction_ = 0;  // elapsed fraction of advance()'s time limit (0 untimed)
  const detail::SweepDeadline* watch_ = nullptr;  // set by the drive for a sweep of unknown duration
};

/// Refuses parameters a kernel cannot run with: a schedule end that is negative or not finite
/// (Schedule::check), hazard_below negative or not finite. The
/// one-call functions assert it; call it first where the parameters come from outside.
inline Status check_params(const AnnealParams& params) noexcept {
  const Status s = params.schedule.check();
  if (!s) return s;
  if (!(params.hazard_below >= 0) || params.hazard_below - params.hazard_below != 0) {
    return Status::error(StatusCode::invalid_argument, "hazard_below must be finite and >= 0");
  }
  return Status::success();
}

/// The schedule of a warm re-solve: geometric, ending at the span's cold end and starting
/// `heat` of the way (in log beta) from there back towards its hot end. heat = 1 is the whole
/// automatic range (a re-solve from scratch), heat = 0 stays at the cold end (descent-like
/// sampling). Guidance on choosing it, and on when to re-solve from scratch instead, measured
/// in docs/embedding.md ("Warm re-solve"). heat is clamped to [0, 1].
inline Schedule warm_schedule(const BetaSpan& span, double heat) noexcept {
  if (!(heat > 0)) heat = 0;
  if (heat > 1) heat = 1;
  const double cold = span.beta_end;
  const double hot = span.beta_start > 0 ? span.beta_start : cold;
  return Schedule::geometric(cold * std::pow(hot / cold, heat), cold);
}
/// The same over the beta span estimated from the model (one pass over it).
template <class Model>
Schedule warm_schedule(const Model& model, double heat) {
  return warm_schedule(estimate_beta_span(model), heat);
}

#if !SPINWRIGHT_NO_HEAP
namespace detail {
// advance() and the result of a one-call anneal, with the budget stamped at the call's entry
// (see Budget::start): the workspace, the sweeps and the result all count against a time
// limit. Integer models report the tracked best energy (exact); floating ones recompute it.
template <class Model, class Move, class Observer>
Solution<typename Model::energy_type> anneal_call(Annealer<Model, Move>& a, std::uint64_t restart, const Budget& budget,
                                                  Observer& observer) {
  double seconds = 0;
  const StopReason why = a.advance(budget, observer, &seconds);
  const auto best = a.best();
  Solution<typename Model::energy_type> s;
  s.spins.assign(best.spins, best.spins + best.size);
  if constexpr (std::is_integral_v<typename Model::energy_type>) {
    s.energy = best.energy;
  } else {
    s.energy = a.best_energy_exact();
  }
  s.sweeps = a.sweeps_done();
  s.attempted = a.attempted();
  s.accepted = a.accepted();
  s.restart = restart;
  s.reason = why;
  s.seconds = call_seconds(budget, seconds);
  return s;
}
}  // namespace detail

/// One restart of annealing with the default single-flip move. A time limit bounds the whole
/// call: building the workspace and the result count against it (Budget::start).
template <class Model>
Solution<typename Model::energy_type> anneal(const Model& model, const AnnealParams& params, std::uint64_t seed,
                                             std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  NoObserver none;
  return anneal(model, params, seed, restart, budget, none);
}

/// The same with an observer (on_improvement / on_progress, see control/control.hpp).
template <class Model, class Observer>
Solution<typename Model::energy_type> anneal(const Model& model, const AnnealParams& params, std::uint64_t seed,
                                             std::uint64_t restart, const Budget& budget, Observer& observer) {
  const Budget call = budget.stamped();
  SPINWRIGHT_ASSERT(check_params(params).ok(), "anneal: invalid parameters (check_params(params) says which)");
  Annealer<Model> a(model, params, seed, restart);
  return detail::anneal_call(a, restart, call, observer);
}

/// One restart with a user move generator.
template <class Model, class Move>
Solution<typename Model::energy_type> anneal_with(const Model& model, const AnnealParams& params, Move move,
                                                  std::uint64_t seed, std::uint64_t restart = 0,
                                                  const Budget& budget = Budget{}) {
  const Budget call = budget.stamped();
  SPINWRIGHT_ASSERT(check_params(params).ok(), "anneal_with: invalid parameters (check_params(params) says which)");
  Annealer<Model, Move> a(model, params, std::move(move), seed, restart);
  NoObserver none;
  return detail::anneal_call(a, restart, call, none);
}

#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_ANNEAL_HPP
