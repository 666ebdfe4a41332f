// spinwright — population annealing: R replicas cooled together from beta = 0; at every beta
// step the population is resampled by Boltzmann weights and every replica is swept at the new
// beta. Gives ground states and equilibrium estimates with the free energy from the
// normalisation factors. A one-call function population_anneal() and a stepping object
// PopulationAnnealer of the one kernel shape (docs/kernels.md); rules: docs/quantum.md.
#ifndef SPINWRIGHT_KERNELS_POPULATION_HPP
#define SPINWRIGHT_KERNELS_POPULATION_HPP

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

#include <cmath>    // std::exp, std::log, std::isfinite
#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t
#include <cstring>  // std::memcpy
#include <limits>   // std::numeric_limits

namespace spinwright {

// Runs body(job, begin, end) over disjoint ranges that cover [0, count), in any order or at
// once (e.g. on threads). Every replica uses its own random stream, so the result is the same
// whatever the split.
struct ParallelFor {
  void (*run)(void* context, std::size_t count, void* job,
              void (*body)(void* job, std::size_t begin, std::size_t end)) = nullptr;
  void* context = nullptr;
};

struct PopulationParams {
  std::size_t population = 100;       // R, at least 1
  std::uint64_t steps = 200;          // beta steps S (the schedule's points)
  std::uint64_t sweeps_per_step = 2;  // Metropolis sweeps of every replica after each resampling
  // beta of step j = 1..S is schedule.beta_at((j - 1) / (S - 1)); the population starts at
  // beta = 0 (uniform random states). Automatic (both ends 0): geometric over the model's beta
  // span (for ground states; free-energy runs usually want linear steps from near 0).
  Schedule schedule{};
  const std::int8_t* initial = nullptr;  // every replica starts here (no free-energy estimate then)
  std::uint64_t progress_every = 0;      // observers' on_progress period in population sweeps
  ParallelFor parallel{};                // how replica sweeps run (serially by default)
};

// What the population tells at its current beta (docs/quantum.md, "Population annealing").
struct PopulationStats {
  double beta = 0;
  double log_partition = 0;            // ln Z estimate: N ln 2 + sum over steps of ln Q (NaN after a warm start)
  double free_energy = 0;              // -ln Z / beta (NaN at beta 0 or after a warm start)
  double mean_energy = 0;              // population average of the energy
  double effective_size = 0;           // (sum w)^2 / sum w^2 of the last resampling (R before any)
  double smallest_effective_size = 0;  // the smallest of those over the run
  std::size_t families = 0;            // start replicas that still have descendants
  double family_entropy = 0;           // S_f = -sum_i nu_i ln nu_i, nu_i: fraction descended from i
  double rho_t = 0;                    // R sum_i nu_i^2 (Wang, Machta & Katzgraber 2015)
  std::uint64_t step = 0;              // beta steps done
};

template <class Model>
class PopulationAnnealer : public detail::Drive<PopulationAnnealer<Model>> {
 public:
  using model_type = Model;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  PopulationAnnealer(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// R random replicas from (seed, restart), or params.initial. Allocates on the heap; check
  /// status() for refused parameters.
  PopulationAnnealer(const Model& model, const PopulationParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        status_(check(params)),
        r_(status_ ? params.population : 0),
        n_(model.num_spins()),
        replicas_(r_, [&model](std::size_t) { return state_type(model); }),
        streams_(r_),
        scratch_(r_ * n_),
        family_(r_),
        scratch_family_(r_),
        counts_(r_),
        cumulative_(r_),
        best_spins_(n_, 1) {
    if (status_) init(seed, restart);
  }
#endif

  /// The same carved from a caller-supplied arena (no heap); check valid().
  PopulationAnnealer(const Model& model, const PopulationParams& params, Arena& arena, std::uint64_t seed,
                     std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        status_(check(params)),
        r_(status_ ? params.population : 0),
        n_(model.num_spins()),
        replicas_(r_, arena, [&](std::size_t) { return state_type(model, arena); }),
        streams_(r_, arena),
        scratch_(r_ * n_, arena),
        family_(r_, arena),
        scratch_family_(r_, arena),
        counts_(r_, arena),
        cumulative_(r_, arena),
        best_spins_(n_, arena, 1) {
    if (status_ && valid()) init(seed, restart);
  }

  static std::size_t bytes_needed(const Model& model, const PopulationParams& params) {
    const std::size_t r = params.population;
    const std::size_t n = model.num_spins();
    return detail::ObjectArray<state_type>::bytes_needed(r) + r * state_type::bytes_needed(n) +
           arena_bytes<Xoshiro256>(r) + arena_bytes<std::int8_t>(r * n) + 3 * arena_bytes<std::uint32_t>(r) +
           arena_bytes<double>(r) + arena_bytes<std::int8_t>(n);
  }

  /// Parameters the kernel refuses (the message names the offending one).
  static Status check(const PopulationParams& params) noexcept {
    if (params.population == 0) return Status::error(StatusCode::invalid_argument, "population must be at least 1");
    if (params.population > 0xFFFFFFFFu) {
      return Status::error(StatusCode::size_limit, "population must be below 2^32");
    }
    if (params.steps == 0) return Status::error(StatusCode::invalid_argument, "steps must be at least 1");
    if (params.sweeps_per_step == 0) {
      return Status::error(StatusCode::invalid_argument, "sweeps_per_step must be at least 1");
    }
    if (params.schedule.shape == ScheduleShape::callable && params.schedule.function == nullptr) {
      return Status::error(StatusCode::invalid_argument, "schedule: callable without a function");
    }
    return Status::success();
  }

  bool valid() const noexcept {
    bool ok = status_.ok() && replicas_.valid() && streams_.valid() && scratch_.valid() && family_.valid() &&
              scratch_family_.valid() && counts_.valid() && cumulative_.valid() && best_spins_.valid();
    for (const auto& s : replicas_) ok = ok && s.valid();
    return ok;
  }
  const Status& status() const noexcept { return status_; }

  /// New streams (seed, restart), R independent uniform random replicas at beta = 0 (the
  /// free-energy anchor ln Z = N ln 2), counters, families and best cleared. No allocation.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    seed_streams(seed, restart);
    for (std::size_t j = 0; j < r_; ++j) replicas_[j].randomize(streams_[j]);
    log_z_ = static_cast<double>(n_) * 0.69314718055994531;
    start();
  }

  /// Every replica starts from the given spins; the free-energy estimate is then undefined.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    seed_streams(seed, restart);
    for (auto& s : replicas_) s.set_spins(spins);
    log_z_ = std::numeric_limits<double>::quiet_NaN();
    start();
  }

  BestView<energy_type> best() const noexcept { return {best_spins_.data(), n_, best_energy_, best_sweep_}; }

#if !SPINWRIGHT_NO_HEAP
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

  /// The population's estimates at the current beta (O(R)).
  PopulationStats stats() const noexcept {
    PopulationStats st;
    st.beta = beta_;
    st.log_partition = log_z_;
    st.free_energy = beta_ > 0 ? -log_z_ / beta_ : std::numeric_limits<double>::quiet_NaN();
    double sum = 0;
    for (const auto& s : replicas_) sum += static_cast<double>(s.energy());
    st.mean_energy = r_ != 0 ? sum / static_cast<double>(r_) : 0.0;
    st.effective_size = effective_;
    st.smallest_effective_size = smallest_effective_;
    for (std::size_t j = 0; j < r_; ++j) counts_[j] = 0;
    for (std::size_t j = 0; j < r_; ++j) ++counts_[family_[j]];
    const double rr = static_cast<double>(r_);
    for (std::size_t j = 0; j < r_; ++j) {
      if (counts_[j] == 0) continue;
      ++st.families;
      const double nu = static_cast<double>(counts_[j]) / rr;
      st.family_entropy -= nu * std::log(nu);
      st.rho_t += rr * nu * nu;
    }
    st.step = step_;
    return st;
  }

  std::size_t population() const noexcept { return r_; }
  const state_type& replica(std::size_t j) const noexcept { return replicas_[j]; }
  /// The start replica replica j descends from.
  std::uint32_t family(std::size_t j) const noexcept { return family_[j]; }
  double beta() const noexcept { return beta_; }
  double log_partition() const noexcept { return log_z_; }
  std::uint64_t steps_done() const noexcept { return step_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  std::uint64_t attempted() const noexcept { return attempted_; }
  std::uint64_t accepted() const noexcept { return accepted_; }
  const Schedule& schedule() const noexcept { return schedule_; }
  /// Change the number of beta steps used by step() (advance() sets it from its budget).
  void set_schedule_steps(std::uint64_t s) noexcept { schedule_steps_ = s; }

  // The drive loop's questions (kernels/detail/drive.hpp): one budget sweep is one sweep of
  // every replica; a beta step is sweeps_per_step of them.
  std::uint64_t default_sweeps() const noexcept { return params_.steps * params_.sweeps_per_step; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy_); }

 private:
  friend class detail::Drive<PopulationAnnealer>;

  void begin_advance(std::uint64_t limit) noexcept {
    const std::uint64_t sps = params_.sweeps_per_step;
    schedule_steps_ = limit == unlimited_sweeps ? params_.steps : (limit + sps - 1) / sps;
    if (schedule_steps_ == 0) schedule_steps_ = 1;
    time_fraction_ = 0;
  }
  void before_sweep(double time_fraction) noexcept { time_fraction_ = time_fraction; }
  bool settled() const noexcept { return !ready_; }

  void init(std::uint64_t seed, std::uint64_t restart) {
    schedule_steps_ = params_.steps;
    schedule_ = params_.schedule;
    if (schedule_.automatic()) {
      const BetaSpan span = estimate_beta_span(*model_);
      schedule_.beta_start = span.beta_start;
      schedule_.beta_end = span.beta_end;
    }
    ready_ = true;
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  void seed_streams(std::uint64_t seed, std::uint64_t restart) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    const std::uint64_t base = rng_.next();
    for (std::size_t j = 0; j < r_; ++j) streams_[j] = Xoshiro256::for_restart(base, j);
    restart_ = restart;
  }

  void start() {
    for (std::size_t j = 0; j < r_; ++j) family_[j] = static_cast<std::uint32_t>(j);
    beta_ = 0;
    step_ = sweeps_ = attempted_ = accepted_ = 0;
    effective_ = smallest_effective_ = static_cast<double>(r_);
    time_fraction_ = 0;
    best_energy_ = energy_type{};
    best_sweep_ = 0;
    std::size_t at = 0;
    for (std::size_t j = 1; j < r_; ++j) {
      if (replicas_[j].energy() < replicas_[at].energy()) at = j;
    }
    if (r_ != 0) {
      std::memcpy(best_spins_.data(), replicas_[at].spins(), n_);
      best_energy_ = replicas_[at].energy();
    }
  }

  double beta_of_step(std::uint64_t j) const noexcept {  // j = 1..S
    const std::uint64_t s = schedule_steps_;
    double f = s > 1 ? static_cast<double>(j - 1) / static_cast<double>(s - 1) : 1.0;
    if (time_fraction_ > f) f = time_fraction_;
    return schedule_.beta_at(f);
  }

  // Multinomial resampling (R draws, probability proportional to exp(-(beta' - beta) E_j)),
  // the fixed-size variant of the resampling step of Hukushima & Iba (2003) and Machta (2010);
  // ln Q = ln((1/R) sum_j exp(-(beta' - beta) E_j)) adds to ln Z.
  void resample(double new_beta) {
    const double db = new_beta - beta_;
    beta_ = new_beta;
    if (db == 0 || r_ == 0) return;
    double low = static_cast<double>(replicas_[0].energy());
    for (std::size_t j = 1; j < r_; ++j) {
      const double e = static_cast<double>(replicas_[j].energy());
      if (db > 0 ? e < low : e > low) low = e;
    }
    double sum = 0, sum_sq = 0;
    for (std::size_t j = 0; j < r_; ++j) {
      const double w = std::exp(-db * (static_cast<double>(replicas_[j].energy()) - low));
      sum += w;
      sum_sq += w * w;
      cumulative_[j] = sum;
    }
    log_z_ += -db * low + std::log(sum / static_cast<double>(r_));
    effective_ = sum * sum / sum_sq;
    if (effective_ < smallest_effective_) smallest_effective_ = effective_;
    for (std::size_t k = 0; k < r_; ++k) {
      const double u = rng_.uniform() * sum;
      std::size_t lo = 0, hi = r_ - 1;  // the first j with cumulative_[j] > u
      while (lo < hi) {
        const std::size_t mid = lo + (hi - lo) / 2;
        if (cumulative_[mid] > u) {
          hi = mid;
        } else {
          lo = mid + 1;
        }
      }
      std::memcpy(scratch_.data() + k * n_, replicas_[lo].spins(), n_);
      scratch_family_[k] = family_[lo];
    }
    for (std::size_t k = 0; k < r_; ++k) {
      replicas_[k].set_spins(scratch_.data() + k * n_);
      family_[k] = scratch_family_[k];
    }
  }

  bool sweep_once() {
    const std::uint64_t sps = params_.sweeps_per_step;
    if (sweeps_ % sps == 0) {
      ++step_;
      resample(beta_of_step(step_));
    }
    if (params_.parallel.run != nullptr) {
      params_.parallel.run(params_.parallel.context, r_, this, &PopulationAnnealer::sweep_job);
    } else {
      sweep_job(this, 0, r_);
    }
    attempted_ += static_cast<std::uint64_t>(r_) * n_;
    for (std::size_t j = 0; j < r_; ++j) accepted_ += counts_[j];
    ++sweeps_;
    bool improved = false;
    for (std::size_t j = 0; j < r_; ++j) {
      if (replicas_[j].energy() < best_energy_) {
        best_energy_ = replicas_[j].energy();
        std::memcpy(best_spins_.data(), replicas_[j].spins(), n_);
        best_sweep_ = sweeps_;
        improved = true;
      }
    }
    return improved;
  }

  static void sweep_job(void* job, std::size_t begin, std::size_t end) {
    static_cast<PopulationAnnealer*>(job)->sweep_range(begin, end);
  }

  // Metropolis sweeps of replicas [begin, end), each with its own stream (N attempts at random
  // sites); accepted moves are tallied in counts_[j]. Touches nothing shared.
  void sweep_range(std::size_t begin, std::size_t end) {
    const auto n = static_cast<std::uint32_t>(n_);
    for (std::size_t j = begin; j < end; ++j) {
      state_type& s = replicas_[j];
      Xoshiro256 rng = streams_[j];
      std::uint32_t accepted = 0;
      for (std::uint32_t t = 0; t < n; ++t) {
        const auto i = static_cast<index_type>(rng.below(n));
        const energy_type d = s.delta(i);
        const double x = beta_ * static_cast<double>(d);
        if (x <= 0 || (x < 745 && rng.uniform() < std::exp(-x))) {
          s.flip_with_delta(i, d);
          ++accepted;
        }
      }
      streams_[j] = rng;
      counts_[j] = accepted;
    }
  }

  const Model* model_;
  PopulationParams params_;
  Status status_;
  std::size_t r_;
  std::size_t n_;
  detail::ObjectArray<state_type> replicas_;
  detail::Buffer<Xoshiro256> streams_;
  detail::Buffer<std::int8_t> scratch_;
  detail::Buffer<std::uint32_t> family_;
  detail::Buffer<std::uint32_t> scratch_family_;
  mutable detail::Buffer<std::uint32_t> counts_;  // accepted moves per replica; family sizes in stats()
  detail::Buffer<double> cumulative_;
  detail::Buffer<std::int8_t> best_spins_;
  Schedule schedule_{};
  Xoshiro256 rng_{};
  double beta_ = 0;
  double log_z_ = 0;
  double effective_ = 0;
  double smallest_effective_ = 0;
  double time_fraction_ = 0;
  energy_type best_energy_{};
  std::uint64_t best_sweep_ = 0;
  std::uint64_t step_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t attempted_ = 0;
  std::uint64_t accepted_ = 0;
  std::uint64_t schedule_steps_ = 0;
  std::uint64_t restart_ = 0;
  bool ready_ = false;
};

#if !SPINWRIGHT_NO_HEAP
/// One run of population annealing; the best replica ever seen as the Solution.
template <class Model>
Solution<typename Model::energy_type> population_anneal(const Model& model, const PopulationParams& params,
                                                        std::uint64_t seed, std::uint64_t restart = 0,
                                                        const Budget& budget = Budget{}) {
  PopulationAnnealer<Model> p(model, params, seed, restart);
  SPINWRIGHT_ASSERT(p.valid(), "population_anneal: refused parameters (PopulationAnnealer::check names them)");
  return p.run(budget);
}

template <class Model, class Observer>
Solution<typename Model::energy_type> population_anneal(const Model& model, const PopulationParams& params,
                                                        std::uint64_t seed, std::uint64_t restart, const Budget& budget,
                                                        Observer& observer) {
  PopulationAnnealer<Model> p(model, params, seed, restart);
  SPINWRIGHT_ASSERT(p.valid(), "population_anneal: refused parameters (PopulationAnnealer::check names them)");
  return p.run(budget, observer);
}
#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_POPULATION_HPP
