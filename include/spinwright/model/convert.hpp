// spinwright — exact conversion between the Ising and QUBO forms, offset included, with
// x = (1 - s) / 2 (spin +1 is bit 0). The formulas and when a conversion is exact (integer
// models: always, or refused; floating ones: within rounding) are in docs/models.md.
// ising_from() produces double couplings; qubo_from() keeps the value type.
#ifndef SPINWRIGHT_MODEL_CONVERT_HPP
#define SPINWRIGHT_MODEL_CONVERT_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "builder.hpp"
#include "form.hpp"
#include "sparse_model.hpp"

#include <cstddef>      // std::size_t
#include <type_traits>  // std::is_integral_v
#include <vector>       // std::vector

namespace spinwright {

template <class Value, class Index>
Result<IsingModel<double, Index>> ising_from(const QuboModel<Value, Index>& q) {
  if constexpr (std::is_integral_v<Value>) {
    if (q.energy_bound() >= 0x1.0p50) {
      return Status::error(StatusCode::value_out_of_range,
                           "integer QUBO too large to convert exactly to double couplings (energy range >= 2^50)");
    }
  }
  const std::size_t n = q.num_spins();
  IsingBuilder<double, Index> b(n);
  b.reserve(q.num_pairs());
  double c = static_cast<double>(q.offset());
  std::vector<double> h(n, 0.0);
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    const double qii = static_cast<double>(q.site_term(ii));
    h[i] -= qii / 2;
    c += qii / 2;
    q.for_each_neighbour(ii, [&](Index j, Value v) {
      const double qij = static_cast<double>(v);
      h[i] -= qij / 4;
      if (j > ii) {
        c += qij / 4;
        b.add_coupling(i, j, qij / 4);
      }
    });
  }
  for (std::size_t i = 0; i < n; ++i) b.add_field(i, h[i]);
  b.add_offset(c);
  return b.build();
}

template <class Value, class Index>
Result<QuboModel<Value, Index>> qubo_from(const IsingModel<Value, Index>& m) {
  using energy_type = energy_t<Value>;
  const std::size_t n = m.num_spins();
  QuboBuilder<Value, Index> b(n);
  b.reserve(m.num_pairs());
  energy_type c = m.offset();
  bool fits = true;
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    const auto hi = static_cast<energy_type>(m.site_term(ii));
    energy_type qii = -2 * hi;
    fits = fits && detail::checked_add(c, hi);
    m.for_each_neighbour(ii, [&](Index j, Value v) {
      const auto jij = static_cast<energy_type>(v);
      fits = fits && detail::checked_add(qii, static_cast<energy_type>(-2 * jij));
      if (j > ii) {
        fits = fits && detail::checked_add(c, jij);
        const energy_type qij = 4 * jij;
        if (!detail::fits_value<Value>(qij)) {
          fits = false;
        } else {
          b.add_pair(i, j, static_cast<Value>(qij));
        }
      }
    });
    if (!detail::fits_value<Value>(qii)) {
      fits = false;
    } else {
      b.add_unary(i, static_cast<Value>(qii));
    }
  }
  if (!fits) {
    return Status::error(StatusCode::value_out_of_range,
                         "QUBO coefficients of this Ising model do not fit the value type");
  }
  b.add_offset(c);
  return b.build();
}

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_CONVERT_HPP
