// spinwright — the incremental state of a run: spins, local fields and the current energy.
// Spins are +1/-1 for both forms (QUBO x = (1 - s) / 2); delta(i) is O(1), flip(i) O(degree).
// The state keeps a pointer to its model: the model must outlive it. Formulas, drift of
// floating fields and in-place edits: docs/models.md ("The incremental state").
#ifndef SPINWRIGHT_STATE_SPIN_STATE_HPP
#define SPINWRIGHT_STATE_SPIN_STATE_HPP

#include "../config.hpp"
#include "../detail/buffer.hpp"
#include "../model/form.hpp"
#include "../status.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t
#include <type_traits>  // std::is_integral_v

namespace spinwright {

// What check() found: the largest absolute error of a local field and of the energy.
struct StateCheck {
  bool exact = true;  // every tracked number equals its recomputed value
  double max_field_error = 0;
  double energy_error = 0;
};

namespace detail {
struct StateAccess;  // kernels/detail/flip_loop.hpp: a sweep's raw view of the state
}

// Tag for the constructors that allocate without computing fields or energy: the owner must
// call randomize(), set_spins() or assign() before any other use (a kernel whose constructor
// starts a run at once, so a random start scans the model once instead of twice).
struct DeferredStart {};

template <class Model>
class SpinState {
 public:
  using model_type = Model;
  using value_type = typename Model::value_type;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  static constexpr Form form = Model::form;

  // A state keeps a pointer to its model: building one over a temporary is refused.
  explicit SpinState(const Model&&) = delete;
  SpinState(const Model&&, Arena&) = delete;

#if !SPINWRIGHT_NO_HEAP
  // All spins +1; the three arrays are allocated on the heap, once.
  explicit SpinState(const Model& model)
      : model_(&model), spins_(model.num_spins(), 1), fields_(model.num_spins()), mark_(model.num_spins(), 0) {
    resync();
  }

  // Allocated, spins +1, fields and energy not computed (see DeferredStart).
  SpinState(const Model& model, DeferredStart)
      : model_(&model), spins_(model.num_spins(), 1), fields_(model.num_spins()), mark_(model.num_spins(), 0) {}
  SpinState(const Model&&, DeferredStart) = delete;
#endif

  // All spins +1; the arrays are carved from a caller-supplied arena (no heap). Check valid():
  // false when the arena had less than bytes_needed(N) left.
  SpinState(const Model& model, Arena& arena)
      : model_(&model),
        spins_(model.num_spins(), arena, 1),
        fields_(model.num_spins(), arena),
        mark_(model.num_spins(), arena, 0) {
    if (valid()) resync();
  }

  // The same from an arena, fields and energy not computed (see DeferredStart).
  SpinState(const Model& model, Arena& arena, DeferredStart)
      : model_(&model),
        spins_(model.num_spins(), arena, 1),
        fields_(model.num_spins(), arena),
        mark_(model.num_spins(), arena, 0) {}
  SpinState(const Model&&, Arena&, DeferredStart) = delete;

  // Arena bytes a state over n spins needs.
  static constexpr std::size_t bytes_needed(std::size_t n) noexcept {
    return 2 * arena_bytes<std::int8_t>(n) + arena_bytes<energy_type>(n);
  }

  bool valid() const noexcept { return spins_.valid() && fields_.valid() && mark_.valid(); }

  const Model& model() const noexcept { return *model_; }
  std::size_t size() const noexcept { return spins_.size(); }
  const std::int8_t* spins() const noexcept { return spins_.data(); }
  std::int8_t spin(index_type i) const noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size(), "spin index beyond the state's model (spin)");
    return spins_[i];
  }
  energy_type energy() const noexcept { return energy_; }
  energy_type local_field(index_type i) const noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size(), "spin index beyond the state's model (local_field)");
    return fields_[i];
  }
  const energy_type* local_fields() const noexcept { return fields_.data(); }

  // Replace every spin (values must be +1 or -1) and recompute fields and energy.
  void set_spins(const std::int8_t* spins) {
    for (std::size_t i = 0; i < spins_.size(); ++i) {
      SPINWRIGHT_ASSERT(spins[i] == 1 || spins[i] == -1, "spins are +1 or -1");
      spins_[i] = spins[i] > 0 ? 1 : -1;
    }
    resync();
  }

  // Copy another state over the same model: spins, local fields and energy, O(N), with no
  // rescan of the model (the warm start of a reused kernel from a caller's exact state). The
  // other state must be exact for the model as it is now: in-place edits made through
  // edit_site_term / edit_pair / edit_offset on it keep it so.
  void assign(const SpinState& other) noexcept {
    SPINWRIGHT_ASSERT(other.model_ == model_, "assign: the state belongs to another model");
    SPINWRIGHT_ASSERT(other.size() == size(), "assign: the states differ in size");
    if (&other == this) return;
    const std::size_t n = spins_.size();
    for (std::size_t i = 0; i < n; ++i) spins_[i] = other.spins_[i];
    for (std::size_t i = 0; i < n; ++i) fields_[i] = other.fields_[i];
    energy_ = other.energy_;
  }

  // Independent fair coins for every spin, then a resync.
  template <class Rng>
  void randomize(Rng& rng) {
    for (auto& s : spins_) s = rng.coin() ? 1 : -1;
    resync();
  }

  SPINWRIGHT_HOT_INLINE energy_type delta(index_type i) const noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size(), "spin index beyond the state's model (delta)");
    if constexpr (form == Form::ising) {
      return -2 * spins_[i] * fields_[i];
    } else {
      return spins_[i] * fields_[i];
    }
  }

  void flip(index_type i) noexcept { flip_with_delta(i, delta(i)); }

  // Flip when the caller has already computed delta(i).
  SPINWRIGHT_HOT_INLINE void flip_with_delta(index_type i, energy_type d) noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size(), "spin index beyond the state's model (flip)");
    energy_ += d;
    const std::int8_t old = spins_[i];
    spins_[i] = static_cast<std::int8_t>(-old);
    energy_type* f = fields_.data();
    if constexpr (form == Form::ising) {
      const energy_type twice_new = -2 * old;
      model_->for_each_neighbour(
          i, [f, twice_new](index_type j, value_type v) { f[j] += twice_new * static_cast<energy_type>(v); });
    } else {
      // x_i changes by +1 when the old spin was +1 and by -1 otherwise.
      const energy_type dx = old;
      model_->for_each_neighbour(i, [f, dx](index_type j, value_type v) { f[j] += dx * static_cast<energy_type>(v); });
    }
  }

  // Energy change of flipping every spin of a set at once (indices distinct); pairs inside
  // the set are counted once, correctly. O(sum of degrees).
  energy_type delta_group(const index_type* group, std::size_t count) const noexcept {
    energy_type d = 0;
    for (std::size_t k = 0; k < count; ++k) {
      SPINWRIGHT_ASSERT(group[k] < spins_.size(), "spin index beyond the state's model (delta_group)");
      SPINWRIGHT_ASSERT(mark_[group[k]] == 0, "group indices must be distinct");
      mark_[group[k]] = 1;
      d += delta(group[k]);
    }
    // Sum over inside pairs (each seen from both ends, so halve by visiting j > i only).
    energy_type inside = 0;
    for (std::size_t k = 0; k < count; ++k) {
      const index_type i = group[k];
      model_->for_each_neighbour(i, [&](index_type j, value_type v) {
        if (j > i && mark_[j]) inside += static_cast<energy_type>(v) * spins_[i] * spins_[j];
      });
    }
    for (std::size_t k = 0; k < count; ++k) mark_[group[k]] = 0;
    // Ising: the single deltas changed each inside J s_i s_j by -2 twice, the truth is 0.
    // QUBO: the single deltas miss the product term Q_ij dx_i dx_j = Q_ij s_i s_j.
    if constexpr (form == Form::ising) {
      return d + 4 * inside;
    } else {
      return d + inside;
    }
  }

  void flip_group(const index_type* group, std::size_t count) noexcept {
    for (std::size_t k = 0; k < count; ++k) flip(group[k]);
  }

  // Energy change of exchanging two opposite spins (i.e. flipping both). O(log degree).
  energy_type delta_swap(index_type i, index_type j) const noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size() && j < spins_.size(), "spin index beyond the state's model (delta_swap)");
    SPINWRIGHT_ASSERT(spins_[i] != spins_[j], "a count-keeping swap needs two opposite spins");
    const auto v = static_cast<energy_type>(model_->pair(i, j));
    const energy_type inside = v * spins_[i] * spins_[j];
    if constexpr (form == Form::ising) {
      return delta(i) + delta(j) + 4 * inside;
    } else {
      return delta(i) + delta(j) + inside;
    }
  }

  void apply_swap(index_type i, index_type j) noexcept {
    SPINWRIGHT_ASSERT(i != j, "a count-keeping swap needs two distinct spins");
    flip(i);
    flip(j);
  }

  // Recompute every local field and the energy from the model. Integer models take the
  // energy from the fields (exact, O(N), no second pass over the pairs); floating models
  // from the model, so their energy carries no rounding of the field sums.
  void resync() noexcept {
    const std::size_t n = spins_.size();
    for (std::size_t i = 0; i < n; ++i) fields_[i] = recompute_field(static_cast<index_type>(i));
    if constexpr (std::is_integral_v<energy_type>) {
      energy_ = energy_from_fields();
    } else {
      energy_ = model_->energy(spins_.data());
    }
  }

  // Compare the tracked fields and energy with values recomputed from the model.
  StateCheck check() const noexcept {
    StateCheck c;
    for (std::size_t i = 0; i < spins_.size(); ++i) {
      const energy_type truth = recompute_field(static_cast<index_type>(i));
      const double err = abs_difference(fields_[i], truth);
      if (fields_[i] != truth) c.exact = false;
      if (err > c.max_field_error) c.max_field_error = err;
    }
    const energy_type e = model_->energy(spins_.data());
    if (e != energy_) c.exact = false;
    c.energy_error = abs_difference(energy_, e);
    return c;
  }

  // Low-level hooks for in-place coefficient edits, called by edit_site_term / edit_pair /
  // edit_offset after the model holds the new value; `change` is new minus old.
  // Integer models update in O(1) and stay exact. Floating models recompute the touched local
  // fields from the model (O(degree)) and the energy from the fields (O(N)): an incremental
  // update would keep the rounding of a removed dominant term (a coefficient 10^17 times the
  // others leaves its rounding in the sums after it is edited away).
  void on_site_term_change(index_type i, energy_type change) noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size(), "spin index beyond the state's model (site term edit)");
    if constexpr (std::is_integral_v<energy_type>) {
      fields_[i] += change;
      if constexpr (form == Form::ising) {
        energy_ += change * spins_[i];
      } else {
        if (spins_[i] < 0) energy_ += change;
      }
    } else {
      fields_[i] = recompute_field(i);
      energy_ = energy_from_fields();
    }
  }
  void on_pair_change(index_type i, index_type j, energy_type change) noexcept {
    SPINWRIGHT_ASSERT(i < spins_.size() && j < spins_.size(), "spin index beyond the state's model (pair edit)");
    if constexpr (std::is_integral_v<energy_type>) {
      if constexpr (form == Form::ising) {
        fields_[i] += change * spins_[j];
        fields_[j] += change * spins_[i];
        energy_ += change * spins_[i] * spins_[j];
      } else {
        const bool xi = spins_[i] < 0;
        const bool xj = spins_[j] < 0;
        if (xj) fields_[i] += change;
        if (xi) fields_[j] += change;
        if (xi && xj) energy_ += change;
      }
    } else {
      fields_[i] = recompute_field(i);
      fields_[j] = recompute_field(j);
      energy_ = energy_from_fields();
    }
  }
  void on_offset_change(energy_type change) noexcept {
    if constexpr (std::is_integral_v<energy_type>) {
      energy_ += change;
    } else {
      energy_ = energy_from_fields();
    }
  }

 private:
  friend struct detail::StateAccess;

  energy_type recompute_field(index_type i) const noexcept {
    auto f = static_cast<energy_type>(model_->site_term(i));
    if constexpr (form == Form::ising) {
      model_->for_each_neighbour(i, [&](index_type j, value_type v) {
        if (j != i) f += static_cast<energy_type>(v) * spins_[j];
      });
    } else {
      model_->for_each_neighbour(i, [&](index_type j, value_type v) {
        if (j != i && spins_[j] < 0) f += static_cast<energy_type>(v);
      });
    }
    return f;
  }

  // Ising: sum_i s_i f_i = sum_i s_i h_i + 2 sum_{i<j} J_ij s_i s_j, so
  //   E = c + (sum_i s_i h_i + sum_i s_i f_i) / 2.
  // QUBO: sum_i x_i g_i = sum_i Q_ii x_i + 2 sum_{i<j} Q_ij x_i x_j, so
  //   E = c + (sum_i x_i Q_ii + sum_i x_i g_i) / 2.
  energy_type energy_from_fields() const noexcept {
    energy_type twice = 0;
    for (std::size_t i = 0; i < spins_.size(); ++i) {
      const auto ii = static_cast<index_type>(i);
      const auto h = static_cast<energy_type>(model_->site_term(ii));
      if constexpr (form == Form::ising) {
        twice += spins_[i] * (h + fields_[i]);
      } else {
        if (spins_[i] < 0) twice += h + fields_[i];
      }
    }
    return static_cast<energy_type>(model_->offset()) + twice / 2;
  }

  static double abs_difference(energy_type a, energy_type b) noexcept {
    const double d = static_cast<double>(a) - static_cast<double>(b);
    return d < 0 ? -d : d;
  }

  const Model* model_;
  detail::Buffer<std::int8_t> spins_;
  detail::Buffer<energy_type> fields_;
  mutable detail::Buffer<std::int8_t> mark_;  // scratch for delta_group, always all zero between calls
  energy_type energy_{0};
};

// In-place coefficient edits that keep a state exact. The model must be the state's model.
template <class Model>
Status edit_site_term(Model& model, SpinState<Model>& state, typename Model::index_type i,
                      typename Model::value_type v) {
  SPINWRIGHT_ASSERT(&state.model() == &model, "the state belongs to another model");
  if (i >= model.num_spins()) return model.set_site_term(i, v);
  const auto old = static_cast<typename Model::energy_type>(model.site_term(i));
  const Status st = model.set_site_term(i, v);
  if (!st) return st;
  state.on_site_term_change(i, static_cast<typename Model::energy_type>(v) - old);
  return st;
}

template <class Model>
Status edit_pair(Model& model, SpinState<Model>& state, typename Model::index_type i, typename Model::index_type j,
                 typename Model::value_type v) {
  SPINWRIGHT_ASSERT(&state.model() == &model, "the state belongs to another model");
  if (i >= model.num_spins() || j >= model.num_spins()) return model.set_pair(i, j, v);
  const auto old = static_cast<typename Model::energy_type>(model.pair(i, j));
  const Status st = model.set_pair(i, j, v);
  if (!st) return st;
  state.on_pair_change(i, j, static_cast<typename Model::energy_type>(v) - old);
  return st;
}

template <class Model>
Status edit_offset(Model& model, SpinState<Model>& state, typename Model::energy_type c) {
  SPINWRIGHT_ASSERT(&state.model() == &model, "the state belongs to another model");
  const auto old = model.offset();
  const Status st = model.set_offset(c);
  if (!st) return st;
  state.on_offset_change(c - old);
  return st;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_STATE_SPIN_STATE_HPP
