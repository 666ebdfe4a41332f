// spinwright — the flips of one sweep of the built-in single flip, with the state's arrays and
// the sparse model's rows held in locals. SpinState::flip_with_delta reaches them through the
// state and the model; every spin it writes is an int8_t store, which may alias anything, so
// the compiler reloads each pointer after it (a chain of four dependent loads before the
// first field update of the next flip). A FlipLoop copies the pointers once per sweep and
// keeps the energy in a local until finish(). Same arithmetic in the same order as
// flip_with_delta (floating energies round exactly as they did). No allocation.
#ifndef SPINWRIGHT_KERNELS_DETAIL_FLIP_LOOP_HPP
#define SPINWRIGHT_KERNELS_DETAIL_FLIP_LOOP_HPP

#include "../../config.hpp"
#include "../../model/form.hpp"
#include "../../state/spin_state.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t
#include <type_traits>  // std::false_type, std::true_type, std::void_t
#include <utility>      // std::declval

namespace spinwright {
namespace detail {

// A sweep's raw view of a state (SpinState befriends it).
struct StateAccess {
  template <class Model>
  static std::int8_t* spins(SpinState<Model>& s) noexcept {
    return s.spins_.data();
  }
  template <class Model>
  static typename Model::energy_type* fields(SpinState<Model>& s) noexcept {
    return s.fields_.data();
  }
  template <class Model>
  static void set_energy(SpinState<Model>& s, typename Model::energy_type e) noexcept {
    s.energy_ = e;
  }
};

// Models that expose their rows as arrays (SparseModelView and SparseModel).
template <class Model, class = void>
struct has_row_arrays : std::false_type {};
template <class Model>
struct has_row_arrays<Model, std::void_t<decltype(std::declval<const Model&>().row_start_data()),
                                         decltype(std::declval<const Model&>().neighbour_data()),
                                         decltype(std::declval<const Model&>().value_data())>> : std::true_type {};

// Any other model: the state's own flip.
template <class Model, bool Rows = has_row_arrays<Model>::value>
class FlipLoop {
 public:
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;

  explicit FlipLoop(SpinState<Model>& state) noexcept : state_(&state) {}
  SPINWRIGHT_HOT_INLINE void flip(index_type i, energy_type d) noexcept { state_->flip_with_delta(i, d); }
  void finish() noexcept {}

 private:
  SpinState<Model>* state_;
};

template <class Model>
class FlipLoop<Model, true> {
 public:
  using index_type = typename Model::index_type;
  using value_type = typename Model::value_type;
  using energy_type = typename Model::energy_type;

  explicit FlipLoop(SpinState<Model>& state) noexcept
      : state_(&state),
        spins_(StateAccess::spins(state)),
        fields_(StateAccess::fields(state)),
        row_(state.model().row_start_data()),
        neighbours_(state.model().neighbour_data()),
        values_(state.model().value_data()),
        energy_(state.energy()) {}

  // flip_with_delta(i, d) of the state, with the energy kept here until finish().
  SPINWRIGHT_HOT_INLINE void flip(index_type i, energy_type d) noexcept {
    SPINWRIGHT_ASSERT(i < state_->size(), "spin index beyond the state's model (flip)");
    energy_ += d;
    const std::int8_t old = spins_[i];
    spins_[i] = static_cast<std::int8_t>(-old);
    // Ising: fields change by -2 s_old J; QUBO: x_i changes by +1 when the old spin was +1.
    const energy_type step = Model::form == Form::ising ? static_cast<energy_type>(-2 * old) : old;
    const std::size_t end = row_[i + 1];
    for (std::size_t k = row_[i]; k < end; ++k) fields_[neighbours_[k]] += step * static_cast<energy_type>(values_[k]);
  }

  // Hands the energy back to the state; call before the state is read or flipped otherwise.
  void finish() noexcept { StateAccess::set_energy(*state_, energy_); }

 private:
  SpinState<Model>* state_;
  std::int8_t* spins_;
  energy_type* fields_;
  const std::size_t* row_;
  const index_type* neighbours_;
  const value_type* values_;
  energy_type energy_;
};

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_FLIP_LOOP_HPP
