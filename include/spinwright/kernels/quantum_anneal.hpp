// spinwright — simulated quantum annealing by path-integral Monte Carlo: the transverse-field
// Hamiltonian H(f) = -A(f) sum_i sigma^x_i + B(f) H_problem at temperature T, split into P
// coupled slices (Suzuki-Trotter), sampled with Metropolis. A one-call function quantum_anneal()
// and a stepping object QuantumAnnealer of the one kernel shape (docs/kernels.md). The
// parameters, the estimator and the checks: docs/quantum.md.
#ifndef SPINWRIGHT_KERNELS_QUANTUM_ANNEAL_HPP
#define SPINWRIGHT_KERNELS_QUANTUM_ANNEAL_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../detail/buffer.hpp"
#include "../detail/object_array.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "../status.hpp"
#include "detail/drive.hpp"
#include "beta_span.hpp"
#include "schedule.hpp"
#include "solution.hpp"

#include <cmath>    // std::exp, std::log, std::tanh, std::isfinite, std::sinh, std::cosh
#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t, std::uint8_t
#include <cstring>  // std::memcpy
#include <limits>   // std::numeric_limits

namespace spinwright {

// Which moves a sweep makes (docs/quantum.md, "Moves").
enum class SliceMoves : std::uint8_t {
  local,         // N x P single-spin attempts: spin i of slice k
  time_cluster,  // N attempts of a cluster along imaginary time (one site, a run of slices, up to all)
  both,          // the local attempts, then the cluster attempts
};

struct QuantumAnnealParams {
  std::uint64_t sweeps = 1000;  // schedule length (a Budget's sweeps override it in run())
  std::uint32_t slices = 16;    // P, the Trotter number (at least 1)
  // T in the model's energy units; 0: P T = u / 4, where u = BetaSpan::hot_delta / 2 (the RMS
  // local field of a random state) is the model's energy scale (docs/quantum.md: instances
  // with widely spread coefficients, such as bqp, do better near P T = u / 10).
  double temperature = 0;
  // A(f) and B(f) over the run fraction f in [0, 1]; the Schedule type is reused as a function
  // of f (beta_start / beta_end are the values at f = 0 / 1). Default field (both ends 0):
  // linear from 1.25 u to 0.001 u; default problem factor: 1 throughout.
  Schedule field{ScheduleShape::linear, 0, 0, nullptr, nullptr};
  Schedule problem = Schedule::constant(1.0);
  SliceMoves moves = SliceMoves::both;
  const std::int8_t* initial = nullptr;  // start spins (+1/-1) copied into every slice; random slices otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
};

namespace detail {
// J_perp = -(P T / 2) ln tanh(A / (P T)) (Santoro, Martonak, Tosatti & Car, Science 295, 2427
// (2002)); +infinity at A = 0 (slices locked together).
inline double slice_coupling(double field, double p_times_t) noexcept {
  if (!(field > 0)) return std::numeric_limits<double>::infinity();
  const double t = std::tanh(field / p_times_t);
  if (!(t > 0)) return std::numeric_limits<double>::infinity();
  return -0.5 * p_times_t * std::log(t);
}
}  // namespace detail

template <class Model>
class QuantumAnnealer : public detail::Drive<QuantumAnnealer<Model>> {
 public:
  using model_type = Model;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  QuantumAnnealer(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Random slices from Xoshiro256::for_restart(seed, restart), or params.initial in every
  /// slice. Allocates the workspace on the heap. Check status() for refused parameters.
  QuantumAnnealer(const Model& model, const QuantumAnnealParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        status_(check(params)),
        p_(status_ ? params.slices : 0),
        slices_(p_, [&model](std::size_t) { return state_type(model); }),
        best_spins_(model.num_spins(), 1) {
    if (status_) init(seed, restart);
  }
#endif

  /// The same with the workspace carved from a caller-supplied arena (no heap); check valid().
  QuantumAnnealer(const Model& model, const QuantumAnnealParams& params, Arena& arena, std::uint64_t seed,
                  std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        status_(check(params)),
        p_(status_ ? params.slices : 0),
        slices_(p_, arena, [&](std::size_t) { return state_type(model, arena); }),
        best_spins_(model.num_spins(), arena, 1) {
    if (status_ && valid()) init(seed, restart);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const QuantumAnnealParams& params) {
    const std::size_t p = params.slices;
    return detail::ObjectArray<state_type>::bytes_needed(p) + p * state_type::bytes_needed(model.num_spins()) +
           arena_bytes<std::int8_t>(model.num_spins());
  }

  /// Parameters the kernel refuses (the message names the offending one).
  static Status check(const QuantumAnnealParams& params) noexcept {
    if (params.slices == 0) return Status::error(StatusCode::invalid_argument, "slices must be at least 1");
    if (!(params.temperature >= 0) || !std::isfinite(params.temperature)) {
      return Status::error(StatusCode::invalid_argument, "temperature must be finite and not negative");
    }
    if (params.field.shape == ScheduleShape::callable && params.field.function == nullptr) {
      return Status::error(StatusCode::invalid_argument, "field schedule: callable without a function");
    }
    if (params.problem.shape == ScheduleShape::callable && params.problem.function == nullptr) {
      return Status::error(StatusCode::invalid_argument, "problem schedule: callable without a function");
    }
    return Status::success();
  }

  bool valid() const noexcept {
    bool ok = status_.ok() && slices_.valid() && best_spins_.valid();
    for (const auto& s : slices_) ok = ok && s.valid();
    return ok;
  }
  const Status& status() const noexcept { return status_; }

  /// Restart: new stream (seed, restart), independent random spins in every slice, counters
  /// and best cleared. No allocation.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    for (auto& s : slices_) s.randomize(rng_);
    start();
  }

  /// Restart with the given spins (+1/-1) in every slice. No allocation.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    for (auto& s : slices_) s.set_spins(spins);
    start();
  }

  /// The lowest problem energy seen at a sweep end in any slice.
  BestView<energy_type> best() const noexcept {
    return {best_spins_.data(), best_spins_.size(), best_energy_, best_sweep_};
  }

#if !SPINWRIGHT_NO_HEAP
  /// The best state as a Solution (energy recomputed from the model); allocates.
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

  std::size_t num_slices() const noexcept { return p_; }
  const state_type& slice(std::size_t k) const noexcept { return slices_[k]; }
  const Model& model() const noexcept { return *model_; }
  double temperature() const noexcept { return temperature_; }
  /// A, B and J_perp of the last sweep (of the next one before any sweep).
  double field() const noexcept { return a_; }
  double problem_factor() const noexcept { return b_; }
  double slice_coupling() const noexcept { return j_perp_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t attempted() const noexcept { return attempted_; }
  std::uint64_t accepted() const noexcept { return accepted_; }
  /// Change the schedule length used by step() (advance() sets it from its budget).
  void set_schedule_sweeps(std::uint64_t s) noexcept { schedule_sweeps_ = s; }

  /// Sum over slices and sites of s_i^k s_i^(k+1) (periodic in k).
  double slice_alignment() const noexcept {
    double sum = 0;
    const std::size_t n = best_spins_.size();
    for (std::size_t k = 0; k < p_; ++k) {
      const std::int8_t* a = slices_[k].spins();
      const std::int8_t* b = slices_[k + 1 == p_ ? 0 : k + 1].spins();
      long long c = 0;
      for (std::size_t i = 0; i < n; ++i) c += a[i] * b[i];
      sum += static_cast<double>(c);
    }
    return sum;
  }

  /// Mean problem energy over the slices.
  double mean_slice_energy() const noexcept {
    double sum = 0;
    for (const auto& s : slices_) sum += static_cast<double>(s.energy());
    return p_ != 0 ? sum / static_cast<double>(p_) : 0.0;
  }

  /// The thermodynamic estimator of <H> = <B H_problem - A sum_i sigma^x_i> for the current
  /// configuration at the current A, B and T: minus the beta-derivative of the Trotter
  /// partition function's log (docs/quantum.md):
  ///   B mean_k E_k - N A coth(2 A / (P T)) + (A / P) / sinh(2 A / (P T)) sum_{k,i} s_i^k s_i^(k+1).
  /// Average it over sweeps at a fixed A and B for the thermal energy. Needs A > 0.
  double energy_estimate() const noexcept {
    const double n = static_cast<double>(best_spins_.size());
    const double x = 2 * a_ / (static_cast<double>(p_) * temperature_);
    const double kinetic =
        -n * a_ * std::cosh(x) / std::sinh(x) + (a_ / static_cast<double>(p_)) / std::sinh(x) * slice_alignment();
    return b_ * mean_slice_energy() + kinetic;
  }

  // The drive loop's questions (kernels/detail/drive.hpp).
  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy_); }

 private:
  friend class detail::Drive<QuantumAnnealer>;

  void begin_advance(std::uint64_t limit) noexcept {
    schedule_sweeps_ = limit;
    time_fraction_ = 0;
    set_schedule_point(sweeps_);
  }
  void before_sweep(double time_fraction) noexcept { time_fraction_ = time_fraction; }
  // A kernel with refused parameters or a short arena never sweeps.
  bool settled() const noexcept { return !ready_; }

  void init(std::uint64_t seed, std::uint64_t restart) {
    schedule_sweeps_ = params_.sweeps;
    const BetaSpan span = estimate_beta_span(*model_);
    const double u = span.hot_delta > 0 ? span.hot_delta / 2 : 1.0;
    const double pt = params_.temperature > 0 ? params_.temperature * params_.slices : u / 4;
    temperature_ = pt / params_.slices;
    field_ = params_.field;
    if (field_.automatic()) {
      field_.beta_start = 1.25 * u;
      field_.beta_end = 1e-3 * u;
    }
    problem_ = params_.problem;
    ready_ = true;
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  void start() {
    const std::size_t n = best_spins_.size();
    std::size_t at = 0;
    for (std::size_t k = 1; k < p_; ++k) {
      if (slices_[k].energy() < slices_[at].energy()) at = k;
    }
    if (p_ != 0) std::memcpy(best_spins_.data(), slices_[at].spins(), n);
    best_energy_ = p_ != 0 ? slices_[at].energy() : energy_type{};
    best_sweep_ = 0;
    sweeps_ = attempted_ = accepted_ = 0;
    time_fraction_ = 0;
    set_schedule_point(0);
  }

  void set_schedule_point(std::uint64_t k) noexcept {
    double f = schedule_sweeps_ > 1 ? static_cast<double>(k) / static_cast<double>(schedule_sweeps_ - 1) : 1.0;
    if (time_fraction_ > f) f = time_fraction_;
    a_ = field_.beta_at(f);
    b_ = problem_.beta_at(f);
    j_perp_ = detail::slice_coupling(a_, temperature_ * static_cast<double>(p_));
  }

  // Metropolis on the slice Hamiltonian H_eff = B sum_k E_k - J_perp sum_{k,i} s_i^k s_i^(k+1)
  // at temperature P T: accept when x <= 0 or u < exp(-x), x = change / (P T).
  bool accept(double x) noexcept { return x <= 0 || (x < 745 && rng_.uniform() < std::exp(-x)); }

  bool sweep_once() {
    set_schedule_point(sweeps_);
    const std::size_t n = best_spins_.size();
    const auto n32 = static_cast<std::uint32_t>(n);
    const double inv_pt = 1.0 / (temperature_ * static_cast<double>(p_));
    if (n != 0 && params_.moves != SliceMoves::time_cluster) local_sweep(n32, inv_pt);
    if (n != 0 && params_.moves != SliceMoves::local) cluster_sweep(n32, inv_pt);
    ++sweeps_;
    bool improved = false;
    for (std::size_t k = 0; k < p_; ++k) {
      if (slices_[k].energy() < best_energy_) {
        best_energy_ = slices_[k].energy();
        std::memcpy(best_spins_.data(), slices_[k].spins(), n);
        best_sweep_ = sweeps_;
        improved = true;
      }
    }
    return improved;
  }

  // N attempts per slice, sites drawn at random, slices in order.
  void local_sweep(std::uint32_t n, double inv_pt) {
    std::uint64_t accepted = 0;
    for (std::size_t k = 0; k < p_; ++k) {
      state_type& s = slices_[k];
      const std::int8_t* up = slices_[k + 1 == p_ ? 0 : k + 1].spins();
      const std::int8_t* down = slices_[k == 0 ? p_ - 1 : k - 1].spins();
      for (std::uint32_t t = 0; t < n; ++t) {
        const auto i = static_cast<index_type>(rng_.below(n));
        const energy_type d = s.delta(i);
        double change = b_ * static_cast<double>(d);
        if (p_ > 1) {
          const int around = up[i] + down[i];
          if (around != 0) change += 2 * j_perp_ * s.spin(i) * around;
        }
        if (accept(change * inv_pt)) {
          s.flip_with_delta(i, d);
          ++accepted;
        }
      }
    }
    attempted_ += static_cast<std::uint64_t>(n) * p_;
    accepted_ += accepted;
  }

  // N cluster attempts: a random site i and slice k; the cluster grows from k both ways along
  // the ring of slices, adding each aligned neighbour with probability 1 - exp(-2 J_perp / (P T))
  // (a one-dimensional Wolff cluster: it satisfies detailed balance for the slice couplings),
  // and the flip of the cluster is then accepted by Metropolis on B times its problem-energy
  // change. A cluster that closes the ring flips the whole world line of site i.
  void cluster_sweep(std::uint32_t n, double inv_pt) {
    const double p_add = p_ > 1 ? 1 - std::exp(-2 * j_perp_ * inv_pt) : 0.0;
    const auto p32 = static_cast<std::uint32_t>(p_);
    std::uint64_t accepted = 0;
    for (std::uint32_t t = 0; t < n; ++t) {
      const auto i = static_cast<index_type>(rng_.below(n));
      const std::uint32_t k0 = rng_.below(p32);
      const std::int8_t s0 = slices_[k0].spin(i);
      // The cluster is slices k0 - back .. k0 + ahead (mod P), length 1 + back + ahead <= P.
      std::uint32_t ahead = 0;
      while (1 + ahead < p32) {
        const std::uint32_t k = (k0 + ahead + 1) % p32;
        if (slices_[k].spin(i) != s0 || !(rng_.uniform() < p_add)) break;
        ++ahead;
      }
      std::uint32_t back = 0;
      while (1 + ahead + back < p32) {
        const std::uint32_t k = (k0 + p32 - back - 1) % p32;
        if (slices_[k].spin(i) != s0 || !(rng_.uniform() < p_add)) break;
        ++back;
      }
      double change = 0;
      for (std::uint32_t c = 0; c <= ahead + back; ++c) {
        change += static_cast<double>(slices_[(k0 + p32 - back + c) % p32].delta(i));
      }
      if (accept(b_ * change * inv_pt)) {
        for (std::uint32_t c = 0; c <= ahead + back; ++c) slices_[(k0 + p32 - back + c) % p32].flip(i);
        ++accepted;
      }
    }
    attempted_ += n;
    accepted_ += accepted;
  }

  const Model* model_;
  QuantumAnnealParams params_;
  Status status_;
  std::size_t p_;
  detail::ObjectArray<state_type> slices_;
  detail::Buffer<std::int8_t> best_spins_;
  Schedule field_{};
  Schedule problem_{};
  Xoshiro256 rng_{};
  double temperature_ = 1;
  double a_ = 0;
  double b_ = 1;
  double j_perp_ = 0;
  energy_type best_energy_{};
  std::uint64_t best_sweep_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t attempted_ = 0;
  std::uint64_t accepted_ = 0;
  std::uint64_t schedule_sweeps_ = 0;
  std::uint64_t restart_ = 0;
  double time_fraction_ = 0;
  bool ready_ = false;
};

#if !SPINWRIGHT_NO_HEAP
/// One restart of simulated quantum annealing.
template <class Model>
Solution<typename Model::energy_type> quantum_anneal(const Model& model, const QuantumAnnealParams& params,
                                                     std::uint64_t seed, std::uint64_t restart = 0,
                                                     const Budget& budget = Budget{}) {
  QuantumAnnealer<Model> q(model, params, seed, restart);
  SPINWRIGHT_ASSERT(q.valid(), "quantum_anneal: refused parameters (QuantumAnnealer::check names them)");
  return q.run(budget);
}

/// The same with an observer (on_improvement / on_progress, see control/observer.hpp).
template <class Model, class Observer>
Solution<typename Model::energy_type> quantum_anneal(const Model& model, const QuantumAnnealParams& params,
                                                     std::uint64_t seed, std::uint64_t restart, const Budget& budget,
                                                     Observer& observer) {
  QuantumAnnealer<Model> q(model, params, seed, restart);
  SPINWRIGHT_ASSERT(q.valid(), "quantum_anneal: refused parameters (QuantumAnnealer::check names them)");
  return q.run(budget, observer);
}
#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_QUANTUM_ANNEAL_HPP
