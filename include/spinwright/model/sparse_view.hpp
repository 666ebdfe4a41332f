// spinwright — SparseModelView: a sparse model over arrays the caller owns (static storage,
// flash, or any buffer), for builds without a heap. It has the read interface of SparseModel
// (kernels and states accept it unchanged) and never allocates; coefficients cannot be
// edited through it.
//
// The arrays are the compressed rows SparseModel uses: `row_starts` (N + 1 entries),
// `neighbours` and `values` (row_starts[N] entries; both directions of every pair, each row
// sorted by neighbour), `linear` (N fields or unary terms) and the offset. over() checks all
// of it — sorted rows, symmetric storage, no self-pairs, finite values, and for integer
// models the energy bound — and refuses with a Status naming the first bad entry.
#ifndef SPINWRIGHT_MODEL_SPARSE_VIEW_HPP
#define SPINWRIGHT_MODEL_SPARSE_VIEW_HPP

#include "../config.hpp"
#include "span.hpp"
#include "detail/energy_range.hpp"
#include "../status.hpp"
#include "form.hpp"
#include "sparse_model.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t
#include <type_traits>  // std::is_integral_v

namespace spinwright {

template <Form F, class Value, class Index = std::uint32_t>
class SparseModelView {
  static_assert(is_value_type_v<Value>, "Value must be double, float, int32_t or int64_t");
  static_assert(is_index_type_v<Index>, "Index must be uint16_t or uint32_t");

 public:
  using value_type = Value;
  using index_type = Index;
  using energy_type = energy_t<Value>;
  static constexpr Form form = F;
  static constexpr bool is_dense = false;
  static constexpr std::size_t npos = ~std::size_t{0};

  SparseModelView() = default;

  static Result<SparseModelView> over(std::size_t n, const Value* linear, const std::size_t* row_starts,
                                      const Index* neighbours, const Value* values, energy_type offset = 0) noexcept {
    if (n >= max_spins_v<Index>)
      return Status::error(StatusCode::index_out_of_range, "more spins than the index type can address");
    if (row_starts == nullptr || (n > 0 && linear == nullptr)) {
      return Status::error(StatusCode::invalid_argument, "missing array (site terms or row starts)");
    }
    if (row_starts[0] != 0) return Status::error(StatusCode::invalid_argument, "row_starts[0] must be 0");
    if (!detail::is_finite(offset)) return Status::error(StatusCode::non_finite_value, "offset is NaN or infinite");
    SparseModelView v;
    v.n_ = n;
    v.linear_ = linear;
    v.row_ = row_starts;
    v.neighbours_ = neighbours;
    v.values_ = values;
    v.offset_ = offset;
    detail::EnergyRange<Value> range;
    bool fits = range.add(offset);
    for (std::size_t i = 0; i < n; ++i) {
      if (row_starts[i + 1] < row_starts[i]) {
        return Status::error(StatusCode::invalid_argument, "row_starts must not decrease").at_term(no_term, i, i);
      }
      if (!detail::is_finite(linear[i])) {
        return Status::error(StatusCode::non_finite_value, "site term is NaN or infinite").at_term(no_term, i, i);
      }
      fits = range.add(linear[i]) && fits;
      for (std::size_t k = row_starts[i]; k < row_starts[i + 1]; ++k) {
        const Index j = neighbours[k];
        if (j >= n)
          return Status::error(StatusCode::index_out_of_range, "neighbour beyond the model").at_term(no_term, i, j);
        if (j == i)
          return Status::error(StatusCode::invalid_argument,
                               "self-pair in a row (fold it into the site term or offset)")
              .at_term(no_term, i, j);
        if (k > row_starts[i] && neighbours[k - 1] >= j) {
          return Status::error(StatusCode::invalid_argument, "row not sorted by neighbour, or a neighbour repeated")
              .at_term(no_term, i, j);
        }
        if (!detail::is_finite(values[k])) {
          return Status::error(StatusCode::non_finite_value, "pair value is NaN or infinite").at_term(no_term, i, j);
        }
        if (values[k] == Value{0})
          return Status::error(StatusCode::invalid_argument, "stored pair value is zero").at_term(no_term, i, j);
        const std::size_t back = v.find(j, static_cast<Index>(i));
        if (back == npos || values[back] != values[k]) {
          return Status::error(StatusCode::invalid_argument, "pair not stored symmetrically (j, i) with the same value")
              .at_term(no_term, i, j);
        }
        if (j > i) fits = range.add(values[k]) && fits;
      }
    }
    if (!fits) return Status::error(StatusCode::energy_overflow, detail::build_range_message<Value>());
    v.bound_ = range.bound();
    return v;
  }

  std::size_t num_spins() const noexcept { return n_; }
  std::size_t size() const noexcept { return n_; }
  std::size_t num_pairs() const noexcept { return row_ == nullptr ? 0 : row_[n_] / 2; }
  energy_type offset() const noexcept { return offset_; }
  Value site_term(Index i) const noexcept { return linear_[i]; }
  std::size_t degree(Index i) const noexcept { return row_[i + 1] - row_[i]; }
  Span<Index> neighbours(Index i) const noexcept { return {neighbours_ + row_[i], degree(i)}; }
  Span<Value> row_values(Index i) const noexcept { return {values_ + row_[i], degree(i)}; }

  template <class Fn>
  void for_each_neighbour(Index i, Fn&& f) const {
    const std::size_t end = row_[i + 1];
    for (std::size_t k = row_[i]; k < end; ++k) f(neighbours_[k], values_[k]);
  }

  std::size_t find(Index i, Index j) const noexcept {
    std::size_t lo = row_[i];
    std::size_t hi = row_[i + 1];
    while (lo < hi) {
      const std::size_t mid = lo + (hi - lo) / 2;
      if (neighbours_[mid] < j) {
        lo = mid + 1;
      } else {
        hi = mid;
      }
    }
    return (lo < row_[i + 1] && neighbours_[lo] == j) ? lo : npos;
  }

  Value pair(Index i, Index j) const noexcept {
    const std::size_t k = find(i, j);
    return k == npos ? Value{0} : values_[k];
  }

  energy_type energy(const std::int8_t* spins) const noexcept {
    energy_type e = offset_;
    for (std::size_t i = 0; i < n_; ++i) {
      const auto ii = static_cast<Index>(i);
      if constexpr (F == Form::ising) {
        energy_type local = 0;
        for (std::size_t k = row_[i]; k < row_[i + 1]; ++k) {
          if (neighbours_[k] > ii) local += static_cast<energy_type>(values_[k]) * spins[neighbours_[k]];
        }
        e += spins[i] * (static_cast<energy_type>(linear_[i]) + local);
      } else {
        if (spins[i] > 0) continue;
        auto local = static_cast<energy_type>(linear_[i]);
        for (std::size_t k = row_[i]; k < row_[i + 1]; ++k) {
          if (neighbours_[k] > ii && spins[neighbours_[k]] < 0) local += static_cast<energy_type>(values_[k]);
        }
        e += local;
      }
    }
    return e;
  }

  double energy_bound() const noexcept { return bound_; }

 private:
  std::size_t n_ = 0;
  const Value* linear_ = nullptr;
  const std::size_t* row_ = nullptr;
  const Index* neighbours_ = nullptr;
  const Value* values_ = nullptr;
  energy_type offset_{0};
  double bound_ = 0;
};

template <class Value, class Index = std::uint32_t>
using IsingModelView = SparseModelView<Form::ising, Value, Index>;
template <class Value, class Index = std::uint32_t>
using QuboModelView = SparseModelView<Form::qubo, Value, Index>;

// A view of an existing model's arrays (valid while the model lives and is not edited).
template <Form F, class Value, class Index>
SparseModelView<F, Value, Index> view_of(const SparseModel<F, Value, Index>& m) noexcept {
  auto v = SparseModelView<F, Value, Index>::over(m.num_spins(), m.site_term_array().data(), m.row_starts().data(),
                                                  m.neighbour_array().data(), m.value_array().data(), m.offset());
  SPINWRIGHT_ASSERT(v.ok(), "a built model always satisfies the view's checks");
  return v.ok() ? v.value() : SparseModelView<F, Value, Index>{};
}

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_SPARSE_VIEW_HPP
