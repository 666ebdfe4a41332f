// spinwright — the `auto` choice: a kernel and its parameters picked from the model's size and
// density (choose_kernel: exact for N <= 20, breakout for dense models, annealing then descent
// otherwise), and solve_auto in its fixed and time-filling modes (auto_fill_kernel: tempering
// with cluster moves on square-lattice-like graphs, growing anneals elsewhere, in groups of
// restarts where the time allows). The rule, the measurements behind it and what the time
// limit bounds: docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_AUTO_HPP
#define SPINWRIGHT_KERNELS_AUTO_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "anneal.hpp"
#include "bit_sliced.hpp"
#include "descent.hpp"
#include "exact.hpp"
#include "lanes.hpp"
#include "solution.hpp"
#include "breakout.hpp"
#include "tabu.hpp"
#include "temper.hpp"

#include <algorithm>    // std::stable_sort (a group's restarts by energy)
#include <cmath>        // std::sqrt (the automatic rung count)
#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t, std::uint8_t
#include <cstring>      // std::memcpy
#include <limits>       // std::numeric_limits
#include <optional>     // std::optional (the descender, built when there is time for it)
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
#include <vector>       // std::vector (the returned Solution's spins)

namespace spinwright {

enum class KernelKind : std::uint8_t { anneal, temper, tabu, descent, exact, breakout };

inline constexpr const char* to_string(KernelKind k) noexcept {
  switch (k) {
    case KernelKind::anneal:
      return "anneal";
    case KernelKind::temper:
      return "temper";
    case KernelKind::tabu:
      return "tabu";
    case KernelKind::breakout:
      return "breakout";
    case KernelKind::descent:
      return "descent";
    case KernelKind::exact:
      return "exact";
  }
  return "unknown";
}

struct AutoChoice {
  KernelKind kernel = KernelKind::anneal;
  std::uint64_t sweeps = 0;  // 0 for exact enumeration
  const char* reason = "";
};

inline constexpr std::size_t auto_exact_max_spins = 20;
inline constexpr double auto_dense_threshold = 0.10;
inline constexpr std::uint64_t auto_fill_first_sweeps = 256;
inline constexpr double auto_fill_margin = 0.9;
inline constexpr std::uint64_t auto_fill_growth = 4;
inline constexpr std::uint64_t auto_fill_last_min_sweeps = 16;  // no closing anneal shorter than this
inline constexpr double auto_fill_hot_factor = 6.0;
// Tempering of square-lattice-like models (auto_fill_kernel, auto_fill_rungs): a pessimistic
// cost of one replica's flip attempt with cluster moves (about 8 ns measured on a 20,000-spin
// +-1 torus, docs/quality.md), the ladder sweeps the limit must hold at the fewest rungs, the
// sweeps the rung count aims at, and the fewest rungs.
inline constexpr double auto_fill_temper_attempt_cost = 10e-9;
inline constexpr double auto_fill_temper_sweeps_min = 100;
inline constexpr double auto_fill_temper_sweeps_aim = 200;
inline constexpr std::size_t auto_fill_temper_rungs_min = 16;

// The seed of annealing run k of the time-filling mode (run 0 uses `seed` itself).
inline constexpr std::uint64_t auto_fill_seed(std::uint64_t seed, std::uint64_t k) noexcept {
  if (k == 0) return seed;
  std::uint64_t state = seed ^ (k * 0xC2B2AE3D27D4EB4FULL);
  return splitmix64(state);
}

template <class Model>
AutoChoice choose_kernel(const Model& model) noexcept {
  const std::size_t n = model.num_spins();
  if (n <= auto_exact_max_spins) return {KernelKind::exact, 0, "at most 20 spins: exact enumeration"};
  const double all_pairs = 0.5 * static_cast<double>(n) * static_cast<double>(n - 1);
  const double density = static_cast<double>(model.num_pairs()) / all_pairs;
  if (Model::is_dense || density >= auto_dense_threshold) {
    return {KernelKind::breakout, 1000, "dense model (pair density >= 0.10): breakout local search"};
  }
  const std::uint64_t sweeps = n <= 10000 ? 4000 : (n <= 100000 ? 2000 : 1000);
  return {KernelKind::anneal, sweeps, "sparse model: annealing, then descent"};
}

namespace detail {

struct DegreeProfile {
  std::size_t min = 0;
  std::size_t max = 0;
  std::size_t low = 0;  // spins of degree <= 2
};

template <class Model>
DegreeProfile degree_profile(const Model& model) noexcept {
  using index_type = typename Model::index_type;
  DegreeProfile p;
  const std::size_t n = model.num_spins();
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t d = model.degree(static_cast<index_type>(i));
    if (i == 0 || d < p.min) p.min = d;
    if (d > p.max) p.max = d;
    p.low += d <= 2 ? 1 : 0;
  }
  return p;
}

}  // namespace detail

// Acceptance of the time-filling anneals (sequential site order): Metropolis, unless at least a
// quarter of the spins have degree <= 2 (rings, chains), where sequential Metropolis sweeps carry
// domain walls along without letting them meet; heat-bath acceptance there.
template <class Model>
Acceptance auto_fill_acceptance(const Model& model) noexcept {
  return 4 * detail::degree_profile(model).low >= model.num_spins() ? Acceptance::heat_bath : Acceptance::metropolis;
}

namespace detail {

// True when every spin has 3 or 4 partners and at least half the spins lie on a cycle of four
// (two of their partners share another partner): square lattices, periodic or with a few
// bonds missing, and their +-1 variants; not random regular graphs (few short cycles), nor
// cubic lattices (degree 6). Walks each spin's partners' partners once: O(N) for degree <= 4.
template <class Model>
bool square_lattice_like(const Model& model) noexcept {
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  const std::size_t n = model.num_spins();
  if (n == 0) return false;
  auto partners = [&model](std::size_t i, std::size_t* out) noexcept {
    std::size_t d = 0;
    const auto ii = static_cast<index_type>(i);
    model.for_each_neighbour(ii, [&](index_type j, value_type v) {
      if (j == ii || v == value_type{0}) return;
      if (d < 5) out[d] = static_cast<std::size_t>(j);
      ++d;
    });
    return d;
  };
  std::size_t on_square = 0;
  for (std::size_t i = 0; i < n; ++i) {
    std::size_t a[5];
    const std::size_t d = partners(i, a);
    if (d < 3 || d > 4) return false;
    bool found = false;
    for (std::size_t x = 0; x < d && !found; ++x) {
      std::size_t ax[5];
      const std::size_t dx = partners(a[x], ax);
      if (dx > 4) return false;
      for (std::size_t y = x + 1; y < d && !found; ++y) {
        std::size_t ay[5];
        const std::size_t dy = partners(a[y], ay);
        if (dy > 4) return false;
        for (std::size_t p = 0; p < dx && !found; ++p)
          for (std::size_t q = 0; q < dy && !found; ++q) found = ax[p] == ay[q] && ax[p] != i;
      }
    }
    on_square += found ? 1 : 0;
  }
  return 2 * on_square >= n;
}

// The fewest ladder sweeps (at the fewest rungs) and the rung count for `seconds` (below).
inline double auto_fill_temper_sweep_cost(std::size_t n, std::size_t rungs) noexcept {
  return 2.0 * static_cast<double>(rungs) * static_cast<double>(n) * auto_fill_temper_attempt_cost;
}

}  // namespace detail

// The kernel of the time-filling mode, for a limit of `seconds`: choose_kernel's, except that
// a square-lattice-like sparse model (detail::square_lattice_like) gets tempering with Houdayer
// cluster moves (built for 2D spin glasses) instead of annealing, when the limit holds
// auto_fill_temper_sweeps_min sweeps of a ladder of auto_fill_temper_rungs_min rungs at the
// pessimistic cost above.
template <class Model>
KernelKind auto_fill_kernel(const Model& model,
                            double seconds = std::numeric_limits<double>::infinity()) noexcept {
  const KernelKind k = choose_kernel(model).kernel;
  if (k != KernelKind::anneal) return k;
  const double least =
      auto_fill_temper_sweeps_min * detail::auto_fill_temper_sweep_cost(model.num_spins(), auto_fill_temper_rungs_min);
  return seconds >= least && detail::square_lattice_like(model) ? KernelKind::temper : KernelKind::anneal;
}

// The rungs of that tempering: as many as give each about auto_fill_temper_sweeps_aim sweeps
// in `seconds` at the cost above, at least auto_fill_temper_rungs_min, at most the automatic
// count (clamp(sqrt(N) + 4, 2, 32), kernels/temper.hpp).
inline std::size_t auto_fill_rungs(std::size_t n, double seconds) noexcept {
  std::size_t automatic = static_cast<std::size_t>(std::sqrt(static_cast<double>(n))) + 4;
  if (automatic > 32) automatic = 32;
  const double fit = seconds / (auto_fill_temper_sweeps_aim * detail::auto_fill_temper_sweep_cost(n, 1));
  std::size_t r = fit >= static_cast<double>(automatic) ? automatic : static_cast<std::size_t>(fit);
  if (r < auto_fill_temper_rungs_min) r = auto_fill_temper_rungs_min;
  return r < automatic ? r : automatic;
}

// How the time-filling mode anneals a sparse model it does not temper: groups of restarts in
// lockstep (64 per word in the bit-sliced kernel where it takes the model, else W lanes), or
// one restart at a time.
enum class AutoFillGroup : std::uint8_t { single, lanes, bit_sliced };

inline constexpr const char* to_string(AutoFillGroup g) noexcept {
  switch (g) {
    case AutoFillGroup::lanes:
      return "lanes";
    case AutoFillGroup::bit_sliced:
      return "bit-sliced";
    case AutoFillGroup::single:
      return "single";
  }
  return "unknown";
}

// Groups are used when the time limit holds at least this many sweeps of one group, at a
// pessimistic estimate of their cost (auto_fill_group_for): a group's sweep is then a small
// fraction of the limit, so the first group (auto_fill_first_sweeps) and the one sweep a
// deadline may find under way stay short.
inline constexpr double auto_fill_group_sweeps_min = 1024;
// The estimates, in seconds: a bit-sliced sweep of the 64 restarts of one word per spin; a
// lanes sweep per restart, per spin and per stored neighbour entry (1.5 to 7 times the costs
// measured on the G-set graphs, docs/kernels.md).
inline constexpr double auto_fill_bit_sliced_site_cost = 50e-9;
inline constexpr double auto_fill_lane_site_cost = 2e-9;
inline constexpr double auto_fill_lane_entry_cost = 0.2e-9;

// The group kind the time-filling mode anneals `model` with, given `seconds` of time limit
// (the rule: docs/kernels.md, "The automatic choice"). Walks the model's terms once.
template <class Model>
AutoFillGroup auto_fill_group_for(const Model& model, double seconds) {
  if constexpr (Model::is_dense) {
    return AutoFillGroup::single;
  } else {
    const double n = static_cast<double>(model.num_spins());
    const double entries = 2.0 * static_cast<double>(model.num_pairs());
    if constexpr (Model::form == Form::ising) {
      if (auto_fill_group_sweeps_min * n * auto_fill_bit_sliced_site_cost <= seconds && bit_sliced_fits(model).ok()) {
        return AutoFillGroup::bit_sliced;
      }
    }
    const double lane_sweep = static_cast<double>(default_lane_width) *
                              (n * auto_fill_lane_site_cost + entries * auto_fill_lane_entry_cost);
    if (auto_fill_group_sweeps_min * lane_sweep <= seconds && LaneAnnealer<Model>::fits(model)) {
      return AutoFillGroup::lanes;
    }
    return AutoFillGroup::single;
  }
}

// True when solve_auto(model, seed, restart, budget) uses the time-filling mode.
inline bool auto_fills_time(const Budget& budget) noexcept {
  return budget.sweeps == 0 && budget.clock.valid() && budget.seconds < std::numeric_limits<double>::infinity();
}

// solve_auto returns a Solution (a std::vector of spins) and builds its kernels on the heap:
// with SPINWRIGHT_NO_HEAP it is not declared (docs/embedding.md); choose_kernel above is.
#if !SPINWRIGHT_NO_HEAP

namespace detail {

// The next run of the growing sequence of the time-filling anneals, after runs of `sweeps` in
// all took `elapsed` of the `limit` (seconds from the start): `growth` times the last `length`,
// capped by what fits in auto_fill_margin of the time left at that rate. When the run after it
// could not grow again it is the closing run (`closing` set): rather than a sweep count that
// ends at the margin (and leaves it unused), it runs on the clock up to `closing_end`, the
// limit less `room` for its polish (at most half the time left). False when no run of
// auto_fill_last_min_sweeps fits.
inline bool auto_fill_next_run(double limit, double elapsed, std::uint64_t sweeps, std::uint64_t growth, double room,
                               std::uint64_t& length, bool& closing, double& closing_end) noexcept {
  const double left = limit - elapsed;
  if (!(left > 0)) return false;
  const double per_sweep = sweeps > 0 ? elapsed / static_cast<double>(sweeps) : 0.0;
  const double cap = static_cast<double>(std::uint64_t{1} << 62);
  const double fits_d = per_sweep > 0 ? auto_fill_margin * left / per_sweep : cap;
  const std::uint64_t fits = fits_d < cap ? static_cast<std::uint64_t>(fits_d) : std::uint64_t{1} << 62;
  if (fits < auto_fill_last_min_sweeps) return false;
  std::uint64_t next = growth * length;
  if (next > fits) next = fits;
  if (fits - next < growth * next) {
    const double reserve = room < left / 2 ? room : left / 2;
    closing = true;
    closing_end = limit - reserve;
    next = fits;
  }
  length = next;
  return true;
}

// Time-filling annealing (see the rule at the top of this header). `budget` has its start
// stamped (solve_auto's entry): everything below counts against its limit.
template <class Model>
Solution<typename Model::energy_type> auto_fill_anneal(const Model& model, std::uint64_t seed, std::uint64_t restart,
                                                       const Budget& budget, std::uint64_t growth = auto_fill_growth,
                                                       SiteOrder order = SiteOrder::sequential,
                                                       Acceptance acceptance = Acceptance::metropolis) {
  using energy_type = typename Model::energy_type;
  const Budget whole = budget.stamped();
  const Clock clock = whole.clock;
  const double t0 = whole.start;
  const std::uint64_t first = auto_fill_first_sweeps;
  AnnealParams params;
  params.sweeps = first;
  params.order = order;
  params.acceptance = acceptance;
  Annealer<Model> annealer(model, params, seed, restart);
  // The descender (its workspace costs about half the annealer's) is built at the first descent,
  // once an anneal has ended, and only when the time left then exceeds what the annealer took
  // to build: a limit that the set-up and the first anneal fill has no descent.
  DescentParams descent_params;
  descent_params.rule = DescentRule::steepest;
  descent_params.initial = annealer.best().spins;
  std::optional<Descender<Model>> descender;
  const double built = clock.read() - t0;
  // Descents run to a local minimum within what is left of the whole budget (its deadline,
  // stop token and target), so the closing polish never outlasts the limit.
  Budget descent_budget = whole;
  descent_budget.sweeps = 0;

  const std::size_t n = model.num_spins();
  Solution<energy_type> out;
  out.spins.assign(n, 1);
  out.restart = restart;
  bool have = false;
  std::uint64_t anneal_sweeps = 0;
  std::uint64_t length = first;
  bool closing = false;        // the next anneal is the last: it follows the clock
  double closing_end = 0;      // where the closing anneal's schedule ends cold (seconds from t0)
  double polish_seconds = 0;   // the longest descent so far: the room the closing anneal leaves
  StopReason why = StopReason::deadline;
  NoObserver none;
  // Adds a descent's counters and keeps its state when it is the best so far.
  auto keep = [&](const Descender<Model>& d) {
    out.sweeps += d.passes();
    out.attempted += d.attempted();
    out.accepted += d.accepted();
    if (!have || d.energy() < out.energy) {
      std::memcpy(out.spins.data(), d.state().spins(), n);
      out.energy = d.energy();
      have = true;
    }
  };
  for (std::uint64_t k = 0;; ++k) {
    if (k > 0) annealer.reset(auto_fill_seed(seed, k), restart);
    Budget run = whole;
    run.sweeps = length;
    if (closing) {
      // Time-driven: no sweep count, the schedule's position is the elapsed fraction of the
      // time up to closing_end, so the anneal reaches its cold end just before the polish.
      run.sweeps = unlimited_sweeps;
      run.seconds = closing_end;
    }
    const StopReason r = annealer.advance(run, none);
    anneal_sweeps += annealer.sweeps_done();
    out.sweeps += annealer.sweeps_done();
    out.attempted += annealer.attempted();
    out.accepted += annealer.accepted();
    const auto best = annealer.best();
    if (r != StopReason::stopped && !descender && (!whole.timed() || whole.remaining() > built)) {
      descender.emplace(model, descent_params, seed, restart);
    }
    if (r != StopReason::stopped && descender && whole.remaining() > 0) {
      // A finished schedule ends cold, and so does one the deadline cut (its position follows
      // the elapsed time): steepest descent takes a few moves; first improvement when cut
      // (cheaper per move; this happens once at most: the deadline ends the sequence).
      descender->set_rule(r == StopReason::deadline ? DescentRule::first_improvement : DescentRule::steepest);
      if (annealer.state().energy() == best.energy) {
        descender->warm_start(annealer.state(), seed, restart);  // the current state is the best: no rescan
      } else {
        descender->warm_start(best.spins, seed, restart);
      }
      const double before = clock.read();
      descender->advance(descent_budget, none);
      const double took = clock.read() - before;
      if (took > polish_seconds) polish_seconds = took;
      keep(*descender);
    } else if (!have || best.energy < out.energy) {
      std::memcpy(out.spins.data(), best.spins, n);
      out.energy = best.energy;
      have = true;
    }
    if (whole.has_target && static_cast<double>(out.energy) <= whole.target) {
      why = StopReason::target_reached;
      break;
    }
    if (r == StopReason::stopped || (whole.stop != nullptr && whole.stop->stop_requested())) {
      why = StopReason::stopped;
      break;
    }
    if (r == StopReason::deadline || closing) break;
    // The closing anneal leaves room for twice the longest descent.
    if (!auto_fill_next_run(whole.seconds, clock.read() - t0, anneal_sweeps, growth, 2 * polish_seconds, length,
                            closing, closing_end))
      break;
  }
  // Integer models track energies exactly; floating ones recompute from the model (no drift).
  if constexpr (!std::is_integral_v<energy_type>) out.energy = model.energy(out.spins.data());
  out.seconds = clock.read() - t0;
  out.reason = why;
  return out;
}

// The two group kernels of the time-filling mode behind one surface: restart k of the group
// (0 .. count() - 1), its best energy, whether a descent from its best could move, its best spins.
// Group `restart` of run k covers the kernel's restarts restart * count() ... of seed k.
template <class Model>
class AutoLaneGroup {
 public:
  using energy_type = typename Model::energy_type;
  static constexpr std::size_t width = default_lane_width;
  AutoLaneGroup(const Model& model, const AnnealParams& params, std::uint64_t seed, std::uint64_t restart)
      : kernel_(model, params, seed, restart * width) {}
  void reset(std::uint64_t seed, std::uint64_t restart) { kernel_.reset(seed, restart * width); }
  LaneAnnealer<Model>& kernel() noexcept { return kernel_; }
  static constexpr std::size_t count() noexcept { return width; }
  std::uint64_t attempted() const noexcept { return kernel_.sweeps_done() * kernel_.size() * width; }
  std::uint64_t accepted() const noexcept {
    std::uint64_t a = 0;
    for (std::size_t l = 0; l < width; ++l) a += kernel_.accepted(l);
    return a;
  }
  void prepare() noexcept {}
  energy_type energy(std::size_t l) const noexcept { return kernel_.best(l).energy; }
  bool may_improve(std::size_t) const noexcept { return true; }
  const std::int8_t* spins(std::size_t l) const noexcept { return kernel_.best(l).spins; }

 private:
  LaneAnnealer<Model> kernel_;
};

template <class Model>
class AutoBitGroup {
 public:
  using energy_type = typename Model::energy_type;
  AutoBitGroup(const Model& model, const AnnealParams& params, std::uint64_t seed, std::uint64_t restart)
      : kernel_(model, bit_params(params), seed, restart), spins_(model.num_spins(), 1) {}
  void reset(std::uint64_t seed, std::uint64_t restart) { kernel_.reset(seed, restart); }
  BitSlicedAnnealer<Model>& kernel() noexcept { return kernel_; }
  static constexpr std::size_t count() noexcept { return BitSlicedAnnealer<Model>::restarts_per_group; }
  std::uint64_t attempted() const noexcept { return kernel_.attempted(); }
  std::uint64_t accepted() const noexcept { return kernel_.accepted(); }
  // The restarts whose best state is not a local minimum of single flips (one pass for all 64).
  void prepare() noexcept { improvable_ = kernel_.improvable_best(0); }
  energy_type energy(std::size_t k) const noexcept { return kernel_.best_energy(k); }
  bool may_improve(std::size_t k) const noexcept { return ((improvable_ >> k) & 1u) != 0; }
  const std::int8_t* spins(std::size_t k) {
    kernel_.best_spins(k, spins_.data());
    return spins_.data();
  }

 private:
  static BitSlicedParams bit_params(const AnnealParams& params) {
    BitSlicedParams b;
    b.sweeps = params.sweeps;
    return b;
  }
  BitSlicedAnnealer<Model> kernel_;
  std::vector<std::int8_t> spins_;
  std::uint64_t improvable_ = 0;
};

// Time-filling annealing with groups of restarts (docs/kernels.md, "The automatic choice"): the
// growing sequence of auto_fill_anneal, each run a group of count() restarts in lockstep, every
// restart of a group polished by steepest descent (restarts whose best is already a local
// minimum, where the kernel can tell, are taken as they are).
template <class Group, class Model>
Solution<typename Model::energy_type> auto_fill_groups(const Model& model, std::uint64_t seed, std::uint64_t restart,
                                                       const Budget& budget, Acceptance acceptance) {
  using energy_type = typename Model::energy_type;
  const Budget whole = budget.stamped();
  const Clock clock = whole.clock;
  const double t0 = whole.start;
  AnnealParams params;
  params.sweeps = auto_fill_first_sweeps;
  params.order = SiteOrder::sequential;
  params.acceptance = acceptance;
  Group group(model, params, seed, restart);
  DescentParams descent_params;
  descent_params.rule = DescentRule::steepest;
  std::optional<Descender<Model>> descender;
  Budget descent_budget = whole;
  descent_budget.sweeps = 0;

  const std::size_t n = model.num_spins();
  Solution<energy_type> out;
  out.spins.assign(n, 1);
  out.restart = restart;
  bool have = false;
  std::uint64_t group_sweeps = 0;
  std::uint64_t length = auto_fill_first_sweeps;
  bool closing = false;
  double closing_end = 0;
  double polish_seconds = 0;  // the longest polish of a group so far
  StopReason why = StopReason::deadline;
  NoObserver none;
  auto take = [&](energy_type e, const std::int8_t* spins) {
    if (have && !(e < out.energy)) return;
    std::memcpy(out.spins.data(), spins, n);
    out.energy = e;
    have = true;
  };
  for (std::uint64_t k = 0;; ++k) {
    if (k > 0) group.reset(auto_fill_seed(seed, k), restart);
    Budget run = whole;
    run.sweeps = length;
    if (closing) {
      run.sweeps = unlimited_sweeps;
      run.seconds = closing_end;
    }
    const StopReason r = group.kernel().advance(run, none);
    const std::uint64_t done = group.kernel().sweeps_done();
    group_sweeps += done;
    out.sweeps += done * group.count();
    out.attempted += group.attempted();
    out.accepted += group.accepted();
    const double before = clock.read();
    group.prepare();
    // Lowest annealed energy first: a polish the deadline cuts short has done the likeliest best.
    energy_type energies[Group::count()];
    std::uint8_t order[Group::count()];
    for (std::size_t i = 0; i < group.count(); ++i) {
      energies[i] = group.energy(i);
      order[i] = static_cast<std::uint8_t>(i);
    }
    std::stable_sort(order, order + group.count(),
                     [&energies](std::uint8_t a, std::uint8_t b) { return energies[a] < energies[b]; });
    for (const std::uint8_t i : order) {
      const energy_type e = energies[i];
      if (r == StopReason::stopped || !group.may_improve(i) || whole.remaining() <= 0) {
        if (!have || e < out.energy) take(e, group.spins(i));
        continue;
      }
      if (!descender) {
        descent_params.initial = group.spins(i);
        descender.emplace(model, descent_params, seed, restart);
      } else {
        descender->warm_start(group.spins(i), seed, restart);
      }
      // A group the deadline cut ends near its cold end (the schedule follows the elapsed
      // time): first improvement then, cheaper per move.
      descender->set_rule(r == StopReason::deadline ? DescentRule::first_improvement : DescentRule::steepest);
      descender->advance(descent_budget, none);
      out.sweeps += descender->passes();
      out.attempted += descender->attempted();
      out.accepted += descender->accepted();
      take(descender->energy(), descender->state().spins());
    }
    const double took = clock.read() - before;
    if (took > polish_seconds) polish_seconds = took;
    if (whole.has_target && static_cast<double>(out.energy) <= whole.target) {
      why = StopReason::target_reached;
      break;
    }
    if (r == StopReason::stopped || (whole.stop != nullptr && whole.stop->stop_requested())) {
      why = StopReason::stopped;
      break;
    }
    if (r == StopReason::deadline || closing) break;
    // The closing group ends cold where the longest polish so far still fits (a polish the
    // deadline cuts has done the lowest restarts first).
    if (!auto_fill_next_run(whole.seconds, clock.read() - t0, group_sweeps, auto_fill_growth, polish_seconds, length,
                            closing, closing_end))
      break;
  }
  if constexpr (!std::is_integral_v<energy_type>) out.energy = model.energy(out.spins.data());
  out.seconds = clock.read() - t0;
  out.reason = why;
  return out;
}

// Time-filling tempering (see the rule at the top of this header).
template <class Model>
Solution<typename Model::energy_type> auto_fill_temper(const Model& model, std::uint64_t seed, std::uint64_t restart,
                                                       const Budget& budget) {
  using energy_type = typename Model::energy_type;
  TemperParams params;
  const BetaSpan range = estimate_beta_span(model);
  params.ladder.beta_min = auto_fill_hot_factor * range.beta_start;
  params.ladder.beta_max = range.beta_end;
  if (params.ladder.beta_max < params.ladder.beta_min) params.ladder.beta_max = params.ladder.beta_min;
  params.ladder.temperatures = auto_fill_rungs(model.num_spins(), budget.seconds);
  params.houdayer = true;
  params.order = SiteOrder::sequential;
  Budget run = budget.stamped();
  run.sweeps = std::numeric_limits<std::uint64_t>::max();
  Solution<energy_type> s = static_cast<Solution<energy_type>>(temper(model, params, seed, restart, run));
  if (s.reason == StopReason::stopped) return s;
  Budget rest = run;  // the polish within what is left of the limit
  rest.sweeps = 0;
  return polish(model, s, DescentRule::steepest, rest);
}

}  // namespace detail

// One restart of the automatically chosen kernel. Restart r depends on (seed, r) only (and, in
// the time-filling mode, on the clock readings). See the two modes at the top of this header.
template <class Model>
Solution<typename Model::energy_type> solve_auto(const Model& model, std::uint64_t seed, std::uint64_t restart = 0,
                                                 const Budget& given = Budget{}) {
  using energy_type = typename Model::energy_type;
  const Budget budget = given.stamped();  // a time limit bounds the whole call (Budget::start)
  const AutoChoice choice = choose_kernel(model);
  const bool fill = auto_fills_time(budget);
  switch (choice.kernel) {
    case KernelKind::exact: {
      ExactParams params;
      params.max_spins = auto_exact_max_spins;
      auto exact = solve_exact(model, params);
      SPINWRIGHT_ASSERT(exact.ok(), "exact enumeration within its limit cannot fail");
      Solution<energy_type> s;
      s.spins = std::move(exact.value().spins);
      s.energy = exact.value().energy;
      s.attempted = exact.value().states;
      s.restart = restart;
      s.reason = StopReason::budget_exhausted;
      return s;
    }
    case KernelKind::breakout: {
      BreakoutParams params;
      params.sweeps = choice.sweeps;
      if (!fill) return breakout(model, params, seed, restart, budget);
      Budget run = budget;
      run.sweeps = unlimited_sweeps;
      return breakout(model, params, seed, restart, run);
    }
    default: {
      if (fill) {
        if (auto_fill_kernel(model, budget.seconds) == KernelKind::temper)
          return detail::auto_fill_temper(model, seed, restart, budget);
        const Acceptance acceptance = auto_fill_acceptance(model);
        if constexpr (!Model::is_dense) {
          const AutoFillGroup group = auto_fill_group_for(model, budget.seconds);
          if constexpr (Model::form == Form::ising) {
            if (group == AutoFillGroup::bit_sliced)
              return detail::auto_fill_groups<detail::AutoBitGroup<Model>>(model, seed, restart, budget, acceptance);
          }
          if (group == AutoFillGroup::lanes)
            return detail::auto_fill_groups<detail::AutoLaneGroup<Model>>(model, seed, restart, budget, acceptance);
        }
        return detail::auto_fill_anneal(model, seed, restart, budget, auto_fill_growth, SiteOrder::sequential,
                                        acceptance);
      }
      AnnealParams params;
      params.sweeps = choice.sweeps;
      Solution<energy_type> annealed = anneal(model, params, seed, restart, budget);
      if (annealed.reason == StopReason::stopped || annealed.reason == StopReason::deadline) return annealed;
      // polish() adds its own counters to the annealer's and keeps its stop reason; it ends
      // at the deadline of a timed budget.
      Budget rest = budget;
      rest.sweeps = 0;
      return polish(model, annealed, DescentRule::steepest, rest);
    }
  }
}

#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_AUTO_HPP
