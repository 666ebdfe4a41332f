// spinwright — max-cut on a weighted graph as an Ising model.
// A graph with edge weights w becomes J_ij = w_ij, h = 0 (self-loops fold into the offset).
// Edge (i, j) is cut when s_i != s_j, and
//   cut(s) = sum w_ij (1 - s_i s_j) / 2 = (W - E(s)) / 2,   W = offset + sum_{i<j} J_ij,
// so the largest cut is the ground state (common practice; e.g. Barahona, Groetschel,
// Juenger, Reinelt, Oper. Res. 36, 1988).
#ifndef SPINWRIGHT_MODEL_MAXCUT_HPP
#define SPINWRIGHT_MODEL_MAXCUT_HPP

#include "../config.hpp"
#include "form.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t

namespace spinwright {

// W: the total weight of a max-cut model (offset plus every coupling once).
template <class Model>
typename Model::energy_type total_weight(const Model& m) noexcept {
  static_assert(Model::form == Form::ising, "max-cut models are Ising models");
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;
  energy_type w = m.offset();
  for (std::size_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    m.for_each_neighbour(ii, [&](index_type j, typename Model::value_type v) {
      if (j > ii) w += static_cast<energy_type>(v);
    });
  }
  return w;
}

// The weight of the edges cut by a spin assignment, counted edge by edge.
template <class Model>
typename Model::energy_type cut_value(const Model& m, const std::int8_t* spins) noexcept {
  using energy_type = typename Model::energy_type;
  using index_type = typename Model::index_type;
  energy_type cut = 0;
  for (std::size_t i = 0; i < m.num_spins(); ++i) {
    const auto ii = static_cast<index_type>(i);
    m.for_each_neighbour(ii, [&](index_type j, typename Model::value_type v) {
      if (j > ii && spins[i] != spins[j]) cut += static_cast<energy_type>(v);
    });
  }
  return cut;
}

template <class Energy>
constexpr Energy cut_from_energy(Energy total_weight, Energy energy) noexcept {
  return (total_weight - energy) / 2;
}

template <class Energy>
constexpr Energy energy_from_cut(Energy total_weight, Energy cut) noexcept {
  return total_weight - 2 * cut;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_MAXCUT_HPP
