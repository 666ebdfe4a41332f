// spinwright — exact conversion between the Ising and QUBO forms, offset included, with
// x = (1 - s) / 2 (spin +1 is bit 0). The formulas and when a conversion is exact (integer
// models: always, or refused; floating ones: within rounding) are in docs/models.md.
// ising_from() produces double couplings; qubo_from() keeps the value type; with_value_type()
// changes only the value type, exactly or not at all.
#ifndef SPINWRIGHT_MODEL_CONVERT_HPP
#define SPINWRIGHT_MODEL_CONVERT_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "builder.hpp"
#include "form.hpp"
#include "sparse_model.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int64_t
#include <limits>       // std::numeric_limits
#include <type_traits>  // std::is_integral_v
#include <utility>      // std::move
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

namespace detail {
// v as To, when it converts exactly (and back to the same value).
template <class To, class From>
bool converts_exactly(From v) noexcept {
  if constexpr (std::is_integral_v<From> && std::is_floating_point_v<To>) {
    constexpr std::int64_t limit = std::int64_t{1} << std::numeric_limits<To>::digits;  // 2^53 for double
    const auto w = static_cast<std::int64_t>(v);
    return -limit <= w && w <= limit;
  } else if constexpr (std::is_integral_v<From>) {
    return fits_value<To>(v);
  } else if constexpr (std::is_integral_v<To>) {
    static_assert(std::is_signed_v<To>, "model values are signed");
    constexpr double low = static_cast<double>(std::numeric_limits<To>::min());  // -2^(bits - 1), exact
    return v >= low && v < -low && static_cast<From>(static_cast<To>(v)) == v;
  } else {
    return fits_value<To>(v) && static_cast<From>(static_cast<To>(v)) == v;
  }
}
}  // namespace detail

/// The same model (form, pattern, order of every row) with another value type, in O(N + pairs)
/// with no sort: e.g. an int64 model whose values and energy range fit int32, or an integer
/// model as double. Refused, naming the first term that does not convert exactly (or the
/// energy range), when a value or the offset would change.
template <class To, Form F, class From, class Index>
Result<SparseModel<F, To, Index>> with_value_type(const SparseModel<F, From, Index>& m) {
  using to_energy = energy_t<To>;
  const std::size_t n = m.num_spins();
  const auto& row = m.row_starts();
  const auto& nbr = m.neighbour_array();
  const auto& from_values = m.value_array();
  const auto& from_linear = m.site_term_array();
  std::vector<To> linear(n);
  std::vector<To> values(from_values.size());
  detail::EnergyRange<To> range;
  const auto offset = m.offset();
  if (!detail::converts_exactly<to_energy>(offset)) {
    return Status::error(StatusCode::value_out_of_range, "the offset does not convert exactly to the new value type");
  }
  // The range adds the offset, the one-body terms, then each pair once in (i, j) order, as a
  // builder does (so a floating bound is the builder's to the last bit).
  bool fits = range.add(static_cast<to_energy>(offset));
  for (std::size_t i = 0; i < n; ++i) {
    if (!detail::converts_exactly<To>(from_linear[i])) {
      return Status::error(StatusCode::value_out_of_range, "a one-body term does not convert exactly to the new value type")
          .at_term(no_term, i, i);
    }
    linear[i] = static_cast<To>(from_linear[i]);
    fits = range.add(static_cast<to_energy>(linear[i])) && fits;
  }
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t k = row[i]; k < row[i + 1]; ++k) {
      if (!detail::converts_exactly<To>(from_values[k])) {
        return Status::error(StatusCode::value_out_of_range, "a pair term does not convert exactly to the new value type")
            .at_term(no_term, i, static_cast<std::size_t>(nbr[k]));
      }
      values[k] = static_cast<To>(from_values[k]);
      if (static_cast<std::size_t>(nbr[k]) > i) fits = range.add(static_cast<to_energy>(values[k])) && fits;
    }
  }
  if (!fits) return Status::error(StatusCode::energy_overflow, detail::build_range_message<To>());
  return detail::ModelAccess::make<F, To, Index>(std::move(linear), std::vector<std::size_t>(row),
                                                 std::vector<Index>(nbr), std::move(values),
                                                 static_cast<to_energy>(offset), range);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_CONVERT_HPP
