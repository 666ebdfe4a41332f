// spinwright — immutable-structure sparse models: IsingModel and QuboModel.
// Compressed rows with both directions of every pair stored and each neighbour list sorted.
// Coefficients of existing terms can be edited in place (set_site_term / set_pair); the
// sparsity pattern cannot change after build().
#ifndef SPINWRIGHT_MODEL_SPARSE_MODEL_HPP
#define SPINWRIGHT_MODEL_SPARSE_MODEL_HPP

#include "../config.hpp"
#include "span.hpp"
#include "detail/energy_range.hpp"
#include "../status.hpp"
#include "form.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint64_t
#include <type_traits>  // std::enable_if_t
#include <utility>      // std::move
#include <vector>       // std::vector (models own their storage)

namespace spinwright {

namespace detail {
struct ModelAccess;
}

// Figures a user looks at before choosing a kernel.
struct ModelSummary {
  std::size_t num_spins = 0;
  std::size_t num_pairs = 0;
  std::size_t num_site_terms = 0;  // non-zero fields (Ising) or unary terms (QUBO)
  std::size_t min_degree = 0;
  std::size_t max_degree = 0;
  double largest_magnitude = 0;   // over non-zero linear and pair coefficients
  double smallest_magnitude = 0;  // over non-zero linear and pair coefficients (0 if none)
};

template <Form F, class Value, class Index = std::uint32_t>
class SparseModel {
  static_assert(is_value_type_v<Value>, "Value must be double, float, int32_t or int64_t");
  static_assert(is_index_type_v<Index>, "Index must be uint16_t or uint32_t");

 public:
  using value_type = Value;
  using index_type = Index;
  using energy_type = energy_t<Value>;
  static constexpr Form form = F;
  static constexpr bool is_dense = false;

  SparseModel() = default;

  std::size_t num_spins() const noexcept { return linear_.size(); }
  std::size_t size() const noexcept { return linear_.size(); }
  std::size_t num_pairs() const noexcept { return values_.size() / 2; }
  energy_type offset() const noexcept { return offset_; }

  // h_i for an Ising model, Q_ii for a QUBO model.
  Value site_term(Index i) const noexcept {
    SPINWRIGHT_ASSERT(i < num_spins(), "spin index out of range");
    return linear_[i];
  }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value field(Index i) const noexcept {
    return site_term(i);
  }
  template <Form G = F, std::enable_if_t<G == Form::qubo, int> = 0>
  Value unary(Index i) const noexcept {
    return site_term(i);
  }

  std::size_t degree(Index i) const noexcept { return row_[i + 1] - row_[i]; }
  Span<Index> neighbours(Index i) const noexcept { return {neighbours_.data() + row_[i], degree(i)}; }
  Span<Value> row_values(Index i) const noexcept { return {values_.data() + row_[i], degree(i)}; }

  // Calls f(j, value) for every neighbour j of i, in increasing j.
  template <class Fn>
  void for_each_neighbour(Index i, Fn&& f) const {
    const std::size_t end = row_[i + 1];
    for (std::size_t k = row_[i]; k < end; ++k) f(neighbours_[k], values_[k]);
  }

  // Position of pair (i, j) in row i, or npos when the model has no such pair. O(log degree).
  static constexpr std::size_t npos = ~std::size_t{0};
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

  // J_ij (Ising) or Q_ij (QUBO); 0 when the pair is absent.
  Value pair(Index i, Index j) const noexcept {
    const std::size_t k = find(i, j);
    return k == npos ? Value{0} : values_[k];
  }
  template <Form G = F, std::enable_if_t<G == Form::ising, int> = 0>
  Value coupling(Index i, Index j) const noexcept {
    return pair(i, j);
  }

  // Energy of a spin assignment (+1/-1 per spin; for QUBO, x = (1 - s) / 2), offset included.
  energy_type energy(const std::int8_t* spins) const noexcept {
    energy_type e = offset_;
    const std::size_t n = num_spins();
    for (std::size_t i = 0; i < n; ++i) {
      const auto ii = static_cast<Index>(i);
      if constexpr (F == Form::ising) {
        energy_type local = 0;
        const std::size_t end = row_[i + 1];
        for (std::size_t k = row_[i]; k < end; ++k) {
          if (neighbours_[k] > ii) local += static_cast<energy_type>(values_[k]) * spins[neighbours_[k]];
        }
        e += spins[i] * (static_cast<energy_type>(linear_[i]) + local);
      } else {
        if (spins[i] > 0) continue;  // x_i = 0
        energy_type local = static_cast<energy_type>(linear_[i]);
        const std::size_t end = row_[i + 1];
        for (std::size_t k = row_[i]; k < end; ++k) {
          if (neighbours_[k] > ii && spins[neighbours_[k]] < 0) local += static_cast<energy_type>(values_[k]);
        }
        e += local;
      }
    }
    return e;
  }

  // Energy of a bit assignment (0/1 per variable), for QUBO users who think in bits.
  template <Form G = F, std::enable_if_t<G == Form::qubo, int> = 0>
  energy_type energy_of_bits(const std::uint8_t* bits) const {
    std::vector<std::int8_t> spins(num_spins());
    for (std::size_t i = 0; i < spins.size(); ++i) spins[i] = bits[i] ? -1 : 1;
    return energy(spins.data());
  }

  ModelSummary summary() const noexcept {
    ModelSummary s;
    s.num_spins = num_spins();
    s.num_pairs = num_pairs();
    bool first = true;
    auto see = [&](Value v) {
      if (v == Value{0}) return;
      const double a = detail::abs_double(v);
      if (first || a > s.largest_magnitude) s.largest_magnitude = a;
      if (first || a < s.smallest_magnitude) s.smallest_magnitude = a;
      first = false;
    };
    for (std::size_t i = 0; i < num_spins(); ++i) {
      if (linear_[i] != Value{0}) ++s.num_site_terms;
      see(linear_[i]);
      const std::size_t d = degree(static_cast<Index>(i));
      if (i == 0 || d < s.min_degree) s.min_degree = d;
      if (d > s.max_degree) s.max_degree = d;
    }
    for (const Value v : values_) see(v);
    return s;
  }

  // Bound on |E| and on every local field: |c| + sum |linear| + sum_{i<j} |pair|.
  // For integer models this never exceeds integer_energy_limit (enforced by build and edits).
  double energy_bound() const noexcept { return range_.bound(); }

  // In-place edits of existing terms; the pattern never changes (a pair set to 0 stays stored,
  // and can be given a value again). Use the free functions in
  // state/spin_state.hpp to keep a state's local fields exact through an edit.
  Status set_site_term(Index i, Value v) noexcept {
    if (i >= num_spins()) {
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a site term at an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, i);
    }
    if (!detail::is_finite(v)) {
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, i);
    }
    const Status st = rebound(linear_[i], v);
    if (!st) return Status(st).at_term(no_term, i, i);
    linear_[i] = v;
    return Status::success();
  }

  Status set_pair(Index i, Index j, Value v) noexcept {
    if (i >= num_spins() || j >= num_spins()) {
      return Status::error(StatusCode::index_out_of_range,
                           "edit of a pair with an index >= num_spins() (valid: 0 .. num_spins() - 1)")
          .at_term(no_term, i, j);
    }
    const std::size_t kij = find(i, j);
    if (kij == npos) {
      return Status::error(StatusCode::missing_term,
                           "edit of a pair the model does not have (the pattern is fixed at build)")
          .at_term(no_term, i, j);
    }
    if (!detail::is_finite(v)) {
      return Status::error(StatusCode::non_finite_value,
                           "edited value is NaN or infinite; only finite values are allowed")
          .at_term(no_term, i, j);
    }
    const Status st = rebound(values_[kij], v);
    if (!st) return Status(st).at_term(no_term, i, j);
    values_[kij] = v;
    values_[find(j, i)] = v;
    return Status::success();
  }

  Status set_offset(energy_type c) noexcept {
    if (!detail::is_finite(c))
      return Status::error(StatusCode::non_finite_value, "offset is NaN or infinite; only finite values are allowed");
    if (!range_.replace(offset_, c))
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(true));
    offset_ = c;
    return Status::success();
  }

  // Raw access for kernels and file writers.
  const std::vector<std::size_t>& row_starts() const noexcept { return row_; }
  const std::vector<Index>& neighbour_array() const noexcept { return neighbours_; }
  const std::vector<Value>& value_array() const noexcept { return values_; }
  const std::vector<Value>& site_term_array() const noexcept { return linear_; }

 private:
  friend struct detail::ModelAccess;

  Status rebound(Value old_value, Value new_value) noexcept {
    if (!range_.replace(static_cast<energy_type>(old_value), static_cast<energy_type>(new_value))) {
      return Status::error(StatusCode::energy_overflow, detail::range_message<Value>(false));
    }
    return Status::success();
  }

  std::vector<Value> linear_;
  std::vector<std::size_t> row_{0};
  std::vector<Index> neighbours_;
  std::vector<Value> values_;
  energy_type offset_{0};
  detail::EnergyRange<Value> range_{};  // |c| + sum |linear| + sum |pair|
};

template <class Value, class Index = std::uint32_t>
using IsingModel = SparseModel<Form::ising, Value, Index>;
template <class Value, class Index = std::uint32_t>
using QuboModel = SparseModel<Form::qubo, Value, Index>;

namespace detail {
struct ModelAccess {
  template <Form F, class Value, class Index>
  static SparseModel<F, Value, Index> make(std::vector<Value> linear, std::vector<std::size_t> row,
                                           std::vector<Index> neighbours, std::vector<Value> values,
                                           energy_t<Value> offset, EnergyRange<Value> range) {
    SparseModel<F, Value, Index> m;
    m.linear_ = std::move(linear);
    m.row_ = std::move(row);
    m.neighbours_ = std::move(neighbours);
    m.values_ = std::move(values);
    m.offset_ = offset;
    m.range_ = range;
    return m;
  }
};
}  // namespace detail

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_SPARSE_MODEL_HPP
