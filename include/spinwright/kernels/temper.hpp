// spinwright — replica-exchange tempering (Hukushima & Nemoto 1996): a one-call function
// temper() and a stepping object Tempering; geometric, linear or listed ladders, an adaptive
// ladder by equal energy-fluctuation length, optional Houdayer cluster moves. The method, the
// ladder rules and what allocates: docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_TEMPER_HPP
#define SPINWRIGHT_KERNELS_TEMPER_HPP

#include "../arena.hpp"
#include "../config.hpp"
#include "../detail/buffer.hpp"
#include "../detail/object_array.hpp"
#include "../model/span.hpp"
#include "../control.hpp"
#include "../rng/xoshiro.hpp"
#include "../state/spin_state.hpp"
#include "../moves/single_flip.hpp"  // SiteOrder
#include "detail/drive.hpp"
#include "detail/hazard_sweep.hpp"
#include "acceptance.hpp"
#include "beta_span.hpp"
#include "schedule.hpp"
#include "solution.hpp"

#include <cmath>    // std::exp, std::pow, std::sqrt
#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t, std::uint32_t, std::uint64_t
#include <cstring>  // std::memcpy
#include <vector>   // std::vector (allocated at construction only)

namespace spinwright {

enum class LadderShape : std::uint8_t {
  geometric,  // beta_k = beta_min (beta_max / beta_min)^(k / (T - 1))
  linear,     // beta_k = beta_min + (beta_max - beta_min) k / (T - 1)
  listed,     // Ladder::betas: a list of `temperatures` increasing values
};

struct Ladder {
  LadderShape shape = LadderShape::geometric;
  std::size_t temperatures = 0;  // number of rungs; 0: automatic, clamp(sqrt(N) + 4, 4, 32)
  double beta_min = 0;           // both 0: automatic range from the model
  double beta_max = 0;
  const double* betas = nullptr;  // listed ladder (increasing), read at construction
  bool adaptive = false;          // even out swap acceptance during a warm-up
  std::uint64_t adapt_rounds = 10;
  std::uint64_t adapt_sweeps = 50;
};

struct TemperParams {
  std::uint64_t sweeps = 1000;  // default budget of run() (a Budget's sweeps override it)
  Ladder ladder{};
  SiteOrder order = SiteOrder::random;   // sites of a Metropolis sweep (sequential order moves
                                         // zero-cost domain walls in lockstep, e.g. on cycles)
  bool houdayer = false;                 // two replicas per rung and cluster moves between them
  double houdayer_beta_max = 0;          // cluster moves on rungs with beta <= this (0: every rung)
  const std::int8_t* initial = nullptr;  // warm start for every replica (n spins); random otherwise
  std::uint64_t progress_every = 0;      // observers' on_progress period in sweeps (0: never)
  std::size_t table_limit = 4096;        // entries of each integer acceptance table
  // Integer models: a replica's sweep takes the hazard path (kernels/detail/hazard_sweep.hpp) on the
  // same rule as annealing (AnnealParams::hazard_below: the replica's previous sweep accepted
  // less than this fraction, and the table is cheap to fill); 0 disables it, > 1 forces it.
  double hazard_below = 0.125;
};

/// The result of one tempering run: the best state (as every kernel's Solution) plus the
/// final ladder and the swap acceptance of each neighbouring pair (k, k+1), in [0, 1].
template <class Energy>
struct TemperSolution : Solution<Energy> {
  std::vector<double> betas;
  std::vector<double> swap_acceptance;  // size T - 1 (both replica sets pooled with Houdayer moves)
  std::uint64_t swap_attempts = 0;      // per pair, since the last ladder change
  std::uint64_t cluster_moves = 0;      // Houdayer moves made
  std::uint64_t cluster_sites = 0;      // sites flipped by them (in each replica)
};

template <class Model>
class Tempering : public detail::Drive<Tempering<Model>> {
 public:
  using model_type = Model;
  using state_type = SpinState<Model>;
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;

  /// A kernel keeps a pointer to its model: building one over a temporary is refused.
  template <class... Args>
  Tempering(const Model&&, Args&&...) = delete;

#if !SPINWRIGHT_NO_HEAP
  /// Random start states from (seed, restart), or params.initial; the workspace on the heap.
  Tempering(const Model& model, const TemperParams& params, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        n_(model.num_spins()),
        temps_(rungs_for(n_, params)),
        sets_(params.houdayer ? 2 : 1),
        betas_(temps_, 1.0),
        replicas_(temps_ * sets_, [&model](std::size_t) { return state_type(model); }),
        acceptors_(temps_,
                   [&](std::size_t) {
                     return make_acceptor(model, Acceptance::metropolis, params.table_limit, params.hazard_below > 0);
                   }),
        rates_(temps_ * sets_, 1.0),
        slot_(temps_ * sets_, 0),
        swap_tried_(temps_ - 1, 0),
        swap_done_(temps_ - 1, 0),
        moments_(3 * temps_, 0.0),
        sigma_(temps_, 0.0),
        cumulative_(temps_, 0.0),
        old_betas_(temps_, 0.0),
        stack_(params.houdayer ? n_ : 0, 0),
        differ_(params.houdayer ? n_ : 0, 0),
        mark_(params.houdayer ? n_ : 0, 0),
        best_spins_(n_, 1) {
    init(seed, restart);
  }
#endif

  /// The same with the workspace carved from a caller-supplied arena; check valid().
  Tempering(const Model& model, const TemperParams& params, Arena& arena, std::uint64_t seed, std::uint64_t restart = 0)
      : model_(&model),
        params_(params),
        n_(model.num_spins()),
        temps_(rungs_for(n_, params)),
        sets_(params.houdayer ? 2 : 1),
        betas_(temps_, arena, 1.0),
        replicas_(temps_ * sets_, arena, [&](std::size_t) { return state_type(model, arena); }),
        acceptors_(temps_, arena,
                   [&](std::size_t) {
                     return make_acceptor(model, Acceptance::metropolis, params.table_limit, arena,
                                          params.hazard_below > 0);
                   }),
        rates_(temps_ * sets_, arena, 1.0),
        slot_(temps_ * sets_, arena, 0),
        swap_tried_(temps_ - 1, arena, 0),
        swap_done_(temps_ - 1, arena, 0),
        moments_(3 * temps_, arena, 0.0),
        sigma_(temps_, arena, 0.0),
        cumulative_(temps_, arena, 0.0),
        old_betas_(temps_, arena, 0.0),
        stack_(params.houdayer ? n_ : 0, arena, 0),
        differ_(params.houdayer ? n_ : 0, arena, 0),
        mark_(params.houdayer ? n_ : 0, arena, 0),
        best_spins_(n_, arena, 1) {
    if (valid()) init(seed, restart);
  }

  /// Arena bytes the arena constructor needs.
  static std::size_t bytes_needed(const Model& model, const TemperParams& params) {
    const std::size_t n = model.num_spins();
    const std::size_t t = rungs_for(n, params);
    const std::size_t r = t * (params.houdayer ? 2 : 1);
    const std::size_t h = params.houdayer ? n : 0;
    const std::size_t acceptor =
        acceptor_bytes(model, Acceptance::metropolis, params.table_limit, params.hazard_below > 0);
    return arena_bytes<double>(t) + detail::ObjectArray<state_type>::bytes_needed(r) + r * state_type::bytes_needed(n) +
           detail::ObjectArray<Acceptor<energy_type>>::bytes_needed(t) + t * acceptor + arena_bytes<double>(r) +
           arena_bytes<std::size_t>(r) + 2 * arena_bytes<std::uint64_t>(t - 1) + arena_bytes<double>(3 * t) +
           3 * arena_bytes<double>(t) + 2 * arena_bytes<index_type>(h) + arena_bytes<std::uint8_t>(h) +
           arena_bytes<std::int8_t>(n);
  }

  bool valid() const noexcept {
    bool ok = betas_.valid() && replicas_.valid() && acceptors_.valid() && rates_.valid() && slot_.valid() &&
              swap_tried_.valid() && swap_done_.valid() && moments_.valid() && sigma_.valid() && cumulative_.valid() &&
              old_betas_.valid() && stack_.valid() && differ_.valid() && mark_.valid() && best_spins_.valid();
    for (const auto& r : replicas_) ok = ok && r.valid();
    for (const auto& a : acceptors_) ok = ok && a.valid();
    return ok;
  }

  /// Restart: new RNG stream (seed, restart), independent random spins for every replica,
  /// counters and best cleared. The ladder in use is kept (an adapted ladder is not re-adapted).
  /// No allocation.
  void reset(std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    for (auto& s : replicas_) s.randomize(rng_);
    start();
  }

  /// Restart with every replica at the given spins. No allocation.
  void warm_start(const std::int8_t* spins, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    for (auto& s : replicas_) s.set_spins(spins);
    start();
  }

  /// Restart with every replica at a caller's state over the same model, exact for the model as it is now (a
  /// SpinState kept through edit_site_term / edit_pair): spins, local fields and energy are
  /// copied in O(N) instead of recomputed from the model. No allocation.
  void warm_start(const state_type& from, std::uint64_t seed, std::uint64_t restart = 0) {
    rng_ = Xoshiro256::for_restart(seed, restart);
    restart_ = restart;
    for (auto& s : replicas_) s.assign(from);
    start();
  }

  BestView<energy_type> best() const noexcept {
    return {best_spins_.data(), best_spins_.size(), best_energy_, best_sweep_};
  }

#if !SPINWRIGHT_NO_HEAP
  /// The best state, the ladder and the swap acceptances (allocates). The energy is recomputed
  /// from the model.
  TemperSolution<energy_type> solution() const {
    TemperSolution<energy_type> s;
    s.spins.assign(best_spins_.begin(), best_spins_.end());
    s.energy = model_->energy(best_spins_.data());
    s.sweeps = sweeps_;
    s.attempted = attempted_;
    s.accepted = accepted_;
    s.restart = restart_;
    s.betas.assign(betas_.begin(), betas_.end());
    s.swap_acceptance = swap_acceptance();
    s.swap_attempts = swap_tried_.empty() ? 0 : swap_tried_[0];
    s.cluster_moves = cluster_moves_;
    s.cluster_sites = cluster_sites_;
    return s;
  }

  /// Acceptance of swaps between rungs k and k+1 since the last ladder change (0 before any attempt).
  std::vector<double> swap_acceptance() const {
    std::vector<double> a(swap_tried_.size(), 0.0);
    for (std::size_t k = 0; k < a.size(); ++k) {
      a[k] = swap_tried_[k] == 0 ? 0.0 : static_cast<double>(swap_done_[k]) / static_cast<double>(swap_tried_[k]);
    }
    return a;
  }
#endif

  /// One Houdayer cluster move between the two replicas on rung k (params.houdayer must be set;
  /// asserted). Returns the number of sites flipped in each replica (0 when the replicas are
  /// equal or opposite everywhere). No allocation.
  std::size_t houdayer_move(std::size_t k) {
    SPINWRIGHT_ASSERT(sets_ == 2 && k < temps_, "houdayer_move needs params.houdayer and a rung index");
    const std::uint64_t before = cluster_sites_;
    cluster_move(k, rng_);
    return static_cast<std::size_t>(cluster_sites_ - before);
  }

  std::size_t temperatures() const noexcept { return temps_; }
  std::size_t replicas() const noexcept { return replicas_.size(); }
  double beta(std::size_t k) const noexcept {
    SPINWRIGHT_ASSERT(k < temps_, "rung index beyond the ladder (beta)");
    return betas_[k];
  }
  Span<double> betas() const noexcept { return {betas_.data(), betas_.size()}; }
  /// The replica on rung k of replica set `set` (0, or 1 with Houdayer moves).
  const state_type& state(std::size_t k, std::size_t set = 0) const noexcept {
    SPINWRIGHT_ASSERT(k < temps_ && set < sets_, "rung or replica set beyond the kernel (state)");
    return replicas_[slot_[set * temps_ + k]];
  }
  /// The replica on the coldest rung.
  const state_type& state() const noexcept { return state(temps_ - 1); }
  const Model& model() const noexcept { return *model_; }
  std::uint64_t sweeps_done() const noexcept { return sweeps_; }
  bool adapting() const noexcept { return adapt_left_ > 0; }

  // The drive loop's questions (kernels/detail/drive.hpp).
  std::uint64_t default_sweeps() const noexcept { return params_.sweeps; }
  std::uint64_t progress_every() const noexcept { return params_.progress_every; }
  double best_for_target() const noexcept { return static_cast<double>(best_energy_); }

 private:
  friend class detail::Drive<Tempering>;

  // Rungs: the ladder's count, or clamp(sqrt(N) + 4, 2, 32) when 0; at least 2.
  static std::size_t rungs_for(std::size_t n, const TemperParams& params) noexcept {
    std::size_t t = params.ladder.temperatures;
    if (t == 0) {
      t = static_cast<std::size_t>(std::sqrt(static_cast<double>(n))) + 4;
      if (t > 32) t = 32;
    }
    return t < 2 ? 2 : t;
  }

  // The ladder (listed, or geometric / linear over the given or estimated span), then the start.
  void init(std::uint64_t seed, std::uint64_t restart) {
    const Ladder& lad = params_.ladder;
    if (lad.shape == LadderShape::listed && lad.betas != nullptr) {
      for (std::size_t k = 0; k < temps_; ++k) betas_[k] = lad.betas[k];
    } else {
      double b0 = lad.beta_min;
      double b1 = lad.beta_max;
      if (b0 == 0 && b1 == 0) {
        const BetaSpan r = estimate_beta_span(*model_);
        b0 = r.beta_start;
        b1 = r.beta_end;
      }
      if (b1 < b0) b1 = b0;
      for (std::size_t k = 0; k < temps_; ++k) {
        const double f = static_cast<double>(k) / static_cast<double>(temps_ - 1);
        betas_[k] = (lad.shape == LadderShape::linear || b0 <= 0) ? b0 + (b1 - b0) * f : b0 * std::pow(b1 / b0, f);
      }
    }
    for (std::size_t k = 0; k < temps_; ++k) acceptors_[k].set_beta(betas_[k]);
    adapt_left_ = lad.adaptive ? lad.adapt_rounds : 0;
    if (params_.initial != nullptr) {
      warm_start(params_.initial, seed, restart);
    } else {
      reset(seed, restart);
    }
  }

  void start() {
    for (auto& a : acceptors_) a.retune(*model_);  // honour in-place coefficient edits (no allocation)
    for (std::size_t s = 0; s < sets_; ++s)
      for (std::size_t k = 0; k < temps_; ++k) slot_[s * temps_ + k] = s * temps_ + k;
    for (std::size_t k = 0; k + 1 < temps_; ++k) swap_tried_[k] = swap_done_[k] = 0;
    sweeps_ = attempted_ = accepted_ = cluster_moves_ = cluster_sites_ = 0;
    for (double& r : rates_) r = 1;
    round_sweeps_ = 0;
    for (auto& x : moments_) x = 0;
    best_energy_ = replicas_[0].energy();
    std::memcpy(best_spins_.data(), replicas_[0].spins(), n_);
    best_sweep_ = 0;
    for (const auto& s : replicas_) {
      if (s.energy() < best_energy_) {
        best_energy_ = s.energy();
        std::memcpy(best_spins_.data(), s.spins(), n_);
      }
    }
  }

  // One Metropolis sweep of replica `s`; `rate` (the accepted fraction of this replica's
  // previous sweep) chooses the path and is updated here.
  void metropolis_sweep(state_type& s, Acceptor<energy_type>& acc, double& rate, Xoshiro256& stream) {
    std::uint64_t accepted = 0;
    bool swept = false;
    if constexpr (Acceptor<energy_type>::has_hazard_path) {  // integer models only
      if (detail::take_hazard_path(acc, rate, params_.hazard_below, n_)) {
        accepted = detail::hazard_sweep(s, acc, params_.order, stream);
        swept = true;
      }
    }
    if (!swept) accepted = uniform_sweep(s, acc, stream);
    attempted_ += n_;
    accepted_ += accepted;
    rate = n_ != 0 ? static_cast<double>(accepted) / static_cast<double>(n_) : 1.0;
  }

  // One uniform per uncertain attempt. The generator is copied into a local for the sweep:
  // reached through the reference, its state would be stored and reloaded at every draw
  // (flips write through int8_t pointers, which may alias anything).
  std::uint64_t uniform_sweep(state_type& s, const Acceptor<energy_type>& acc, Xoshiro256& stream) {
    Xoshiro256 rng = stream;
    std::uint64_t accepted = 0;
    const bool random = params_.order == SiteOrder::random;
    const auto n32 = static_cast<std::uint32_t>(n_);
    for (std::size_t i = 0; i < n_; ++i) {
      const auto ii = static_cast<index_type>(random ? rng.below(n32) : i);
      const energy_type d = s.delta(ii);
      if (acc.accept(d, rng)) {
        s.flip_with_delta(ii, d);
        ++accepted;
      }
    }
    stream = rng;
    return accepted;
  }

  // One Houdayer move between the two replicas on rung k.
  void cluster_move(std::size_t k, Xoshiro256& rng) {
    state_type& a = replicas_[slot_[k]];
    state_type& b = replicas_[slot_[temps_ + k]];
    const std::int8_t* sa = a.spins();
    const std::int8_t* sb = b.spins();
    std::uint32_t count = 0;
    for (std::size_t i = 0; i < n_; ++i) {
      if (sa[i] != sb[i]) differ_[count++] = static_cast<index_type>(i);
    }
    if (count == 0 || count == n_) return;  // identical or opposite: the move changes nothing useful
    const index_type seed_site = differ_[rng.below(count)];
    std::size_t top = 0;
    std::size_t size = 0;
    stack_[top++] = seed_site;
    mark_[seed_site] = 1;
    while (top > 0) {
      const index_type i = stack_[--top];
      differ_[size++] = i;  // differ_ is free again once the seed is drawn: it now lists the cluster
      model_->for_each_neighbour(i, [&](index_type j, typename Model::value_type v) {
        if (j == i || v == typename Model::value_type{0} || mark_[j] || sa[j] == sb[j]) return;
        mark_[j] = 1;
        stack_[top++] = j;
      });
    }
    for (std::size_t c = 0; c < size; ++c) {
      mark_[differ_[c]] = 0;
      a.flip(differ_[c]);
      b.flip(differ_[c]);
    }
    ++cluster_moves_;
    cluster_sites_ += size;
  }

  void swaps(std::size_t set, Xoshiro256& rng) {
    std::size_t* slot = slot_.data() + set * temps_;
    for (std::size_t k = 0; k + 1 < temps_; ++k) {
      const double x = (betas_[k] - betas_[k + 1]) * (static_cast<double>(replicas_[slot[k]].energy()) -
                                                      static_cast<double>(replicas_[slot[k + 1]].energy()));
      ++swap_tried_[k];
      if (x >= 0 || rng.uniform() < std::exp(x)) {
        const std::size_t tmp = slot[k];
        slot[k] = slot[k + 1];
        slot[k + 1] = tmp;
        ++swap_done_[k];
      }
    }
  }

  // Re-places the inner rungs so that every gap has the same share of the "length"
  // sum_k (beta_{k+1} - beta_k) sqrt(sigma_k sigma_{k+1}), sigma_k the energy standard deviation
  // measured on rung k during the round (piecewise-linear in beta between rungs).
  void adapt_ladder() {
    const std::size_t m = temps_ - 1;
    double largest = 0;
    for (std::size_t k = 0; k < temps_; ++k) {
      const double c = moments_[3 * k];
      double var = 0;
      if (c > 1) {
        const double mean = moments_[3 * k + 1] / c;
        var = moments_[3 * k + 2] / c - mean * mean;
      }
      sigma_[k] = var > 0 ? std::sqrt(var) : 0.0;
      largest = sigma_[k] > largest ? sigma_[k] : largest;
      moments_[3 * k] = moments_[3 * k + 1] = moments_[3 * k + 2] = 0;
    }
    if (largest > 0) {
      // A floor keeps frozen rungs (sigma = 0) from collapsing their gaps to nothing.
      for (std::size_t k = 0; k < temps_; ++k) sigma_[k] += 0.01 * largest;
      // Cumulative length at each rung.
      cumulative_[0] = 0;
      for (std::size_t k = 0; k < m; ++k) {
        cumulative_[k + 1] = cumulative_[k] + (betas_[k + 1] - betas_[k]) * std::sqrt(sigma_[k] * sigma_[k + 1]);
      }
      const double total = cumulative_[m];
      for (std::size_t k = 0; k < temps_; ++k) old_betas_[k] = betas_[k];
      std::size_t seg = 0;
      for (std::size_t k = 1; k < m; ++k) {
        const double target = total * static_cast<double>(k) / static_cast<double>(m);
        while (seg + 1 < m && cumulative_[seg + 1] < target) ++seg;
        const double piece = cumulative_[seg + 1] - cumulative_[seg];
        const double f = piece > 0 ? (target - cumulative_[seg]) / piece : 0.5;
        betas_[k] = old_betas_[seg] + f * (old_betas_[seg + 1] - old_betas_[seg]);
      }
    }
    for (std::size_t k = 0; k < temps_; ++k) acceptors_[k].set_beta(betas_[k]);
    for (std::size_t k = 0; k < m; ++k) swap_tried_[k] = swap_done_[k] = 0;
  }

  void record_moments() noexcept {
    for (std::size_t s = 0; s < sets_; ++s) {
      for (std::size_t k = 0; k < temps_; ++k) {
        const double e = static_cast<double>(replicas_[slot_[s * temps_ + k]].energy());
        moments_[3 * k] += 1;
        moments_[3 * k + 1] += e;
        moments_[3 * k + 2] += e * e;
      }
    }
  }

  // One sweep; true when it ended at a new best.
  bool sweep_once() {
    Xoshiro256 rng = rng_;
    for (std::size_t s = 0; s < sets_; ++s)
      for (std::size_t k = 0; k < temps_; ++k) {
        const std::size_t r = slot_[s * temps_ + k];
        metropolis_sweep(replicas_[r], acceptors_[k], rates_[r], rng);
      }
    if (sets_ == 2) {
      for (std::size_t k = 0; k < temps_; ++k) {
        if (params_.houdayer_beta_max == 0 || betas_[k] <= params_.houdayer_beta_max) cluster_move(k, rng);
      }
    }
    for (std::size_t s = 0; s < sets_; ++s) swaps(s, rng);
    rng_ = rng;
    ++sweeps_;
    if (adapt_left_ > 0) record_moments();
    if (adapt_left_ > 0 && ++round_sweeps_ >= params_.ladder.adapt_sweeps) {
      adapt_ladder();
      round_sweeps_ = 0;
      --adapt_left_;
    }
    bool improved = false;
    for (const auto& s : replicas_) {
      if (s.energy() < best_energy_) {
        best_energy_ = s.energy();
        std::memcpy(best_spins_.data(), s.spins(), n_);
        best_sweep_ = sweeps_;
        improved = true;
      }
    }
    return improved;
  }

  const Model* model_;
  TemperParams params_;
  std::size_t n_;
  std::size_t temps_ = 2;
  std::size_t sets_ = 1;
  detail::Buffer<double> betas_;
  detail::ObjectArray<state_type> replicas_;
  detail::ObjectArray<Acceptor<energy_type>> acceptors_;
  detail::Buffer<double> rates_;      // per replica: accepted fraction of its previous sweep
  detail::Buffer<std::size_t> slot_;  // slot_[set * T + k]: the replica on rung k of that set
  detail::Buffer<std::uint64_t> swap_tried_;
  detail::Buffer<std::uint64_t> swap_done_;
  detail::Buffer<double> moments_;  // adaptive warm-up: count, sum E, sum E^2 per rung
  detail::Buffer<double> sigma_;
  detail::Buffer<double> cumulative_;
  detail::Buffer<double> old_betas_;
  detail::Buffer<index_type> stack_;
  detail::Buffer<index_type> differ_;
  detail::Buffer<std::uint8_t> mark_;
  detail::Buffer<std::int8_t> best_spins_;
  Xoshiro256 rng_{};
  energy_type best_energy_{};
  std::uint64_t best_sweep_ = 0;
  std::uint64_t sweeps_ = 0;
  std::uint64_t attempted_ = 0;
  std::uint64_t accepted_ = 0;
  std::uint64_t cluster_moves_ = 0;
  std::uint64_t cluster_sites_ = 0;
  std::uint64_t adapt_left_ = 0;
  std::uint64_t round_sweeps_ = 0;
  std::uint64_t restart_ = 0;
};

/// Refuses parameters tempering cannot run with: a ladder end (beta_min, beta_max) or a listed
/// beta that is negative or not finite, a listed ladder that is missing, shorter than 2 rungs or
/// not increasing, houdayer_beta_max or hazard_below negative or not finite. temper() asserts
/// it; call it first where the parameters come from outside.
inline Status check_params(const TemperParams& params) noexcept {
  auto bad = [](double b) { return !(b >= 0) || b - b != 0; };
  const Ladder& lad = params.ladder;
  if (bad(lad.beta_min) || bad(lad.beta_max)) {
    return Status::error(StatusCode::invalid_argument, "ladder: beta_min and beta_max must be finite and >= 0");
  }
  if (lad.shape == LadderShape::listed) {
    if (lad.betas == nullptr || lad.temperatures < 2) {
      return Status::error(StatusCode::invalid_argument, "ladder: a listed ladder needs `temperatures` >= 2 betas");
    }
    for (std::size_t k = 0; k < lad.temperatures; ++k) {
      if (bad(lad.betas[k])) {
        return Status::error(StatusCode::invalid_argument, "ladder: a listed beta is negative or not finite")
            .at_term(k, k, k);
      }
      if (k > 0 && !(lad.betas[k] > lad.betas[k - 1])) {
        return Status::error(StatusCode::invalid_argument, "ladder: listed betas must increase").at_term(k, k - 1, k);
      }
    }
  }
  if (bad(params.houdayer_beta_max) || bad(params.hazard_below)) {
    return Status::error(StatusCode::invalid_argument, "houdayer_beta_max and hazard_below must be finite and >= 0");
  }
  return Status::success();
}

#if !SPINWRIGHT_NO_HEAP
/// One tempering run (restart `restart` of `seed`). A time limit bounds the whole call.
template <class Model>
TemperSolution<typename Model::energy_type> temper(const Model& model, const TemperParams& params, std::uint64_t seed,
                                                   std::uint64_t restart = 0, const Budget& budget = Budget{}) {
  NoObserver none;
  return temper(model, params, seed, restart, budget, none);
}

/// The same with an observer (on_improvement / on_progress, see control/control.hpp).
template <class Model, class Observer>
TemperSolution<typename Model::energy_type> temper(const Model& model, const TemperParams& params, std::uint64_t seed,
                                                   std::uint64_t restart, const Budget& budget, Observer& observer) {
  const Budget call = budget.stamped();  // the workspace and the result count against a time limit
  SPINWRIGHT_ASSERT(check_params(params).ok(), "temper: invalid parameters (check_params(params) says which)");
  Tempering<Model> t(model, params, seed, restart);
  auto s = t.run(call, observer);
  s.seconds = detail::call_seconds(call, s.seconds);
  return s;
}
#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_TEMPER_HPP
