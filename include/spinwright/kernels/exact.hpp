// spinwright — exact enumeration of every spin assignment in Gray-code order: ground energy,
// the ground state of lowest canonical index, the number of ground states and optionally the k
// lowest levels; a fixed chunking so threads give bit-identical answers, the flip-symmetry
// shortcut, the floating-level tolerance and the size limits are in docs/kernels.md.
#ifndef SPINWRIGHT_KERNELS_EXACT_HPP
#define SPINWRIGHT_KERNELS_EXACT_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../model/form.hpp"
#include "../state/spin_state.hpp"
#include "../status.hpp"
#include "solution.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t, std::uint8_t
#include <type_traits>  // std::is_integral_v
#include <vector>       // std::vector (results and per-chunk workspace)

namespace spinwright {

/// The largest model exact enumeration ever accepts (2^40 states, hours of work).
inline constexpr std::size_t exact_hard_limit = 40;
/// The default limit (2^30 states, seconds to a minute on one core for sparse models).
inline constexpr std::size_t exact_default_limit = 30;

struct ExactParams {
  std::size_t max_spins = exact_default_limit;  // refuse larger models (capped at exact_hard_limit)
  std::size_t levels = 1;                       // how many lowest distinct energy levels to keep (>= 1)
  double tolerance = 1e-9;                      // floating models: relative level tolerance
  bool flip_symmetry = true;                    // halve the work on field-free Ising models
  unsigned chunk_bits = 6;                      // the work is cut into 2^chunk_bits chunks (fewer when N is small)
  const StopToken* stop = nullptr;              // polled every 2^16 states (StatusCode::stopped)
};

inline constexpr unsigned exact_stop_poll_bits = 16;

/// One energy level: its energy, the number of assignments on it, and the lowest canonical
/// index among them.
template <class Energy>
struct ExactLevel {
  Energy energy{};
  std::uint64_t count = 0;
  std::uint64_t first_index = 0;
};

// Exact enumeration returns its answer in std::vectors: with SPINWRIGHT_NO_HEAP it is not
// declared (docs/embedding.md).
#if !SPINWRIGHT_NO_HEAP

template <class Energy>
struct ExactResult {
  Energy energy{};                         // ground energy (recomputed from the model for the reported state)
  std::vector<std::int8_t> spins;          // the ground state with the lowest canonical index
  std::uint64_t ground_states = 0;         // number of ground-state assignments
  std::vector<ExactLevel<Energy>> levels;  // the lowest distinct levels, increasing energy
  std::uint64_t states = 0;                // assignments visited (2^N, or 2^(N-1) with the symmetry)
  bool used_flip_symmetry = false;

  /// Bits of the ground state, x = (1 - s) / 2.
  std::vector<std::uint8_t> bits() const {
    std::vector<std::uint8_t> b(spins.size());
    for (std::size_t i = 0; i < spins.size(); ++i) b[i] = spins[i] < 0 ? 1 : 0;
    return b;
  }

  /// The ground state as a Solution (attempted = assignments visited), e.g. for a Tally.
  Solution<Energy> solution() const {
    Solution<Energy> s;
    s.spins = spins;
    s.energy = energy;
    s.attempted = states;
    return s;
  }
};

namespace detail {

inline unsigned trailing_zeros(std::uint64_t v) noexcept {
#if defined(__GNUC__) || defined(__clang__)
  return static_cast<unsigned>(__builtin_ctzll(v));
#else
  unsigned k = 0;
  while ((v & 1) == 0) {
    v >>= 1;
    ++k;
  }
  return k;
#endif
}

// The k lowest distinct energies seen so far, with counts and lowest canonical index.
// offer() is O(1) for an energy above the k-th level (the common case once the levels are
// filled) and O(k) otherwise. Storage is reserved at construction: offer() never allocates.
template <class Energy>
class LevelKeeper {
 public:
  LevelKeeper() = default;
  LevelKeeper(std::size_t k, Energy tolerance) : k_(k == 0 ? 1 : k), tol_(tolerance) { levels_.reserve(k_ + 1); }

  void offer(Energy e, std::uint64_t index, std::uint64_t count = 1) {
    if (levels_.size() == k_ && e > cutoff_) return;
    std::size_t j = 0;
    while (j < levels_.size() && levels_[j].energy + tol_ < e) ++j;
    if (j < levels_.size() && !(e + tol_ < levels_[j].energy)) {
      ExactLevel<Energy>& l = levels_[j];
      l.count += count;
      if (index < l.first_index) l.first_index = index;
      if (e < l.energy) l.energy = e;
    } else {
      levels_.insert(levels_.begin() + static_cast<std::ptrdiff_t>(j), ExactLevel<Energy>{e, count, index});
      if (levels_.size() > k_) levels_.pop_back();
    }
    cutoff_ = levels_.back().energy + tol_;
  }

  void merge(const LevelKeeper& other) {
    for (const auto& l : other.levels_) offer(l.energy, l.first_index, l.count);
  }

  const std::vector<ExactLevel<Energy>>& levels() const noexcept { return levels_; }

 private:
  std::size_t k_ = 1;
  Energy tol_{};
  Energy cutoff_{};
  std::vector<ExactLevel<Energy>> levels_;
};

// How the 2^N states are cut: `low_bits` enumerated in Gray order inside each of `chunks`
// chunks; with the symmetry, spin N-1 stays +1.
struct ExactPlan {
  std::size_t n = 0;
  bool symmetric = false;
  unsigned low_bits = 0;
  std::uint64_t chunks = 1;
};

template <class Model>
Result<ExactPlan> exact_plan(const Model& model, const ExactParams& params) {
  const std::size_t n = model.num_spins();
  if (n > exact_hard_limit) {
    return Status::error(StatusCode::size_limit, "exact enumeration is limited to 40 spins (exact_hard_limit)");
  }
  if (n > params.max_spins) {
    return Status::error(StatusCode::size_limit,
                         "model has more spins than ExactParams::max_spins (default 30, at most 40)");
  }
  if (params.levels == 0) {
    return Status::error(StatusCode::invalid_argument, "ExactParams::levels must be at least 1");
  }
  if (!(params.tolerance >= 0)) {
    return Status::error(StatusCode::invalid_argument, "ExactParams::tolerance must be >= 0");
  }
  ExactPlan plan;
  plan.n = n;
  if constexpr (Model::form == Form::ising) {
    if (params.flip_symmetry && n > 0) {
      bool field_free = true;
      for (std::size_t i = 0; i < n; ++i) {
        field_free =
            field_free && model.site_term(static_cast<typename Model::index_type>(i)) == typename Model::value_type{0};
      }
      plan.symmetric = field_free;
    }
  }
  const auto free_bits = static_cast<unsigned>(plan.symmetric ? n - 1 : n);
  unsigned chunk_bits = params.chunk_bits > 16 ? 16 : params.chunk_bits;
  // Keep at least 4 low bits per chunk so tiny models are not cut into 1-state chunks.
  if (free_bits < chunk_bits + 4) chunk_bits = free_bits > 4 ? free_bits - 4 : 0;
  plan.low_bits = free_bits - chunk_bits;
  plan.chunks = std::uint64_t{1} << chunk_bits;
  return plan;
}

template <class Model>
typename Model::energy_type exact_tolerance(const Model& model, const ExactParams& params) {
  using energy_type = typename Model::energy_type;
  if constexpr (std::is_integral_v<energy_type>) {
    return 0;
  } else {
    const double bound = model.energy_bound();
    return params.tolerance * (bound > 1 ? bound : 1.0);
  }
}

// Enumerates chunk `c` of the plan into `keeper`. `state` and `buffer` are the caller's
// workspace (a state over `model` and n spins); nothing is allocated inside the loop.
// Returns false when `stop` was requested (polled every 2^exact_stop_poll_bits states).
template <class Model>
bool exact_chunk(const ExactPlan& plan, std::uint64_t c, SpinState<Model>& state, std::vector<std::int8_t>& buffer,
                 LevelKeeper<typename Model::energy_type>& keeper, const StopToken* stop = nullptr) {
  using index_type = typename Model::index_type;
  if (stop != nullptr && stop->stop_requested()) return false;
  const std::uint64_t base = c << plan.low_bits;
  for (std::size_t k = 0; k < plan.n; ++k) buffer[k] = ((base >> k) & 1) ? -1 : 1;
  state.set_spins(buffer.data());
  std::uint64_t index = base;
  keeper.offer(state.energy(), index);
  const std::uint64_t steps = std::uint64_t{1} << plan.low_bits;
  const std::uint64_t poll = (std::uint64_t{1} << exact_stop_poll_bits) - 1;
  for (std::uint64_t t = 1; t < steps; ++t) {
    const unsigned b = trailing_zeros(t);
    state.flip(static_cast<index_type>(b));
    index ^= std::uint64_t{1} << b;
    keeper.offer(state.energy(), index);
    if ((t & poll) == 0 && stop != nullptr && stop->stop_requested()) return false;
  }
  return true;
}

inline Status exact_stopped() noexcept {
  return Status::error(StatusCode::stopped, "exact enumeration stopped by its StopToken before it finished");
}

template <class Model>
ExactResult<typename Model::energy_type> exact_finish(const Model& model, const ExactPlan& plan,
                                                      const LevelKeeper<typename Model::energy_type>& keeper) {
  ExactResult<typename Model::energy_type> r;
  r.levels = keeper.levels();
  const std::uint64_t factor = plan.symmetric ? 2 : 1;
  for (auto& l : r.levels) l.count *= factor;
  r.used_flip_symmetry = plan.symmetric;
  r.states = plan.chunks << plan.low_bits;
  r.ground_states = r.levels.front().count;
  r.spins.resize(plan.n);
  for (std::size_t k = 0; k < plan.n; ++k) r.spins[k] = ((r.levels.front().first_index >> k) & 1) ? -1 : 1;
  r.energy = model.energy(r.spins.data());
  return r;
}

}  // namespace detail

/// Exact enumeration on the calling thread. Returns size_limit beyond the limits above,
/// invalid_argument for levels == 0 or a negative tolerance, stopped when params.stop ended it. Allocates O(N + levels)
/// at start. Model: any sparse or dense model (Ising or QUBO, every value type).
template <class Model>
Result<ExactResult<typename Model::energy_type>> solve_exact(const Model& model, const ExactParams& params = {}) {
  using energy_type = typename Model::energy_type;
  auto planned = detail::exact_plan(model, params);
  if (!planned) return planned.status();
  const detail::ExactPlan plan = planned.value();
  const energy_type tol = detail::exact_tolerance(model, params);
  detail::LevelKeeper<energy_type> total(params.levels, tol);
  detail::LevelKeeper<energy_type> chunk(params.levels, tol);
  SpinState<Model> state(model);
  std::vector<std::int8_t> buffer(plan.n, 1);
  for (std::uint64_t c = 0; c < plan.chunks; ++c) {
    chunk = detail::LevelKeeper<energy_type>(params.levels, tol);
    if (!detail::exact_chunk(plan, c, state, buffer, chunk, params.stop)) return detail::exact_stopped();
    total.merge(chunk);
  }
  return detail::exact_finish(model, plan, total);
}

#endif  // !SPINWRIGHT_NO_HEAP

}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_EXACT_HPP
